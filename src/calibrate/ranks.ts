/**
 * Simulation-based calibration (SBC) rank statistics: the rank of a true value
 * among posterior draws, rank histograms, a χ² test of their uniformity and
 * the binomial band a uniform histogram falls in.
 *
 * Talts, Betancourt, Simpson, Vehtari & Gelman 2018, "Validating Bayesian
 * inference algorithms with simulation-based calibration", arXiv:1804.06788:
 * if θ̃ ~ π(θ), ỹ ~ π(y | θ̃) and θ₁…θ_L are independent draws from π(θ | ỹ),
 * the rank r = #{ℓ : f(θ_ℓ) < f(θ̃)} is uniform on {0, …, L} for any f
 * (their Theorem 1, Algorithm 1).
 * @module
 */
import { lnGamma } from "../model/priors.ts";
import { chiSquareSurvival } from "./chi_square.ts";

/** Options of {@link sbcRank}. */
export interface RankOptions {
  /** Number of draws to read from `draws`. @default draws.length */
  count?: number;
  /**
   * A uniform deviate in [0, 1) that splits ties: the rank is
   * less + ⌊u · (ties + 1)⌋, so tied values keep the rank uniform (random
   * tie-breaking; common practice, no source). @default 0
   */
  tieBreak?: number;
}

/**
 * Rank of `truth` among the first `count` draws: the number of draws below
 * it, ties split by `options.tieBreak` (Talts et al. 2018, arXiv:1804.06788,
 * Algorithm 1). In 0 … count; `NaN` when `truth` or a draw is NaN.
 */
export function sbcRank(truth: number, draws: Float64Array, options: RankOptions = {}): number {
  const n = options.count ?? draws.length;
  if (!Number.isInteger(n) || n < 0 || n > draws.length) {
    throw new RangeError(
      `Cannot rank truth as count is outside the draws: count=${n}, draws=${draws.length}`,
    );
  }
  if (Number.isNaN(truth)) return NaN;
  let less = 0;
  let ties = 0;
  for (let i = 0; i < n; i++) {
    const v = draws[i]!;
    if (v < truth) less++;
    else if (v === truth) ties++;
    else if (Number.isNaN(v)) return NaN;
  }
  const u = options.tieBreak ?? 0;
  return ties === 0 ? less : less + Math.min(ties, Math.floor(u * (ties + 1)));
}

/** Shape of a rank histogram: ranks 0 … draws in `bins` equal bins. */
export interface RankBinning {
  /** L, the number of posterior draws per simulation (ranks run 0 … L). */
  draws: number;
  /** B, the number of bins; must divide L + 1 so that every bin holds as many ranks. */
  bins: number;
}

/** Check a {@link RankBinning}. @throws {RangeError} when B does not divide L + 1. */
export function validateBinning(binning: RankBinning): void {
  const { draws, bins } = binning;
  if (!Number.isInteger(draws) || draws < 1) {
    throw new RangeError(`Cannot bin ranks as draws must be a positive integer: draws=${draws}`);
  }
  if (!Number.isInteger(bins) || bins < 2 || (draws + 1) % bins !== 0) {
    throw new RangeError(
      `Cannot bin ranks as bins must be at least 2 and divide draws + 1: bins=${bins}, draws=${draws}`,
    );
  }
}

/**
 * Counts of ranks per bin: rank r goes to bin ⌊r · B / (L + 1)⌋, so each bin
 * holds (L + 1)/B consecutive ranks and has probability 1/B under uniformity.
 * @throws {RangeError} for a bad binning or a rank outside 0 … L.
 */
export function rankCounts(ranks: ArrayLike<number>, binning: RankBinning): Float64Array {
  validateBinning(binning);
  const { draws, bins } = binning;
  const counts = new Float64Array(bins);
  for (let i = 0; i < ranks.length; i++) {
    const r = ranks[i]!;
    if (!Number.isInteger(r) || r < 0 || r > draws) {
      throw new RangeError(
        `Cannot bin ranks as a rank is outside 0 to draws: index=${i}, rank=${r}, draws=${draws}`,
      );
    }
    const b = Math.floor((r * bins) / (draws + 1));
    counts[b] = counts[b]! + 1;
  }
  return counts;
}

