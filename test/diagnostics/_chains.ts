/**
 * Seeded synthetic chains for the diagnostics tests (not a test file).
 * @module
 */

import seedrandom from "seedrandom";
import type { ChainView } from "../../src/diagnostics/mod.ts";

/** Standard normal deviates from a seeded uniform source (Box & Muller 1958, Ann. Math. Stat. 29, 610). */
export function gaussian(seed: string): () => number {
  const rng = seedrandom(seed);
  return () => {
    let u = 0;
    while (u === 0) u = rng();
    return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rng());
  };
}

/**
 * Stationary AR(1) chains x_t = rho x_{t-1} + e_t, e_t ~ N(0, 1), started
 * from the stationary law N(0, 1/(1 - rho^2)), one independent chain per
 * walker, in column `column` of `columns` (other columns 0).
 */
export function ar1View(
  rho: number,
  steps: number,
  walkers: number,
  seed: string,
  columns = 1,
  column = 0,
): ChainView {
  const g = gaussian(seed);
  const data = new Float64Array(steps * walkers * columns);
  const sd0 = 1 / Math.sqrt(1 - rho * rho);
  for (let w = 0; w < walkers; w++) {
    let x = g() * sd0;
    for (let s = 0; s < steps; s++) {
      if (s > 0) x = rho * x + g();
      data[(s * walkers + w) * columns + column] = x;
    }
  }
  return { data, steps, walkers, columns };
}

/** iid N(mean_w, sd_w^2) draws, one chain per walker, single column. */
export function normalView(
  steps: number,
  means: readonly number[],
  sds: readonly number[],
  seed: string,
): ChainView {
  const g = gaussian(seed);
  const walkers = means.length;
  const data = new Float64Array(steps * walkers);
  for (let s = 0; s < steps; s++) {
    for (let w = 0; w < walkers; w++) data[s * walkers + w] = means[w]! + sds[w]! * g();
  }
  return { data, steps, walkers, columns: 1 };
}
