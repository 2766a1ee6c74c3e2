/**
 * Prior distributions as the user writes them: log-density, CDF, quantile
 * (inverse CDF) and support. Special functions are written here from published
 * methods: erfc (Abramowitz & Stegun 1964), the normal quantile (Acklam 2003 plus
 * one Halley step), ln Γ (Lanczos 1964), the regularised incomplete beta
 * (continued fraction, Press et al. 2007, Numerical Recipes 3rd ed., §6.4) and
 * its inverse (safeguarded Newton).
 * @module
 */
import { normalQuantile as acklamQuantile } from "../diagnostics/normal_quantile.ts";

/** A prior on one scalar parameter. */
export type Prior =
  | { readonly kind: "uniform"; readonly lo: number; readonly hi: number }
  | { readonly kind: "loguniform"; readonly lo: number; readonly hi: number }
  | { readonly kind: "normal"; readonly mu: number; readonly sigma: number }
  | {
    readonly kind: "truncnormal";
    readonly mu: number;
    readonly sigma: number;
    readonly lo: number;
    readonly hi: number;
  }
  | { readonly kind: "beta"; readonly a: number; readonly b: number }
  | { readonly kind: "fixed"; readonly value: number };

const LN_SQRT_TWO_PI = 0.5 * Math.log(2 * Math.PI);

/**
 * Check a prior's parameters.
 * @throws {RangeError} for non-finite parameters, lo ≥ hi, sigma ≤ 0, loguniform
 * lo ≤ 0, beta a or b ≤ 0.
 */
export function validatePrior(prior: Prior): void {
  const bad = (why: string, state: string): never => {
    throw new RangeError(`Cannot use ${prior.kind} prior as ${why}: ${state}`);
  };
  switch (prior.kind) {
    case "uniform":
    case "loguniform": {
      const { lo, hi } = prior;
      if (!Number.isFinite(lo) || !Number.isFinite(hi)) {
        bad("bounds must be finite", `lo=${lo}, hi=${hi}`);
      }
      if (!(lo < hi)) bad("lo must be below hi", `lo=${lo}, hi=${hi}`);
      if (prior.kind === "loguniform" && !(lo > 0)) bad("lo must be positive", `lo=${lo}`);
      return;
    }
    case "normal":
    case "truncnormal": {
      const { mu, sigma } = prior;
      if (!Number.isFinite(mu)) bad("mu must be finite", `mu=${mu}`);
      if (!(sigma > 0 && sigma < Infinity)) bad("sigma must be positive", `sigma=${sigma}`);
      if (prior.kind === "truncnormal") {
        const { lo, hi } = prior;
        if (Number.isNaN(lo) || Number.isNaN(hi)) {
          bad("bounds must be numbers", `lo=${lo}, hi=${hi}`);
        }
        if (!(lo < hi)) bad("lo must be below hi", `lo=${lo}, hi=${hi}`);
        if (!(truncMass(prior) > 0)) {
          bad("the interval must hold probability", `mu=${mu}, sigma=${sigma}, lo=${lo}, hi=${hi}`);
        }
      }
      return;
    }
    case "beta": {
      const { a, b } = prior;
      if (!(a > 0 && a < Infinity) || !(b > 0 && b < Infinity)) {
        bad("a and b must be positive", `a=${a}, b=${b}`);
      }
      return;
    }
    case "fixed":
      if (!Number.isFinite(prior.value)) bad("the value must be finite", `value=${prior.value}`);
      return;
    default:
      throw new TypeError(
        `Cannot use prior as its kind is unknown: kind=${(prior as { kind: unknown }).kind}`,
      );
  }
}

/** Interval [lo, hi] holding the prior's probability (closed; may be infinite). */
export function priorSupport(prior: Prior): [number, number] {
  switch (prior.kind) {
    case "uniform":
    case "loguniform":
    case "truncnormal":
      return [prior.lo, prior.hi];
    case "normal":
      return [-Infinity, Infinity];
    case "beta":
      return [0, 1];
    case "fixed":
      return [prior.value, prior.value];
  }
}

/**
 * Normalised log-density at x; `-Infinity` outside the support. For "fixed" it
 * is 0 at the value and `-Infinity` elsewhere (a point mass, not a density).
 * Parameters are assumed valid ({@link validatePrior}); `NaN` x gives `-Infinity`.
 */
