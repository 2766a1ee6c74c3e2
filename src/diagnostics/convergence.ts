/**
 * One-call convergence report over chosen columns of an ensemble chain.
 * @module
 */

import { type ChainView, validateBurn, validateChainView, validateColumn } from "./chain_view.ts";
import { combineRhat, extractChains, splitChains, summariseSplit } from "./_core.ts";
import { tauOfChains } from "./_tau.ts";
import { chooseBurnIn } from "./burn_in.ts";

/** Thresholds for declaring convergence. */
export interface ConvergenceThresholds {
  /** R-hat must be below this. @default 1.01 */
  rhat: number;
  /** Bulk ESS must exceed this. @default 400 */
  essBulk: number;
  /** Steps after burn-in per tau must exceed this. @default 50 */
  stepsPerTau: number;
}

/**
 * Default thresholds. R-hat < 1.01 and bulk ESS > 400 are the
 * recommendations of Vehtari et al. 2021 (Bayesian Analysis 16(2), 667,
 * arXiv:1903.08008, sec. 4; 400 = 100 per chain for four chains). Running
 * more than 50 tau is common practice for ensemble samplers (discussed by
 * Foreman-Mackey et al. 2013, PASP 125, 306); no stronger source.
 */
export const DEFAULT_THRESHOLDS: Readonly<ConvergenceThresholds> = Object.freeze({
  rhat: 1.01,
  essBulk: 400,
  stepsPerTau: 50,
});

/** Diagnostics of one column. NaN where undefined. */
export interface ColumnConvergence {
  readonly column: number;
  readonly name: string;
  /** max(rhatBulk, rhatTail), the recommended R-hat. */
  readonly rhat: number;
  /** Classic split R-hat. */
  readonly rhatClassic: number;
  /** Rank-normalised split R-hat. */
  readonly rhatBulk: number;
  /** Rank-normalised folded split R-hat. */
  readonly rhatTail: number;
  readonly essBulk: number;
  /** min of the 5 % and 95 % quantile ESS. */
  readonly essTail: number;
  /** ESS of the raw draws (for the MCSE of the mean). */
  readonly essMean: number;
  /** Monte Carlo standard error of the mean, sd / sqrt(essMean). */
  readonly mcseMean: number;
  readonly mean: number;
  readonly sd: number;
  /** Integrated autocorrelation time in steps. */
  readonly tau: number;
  /** False when Sokal's window did not fit inside the chain (tau unreliable). */
  readonly tauWindowFound: boolean;
  /** Steps after burn-in divided by tau. */
  readonly stepsPerTau: number;
}

/** Result of {@link convergenceReport}. */
export interface ConvergenceReport {
  /** Steps discarded from every walker. */
  readonly burn: number;
  /** Steps per walker after burn-in. */
  readonly steps: number;
  readonly walkers: number;
  readonly columns: readonly ColumnConvergence[];
  /** Largest R-hat (NaN entries ignored; NaN if none defined). */
  readonly maxRhat: number;
  readonly minEssBulk: number;
  readonly minEssTail: number;
  readonly maxTau: number;
  readonly minStepsPerTau: number;
  readonly thresholds: Readonly<ConvergenceThresholds>;
  /** All criteria hold for all columns: a flag, never a proof. */
  readonly converged: boolean;
  /** Why `converged` is false; empty when it is true. */
  readonly reasons: readonly string[];
}

/** Options of {@link convergenceReport}. */
export interface ConvergenceOptions {
  /** Columns to assess (the sampled parameters). */
  columns: readonly number[];
  /** Steps to discard; chosen by {@link chooseBurnIn} when absent. */
  burn?: number;
  /** Overrides of {@link DEFAULT_THRESHOLDS}. */
  thresholds?: Partial<ConvergenceThresholds>;
  /** Display names, one per entry of `columns`. @default "column <c>" */
  names?: readonly string[];
  /** Log-posterior column for the automatic burn-in. */
  logPosteriorColumn?: number;
  /** Sokal window factor. @default 5 */
  factor?: number;
}

function extremum(values: readonly number[], pickMax: boolean): number {
  let out = NaN;
  for (const v of values) {
    if (Number.isNaN(v)) continue;
    if (Number.isNaN(out) || (pickMax ? v > out : v < out)) out = v;
  }
  return out;
}

function fmt(x: number): string {
  if (!Number.isFinite(x)) return String(x);
  return Math.abs(x) >= 100 ? x.toFixed(0) : x.toPrecision(4);
}

