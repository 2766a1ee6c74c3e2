/**
 * Simulation-based calibration (SBC) of a spec's posterior: draw the truth
 * from the priors, simulate RVs at the spec's times, errors and instruments,
 * sample each simulated data set with a short ensemble run, and test the
 * ranks of the truth among thinned posterior draws for uniformity (Talts,
 * Betancourt, Simpson, Vehtari & Gelman 2018, arXiv:1804.06788).
 *
 * ```ts
 * const problem = await loadProblem("spec.toml");
 * const result = await calibrate(problem, { simulations: 200, threads: 2 });
 * for (const line of calibrationText(result)) console.log(line);
 * ```
 * @module
 */
export {
  calibrate,
  type CalibrateOptions,
  type CalibrationProgress,
  type CalibrationResult,
  type QuantityCalibration,
} from "./calibrate.ts";
export {
  calibrationKeys,
  type DensityModule,
  MODEL_DENSITY,
  runSimulation,
  type SimulationResult,
  type SimulationSettings,
  type StartKind,
} from "./simulation.ts";
export {
  derivedFunction,
  derivedKeys,
  drawFromPrior,
  drawPrior,
  instrumentJitters,
  type PriorDraw,
  simulateData,
} from "./simulate.ts";
export {
  binomialBand,
  defaultBins,
  type RankBinning,
  rankCounts,
  type RankOptions,
  rankUniformity,
  sbcRank,
  type UniformityTest,
  validateBinning,
} from "./ranks.ts";
export { chiSquareSurvival, regularizedGammaP, regularizedGammaQ } from "./chi_square.ts";
export { type RankHistogramInput, rankHistogramSvg } from "./histogram_svg.ts";
export { calibrationText, type CalibrationTextOptions, histogramBars } from "./text.ts";
export { type CalibrationJson, calibrationJson, type QuantityJson } from "./json.ts";