/** Result of {@link rankUniformity}. */
export interface UniformityTest {
  /** Counts per bin. */
  readonly counts: Float64Array;
  /** Pearson's statistic Σ (O − E)²/E. */
  readonly chiSquare: number;
  /** Degrees of freedom B − 1. */
  readonly df: number;
  /** Pr(χ²(B − 1) ≥ statistic). */
  readonly pValue: number;
}

/**
 * Pearson's χ² test of uniform ranks over the bins: X² = Σ_b (O_b − E)²/E with
 * E = N/B, referred to χ² with B − 1 degrees of freedom (Pearson 1900,
 * Phil. Mag. 50, 157; the usual large-sample approximation wants E ≥ 5,
 * Cochran 1954, Biometrics 10, 417). `NaN` p-value for no ranks.
 */
export function rankUniformity(ranks: ArrayLike<number>, binning: RankBinning): UniformityTest {
  const counts = rankCounts(ranks, binning);
  const n = ranks.length;
  const df = binning.bins - 1;
  if (n === 0) return { counts, chiSquare: NaN, df, pValue: NaN };
  const expected = n / binning.bins;
  let chiSquare = 0;
  for (const c of counts) chiSquare += ((c - expected) * (c - expected)) / expected;
  return { counts, chiSquare, df, pValue: chiSquareSurvival(chiSquare, df) };
}

/**
 * The default number of bins for N simulations of L draws: the largest
 * divisor B of L + 1 with B ≤ 20 and N/B ≥ 5 (so each bin expects at least
 * five ranks, Cochran 1954); the smallest divisor ≥ 2 when none qualifies.
 * Talts et al. (2018, sec. 4.1) ask for bins that divide L + 1 evenly.
 * With L = 99 and N ≥ 100 this is B = 20.
 */
export function defaultBins(simulations: number, draws: number): number {
  let best = 0;
  for (let b = 2; b <= Math.min(20, draws + 1); b++) {
    if ((draws + 1) % b === 0 && simulations / b >= 5) best = b;
  }
  if (best > 0) return best;
  for (let b = 2; b <= draws + 1; b++) if ((draws + 1) % b === 0) return b;
  return draws + 1;
}

/**
 * Central interval [lo, hi] of a Binomial(n, p) count holding at least
 * `level` of the probability: lo the largest k with Pr(X < k) ≤ (1 − level)/2,
 * hi the smallest k with Pr(X > k) ≤ (1 − level)/2. Talts et al. (2018, Fig. 1)
 * draw this band (99%) behind rank histograms. Probabilities from the pmf
 * C(n, k) pᵏ (1 − p)ⁿ⁻ᵏ via ln Γ.
 */
export function binomialBand(n: number, p: number, level = 0.99): [number, number] {
  if (!Number.isInteger(n) || n < 0 || !(p >= 0 && p <= 1) || !(level > 0 && level < 1)) {
    throw new RangeError(
      `Cannot compute binomial band as the arguments are invalid: n=${n}, p=${p}, level=${level}`,
    );
  }
  const tail = (1 - level) / 2;
  const pmf = new Float64Array(n + 1);
  if (p === 0) pmf[0] = 1;
  else if (p === 1) pmf[n] = 1;
  else {
    const lnC = lnGamma(n + 1);
    for (let k = 0; k <= n; k++) {
      pmf[k] = Math.exp(
        lnC - lnGamma(k + 1) - lnGamma(n - k + 1) + k * Math.log(p) + (n - k) * Math.log1p(-p),
      );
    }
  }
  let lo = 0;
  let below = 0;
  while (lo < n && below + pmf[lo]! <= tail) below += pmf[lo++]!;
  let hi = n;
  let above = 0;
  while (hi > 0 && above + pmf[hi]! <= tail) above += pmf[hi--]!;
  return [lo, hi];
}
