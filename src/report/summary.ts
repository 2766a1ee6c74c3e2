/**
 * The posterior summary of a run: intervals of every sampled and derived
 * quantity after burn-in, and the convergence diagnostics.
 * @module
 */
import {
  acceptanceFractions,
  chooseBurnIn,
  type ConvergenceReport,
  convergenceReport,
  findStuckWalkers,
} from "../diagnostics/mod.ts";
import type { ChainData } from "../run/chain_file.ts";
import type { Manifest } from "../run/manifest.ts";
import { derivedDraws } from "./derived.ts";
import { type Interval, interval } from "./quantiles.ts";

/** The summary as printed by `summary --json`. */
export interface Summary {
  readonly title: string;
  readonly steps: number;
  readonly walkers: number;
  readonly burn: number;
  /** How the burn-in was chosen. */
  readonly burnRule: "auto" | "given";
  /** Every `thin`-th sampler step is stored. */
  readonly thin: number;
  /** Posterior draws used (stored rows after burn-in × walkers). */
  readonly draws: number;
  /** Convergence thresholds used. */
  readonly thresholds: {
    readonly rhat: number;
    readonly essBulk: number;
    readonly stepsPerTau: number;
  };
  readonly parameters: Record<string, Interval>;
  readonly derived: Record<string, Interval>;
  readonly diagnostics: {
    readonly rhat_max: number;
    readonly ess_bulk_min: number;
    readonly ess_tail_min: number;
    readonly tau_max: number;
    readonly steps_per_tau_min: number;
    readonly acceptance_mean: number;
    readonly stuck_walkers: number[];
    readonly converged: boolean;
    readonly reasons: readonly string[];
  };
  readonly perParameter: Record<
    string,
    { rhat: number; ess_bulk: number; ess_tail: number; tau: number; mcse_mean: number }
  >;
}

/**
 * Convergence of a whole chain as `summary` judges it: burn-in by the
 * automatic rule (or `burn`, in sampler steps), then the full report. Shared
 * with the `--until-converged` stopper so that a run stops only when its
 * summary will agree.
 */
export function fullConvergence(
  manifest: Manifest,
  chain: ChainData,
  options: { burn?: number } = {},
): { burn: number; burnRule: "auto" | "given"; report: ConvergenceReport | undefined } {
  const view = {
    data: chain.data,
    steps: chain.steps,
    walkers: chain.walkers,
    columns: chain.columns,
  };
  const columns = manifest.parameters.map((_, i) => 2 + i);
  const names = manifest.parameters.map((p) => p.key);
  const thin = manifest.thin ?? 1;
  let burn: number;
  let burnRule: "auto" | "given";
  if (options.burn !== undefined) {
    burn = Math.min(Math.ceil(options.burn / thin), Math.max(0, chain.steps - 1));
    burnRule = "given";
  } else {
    burn = chain.steps < 4 ? 0 : chooseBurnIn(view, { columns, logPosteriorColumn: 0 }).burn;
    burnRule = "auto";
  }
  const thresholds = manifest.spec.sampler.thresholds;
  const report = chain.steps - burn >= 4
    ? convergenceReport(view, { columns, burn, thresholds, names, logPosteriorColumn: 0 })
    : undefined;
  return { burn, burnRule, report };
}

/**
 * Summarise a chain read in full (all stored rows from 0). `burn` (in sampler
 * steps) overrides the automatic choice. Steps, burn-in and τ are reported in
 * sampler steps: stored row k is step (k + 1)·thin.
 */
export function summarise(
  manifest: Manifest,
  chain: ChainData,
  options: { burn?: number } = {},
): Summary {
  const view = {
    data: chain.data,
    steps: chain.steps,
    walkers: chain.walkers,
    columns: chain.columns,
  };
  const lead = 2;
  const { burn, burnRule, report } = fullConvergence(manifest, chain, options);
  const thresholds = manifest.spec.sampler.thresholds;
  const thin = manifest.thin ?? 1;
  const acc = acceptanceFractions(view, { column: 1 });
  let accMean = 0;
  for (const a of acc) accMean += a / acc.length;
  const parameters: Record<string, Interval> = {};
  const kept = chain.steps - burn;
  const draws = new Float64Array(kept * chain.walkers);
  manifest.parameters.forEach((p, i) => {
    column(chain, lead + i, burn, draws);
    parameters[p.key] = interval(draws, p.unit);
  });
  const derived: Record<string, Interval> = {};
  for (const [key, d] of derivedDraws(manifest, chain, { burn })) {
    derived[key] = interval(d.values, d.unit);
  }
  const perParameter: Summary["perParameter"] = {};
  for (const c of report?.columns ?? []) {
    perParameter[c.name] = {
      rhat: c.rhat,
      ess_bulk: c.essBulk,
      ess_tail: c.essTail,
      tau: c.tau * thin,
      mcse_mean: c.mcseMean,
    };
  }
  return {
    title: manifest.spec.title,
    steps: chain.steps * thin,
    walkers: chain.walkers,
    burn: burn * thin,
    burnRule,
    thin,
    draws: kept * chain.walkers,
    thresholds,
    parameters,
    derived,
    diagnostics: {
      rhat_max: report?.maxRhat ?? NaN,
      ess_bulk_min: report?.minEssBulk ?? NaN,
      ess_tail_min: report?.minEssTail ?? NaN,
      tau_max: (report?.maxTau ?? NaN) * thin,
      steps_per_tau_min: report?.minStepsPerTau ?? NaN,
      acceptance_mean: accMean,
      stuck_walkers: findStuckWalkers(acc),
      converged: report?.converged ?? false,
      reasons: report?.reasons ?? ["too few steps after burn-in to assess convergence"],
    },
    perParameter,
  };
}

/** Copy one column's draws after burn-in (all walkers) into `out`. */
export function column(chain: ChainData, c: number, burn: number, out: Float64Array): Float64Array {
  const { walkers, columns, data } = chain;
  let k = 0;
  for (let s = burn; s < chain.steps; s++) {
    const base = s * walkers * columns + c;
    for (let w = 0; w < walkers; w++) out[k++] = data[base + w * columns]!;
  }
  return out;
}
