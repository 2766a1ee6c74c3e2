/**
 * Split R-hat, classic and rank-normalised (Vehtari, Gelman, Simpson,
 * Carpenter & Bürkner 2021, Bayesian Analysis 16(2), 667,
 * doi:10.1214/20-BA1221, arXiv:1903.08008).
 * @module
 */

import type { ChainView } from "./chain_view.ts";
import { checkArgs } from "./_args.ts";
import {
  combineRhat,
  extractChains,
  fold,
  quantileSorted,
  rankNormalise,
  rhatOfSplit,
  splitChains,
} from "./_core.ts";

/** Options shared by the single-column diagnostics. */
export interface ColumnOptions {
  /** Steps discarded from the start of every walker. @default 0 */
  burn?: number;
}

/**
 * Classic split R-hat of one column: each walker's trace after `burn` is
 * halved (odd lengths drop the middle draw) and
 * R-hat = sqrt(var+ / W) over the 2·walkers half-chains (Vehtari et al. 2021,
 * sec. 3.1; Gelman et al. 2013, BDA3, sec. 11.4).
 *
 * Returns NaN when fewer than 4 steps remain, when any draw is non-finite or
 * when all draws are equal; Infinity when each half-chain is constant but
 * they differ.
 * @throws {TypeError} on a malformed view; {RangeError} on a bad column or burn.
 */
export function splitRhat(view: ChainView, column: number, options: ColumnOptions = {}): number {
  const burn = checkArgs(view, column, options.burn);
  return rhatOfSplit(splitChains(extractChains(view, column, burn)));
}

/** Rank-normalised split R-hat: bulk, folded tail, and their maximum. */
export interface RankRhat {
  /** max(bulk, tail): the recommended R-hat (Vehtari et al. 2021, sec. 4.1). */
  readonly rhat: number;
  /** Split R-hat of the rank-normalised draws. */
  readonly bulk: number;
  /** Split R-hat of the rank-normalised folded draws |theta - median|. */
  readonly tail: number;
}

/**
 * Rank-normalised split R-hat of one column (Vehtari et al. 2021, sec. 4.1):
 * bulk from z = Φ⁻¹((r - 3/8)/(S + 1/4)) of the pooled ranks r, tail from the
 * same transform of the folded draws |theta - median(theta)|; the
 * recommended value is the larger of the two.
 *
 * NaN in the same cases as {@link splitRhat}.
 * @throws {TypeError} on a malformed view; {RangeError} on a bad column or burn.
 */
export function rankNormalizedRhat(
  view: ChainView,
  column: number,
  options: ColumnOptions = {},
): RankRhat {
  const burn = checkArgs(view, column, options.burn);
  const split = splitChains(extractChains(view, column, burn));
  if (!split.finite || split.n < 2) return { rhat: NaN, bulk: NaN, tail: NaN };
  const { z, sorted } = rankNormalise(split);
  if (sorted[0] === sorted[sorted.length - 1]) return { rhat: NaN, bulk: NaN, tail: NaN };
  const bulk = rhatOfSplit(z);
  const folded = fold(split, quantileSorted(sorted, 0.5));
  const tail = rhatOfSplit(rankNormalise(folded).z);
  return { rhat: combineRhat(bulk, tail), bulk, tail };
}
