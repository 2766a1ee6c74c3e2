/**
 * Kepler's equation E − e sin E = M for elliptic orbits (0 ≤ e < 1).
 *
 * Method
 * - Starter: Markley (1995), "Kepler equation solver", Celestial Mechanics and
 *   Dynamical Astronomy 63, 101–111, doi:10.1007/BF00691917: a cubic in E from a
 *   Padé approximant of sin E, solved in closed form (Markley eqs. 5, 9–10, 14–15
 *   and 20 for α). Its error is ≤ 4.4e-4 rad for 0 ≤ e < 1 (measured here on a
 *   grid, e up to 0.999999).
 * - Correction: one fifth-order step. With f(E) = E − e sin E − M and
 *   h = −f/f′, the root of the quartic Taylor polynomial of f about E₁ is, by
 *   series reversion (Lagrange inversion; e.g. Danby 1988, Fundamentals of
 *   Celestial Mechanics, 2nd ed., §6.6, for the quartic form — recalled from
 *   memory),
 *     δ = h − a₂h² + (2a₂² − a₃)h³ + (−5a₂³ + 5a₂a₃ − a₄)h⁴,
 *   a₂ = f″/(2f′), a₃ = f‴/(6f′), a₄ = f⁗/(24f′), with f′ = 1 − e cos E,
 *   f″ = e sin E, f‴ = e cos E, f⁗ = −e sin E. Error O(h⁵) ≈ 1e-17 after the
 *   starter; one division per solve. This plays the role of Markley's eqs. 21–29
 *   (same order, same derivatives) with fewer divisions.
 * - Transcendentals: none from `Math` in the loop. sin E₁, cos E₁ come from a
 *   table at x_k = kπ/256 on [−π, π] and angle addition with Taylor series of
 *   d = E₁ − x_k, |d| ≤ π/512 (the look-up-table idea of Brandt et al. 2021,
 *   AJ 162, 186, §3, applied to sin/cos only); sin E, cos E of the corrected root
 *   again by angle addition with Taylor series of δ. The cube root of Markley's
 *   starter uses Kahan's exponent-division trick plus two Halley steps
 *   ({@link cbrtPositive}). One `Math.sqrt` per solve.
 *
 * Speed note (measured with bench/kepler_bench.ts): V8's `Math.sin`, `Math.cos`
 * and `Math.cbrt` cost 20–40 ns each here and a value boxed across a
 * non-inlined call costs about as much, so the hot path is the array kernel
 * {@link solveKeplerBatch}; the scalar functions wrap it.
 * @module
 */
import type { Radians } from "../units.ts";

const TWO_PI = 2 * Math.PI;
const INV_TWO_PI = 1 / TWO_PI;
const PI_SQUARED = Math.PI * Math.PI;
/** 3π²/(π² − 6) and 1.6π/(π² − 6): Markley (1995) eq. 20 split in two. */
const ALPHA_0 = 3 * PI_SQUARED / (PI_SQUARED - 6);
const ALPHA_1 = 1.6 * Math.PI / (PI_SQUARED - 6);

/** Options for {@link solveKeplerBatch}. */
export interface SolveKeplerBatchOptions {
  /** Receives sin E per point. */
  sinE: Float64Array;
  /** Receives cos E per point. */
  cosE: Float64Array;
  /** Receives E ∈ [−π, π] per point, if given. */
  eccentricAnomaly?: Float64Array;
  /** Number of points. @default meanAnomaly.length */
  count?: number;
}

/**
 * Solve Kepler's equation for many mean anomalies sharing one eccentricity:
 * writes sin E, cos E (and E, if asked) per point. Allocates nothing.
 *
 * Mean anomalies are range-reduced to [−π, π] (M ≡ π gives E = −π); E satisfies
 * E − e sin E ≡ M (mod 2π) to ≤ 1e-12 rad for 0 ≤ e ≤ 0.99 (tested on a dense
 * grid; measured ≤ 1e-15). At e = 0, E equals the reduced M exactly. An
 * eccentricity outside [0, 1) or a non-finite M gives `NaN` outputs.
 */
