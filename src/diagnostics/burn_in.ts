/**
 * Automatic burn-in choice.
 * @module
 */

import { type ChainView, validateChainView, validateColumn } from "./chain_view.ts";
import { extractChains } from "./_core.ts";
import { tauOfChains } from "./_tau.ts";

/** Options of {@link chooseBurnIn}. */
export interface BurnInOptions {
  /** Columns whose autocorrelation time sets the tau part of the rule. */
  columns: readonly number[];
  /** Column of the log-posterior; without it only the tau part applies. */
  logPosteriorColumn?: number;
  /** Burn at least this many tau_max. @default 2 */
  tauMultiple?: number;
  /** Settled means within this many sd of the final-half median. @default 5 */
  tolerance?: number;
  /** Sokal window factor. @default 5 */
  factor?: number;
}

/** The chosen burn-in and its ingredients. */
export interface BurnIn {
  /** Steps to discard from every walker. */
  readonly burn: number;
  /** Largest tau (in steps) of `columns` over the whole chain; NaN if none defined. */
  readonly tauMax: number;
  /** First step from which the walker-mean log-posterior stays settled; NaN without it. */
  readonly settleStep: number;
  /** True when the rule asked for more than half the chain. */
  readonly capped: boolean;
}

/**
 * Burn-in rule used by `summary` unless the user gives one:
 *
 *   burn = min(floor(N/2), max(ceil(tauMultiple · tau_max), settleStep))
 *
 * - tau_max is the largest integrated autocorrelation time of `columns`
 *   over the whole chain (which includes the transient, so it errs long).
 *   Discarding a few tau is common practice (2 tau_max here; common
 *   practice, no source).
 * - settleStep: let m(s) be the walker-mean log-posterior at step s, and med
 *   and sd the median and standard deviation of m over the final half
 *   [floor(N/2), N). settleStep is the first step s <= floor(N/2) such that
 *   |m(s') - med| <= tolerance · sd for every s' in [s, floor(N/2)). Only the
 *   first half is scanned, so rare excursions inside the reference half do
 *   not move it. Two-sided, so it catches ensembles started above the typical
 *   set (at a maximum) as well as below it. Common practice, no source.
 *   It detects a transient that has ended; a trend that persists into the
 *   final half inflates sd and goes unseen here (split R-hat flags it).
 * - Capped at half the chain, so at least half the steps are always kept.
 *
 * @throws {TypeError} on a malformed view; {RangeError} on a bad column.
 */
export function chooseBurnIn(view: ChainView, options: BurnInOptions): BurnIn {
  validateChainView(view);
  for (const c of options.columns) validateColumn(view, c);
  const lpColumn = options.logPosteriorColumn;
  if (lpColumn !== undefined) validateColumn(view, lpColumn);
  const tauMultiple = options.tauMultiple ?? 2;
  const tolerance = options.tolerance ?? 5;
  const factor = options.factor ?? 5;
  const { steps, walkers, columns, data } = view;
  const half = Math.floor(steps / 2);

  let tauMax = NaN;
  for (const c of options.columns) {
    const t = tauOfChains(extractChains(view, c, 0), factor).tau;
    if (Number.isFinite(t) && !(t <= tauMax)) tauMax = t;
  }

  let settleStep = NaN;
  if (lpColumn !== undefined && walkers > 0 && steps > 0) {
    const m = new Float64Array(steps);
    for (let s = 0; s < steps; s++) {
      let sum = 0;
      for (let w = 0; w < walkers; w++) sum += data[(s * walkers + w) * columns + lpColumn]!;
      m[s] = sum / walkers;
    }
    const ref = m.slice(half);
    const sorted = Float64Array.from(ref).sort();
    const k = sorted.length;
    const med = k % 2 === 1 ? sorted[(k - 1) / 2]! : 0.5 * (sorted[k / 2 - 1]! + sorted[k / 2]!);
    let mu = 0;
    for (let i = 0; i < k; i++) mu += ref[i]!;
    mu /= k;
    let ss = 0;
    for (let i = 0; i < k; i++) ss += (ref[i]! - mu) ** 2;
    const sd = k > 1 ? Math.sqrt(ss / (k - 1)) : 0;
    settleStep = 0;
    for (let s = half - 1; s >= 0; s--) {
      const d = Math.abs(m[s]! - med);
      if (!(d <= tolerance * sd)) {
        settleStep = s + 1;
        break;
      }
    }
  }

  const tauPart = Number.isFinite(tauMax) ? Math.ceil(tauMultiple * tauMax) : 0;
  const wanted = Math.max(tauPart, Number.isFinite(settleStep) ? settleStep : 0);
  return { burn: Math.min(half, wanted), tauMax, settleStep, capped: wanted > half };
}
