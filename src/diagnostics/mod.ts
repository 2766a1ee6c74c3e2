/**
 * Convergence diagnostics over ensemble chains: split and rank-normalised
 * R-hat, bulk and tail ESS, Monte Carlo standard errors (Vehtari et al.
 * 2021, Bayesian Analysis 16(2), 667, arXiv:1903.08008), integrated
 * autocorrelation time with Sokal's window, acceptance, stuck walkers,
 * automatic burn-in, a one-call report, and a streaming mode for the
 * dashboard. Pure functions over {@link ChainView}; no I/O.
 * @module
 */

export { type ChainView, validateBurn, validateChainView, validateColumn } from "./chain_view.ts";
export { normalQuantile } from "./normal_quantile.ts";
export { type ColumnOptions, rankNormalizedRhat, type RankRhat, splitRhat } from "./rhat.ts";
export { essBulk, essMean, essQuantile, essTail, type QuantileOptions } from "./ess.ts";
export { mcseMean, mcseQuantile } from "./mcse.ts";
export {
  autocorrelation,
  type AutocorrelationOptions,
  integratedAutocorrTime,
  type TauEstimate,
  type TauOptions,
} from "./autocorrelation.ts";
export {
  acceptanceFractions,
  type AcceptanceOptions,
  findStuckWalkers,
  type StuckOptions,
} from "./acceptance.ts";
export { type BurnIn, type BurnInOptions, chooseBurnIn } from "./burn_in.ts";
export {
  type ColumnConvergence,
  type ConvergenceOptions,
  type ConvergenceReport,
  convergenceReport,
  type ConvergenceThresholds,
  DEFAULT_THRESHOLDS,
} from "./convergence.ts";
export { StreamingDiagnostics, type StreamingOptions, type StreamingReport } from "./streaming.ts";