export function solveKeplerBatch(
  meanAnomaly: Float64Array,
  eccentricity: number,
  options: SolveKeplerBatchOptions,
): void {
  const count = options.count ?? meanAnomaly.length;
  const sinE = options.sinE;
  const cosE = options.cosE;
  const outE = options.eccentricAnomaly;
  const e = eccentricity;
  if (!(e >= 0 && e < 1)) {
    for (let i = 0; i < count; i++) {
      sinE[i] = NaN;
      cosE[i] = NaN;
      if (outE !== undefined) outE[i] = NaN;
    }
    return;
  }
  const oneMinusE = 1 - e;
  const alpha1 = ALPHA_1 / (1 + e);
  const f = CBRT_F64;
  const u = CBRT_U32;
  const hi = CBRT_HI;
  const lo = 1 - hi;
  for (let i = 0; i < count; i++) {
    let m = meanAnomaly[i]!;
    m -= TWO_PI * Math.round(m * INV_TWO_PI);
    let ea = m;
    if (e !== 0) {
      // Markley (1995) starter for M ∈ [−π, π]: α (eq. 20), d (eq. 5), q, r
      // (eqs. 9–10), w (eq. 14), E₁ (eq. 15); d − 1 + e written as d − (1 − e).
      const alpha = ALPHA_0 + alpha1 * (Math.PI - Math.abs(m));
      const d = 3 * oneMinusE + alpha * e;
      const m2 = m * m;
      const q = 2 * alpha * d * oneMinusE - m2;
      const r = (3 * alpha * d * (d - oneMinusE) + m2) * m;
      const q2 = q * q;
      const x = Math.abs(r) + Math.sqrt(q2 * q + r * r);
      // Cube root, see cbrtPositive (inlined here to keep the loop call-free).
      f[0] = x;
      u[hi] = ((u[hi]! / 3) | 0) + 715094163;
      u[lo] = 0;
      let c = f[0]!;
      let c3 = c * c * c;
      c *= (c3 + 2 * x) / (2 * c3 + x);
      c3 = c * c * c;
      c *= (c3 + 2 * x) / (2 * c3 + x);
      if (!(x > MIN_NORMAL)) c = Math.cbrt(x); // only for e → 1, M → 0
      const w = c * c;
      const den = w * w + w * q + q2;
      ea = (2 * r * w + m * den) / (den * d);
    }
    // sin, cos of ea: table + Taylor (A&S 1964 eqs. 4.3.65–66) + angle addition.
    let k = Math.round(ea * TABLE_SCALE);
    if (k < -TABLE_HALF) k = -TABLE_HALF;
    else if (k > TABLE_HALF) k = TABLE_HALF;
    k += TABLE_HALF;
    const dt = ea - TABLE_X[k]!;
    const dt2 = dt * dt;
    const sdt = dt * (1 - dt2 / 6 * (1 - dt2 / 20 * (1 - dt2 / 42 * (1 - dt2 / 72))));
    const cdt = 1 - dt2 / 2 * (1 - dt2 / 12 * (1 - dt2 / 30 * (1 - dt2 / 56 * (1 - dt2 / 90))));
    const st = TABLE_SIN[k]!;
    const ct = TABLE_COS[k]!;
    let s = st * cdt + ct * sdt;
    let co = ct * cdt - st * sdt;
    if (e !== 0) {
      // Fifth-order correction by series reversion (see module doc).
      const es = e * s;
      const ec = e * co;
      const inv = 1 / (1 - ec);
      const h = -(ea - es - m) * inv;
      const a2 = 0.5 * es * inv;
      const a3 = ec * inv / 6;
      const a4 = -es * inv / 24;
      const delta = h *
        (1 + h * (-a2 + h * (2 * a2 * a2 - a3 + h * (5 * a2 * (a3 - a2 * a2) - a4))));
      ea += delta;
      // |δ| ≤ 5e-4: Taylor through δ⁷ / δ⁸ is exact to rounding.
      const d2 = delta * delta;
      const sd = delta * (1 - d2 / 6 * (1 - d2 / 20 * (1 - d2 / 42)));
      const cd = 1 - d2 / 2 * (1 - d2 / 12 * (1 - d2 / 30 * (1 - d2 / 56)));
      const sn = s * cd + co * sd;
      co = co * cd - s * sd;
      s = sn;
    }
    sinE[i] = s;
    cosE[i] = co;
    if (outE !== undefined) outE[i] = ea;
  }
}

/** Options for {@link solveKeplerSinCos}. */
export interface SolveKeplerSinCosOptions {
  /**
   * Receives sin E at index 0 and cos E at index 1. Reuse one options object and
   * one array across calls: the call then allocates nothing.
   */
  out: Float64Array;
}

