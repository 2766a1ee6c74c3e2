/**
 * Ensemble proposals. Each move proposes a new position for one walker of the
 * active half of the ensemble, using only walkers of the complementary half
 * (which stay fixed during the half-step, as the red/blue split of Goodman &
 * Weare 2010 requires), writes it into the half-step's proposal buffer and
 * returns the proposal's log Hastings term. The kernel in `ensemble.ts` owns the
 * split, the evaluation and the accept/reject step.
 * @module
 */

import type { Rng } from "./rng.ts";

/** Buffers and ranges for one half-step; the kernel fills and reuses it. */
export interface HalfStep {
  /** Number of parameters D. */
  readonly dimensions: number;
  /** Whole ensemble, walker-major: `positions[w * D + d]`. */
  readonly positions: Float64Array;
  /** First walker of the active half (the walkers being moved). */
  readonly activeStart: number;
  /** First walker of the complementary half. */
  readonly complementStart: number;
  /** Number of walkers in the complementary half (≥ 2). */
  readonly complementCount: number;
  /** Output rows, one per active walker: row `walker - activeStart`. */
  readonly proposals: Float64Array;
  /** Per-dimension standard deviation of the complementary half; see {@linkcode complementSpread}. */
  readonly spread: Float64Array;
  /** The random stream of this step. */
  readonly rng: Rng;
}

/** Options of {@linkcode stretchMove}. */
export interface StretchOptions {
  /** Scale parameter a > 1 of the stretch distribution. @default 2 */
  scale?: number;
}

/**
 * Propose a stretch move for `walker` and return its log Hastings term.
 *
 * Method: Goodman & Weare (2010), Commun. Appl. Math. Comput. Sci. 5, 65,
 * doi:10.2140/camcos.2010.5.65, eq. (7): Y = X_j + Z (X_k − X_j), with X_j a
 * walker drawn uniformly from the complementary half and Z drawn from
 * g(z) ∝ 1/√z on [1/a, a] (same section; it satisfies g(1/z) = z g(z)). The
 * proposal is accepted with probability min(1, Z^(D−1) p(Y)/p(X_k)), so the
 * log Hastings term returned is (D − 1) ln Z.
 *
 * Sampling Z by inversion: the CDF of g is G(z) = (√z − 1/√a)/(√a − 1/√a), so
 * with u uniform on [0, 1), z = ((a − 1) u + 1)² / a.
 *
 * @param half the half-step buffers; row `walker - half.activeStart` of
 *   `half.proposals` receives the proposal.
 * @param walker index of the walker to move (in the active half).
 * @returns (D − 1) ln z.
 */
export function stretchMove(half: HalfStep, walker: number, options: StretchOptions = {}): number {
  const a = options.scale ?? 2;
  const dims = half.dimensions;
  const rng = half.rng;
  const t = (a - 1) * rng.uniform() + 1;
  const z = (t * t) / a;
  const j = half.complementStart + Math.floor(rng.uniform() * half.complementCount);
  const x = half.positions;
  const xk = walker * dims;
  const xj = j * dims;
  const row = (walker - half.activeStart) * dims;
  const y = half.proposals;
  for (let d = 0; d < dims; d++) {
    const base = x[xj + d]!;
    y[row + d] = base + z * (x[xk + d]! - base);
  }
  return (dims - 1) * Math.log(z);
}

/** Options of {@linkcode differentialEvolutionMove}. */
export interface DifferentialEvolutionOptions {
  /** Step factor γ. @default 2.38 / sqrt(2 D) */
  gamma?: number;
  /** Probability that a proposal uses γ = 1 (a mode-hopping step). @default 0.1 */
  hopProbability?: number;
  /**
   * Standard deviation of the added noise, relative to the per-dimension
   * spread of the complementary half (`half.spread`). @default 1e-4
   */
  noise?: number;
}

/**
 * Propose a differential-evolution move for `walker` and return its log
 * Hastings term, which is 0 (the proposal is symmetric).
 *
 * Method: the DE-MC proposal of ter Braak (2006), Stat. Comput. 16, 239,
 * doi:10.1007/s11222-006-8769-1: Y = X_k + γ (X_j − X_m) + e, with X_j, X_m
 * two distinct walkers drawn from the complementary half (the ensemble form of
 * Nelson, Ford & Payne 2014, ApJS 210, 11, doi:10.1088/0067-0049/210/1/11),
 * γ = 2.38/√(2D) and, with probability `hopProbability`, γ = 1 so that a walker
 * can jump between modes (ter Braak 2006 switches to γ = 1 every tenth
 * generation; section and equation numbers not given as recalled from memory
 * only). e ~ N(0, (noise · spread_d)²) per dimension keeps the chain
 * irreducible; because the complementary half is fixed during the half-step,
 * the pair (j, m) is as likely as (m, j) and the noise is centred and does not
 * depend on X_k, the proposal density is symmetric.
 *
 * `half.spread` must hold the complement's spread (see {@linkcode complementSpread}).
 *
 * @returns 0.
 */
export function differentialEvolutionMove(
  half: HalfStep,
  walker: number,
  options: DifferentialEvolutionOptions = {},
): number {
  const dims = half.dimensions;
  const rng = half.rng;
  const hop = options.hopProbability ?? 0.1;
  const noise = options.noise ?? 1e-4;
  const gamma = rng.uniform() < hop ? 1 : (options.gamma ?? 2.38 / Math.sqrt(2 * dims));
  const count = half.complementCount;
  const first = Math.floor(rng.uniform() * count);
  let second = Math.floor(rng.uniform() * (count - 1));
  if (second >= first) second += 1;
  const x = half.positions;
  const xk = walker * dims;
  const xj = (half.complementStart + first) * dims;
  const xm = (half.complementStart + second) * dims;
  const row = (walker - half.activeStart) * dims;
  const y = half.proposals;
  const spread = half.spread;
  for (let d = 0; d < dims; d++) {
    y[row + d] = x[xk + d]! + gamma * (x[xj + d]! - x[xm + d]!) +
      noise * spread[d]! * rng.normal();
  }
  return 0;
}

/**
 * Fill `half.spread` with the per-dimension standard deviation (divisor n) of
 * the complementary half, computed with the two-pass algorithm (common
 * practice, no source).
 */
export function complementSpread(half: HalfStep): void {
  const dims = half.dimensions;
  const count = half.complementCount;
  const x = half.positions;
  const start = half.complementStart * dims;
  const spread = half.spread;
  for (let d = 0; d < dims; d++) {
    let sum = 0;
    for (let w = 0; w < count; w++) sum += x[start + w * dims + d]!;
    const mean = sum / count;
    let ss = 0;
    for (let w = 0; w < count; w++) {
      const r = x[start + w * dims + d]! - mean;
      ss += r * r;
    }
    spread[d] = Math.sqrt(ss / count);
  }
}
