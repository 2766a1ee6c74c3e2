/**
 * Spectral window of a sampling pattern.
 * @module
 */
import type { FrequencyGrid } from "./frequency_grid.ts";
import { timeRange } from "./_series.ts";
import { TrigTable } from "./_trig.ts";

/** Options of {@linkcode spectralWindow}. */
export interface SpectralWindowOptions {
  /** Number of leading entries of `time` to use. @default time.length */
  count?: number;
  /** Non-negative weight per time (e.g. 1/sigma^2). @default all 1 */
  weights?: Float64Array;
  /** Output buffer, length >= number of frequencies. @default new array */
  out?: Float64Array;
}

/**
 * Spectral window W(f) = |sum_i a_i exp(-2 pi i f t_i)|^2 / (sum_i a_i)^2 of the
 * observation times (Deeming 1975, Ap&SS 36, 137; Roberts, Lehár & Dreher 1987,
 * AJ 93, 968, Sect. II; recalled from memory). W(0) = 1; peaks of W at f_w show
 * where sampling aliases f ± f_w of a true signal f appear (e.g. 1/d for
 * nightly sampling, 1/yr for seasons).
 *
 * Throws RangeError for count < 1 or negative/non-finite weights summing to 0.
 */
export function spectralWindow(
  time: Float64Array,
  grid: FrequencyGrid | Float64Array,
  options: SpectralWindowOptions = {},
): Float64Array {
  const n = options.count ?? time.length;
  if (!Number.isInteger(n) || n < 1 || n > time.length) {
    throw new RangeError(
      `Cannot compute spectral window as count is out of range: count=${n}, length=${time.length}`,
    );
  }
  const weights = options.weights;
  if (weights !== undefined && weights.length < n) {
    throw new TypeError(
      `Cannot compute spectral window as weights are too short: weights=${weights.length}, count=${n}`,
    );
  }
  let total = 0;
  for (let i = 0; i < n; i++) {
    const a = weights === undefined ? 1 : weights[i]!;
    if (!(a >= 0) || !Number.isFinite(a)) {
      throw new RangeError(
        `Cannot compute spectral window as weights must be finite and >= 0: index=${i}, weight=${a}`,
      );
    }
    total += a;
  }
  if (!(total > 0)) {
    throw new RangeError(`Cannot compute spectral window as weights sum to zero: count=${n}`);
  }
  const frequencies = grid instanceof Float64Array ? grid : grid.frequencies;
  const nf = frequencies.length;
  const out = options.out ?? new Float64Array(nf);
  if (out.length < nf) {
    throw new TypeError(
      `Cannot compute spectral window as out is too short: out=${out.length}, frequencies=${nf}`,
    );
  }
  const [t0, t1] = timeRange(time, n);
  const trig = new TrigTable(time, n, 0.5 * (t0 + t1), grid);
  const c = trig.cos, s = trig.sin;
  const norm = 1 / (total * total);
  for (let k = 0; k < nf; k++) {
    trig.set(k);
    let re = 0, im = 0;
    if (weights === undefined) {
      for (let i = 0; i < n; i++) {
        re += c[i]!;
        im += s[i]!;
      }
    } else {
      for (let i = 0; i < n; i++) {
        re += weights[i]! * c[i]!;
        im += weights[i]! * s[i]!;
      }
    }
    out[k] = (re * re + im * im) * norm;
  }
  return out;
}
