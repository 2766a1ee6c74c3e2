/**
 * Generalised Lomb–Scargle periodogram with per-instrument offsets.
 * @module
 */
import type { FrequencyGrid } from "./frequency_grid.ts";
import { nullBasis, projectOut, type RvSeries, timeRange, validateSeries } from "./_series.ts";
import { TrigTable } from "./_trig.ts";

/** Options of {@linkcode glsPeriodogram}. */
export interface GlsOptions {
  /**
   * One free offset per instrument (the floating mean of Zechmeister & Kürster
   * 2009 when there is one instrument). `false` fits no constant at all: with
   * mean-subtracted data and equal errors this is the classical Lomb (1976) /
   * Scargle (1982) periodogram. @default true
   */
  offsets?: boolean;
  /** Degree of a polynomial time trend in the null model (0 = none). @default 0 */
  trendDegree?: number;
  /** Jitter added in quadrature to every rvErr, m/s. @default 0 */
  jitter?: number;
  /** Output buffer for the power, length >= number of frequencies. @default new array */
  out?: Float64Array;
}

/**
 * Periodogram and the facts needed for its false-alarm probability
 * ({@linkcode FapInputs} of `false_alarm.ts`).
 */
export interface GlsResult {
  /** Frequencies, 1/d. */
  readonly frequencies: Float64Array;
  /** Power p(f) in [0, 1]: relative chi^2 reduction (see glsPeriodogram). */
  readonly power: Float64Array;
  /** chi^2 of the null model (offsets and trend only), sum w_i r_i^2. */
  readonly chi2Null: number;
  /** Free parameters of the null model (non-empty instruments + trend terms), d_H. */
  readonly nullParameters: number;
  /** Number of points N. */
  readonly count: number;
  /** Searched frequency range f_max - f_min, 1/d. */
  readonly bandwidth: number;
  /** Weighted variance of the times D_t = <t^2> - <t>^2 (weights 1/sigma^2), d^2. */
  readonly timeVariance: number;
}

/**
 * Generalised Lomb–Scargle (GLS) periodogram, weights w_i = 1/(sigma_i^2 + jitter^2),
 * with one free offset per instrument and an optional polynomial trend.
 *
 * Power (normalisation): for each frequency f the model
 *   y_i = a cos(2 pi f t_i) + b sin(2 pi f t_i) + c_{inst(i)} [+ trend]
 * is fitted by weighted least squares and
 *   p(f) = (chi2_0 - chi2(f)) / chi2_0,
 * the relative chi^2 reduction against the null model (offsets [+ trend]) alone
 * (Zechmeister & Kürster 2009, A&A 496, 577, doi:10.1051/0004-6361:200811296,
 * Sect. 2, the normalised power p(omega) = (chi2_0 - chi2(omega))/chi2_0 and the
 * closed form p = (SS YC^2 + CC YS^2 - 2 CS YC YS)/(YY D), D = CC SS - CS^2;
 * equation numbers not verified). 0 <= p <= 1 (rounding is clamped). With one
 * instrument and no trend this is exactly ZK09's GLS power.
 *
 * Method (offsets): this is direct weighted least squares with design matrix
 * [cos, sin, one indicator column per instrument (, trend columns)], solved in
 * closed form by projecting the nuisance columns out. With an orthonormal
 * basis q_j of the nuisance columns under <u,v> = sum w u v (indicators
 * q_k = 1[inst=k]/sqrt(W_k), trend columns Gram–Schmidt-orthogonalised),
 *   CC = sum w cos^2 - sum_j (q_j.w.cos)^2, SS likewise, CS = sum w cos sin - sum_j (q_j.w.cos)(q_j.w.sin),
 *   YC = sum w r cos, YS = sum w r sin,  r = y minus its null-model fit, YY = chi2_0 = sum w r^2,
 * which for one instrument are ZK09's CC, SS, CS, YC, YS, YY (their sums with
 * normalised weights times W = sum w). The chi^2 reduction of the 2-column fit
 * is (SS YC^2 + CC YS^2 - 2 CS YC YS)/D. If D <= 1e-12 CC SS (cos and sin
 * columns collinear after projection, e.g. at the Nyquist frequency of even
 * sampling) the better single column is used. On an evenly spaced grid the
 * trigonometric values are advanced by recurrence (see `_trig.ts`); cost is
 * O(N) per frequency, plus O(N) per trend term.
 *
 * Returns NaN power when chi2_0 = 0 (data fitted exactly by the null model,
 * up to rounding: weighted rms residual <= 1e-12 of the weighted rms of rv).
 * Throws RangeError/TypeError for malformed series, or when the points do not
 * exceed the parameters of the sinusoid model (N < d_H + 3).
 */