export function logPriorDensity(prior: Prior, x: number): number {
  if (x !== x) return -Infinity;
  switch (prior.kind) {
    case "uniform":
      return x >= prior.lo && x <= prior.hi ? -Math.log(prior.hi - prior.lo) : -Infinity;
    case "loguniform":
      // p(x) = 1/(x ln(hi/lo)) on [lo, hi].
      return x >= prior.lo && x <= prior.hi
        ? -Math.log(x) - Math.log(Math.log(prior.hi / prior.lo))
        : -Infinity;
    case "normal": {
      const z = (x - prior.mu) / prior.sigma;
      return -0.5 * z * z - Math.log(prior.sigma) - LN_SQRT_TWO_PI;
    }
    case "truncnormal": {
      if (!(x >= prior.lo && x <= prior.hi)) return -Infinity;
      const z = (x - prior.mu) / prior.sigma;
      return -0.5 * z * z - Math.log(prior.sigma) - LN_SQRT_TWO_PI - Math.log(truncMass(prior));
    }
    case "beta": {
      if (!(x >= 0 && x <= 1)) return -Infinity;
      const { a, b } = prior;
      const la = a === 1 ? 0 : (a - 1) * Math.log(x);
      const lb = b === 1 ? 0 : (b - 1) * Math.log1p(-x);
      return la + lb - lnBeta(a, b);
    }
    case "fixed":
      return x === prior.value ? 0 : -Infinity;
  }
}

/** Cumulative distribution function P(X ≤ x). */
export function priorCdf(prior: Prior, x: number): number {
  if (x !== x) return NaN;
  switch (prior.kind) {
    case "uniform":
      return x <= prior.lo ? 0 : x >= prior.hi ? 1 : (x - prior.lo) / (prior.hi - prior.lo);
    case "loguniform":
      return x <= prior.lo
        ? 0
        : x >= prior.hi
        ? 1
        : Math.log(x / prior.lo) / Math.log(prior.hi / prior.lo);
    case "normal":
      return normalCdf((x - prior.mu) / prior.sigma);
    case "truncnormal": {
      if (x <= prior.lo) return 0;
      if (x >= prior.hi) return 1;
      const { za, zb } = truncZ(prior);
      const z = (x - prior.mu) / prior.sigma;
      // Work in the tail that keeps precision (upper tail when za > 0).
      if (za > 0) return (normalCdf(-za) - normalCdf(-z)) / (normalCdf(-za) - normalCdf(-zb));
      return (normalCdf(z) - normalCdf(za)) / (normalCdf(zb) - normalCdf(za));
    }
    case "beta":
      return x <= 0 ? 0 : x >= 1 ? 1 : incompleteBeta(x, prior.a, prior.b);
    case "fixed":
      return x >= prior.value ? 1 : 0;
  }
}

/**
 * Quantile (inverse CDF) for u ∈ [0, 1]: the x with P(X ≤ x) = u. `NaN` for u
 * outside [0, 1]. Used to draw from priors (x = quantile(U), U uniform).
 */
export function priorQuantile(prior: Prior, u: number): number {
  if (!(u >= 0 && u <= 1)) return NaN;
  switch (prior.kind) {
    case "uniform":
      return Math.min(prior.hi, prior.lo + u * (prior.hi - prior.lo));
    case "loguniform":
      return Math.min(prior.hi, prior.lo * Math.exp(u * Math.log(prior.hi / prior.lo)));
    case "normal":
      return prior.mu + prior.sigma * normalQuantile(u);
    case "truncnormal": {
      const { za, zb } = truncZ(prior);
      let z: number;
      if (za > 0) {
        // Upper tail: 1 − Φ(z) = Q(za) − u (Q(za) − Q(zb)), Q(z) = Φ(−z).
        const qa = normalCdf(-za);
        const qb = normalCdf(-zb);
        z = -normalQuantile(qa - u * (qa - qb));
      } else {
        const pa = normalCdf(za);
        const pb = normalCdf(zb);
        z = normalQuantile(pa + u * (pb - pa));
      }
      const x = prior.mu + prior.sigma * z;
      return Math.min(prior.hi, Math.max(prior.lo, x));
    }
    case "beta":
      return inverseIncompleteBeta(u, prior.a, prior.b);
    case "fixed":
      return prior.value;
  }
}