const ONE_M = new Float64Array(1);
const ONE_S = new Float64Array(1);
const ONE_C = new Float64Array(1);
const ONE_E = new Float64Array(1);
const ONE_OPTIONS: SolveKeplerBatchOptions = {
  sinE: ONE_S,
  cosE: ONE_C,
  eccentricAnomaly: ONE_E,
  count: 1,
};

/**
 * Solve Kepler's equation E − e sin E = M for the eccentric anomaly E
 * (method: see the module doc).
 *
 * Any finite mean anomaly is accepted. For |M| < π the root is returned in
 * (−π, π) and E − e sin E = M to ≤ 1e-12 rad for 0 ≤ e ≤ 0.99; other M are
 * reduced to [−π, π] first, so the identity holds modulo 2π. Exact at e = 0.
 * Returns `NaN` for an eccentricity outside [0, 1) or a non-finite M.
 *
 * @example
 * ```ts
 * solveKepler(0.5, 0.3); // ≈ 0.6966
 * ```
 */
export function solveKepler(meanAnomaly: Radians, eccentricity: number): Radians {
  ONE_M[0] = meanAnomaly;
  solveKeplerBatch(ONE_M, eccentricity, ONE_OPTIONS);
  return ONE_E[0]!;
}

/**
 * Like {@link solveKepler}, and also writes sin E into `options.out[0]` and cos E
 * into `options.out[1]` (both `NaN` when E is `NaN`), within a few ulps of
 * `Math.sin(E)`, `Math.cos(E)`. Allocation-free when the caller reuses the
 * options object. For many points prefer {@link solveKeplerBatch}.
 */
export function solveKeplerSinCos(
  meanAnomaly: Radians,
  eccentricity: number,
  options: SolveKeplerSinCosOptions,
): Radians {
  ONE_M[0] = meanAnomaly;
  solveKeplerBatch(ONE_M, eccentricity, ONE_OPTIONS);
  options.out[0] = ONE_S[0]!;
  options.out[1] = ONE_C[0]!;
  return ONE_E[0]!;
}

/** Table for sin/cos on [−π, π] at x_k = kπ/256 (values from `Math`, built once). */
const TABLE_HALF = 256;
const TABLE_SCALE = TABLE_HALF / Math.PI;
const TABLE_X = new Float64Array(2 * TABLE_HALF + 1);
const TABLE_SIN = new Float64Array(2 * TABLE_HALF + 1);
const TABLE_COS = new Float64Array(2 * TABLE_HALF + 1);
for (let k = -TABLE_HALF; k <= TABLE_HALF; k++) {
  const x = k * (Math.PI / TABLE_HALF);
  TABLE_X[k + TABLE_HALF] = x;
  TABLE_SIN[k + TABLE_HALF] = Math.sin(x);
  TABLE_COS[k + TABLE_HALF] = Math.cos(x);
}

const MIN_NORMAL = 2.2250738585072014e-308;
const CBRT_F64 = new Float64Array(1);
const CBRT_U32 = new Uint32Array(CBRT_F64.buffer);
/** Index of the high 32-bit word of a float64 in CBRT_U32: 1 on little-endian hosts. */
const CBRT_HI = new Uint8Array(new Uint32Array([1]).buffer)[0] === 1 ? 1 : 0;

/**
 * Cube root of a positive normal x, to ~1e-14 relative (the loop in
 * {@link solveKeplerBatch} inlines the same steps). Start: the high word of the
 * IEEE-754 double divided by 3 plus the bias 715094163, Kahan's trick as in
 * fdlibm s_cbrt.c (Sun Microsystems 1993; recalled from memory), ~5 correct bits;
 * then two Halley steps y ← y (y³ + 2x)/(2y³ + x) (cubic convergence,
 * 5 → 15 → 45 bits; Traub 1964, Iterative Methods for the Solution of
 * Equations, §5.2 — recalled from memory). Markley's starter needs far less
 * (its own error is 4e-4 rad). Other x fall back to `Math.cbrt`.
 */
export function cbrtPositive(x: number): number {
  if (!(x > MIN_NORMAL && x < Infinity)) return Math.cbrt(x);
  const f = CBRT_F64;
  const u = CBRT_U32;
  f[0] = x;
  u[CBRT_HI] = ((u[CBRT_HI]! / 3) | 0) + 715094163;
  u[1 - CBRT_HI] = 0;
  let y = f[0]!;
  let y3 = y * y * y;
  y *= (y3 + 2 * x) / (2 * y3 + x);
  y3 = y * y * y;
  y *= (y3 + 2 * x) / (2 * y3 + x);
  return y;
}
