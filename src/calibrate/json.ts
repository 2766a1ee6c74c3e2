/**
 * The JSON form of a calibration: `{ "parameters": { "<key>": { "p_value",
 * "ranks", … } }, … }`, snake_case keys as in the summary's JSON.
 * @module
 */
import type { CalibrationResult } from "./calibrate.ts";

/** One quantity in {@link CalibrationJson}. */
export interface QuantityJson {
  p_value: number | null;
  ranks: number[];
  chi_square: number | null;
  df: number;
  bin_counts: number[];
  contraction: number | null;
}

/** The JSON document `rvwalk calibrate --json` prints. */
export interface CalibrationJson {
  parameters: Record<string, QuantityJson>;
  simulations: number;
  draws: number;
  bins: number;
  band99: [number, number];
  steps: number;
  burn: number;
  walkers: number;
  seed: number;
  start: string;
  diagnostics: {
    tau_median: number | null;
    tau_max: number | null;
    kept_per_tau_min: number | null;
    short_pools: number;
    rhat_median: number | null;
    rhat_max: number | null;
    rhat_above_1_1: number;
    acceptance_median: number | null;
    relocated_simulations: number;
  };
  seconds: number;
}

/** Plain JSON-able data; non-finite numbers become `null`. */
export function calibrationJson(result: CalibrationResult): CalibrationJson {
  const parameters: Record<string, QuantityJson> = {};
  for (const key of result.keys) {
    const q = result.parameters[key]!;
    parameters[key] = {
      p_value: num(q.pValue),
      ranks: [...q.ranks],
      chi_square: num(q.chiSquare),
      df: q.df,
      bin_counts: [...q.counts],
      contraction: num(q.contraction),
    };
  }
  const d = result.diagnostics;
  return {
    parameters,
    simulations: result.simulations,
    draws: result.draws,
    bins: result.bins,
    band99: [result.band[0], result.band[1]],
    steps: result.steps,
    burn: result.burn,
    walkers: result.walkers,
    seed: result.seed,
    start: result.start,
    diagnostics: {
      tau_median: num(d.tauMedian),
      tau_max: num(d.tauMax),
      kept_per_tau_min: num(d.keptPerTauMin),
      short_pools: d.shortPools,
      rhat_median: num(d.rhatMedian),
      rhat_max: num(d.rhatMax),
      rhat_above_1_1: d.rhatAbove,
      acceptance_median: num(d.acceptanceMedian),
      relocated_simulations: d.relocatedSimulations,
    },
    seconds: Math.round(result.seconds * 10) / 10,
  };
}

function num(x: number): number | null {
  return Number.isFinite(x) ? x : null;
}