function truncZ(
  p: { mu: number; sigma: number; lo: number; hi: number },
): { za: number; zb: number } {
  return { za: (p.lo - p.mu) / p.sigma, zb: (p.hi - p.mu) / p.sigma };
}

/** Probability of [lo, hi] under the untruncated normal, computed in the accurate tail. */
function truncMass(p: { mu: number; sigma: number; lo: number; hi: number }): number {
  const { za, zb } = truncZ(p);
  return za > 0 ? normalCdf(-za) - normalCdf(-zb) : normalCdf(zb) - normalCdf(za);
}

// ---------------------------------------------------------------------------
// Special functions

/**
 * Complementary error function erfc(x), relative error ~1e-15.
 *
 * Method: for |x| < 2 the all-positive series
 * erf(x) = (2/√π) e^{−x²} Σ 2ⁿ x^{2n+1}/(1·3···(2n+1)) (Abramowitz & Stegun 1964,
 * Handbook of Mathematical Functions, eq. 7.1.6); for x ≥ 2 the continued
 * fraction erfc(x) = (e^{−x²}/√π) · 1/(x + (1/2)/(x + 1/(x + (3/2)/(x + ...))))
 * (A&S eq. 7.1.14), evaluated by the modified Lentz method (Press et al. 2007,
 * Numerical Recipes 3rd ed., §5.2); erfc(−x) = 2 − erfc(x).
 */
export function erfc(x: number): number {
  if (x !== x) return NaN;
  if (x < 0) return 2 - erfc(-x);
  if (x < 2) return 1 - erfSeries(x);
  if (x > 27.3) return 0;
  // Lentz: b0 = x, a_k = k/2, b_k = x.
  const tiny = 1e-300;
  let f = x;
  let c = x;
  let d = 0;
  for (let k = 1; k < 500; k++) {
    const a = k / 2;
    d = x + a * d;
    d = d === 0 ? tiny : d;
    c = x + a / c;
    c = c === 0 ? tiny : c;
    d = 1 / d;
    const delta = c * d;
    f *= delta;
    if (Math.abs(delta - 1) < 1e-16) break;
  }
  return Math.exp(-x * x) / (Math.sqrt(Math.PI) * f);
}

function erfSeries(x: number): number {
  const x2 = x * x;
  let term = x;
  let sum = x;
  for (let n = 1; n < 200; n++) {
    term *= 2 * x2 / (2 * n + 1);
    sum += term;
    if (term < 1e-17 * sum) break;
  }
  return 2 / Math.sqrt(Math.PI) * Math.exp(-x2) * sum;
}

/** Standard normal CDF Φ(z) = erfc(−z/√2)/2. */
export function normalCdf(z: number): number {
  return 0.5 * erfc(-z / Math.SQRT2);
}

/**
 * Standard normal quantile Φ⁻¹(p) for p ∈ [0, 1] (±Infinity at the ends, `NaN`
 * outside): Acklam's (2003) rational approximation (relative error 1.15e-9;
 * the one in `src/diagnostics/normal_quantile.ts`, used there as is for rank
 * normalisation) then one Halley step on Φ(z) − p = 0 (Acklam's own suggested
 * refinement), giving ~1e-15 relative.
 */
export function normalQuantile(p: number): number {
  if (!(p >= 0 && p <= 1)) return NaN;
  if (p === 0) return -Infinity;
  if (p === 1) return Infinity;
  const z = acklamQuantile(p);
  // Halley step; the error term is taken in the tail that keeps precision.
  // Φ(z) − p, written (1 − p) − Φ(−z) for z ≥ 0 (1 − p is exact there).
  const err = z < 0 ? normalCdf(z) - p : (1 - p) - normalCdf(-z);
  const u = err * Math.sqrt(2 * Math.PI) * Math.exp(0.5 * z * z);
  return z - u / (1 + 0.5 * z * u);
}

// Lanczos (1964), SIAM J. Numer. Anal. B 1, 86, with g = 7 and the nine
// coefficients popularised by P. Godfrey (recalled from memory; checked in the
// tests against factorials and Γ(1/2) = √π). Relative error ~1e-15.
const LANCZOS = [
  0.99999999999980993,
  676.5203681218851,
  -1259.1392167224028,
  771.32342877765313,
  -176.61502916214059,
  12.507343278686905,
  -0.13857109526572012,
  9.9843695780195716e-6,
  1.5056327351493116e-7,
];