/** Criteria check shared with the streaming mode. */
export function assessColumns(
  columns: readonly ColumnConvergence[],
  thresholds: Readonly<ConvergenceThresholds>,
): { converged: boolean; reasons: string[] } {
  const reasons: string[] = [];
  if (columns.length === 0) reasons.push("no columns were assessed");
  for (const c of columns) {
    if (Number.isNaN(c.rhat)) {
      reasons.push(`R-hat of ${c.name} is undefined (constant, non-finite or too few steps)`);
    } else if (!(c.rhat < thresholds.rhat)) {
      reasons.push(`R-hat of ${c.name} is ${fmt(c.rhat)}, needs < ${thresholds.rhat}`);
    }
    if (Number.isNaN(c.essBulk)) {
      reasons.push(`bulk ESS of ${c.name} is undefined`);
    } else if (!(c.essBulk > thresholds.essBulk)) {
      reasons.push(`bulk ESS of ${c.name} is ${fmt(c.essBulk)}, needs > ${thresholds.essBulk}`);
    }
    if (Number.isNaN(c.stepsPerTau)) {
      reasons.push(`autocorrelation time of ${c.name} is undefined`);
    } else if (!(c.stepsPerTau > thresholds.stepsPerTau)) {
      reasons.push(
        `steps/tau of ${c.name} is ${fmt(c.stepsPerTau)}, needs > ${thresholds.stepsPerTau}`,
      );
    }
  }
  return { converged: reasons.length === 0, reasons };
}

/** Assemble the report from per-column results. */
export function buildReport(
  burn: number,
  steps: number,
  walkers: number,
  columns: readonly ColumnConvergence[],
  thresholds: Readonly<ConvergenceThresholds>,
): ConvergenceReport {
  const { converged, reasons } = assessColumns(columns, thresholds);
  return {
    burn,
    steps,
    walkers,
    columns,
    maxRhat: extremum(columns.map((c) => c.rhat), true),
    minEssBulk: extremum(columns.map((c) => c.essBulk), false),
    minEssTail: extremum(columns.map((c) => c.essTail), false),
    maxTau: extremum(columns.map((c) => c.tau), true),
    minStepsPerTau: extremum(columns.map((c) => c.stepsPerTau), false),
    thresholds,
    converged,
    reasons,
  };
}

/**
 * Convergence report: for each column, classic and rank-normalised split
 * R-hat, bulk and tail ESS, MCSE of the mean (Vehtari et al. 2021,
 * arXiv:1903.08008), integrated autocorrelation time with Sokal's window on
 * the walker-averaged autocorrelation function and steps/tau; then the
 * extremes, and `converged` = every column has R-hat < thresholds.rhat,
 * bulk ESS > thresholds.essBulk and steps/tau > thresholds.stepsPerTau,
 * with the failing criteria listed in `reasons`. Each walker after burn-in
 * counts as one chain. Undefined (NaN) values count as failures.
 *
 * @throws {TypeError} on a malformed view or names of the wrong length;
 * {RangeError} on a bad column, burn or threshold.
 */
export function convergenceReport(
  view: ChainView,
  options: ConvergenceOptions,
): ConvergenceReport {
  validateChainView(view);
  for (const c of options.columns) validateColumn(view, c);
  if (options.names !== undefined && options.names.length !== options.columns.length) {
    throw new TypeError(
      `Cannot name columns as names and columns differ in length: names=${options.names.length}, columns=${options.columns.length}`,
    );
  }
  const thresholds: ConvergenceThresholds = { ...DEFAULT_THRESHOLDS, ...options.thresholds };
  for (const [key, value] of Object.entries(thresholds)) {
    if (!Number.isFinite(value)) {
      throw new RangeError(
        `Cannot judge convergence as a threshold is not finite: ${key}=${value}`,
      );
    }
  }
  const factor = options.factor ?? 5;
  let burn: number;
  if (options.burn !== undefined) {
    validateBurn(view, options.burn);
    burn = options.burn;
  } else {
    burn = chooseBurnIn(view, {
      columns: options.columns,
      logPosteriorColumn: options.logPosteriorColumn,
      factor,
    }).burn;
  }
  const n = view.steps - burn;
  const results: ColumnConvergence[] = options.columns.map((column, i) => {
    const chains = extractChains(view, column, burn);
    const s = summariseSplit(splitChains(chains));
    const t = tauOfChains(chains, factor);
    return {
      column,
      name: options.names?.[i] ?? `column ${column}`,
      rhat: combineRhat(s.rhatBulk, s.rhatTail),
      rhatClassic: s.rhatClassic,
      rhatBulk: s.rhatBulk,
      rhatTail: s.rhatTail,
      essBulk: s.essBulk,
      essTail: s.essTail,
      essMean: s.essMean,
      mcseMean: s.sd / Math.sqrt(s.essMean),
      mean: s.mean,
      sd: s.sd,
      tau: t.tau,
      tauWindowFound: t.windowFound,
      stepsPerTau: n / t.tau,
    };
  });
  return buildReport(burn, n, view.walkers, results, thresholds);
}
