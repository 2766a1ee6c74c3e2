/**
 * Weighted linear least squares of offsets + trend + sinusoids at fixed
 * frequencies (private to `src/search/`).
 * @module
 */
import type { RvSeries } from "./_series.ts";
import type { FittedSinusoid, SinusoidFitResult } from "./fit_sinusoids.ts";

/**
 * Reusable workspace for chi^2(f_1..f_m) of the linear model
 *   y_i = c_{inst(i)} + sum_{j=1..D} d_j ((t_i - tRef)/tScale)^j
 *         + sum_m [a_m cos 2 pi f_m (t_i - tRef) + b_m sin 2 pi f_m (t_i - tRef)],
 * weights w_i = 1/(sigma_i^2 + jitter^2), solved through the normal equations
 * (X^T W X) beta = X^T W y by Cholesky factorisation (Golub & Van Loan 2013,
 * Matrix Computations 4th ed., Sect. 4.2 and 6.1). Columns are bounded by 1 in
 * absolute value, so the normal matrix is well scaled. No allocation per call.
 */
export class SinusoidFitter {
  readonly series: RvSeries;
  readonly weight: Float64Array;
  readonly tRef: number;
  readonly tScale: number;
  readonly trendDegree: number;
  /** Column of each instrument's offset, -1 if it has no points or offsets are off. */
  readonly instrumentColumn: Int32Array;
  readonly offsetColumns: number;
  readonly maxSinusoids: number;
  /** Solution of the last successful solve. */
  readonly beta: Float64Array;
  readonly #a: Float64Array;
  readonly #row: Float64Array;
  readonly #omega: Float64Array;