/** ln Γ(x) for x > 0 (reflection Γ(x)Γ(1−x) = π/sin πx below 0.5). */
export function lnGamma(x: number): number {
  if (!(x > 0)) return NaN;
  if (x < 0.5) return Math.log(Math.PI / Math.sin(Math.PI * x)) - lnGamma(1 - x);
  const y = x - 1;
  let sum = LANCZOS[0]!;
  for (let i = 1; i < 9; i++) sum += LANCZOS[i]! / (y + i);
  const t = y + 7.5;
  return LN_SQRT_TWO_PI + (y + 0.5) * Math.log(t) - t + Math.log(sum);
}

/** ln B(a, b) = ln Γ(a) + ln Γ(b) − ln Γ(a + b). */
export function lnBeta(a: number, b: number): number {
  return lnGamma(a) + lnGamma(b) - lnGamma(a + b);
}

/**
 * Regularised incomplete beta I_x(a, b) for x ∈ [0, 1], a, b > 0.
 *
 * Method: Press et al. 2007, Numerical Recipes 3rd ed., §6.4: the continued
 * fraction (eq. 6.4.5) by modified Lentz, used directly when
 * x < (a + 1)/(a + b + 2) and through I_x(a, b) = 1 − I_{1−x}(b, a) otherwise.
 */
export function incompleteBeta(x: number, a: number, b: number): number {
  if (!(x >= 0 && x <= 1) || !(a > 0) || !(b > 0)) return NaN;
  if (x === 0) return 0;
  if (x === 1) return 1;
  const lnFront = a * Math.log(x) + b * Math.log1p(-x) - lnBeta(a, b);
  if (x < (a + 1) / (a + b + 2)) return Math.exp(lnFront) * betaContinuedFraction(x, a, b) / a;
  return 1 - Math.exp(lnFront) * betaContinuedFraction(1 - x, b, a) / b;
}

function betaContinuedFraction(x: number, a: number, b: number): number {
  const tiny = 1e-300;
  const qab = a + b;
  const qap = a + 1;
  const qam = a - 1;
  let c = 1;
  let d = 1 - qab * x / qap;
  if (Math.abs(d) < tiny) d = tiny;
  d = 1 / d;
  let h = d;
  for (let m = 1; m <= 10000; m++) {
    const m2 = 2 * m;
    let aa = m * (b - m) * x / ((qam + m2) * (a + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < tiny) d = tiny;
    c = 1 + aa / c;
    if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    h *= d * c;
    aa = -(a + m) * (qab + m) * x / ((a + m2) * (qap + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < tiny) d = tiny;
    c = 1 + aa / c;
    if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    const delta = d * c;
    h *= delta;
    if (Math.abs(delta - 1) < 1e-16) break;
  }
  return h;
}

/**
 * Inverse of the regularised incomplete beta: x with I_x(a, b) = p.
 *
 * Method: Newton steps on I_x − p with the density as derivative, kept inside a
 * bisection bracket [lo, hi] that every evaluation shrinks (a safeguarded
 * Newton, e.g. Press et al. 2007, Numerical Recipes 3rd ed., §9.4 rtsafe), from
 * the start x = a/(a + b). Converges to ~1e-15 in x.
 */
export function inverseIncompleteBeta(p: number, a: number, b: number): number {
  if (!(p >= 0 && p <= 1) || !(a > 0) || !(b > 0)) return NaN;
  if (p === 0) return 0;
  if (p === 1) return 1;
  const lnB = lnBeta(a, b);
  let lo = 0;
  let hi = 1;
  let x = a / (a + b);
  for (let it = 0; it < 200; it++) {
    const f = incompleteBeta(x, a, b) - p;
    if (f === 0) return x;
    if (f < 0) lo = x;
    else hi = x;
    const logDensity = (a - 1) * Math.log(x) + (b - 1) * Math.log1p(-x) - lnB;
    let next = x - f / Math.exp(logDensity);
    if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
    if (Math.abs(next - x) <= 1e-15 * Math.max(x, 1e-300) || hi - lo <= 1e-300) return next;
    x = next;
  }
  return x;
}