export function glsPeriodogram(
  series: RvSeries,
  grid: FrequencyGrid | Float64Array,
  options: GlsOptions = {},
): GlsResult {
  validateSeries(series, "compute periodogram");
  const offsets = options.offsets ?? true;
  const trendDegree = options.trendDegree ?? 0;
  const jitter = options.jitter ?? 0;
  if (!Number.isInteger(trendDegree) || trendDegree < 0) {
    throw new RangeError(
      `Cannot compute periodogram as trendDegree must be a non-negative integer: trendDegree=${trendDegree}`,
    );
  }
  if (!(jitter >= 0) || !Number.isFinite(jitter)) {
    throw new RangeError(`Cannot compute periodogram as jitter must be >= 0: jitter=${jitter}`);
  }
  const n = series.count;
  const frequencies = grid instanceof Float64Array ? grid : grid.frequencies;
  const nf = frequencies.length;
  const power = options.out ?? new Float64Array(nf);
  if (power.length < nf) {
    throw new TypeError(
      `Cannot compute periodogram as out is too short: out=${power.length}, frequencies=${nf}`,
    );
  }

  const weight = new Float64Array(n);
  let wSum = 0, wt = 0, wtt = 0;
  const [t0, t1] = timeRange(series.time, n);
  const tRef = 0.5 * (t0 + t1);
  const tScale = Math.max(0.5 * (t1 - t0), Number.MIN_VALUE);
  for (let i = 0; i < n; i++) {
    const s = series.rvErr[i]!;
    const w = 1 / (s * s + jitter * jitter);
    weight[i] = w;
    const t = series.time[i]! - tRef;
    wSum += w;
    wt += w * t;
    wtt += w * t * t;
  }
  const timeVariance = wtt / wSum - (wt / wSum) * (wt / wSum);

  const basis = nullBasis(series, weight, offsets, trendDegree, tRef, tScale);
  if (n < basis.parameters + 3) {
    throw new RangeError(
      `Cannot compute periodogram as points must exceed model parameters: count=${n}, ` +
        `parameters=${basis.parameters + 2}`,
    );
  }
  const residual = new Float64Array(n);
  const chi2Null = projectOut(series, weight, basis, series.rv, residual);
  // Residuals at rounding level (|r| <= 1e-12 |y| in the weighted rms) count as an exact fit.
  let yy = 0;
  for (let i = 0; i < n; i++) yy += weight[i]! * series.rv[i]! * series.rv[i]!;
  const exactFit = !(chi2Null > 1e-24 * yy);

  const trig = new TrigTable(series.time, n, tRef, grid);
  const nInst = series.instruments;
  const instC = new Float64Array(nInst);
  const instS = new Float64Array(nInst);
  const instW = basis.instrumentWeight;
  const inst = series.instrument;
  const nTrend = basis.trendColumns;
  const wq = basis.weightedTrend;
  const c = trig.cos, s = trig.sin;

  for (let k = 0; k < nf; k++) {
    trig.set(k);
    let cc = 0, ss = 0, cs = 0, yc = 0, ys = 0;
    if (offsets) {
      instC.fill(0);
      instS.fill(0);
      for (let i = 0; i < n; i++) {
        const wc = weight[i]! * c[i]!, ws = weight[i]! * s[i]!, r = residual[i]!;
        cc += wc * c[i]!;
        ss += ws * s[i]!;
        cs += wc * s[i]!;
        yc += wc * r;
        ys += ws * r;
        const j = inst[i]!;
        instC[j]! += wc;
        instS[j]! += ws;
      }
      for (let j = 0; j < nInst; j++) {
        const wj = instW[j]!;
        if (wj > 0) {
          const a = instC[j]!, b = instS[j]!;
          cc -= a * a / wj;
          ss -= b * b / wj;
          cs -= a * b / wj;
        }
      }
    } else {
      for (let i = 0; i < n; i++) {
        const wc = weight[i]! * c[i]!, ws = weight[i]! * s[i]!, r = residual[i]!;
        cc += wc * c[i]!;
        ss += ws * s[i]!;
        cs += wc * s[i]!;
        yc += wc * r;
        ys += ws * r;
      }
    }
    for (let m = 0; m < nTrend; m++) {
      let a = 0, b = 0;
      const o = m * n;
      for (let i = 0; i < n; i++) {
        a += wq[o + i]! * c[i]!;
        b += wq[o + i]! * s[i]!;
      }
      cc -= a * a;
      ss -= b * b;
      cs -= a * b;
    }
    const d = cc * ss - cs * cs;
    let reduction: number;
    if (d > 1e-12 * cc * ss && cc > 0 && ss > 0) {
      reduction = (ss * yc * yc + cc * ys * ys - 2 * cs * yc * ys) / d;
    } else if (cc >= ss) {
      reduction = cc > 0 ? yc * yc / cc : 0;
    } else {
      reduction = ss > 0 ? ys * ys / ss : 0;
    }
    const p = exactFit ? NaN : reduction / chi2Null;
    power[k] = p < 0 ? 0 : p > 1 ? 1 : p;
  }

  let fLo = Infinity, fHi = -Infinity;
  for (let k = 0; k < nf; k++) {
    const f = frequencies[k]!;
    if (f < fLo) fLo = f;
    if (f > fHi) fHi = f;
  }
  return {
    frequencies,
    power,
    chi2Null,
    nullParameters: basis.parameters,
    count: n,
    bandwidth: nf > 0 ? fHi - fLo : 0,
    timeVariance,
  };
}
