/**
 * Shared input type and boundary checks for the search kernels (private to
 * `src/search/`).
 * @module
 */

/**
 * Radial-velocity series in column form. Only the first `count` entries of each
 * array are read, so callers may pass larger reusable buffers.
 */
export interface RvSeries {
  /** Observation times in days (BJD or any consistent day count). */
  readonly time: Float64Array;
  /** Radial velocities, m/s. */
  readonly rv: Float64Array;
  /** One-sigma uncertainties of `rv`, m/s; must be finite and > 0. */
  readonly rvErr: Float64Array;
  /** Instrument index of each point, in `[0, instruments)`. */
  readonly instrument: Int32Array;
  /** Number of points used. */
  readonly count: number;
  /** Number of instruments (offset parameters). */
  readonly instruments: number;
}

/**
 * Throws on malformed series: arrays shorter than `count`, non-finite values,
 * non-positive uncertainties or instrument indices out of range.
 */
export function validateSeries(series: RvSeries, action: string): void {
  const { time, rv, rvErr, instrument, count, instruments } = series;
  if (!Number.isInteger(count) || count < 1) {
    throw new RangeError(`Cannot ${action} as count must be a positive integer: count=${count}`);
  }
  if (!Number.isInteger(instruments) || instruments < 1) {
    throw new RangeError(
      `Cannot ${action} as instruments must be a positive integer: instruments=${instruments}`,
    );
  }
  if (
    time.length < count || rv.length < count || rvErr.length < count ||
    instrument.length < count
  ) {
    throw new TypeError(
      `Cannot ${action} as arrays are shorter than count: count=${count}, time=${time.length}, ` +
        `rv=${rv.length}, rvErr=${rvErr.length}, instrument=${instrument.length}`,
    );
  }
  for (let i = 0; i < count; i++) {
    const t = time[i]!, y = rv[i]!, s = rvErr[i]!, k = instrument[i]!;
    if (!Number.isFinite(t) || !Number.isFinite(y)) {
      throw new RangeError(
        `Cannot ${action} as time and rv must be finite: index=${i}, time=${t}, rv=${y}`,
      );
    }
    if (!(s > 0) || !Number.isFinite(s)) {
      throw new RangeError(
        `Cannot ${action} as rvErr must be finite and positive: index=${i}, rvErr=${s}`,
      );
    }
    if (k < 0 || k >= instruments) {
      throw new RangeError(
        `Cannot ${action} as instrument index is out of range: index=${i}, instrument=${k}, ` +
          `instruments=${instruments}`,
      );
    }
  }
}

/** Smallest and largest time among the first `count` points. */
export function timeRange(time: ArrayLike<number>, count: number): [number, number] {
  let lo = Infinity, hi = -Infinity;
  for (let i = 0; i < count; i++) {
    const t = time[i]!;
    if (t < lo) lo = t;
    if (t > hi) hi = t;
  }
  return [lo, hi];
}

/**
 * Orthonormal basis of the "null" (nuisance) model under the weighted inner
 * product <u, v> = sum_i w_i u_i v_i: one indicator column per non-empty
 * instrument (if `offsets`), then polynomial trend columns ((t - tRef)/tScale)^j,
 * j = 1..trendDegree, made orthonormal by modified Gram–Schmidt (Golub & Van
 * Loan 2013, Matrix Computations 4th ed., Sect. 5.2.8).
 *
 * Indicator columns are kept implicit (they are orthogonal with disjoint
 * support: q_k = 1[inst = k] / sqrt(W_k)); trend columns are stored dense, as
 * w_i q_ji so a dot product with any vector needs one multiply per point.
 */
export interface NullBasis {
  /** Weighted sum W_k = sum_{i in k} w_i per instrument (0 for empty or no offsets). */
  readonly instrumentWeight: Float64Array;
  /** Number of dense trend columns. */
  readonly trendColumns: number;
  /** Dense columns, w_i * q_ji, row-major by column: [j * count + i]. */
  readonly weightedTrend: Float64Array;
  /** Number of free parameters of the null model (non-empty instruments + trend columns). */
  readonly parameters: number;
}

