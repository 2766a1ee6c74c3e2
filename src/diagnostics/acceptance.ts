/**
 * Per-walker acceptance and stuck-walker detection.
 * @module
 */

import { type ChainView, validateBurn, validateChainView, validateColumn } from "./chain_view.ts";

/** Options of {@link acceptanceFractions}. */
export interface AcceptanceOptions {
  /** Column holding the accepted flag (non-zero = accepted) or a cumulative count. */
  column: number;
  /**
   * True when the column holds each walker's cumulative number of accepted
   * proposals since the start of the run rather than a per-step flag.
   * @default false
   */
  cumulative?: boolean;
  /** Steps discarded from the start. @default 0 */
  burn?: number;
}

/**
 * Fraction of accepted proposals of each walker over steps `[burn, steps)`.
 * With flags: the mean of (flag !== 0). With cumulative counts:
 * (count[last] - count[burn - 1]) / (steps - burn), taking count[-1] = 0.
 * Entries are NaN when no step remains.
 * @throws {TypeError} on a malformed view; {RangeError} on a bad column or burn.
 */
export function acceptanceFractions(view: ChainView, options: AcceptanceOptions): Float64Array {
  validateChainView(view);
  validateColumn(view, options.column);
  const burn = options.burn ?? 0;
  validateBurn(view, burn);
  const { data, steps, walkers, columns } = view;
  const c = options.column;
  const n = steps - burn;
  const out = new Float64Array(walkers);
  if (n === 0) return out.fill(NaN);
  if (options.cumulative) {
    for (let w = 0; w < walkers; w++) {
      const end = data[((steps - 1) * walkers + w) * columns + c]!;
      const start = burn > 0 ? data[((burn - 1) * walkers + w) * columns + c]! : 0;
      out[w] = (end - start) / n;
    }
    return out;
  }
  for (let s = burn; s < steps; s++) {
    const row = s * walkers;
    for (let w = 0; w < walkers; w++) {
      if (data[(row + w) * columns + c] !== 0) out[w] = out[w]! + 1;
    }
  }
  for (let w = 0; w < walkers; w++) out[w] = out[w]! / n;
  return out;
}

/** Options of {@link findStuckWalkers}. */
export interface StuckOptions {
  /** A walker is stuck only below this fraction of the ensemble median. @default 0.25 */
  ratio?: number;
  /** ...and only below this absolute acceptance. @default 0.05 */
  floor?: number;
}

/**
 * Indices of stuck walkers. Rule (common practice, no source): a walker is
 * stuck when its acceptance is below `ratio` times the ensemble median
 * acceptance and also below the absolute `floor`; with the defaults, a walker
 * under 1/4 of the median and under 5 %. An affine-invariant ensemble walker
 * stranded in a low-probability region shows exactly this: its stretch moves
 * are almost all refused while the others mix. NaN entries are ignored.
 */
export function findStuckWalkers(acceptance: Float64Array, options: StuckOptions = {}): number[] {
  const ratio = options.ratio ?? 0.25;
  const floor = options.floor ?? 0.05;
  const finite = Float64Array.from(acceptance.filter((a) => Number.isFinite(a))).sort();
  if (finite.length === 0) return [];
  const k = finite.length;
  const median = k % 2 === 1 ? finite[(k - 1) / 2]! : 0.5 * (finite[k / 2 - 1]! + finite[k / 2]!);
  const limit = Math.min(ratio * median, floor);
  const stuck: number[] = [];
  for (let w = 0; w < acceptance.length; w++) {
    const a = acceptance[w]!;
    if (Number.isFinite(a) && a < limit) stuck.push(w);
  }
  return stuck;
}