  constructor(
    series: RvSeries,
    options: {
      trendDegree: number;
      offsets: boolean;
      jitter: number;
      tRef: number;
      tScale: number;
      maxSinusoids: number;
    },
  ) {
    const n = series.count;
    this.series = series;
    this.weight = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      const s = series.rvErr[i]!;
      this.weight[i] = 1 / (s * s + options.jitter * options.jitter);
    }
    this.tRef = options.tRef;
    this.tScale = options.tScale;
    this.trendDegree = options.trendDegree;
    this.instrumentColumn = new Int32Array(series.instruments).fill(-1);
    let col = 0;
    if (options.offsets) {
      const seen = new Uint8Array(series.instruments);
      for (let i = 0; i < n; i++) seen[series.instrument[i]!] = 1;
      for (let k = 0; k < series.instruments; k++) if (seen[k]) this.instrumentColumn[k] = col++;
    }
    this.offsetColumns = col;
    this.maxSinusoids = options.maxSinusoids;
    const p = col + options.trendDegree + 2 * options.maxSinusoids;
    this.beta = new Float64Array(p);
    this.#a = new Float64Array(p * p);
    this.#row = new Float64Array(p);
    this.#omega = new Float64Array(options.maxSinusoids);
  }

  /** Number of columns for m sinusoids. */
  columns(m: number): number {
    return this.offsetColumns + this.trendDegree + 2 * m;
  }

  /**
   * Fits with the first m entries of `frequencies`; returns chi^2 = sum w r^2,
   * NaN if the normal matrix is not positive definite (e.g. equal frequencies).
   * The coefficients are left in `beta`: offsets, trend, then (a_m, b_m) pairs.
   */
  solve(frequencies: ArrayLike<number>, m: number): number {
    const { series, weight, beta } = this;
    const a = this.#a, row = this.#row, omega = this.#omega;
    const n = series.count, p = this.columns(m);
    for (let j = 0; j < m; j++) omega[j] = 2 * Math.PI * frequencies[j]!;
    a.fill(0, 0, p * p);
    beta.fill(0, 0, p);
    for (let i = 0; i < n; i++) {
      const w = weight[i]!, y = series.rv[i]!, dt = series.time[i]! - this.tRef;
      this.#fillRow(row, i, dt, m);
      for (let r = 0; r < p; r++) {
        const xr = row[r]!;
        if (xr === 0) continue;
        const wx = w * xr;
        beta[r]! += wx * y;
        const o = r * p;
        for (let c = 0; c <= r; c++) a[o + c]! += wx * row[c]!;
      }
    }
    // Cholesky A = L L^T in the lower triangle.
    for (let j = 0; j < p; j++) {
      let d = a[j * p + j]!;
      for (let k = 0; k < j; k++) d -= a[j * p + k]! * a[j * p + k]!;
      if (!(d > 0)) return NaN;
      const l = Math.sqrt(d);
      a[j * p + j] = l;
      for (let r = j + 1; r < p; r++) {
        let v = a[r * p + j]!;
        for (let k = 0; k < j; k++) v -= a[r * p + k]! * a[j * p + k]!;
        a[r * p + j] = v / l;
      }
    }
    // Forward: L z = X^T W y (z overwrites beta).
    for (let r = 0; r < p; r++) {
      let v = beta[r]!;
      for (let k = 0; k < r; k++) v -= a[r * p + k]! * beta[k]!;
      beta[r] = v / a[r * p + r]!;
    }
    // Back: L^T beta = z.
    for (let r = p - 1; r >= 0; r--) {
      let v = beta[r]!;
      for (let k = r + 1; k < p; k++) v -= a[k * p + r]! * beta[k]!;
      beta[r] = v / a[r * p + r]!;
    }
    // chi^2 from the residuals themselves (y^T W y - z^T z would cancel badly
    // when offsets are large compared with the noise).
    let chi2 = 0;
    for (let i = 0; i < n; i++) {
      const r = series.rv[i]! - this.model(i, m, false);
      chi2 += weight[i]! * r * r;
    }
    return chi2;
  }

  /** Model value at point i with the current beta and m sinusoids (optionally sinusoids only). */
  model(i: number, m: number, sinusoidsOnly: boolean): number {
    const row = this.#row, p = this.columns(m);
    this.#fillRow(row, i, this.series.time[i]! - this.tRef, m);
    let v = 0;
    for (let c = sinusoidsOnly ? this.offsetColumns + this.trendDegree : 0; c < p; c++) {
      v += row[c]! * this.beta[c]!;
    }
    return v;
  }

  /**
   * Solves with the first m frequencies and turns the coefficients into
   * physical quantities (offsets, trend per day^j, K, phase, Tc, residuals).
   */
  describe(frequencies: ArrayLike<number>, m: number): SinusoidFitResult {
    const chi2 = this.solve(frequencies, m);
    const { series, beta } = this;
    const ok = !Number.isNaN(chi2);
    const offsets = new Float64Array(series.instruments).fill(NaN);
    for (let k = 0; k < series.instruments; k++) {
      const col = this.instrumentColumn[k]!;
      if (col >= 0 && ok) offsets[k] = beta[col]!;
    }
    const trend = new Float64Array(this.trendDegree);
    for (let j = 0; j < this.trendDegree; j++) {
      trend[j] = ok ? beta[this.offsetColumns + j]! / Math.pow(this.tScale, j + 1) : NaN;
    }
    const sinusoids: FittedSinusoid[] = [];
    const base = this.offsetColumns + this.trendDegree;
    for (let j = 0; j < m; j++) {
      const f = frequencies[j]!, period = 1 / f;
      const a = ok ? beta[base + 2 * j]! : NaN, b = ok ? beta[base + 2 * j + 1]! : NaN;
      const phase = Math.atan2(b, a);
      // -K sin(2 pi f (t - Tc)) = K cos(2 pi f (t - tRef) - phase)
      //   => Tc = tRef + (phase + pi/2) / (2 pi f)  (mod P)
      let tc = (phase + Math.PI / 2) / (2 * Math.PI * f);
      tc -= period * Math.round(tc / period);
      sinusoids.push({
        period,
        semiAmplitude: Math.hypot(a, b),
        phase,
        timeOfConjunction: this.tRef + tc,
      });
    }
    const n = series.count;
    const residuals = new Float64Array(n);
    for (let i = 0; i < n; i++) residuals[i] = ok ? series.rv[i]! - this.model(i, m, false) : NaN;
    return { chi2, referenceTime: this.tRef, offsets, trend, sinusoids, residuals };
  }

  #fillRow(row: Float64Array, i: number, dt: number, m: number): void {
    const oc = this.offsetColumns, D = this.trendDegree, omega = this.#omega;
    for (let c = 0; c < oc; c++) row[c] = 0;
    const col = this.instrumentColumn[this.series.instrument[i]!]!;
    if (col >= 0) row[col] = 1;
    const u = dt / this.tScale;
    let pw = 1;
    for (let j = 0; j < D; j++) {
      pw *= u;
      row[oc + j] = pw;
    }
    for (let j = 0; j < m; j++) {
      const ph = omega[j]! * dt;
      row[oc + D + 2 * j] = Math.cos(ph);
      row[oc + D + 2 * j + 1] = Math.sin(ph);
    }
  }
}