/**
 * Builds the null-model basis. `weight` holds w_i = 1/sigma_i^2.
 * Trend columns that are numerically dependent on earlier columns (norm below
 * 1e-10 of the original) are dropped and not counted as parameters.
 */
export function nullBasis(
  series: RvSeries,
  weight: Float64Array,
  offsets: boolean,
  trendDegree: number,
  tRef: number,
  tScale: number,
): NullBasis {
  const n = series.count;
  const instrumentWeight = new Float64Array(series.instruments);
  let parameters = 0;
  if (offsets) {
    for (let i = 0; i < n; i++) instrumentWeight[series.instrument[i]!]! += weight[i]!;
    for (let k = 0; k < series.instruments; k++) if (instrumentWeight[k]! > 0) parameters++;
  }
  const dense = new Float64Array(Math.max(0, trendDegree) * n); // plain q_j first
  const column = new Float64Array(n);
  const perInst = new Float64Array(series.instruments);
  let kept = 0;
  for (let j = 1; j <= trendDegree; j++) {
    let norm0 = 0;
    for (let i = 0; i < n; i++) {
      const u = Math.pow((series.time[i]! - tRef) / tScale, j);
      column[i] = u;
      norm0 += weight[i]! * u * u;
    }
    if (offsets) {
      perInst.fill(0);
      for (let i = 0; i < n; i++) perInst[series.instrument[i]!]! += weight[i]! * column[i]!;
      for (let i = 0; i < n; i++) {
        const k = series.instrument[i]!;
        column[i]! -= perInst[k]! / instrumentWeight[k]!;
      }
    }
    for (let m = 0; m < kept; m++) {
      let dot = 0;
      for (let i = 0; i < n; i++) dot += weight[i]! * dense[m * n + i]! * column[i]!;
      for (let i = 0; i < n; i++) column[i]! -= dot * dense[m * n + i]!;
    }
    let norm = 0;
    for (let i = 0; i < n; i++) norm += weight[i]! * column[i]! * column[i]!;
    if (!(norm > 1e-20 * norm0) || norm0 === 0) continue;
    const inv = 1 / Math.sqrt(norm);
    for (let i = 0; i < n; i++) dense[kept * n + i] = column[i]! * inv;
    kept++;
  }
  const weightedTrend = new Float64Array(kept * n);
  for (let m = 0; m < kept; m++) {
    for (let i = 0; i < n; i++) weightedTrend[m * n + i] = weight[i]! * dense[m * n + i]!;
  }
  return { instrumentWeight, trendColumns: kept, weightedTrend, parameters: parameters + kept };
}

/**
 * Overwrites `out` with the residual of `values` after the weighted projection
 * onto the null basis, and returns the weighted residual sum of squares.
 */
export function projectOut(
  series: RvSeries,
  weight: Float64Array,
  basis: NullBasis,
  values: Float64Array,
  out: Float64Array,
): number {
  const n = series.count;
  const perInst = new Float64Array(series.instruments);
  for (let i = 0; i < n; i++) out[i] = values[i]!;
  for (let i = 0; i < n; i++) perInst[series.instrument[i]!]! += weight[i]! * out[i]!;
  for (let i = 0; i < n; i++) {
    const k = series.instrument[i]!;
    const wk = basis.instrumentWeight[k]!;
    if (wk > 0) out[i]! -= perInst[k]! / wk;
  }
  // The stored columns are w * q; q itself is (w * q) / w.
  for (let m = 0; m < basis.trendColumns; m++) {
    let dot = 0;
    for (let i = 0; i < n; i++) dot += basis.weightedTrend[m * n + i]! * out[i]!;
    for (let i = 0; i < n; i++) out[i]! -= dot * basis.weightedTrend[m * n + i]! / weight[i]!;
  }
  let chi2 = 0;
  for (let i = 0; i < n; i++) chi2 += weight[i]! * out[i]! * out[i]!;
  return chi2;
}
