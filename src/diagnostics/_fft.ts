/**
 * A small in-place iterative radix-2 complex FFT and the autocovariance
 * kernel built on it. Private to `src/diagnostics/`.
 *
 * Method: Cooley & Tukey (1965), Math. Comp. 19, 297, decimation in time
 * with bit-reversed input order (e.g. Press et al. 2007, Numerical Recipes
 * 3rd ed., sec. 12.2). Autocovariances by the Wiener–Khinchin route: the
 * inverse transform of |X_k|^2 of the zero-padded series (padding to at least
 * 2n removes the circular wrap-around), e.g. Press et al. 2007, sec. 13.2.
 * Two real series share one complex transform (Press et al. 2007, sec. 12.3):
 * with z = x + i y and Z its transform, X_k = (Z_k + conj Z_{L-k}) / 2 and
 * Y_k = (Z_k - conj Z_{L-k}) / (2i), so |X_k|^2 = |Z_k + conj Z_{L-k}|^2 / 4
 * and |Y_k|^2 = |Z_k - conj Z_{L-k}|^2 / 4.
 * @module
 */

/** Smallest power of two that is >= n (n >= 1). */
export function nextPow2(n: number): number {
  let p = 1;
  while (p < n) p *= 2;
  return p;
}

/** Precomputed tables for transforms of one length. */
export interface FftPlan {
  readonly size: number;
  readonly cos: Float64Array;
  readonly sin: Float64Array;
  readonly rev: Uint32Array;
}

const planCache = new Map<number, FftPlan>();

/** Tables for a transform of `size` points (a power of two), memoised. */
export function fftPlan(size: number): FftPlan {
  const cached = planCache.get(size);
  if (cached !== undefined) return cached;
  const plan = makePlan(size);
  if (planCache.size >= 24) planCache.clear();
  planCache.set(size, plan);
  return plan;
}

function makePlan(size: number): FftPlan {
  const half = size >> 1;
  const cos = new Float64Array(Math.max(half, 1));
  const sin = new Float64Array(Math.max(half, 1));
  for (let k = 0; k < half; k++) {
    cos[k] = Math.cos((2 * Math.PI * k) / size);
    sin[k] = Math.sin((2 * Math.PI * k) / size);
  }
  const rev = new Uint32Array(size);
  let bits = 0;
  while ((1 << bits) < size) bits++;
  for (let i = 0; i < size; i++) {
    let r = 0;
    for (let b = 0; b < bits; b++) r |= ((i >> b) & 1) << (bits - 1 - b);
    rev[i] = r;
  }
  return { size, cos, sin, rev };
}

/**
 * In-place unnormalised DFT: X_k = sum_j x_j exp(sign * 2 pi i j k / L), with
 * sign = -1 (forward) or +1 (inverse, caller divides by L).
 */
export function fft(plan: FftPlan, re: Float64Array, im: Float64Array, sign: number): void {
  const n = plan.size;
  const rev = plan.rev;
  for (let i = 0; i < n; i++) {
    const j = rev[i]!;
    if (j > i) {
      const tr = re[i]!;
      re[i] = re[j]!;
      re[j] = tr;
      const ti = im[i]!;
      im[i] = im[j]!;
      im[j] = ti;
    }
  }
  const cosT = plan.cos;
  const sinT = plan.sin;
  for (let len = 2; len <= n; len *= 2) {
    const half = len >> 1;
    const step = n / len;
    for (let start = 0; start < n; start += len) {
      for (let k = 0; k < half; k++) {
        const wr = cosT[k * step]!;
        const wi = sign * sinT[k * step]!;
        const a = start + k;
        const b = a + half;
        const br = re[b]!;
        const bi = im[b]!;
        const tr = wr * br - wi * bi;
        const ti = wr * bi + wi * br;
        const ar = re[a]!;
        const ai = im[a]!;
        re[b] = ar - tr;
        im[b] = ai - ti;
        re[a] = ar + tr;
        im[a] = ai + ti;
      }
    }
  }
}

/**
 * Add the biased autocovariance of each of `chains` series to `out`:
 * acov_m(t) = (1/n) sum_{i=0}^{n-1-t} (x_i - mean)(x_{i+t} - mean), for
 * t = 0..n-1. The series are stored chain-major in `x` (chain m occupies
 * `[m*n, (m+1)*n)`). When `normalise` is true each chain's function is
 * divided by its own acov_m(0) before adding, and chains with zero variance
 * are skipped. Returns the number of chains added.
 */
export function accumulateAutocovariance(
  x: Float64Array,
  chains: number,
  n: number,
  out: Float64Array,
  normalise: boolean,
): number {
  if (n < 1 || chains < 1) return 0;
  const size = nextPow2(2 * n);
  const plan = fftPlan(size);
  const re = new Float64Array(size);
  const im = new Float64Array(size);
  let used = 0;
  for (let m = 0; m < chains; m += 2) {
    const pair = m + 1 < chains;
    re.fill(0);
    im.fill(0);
    let meanA = 0;
    let meanB = 0;
    const offA = m * n;
    const offB = (m + 1) * n;
    for (let i = 0; i < n; i++) meanA += x[offA + i]!;
    meanA /= n;
    if (pair) {
      for (let i = 0; i < n; i++) meanB += x[offB + i]!;
      meanB /= n;
    }
    // Sums of squares in the time domain decide which chains are constant:
    // the transform's lag-0 value carries rounding noise even for zeros.
    let ssA = 0;
    let ssB = 0;
    for (let i = 0; i < n; i++) {
      const a = x[offA + i]! - meanA;
      re[i] = a;
      ssA += a * a;
      if (pair) {
        const b = x[offB + i]! - meanB;
        im[i] = b;
        ssB += b * b;
      }
    }
    fft(plan, re, im, -1);
    // Power spectra of both real series packed as |X|^2 + i |Y|^2.
    for (let k = 0; k <= size >> 1; k++) {
      const j = (size - k) & (size - 1);
      const zr = re[k]!;
      const zi = im[k]!;
      const cr = re[j]!; // conj Z_{L-k} = (cr, -ci)
      const ci = -im[j]!;
      const sr = zr + cr;
      const si = zi + ci;
      const dr = zr - cr;
      const di = zi - ci;
      const px = 0.25 * (sr * sr + si * si);
      const py = 0.25 * (dr * dr + di * di);
      // |X|^2 and |Y|^2 are even in k, so the same values go to k and L-k.
      re[k] = px;
      im[k] = py;
      re[j] = px;
      im[j] = py;
    }
    fft(plan, re, im, 1);
    const scale = 1 / (size * n);
    const a0 = re[0]! * scale;
    if (!normalise || (ssA > 0 && a0 > 0)) {
      const f = normalise ? scale / a0 : scale;
      for (let t = 0; t < n; t++) out[t] = out[t]! + re[t]! * f;
      used++;
    }
    if (pair) {
      const b0 = im[0]! * scale;
      if (!normalise || (ssB > 0 && b0 > 0)) {
        const f = normalise ? scale / b0 : scale;
        for (let t = 0; t < n; t++) out[t] = out[t]! + im[t]! * f;
        used++;
      }
    }
  }
  return used;
}
