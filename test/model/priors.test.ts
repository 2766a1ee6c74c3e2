import { describe, expect, test } from "vitest";
import {
  erfc,
  incompleteBeta,
  inverseIncompleteBeta,
  lnGamma,
  logPriorDensity,
  normalCdf,
  normalQuantile,
  type Prior,
  priorCdf,
  priorQuantile,
  priorSupport,
  validatePrior,
} from "../../src/model/priors.ts";

/** Composite Simpson rule with n (even) intervals; written here as the independent check. */
function simpson(f: (x: number) => number, a: number, b: number, n: number): number {
  const h = (b - a) / n;
  let s = f(a) + f(b);
  for (let i = 1; i < n; i++) s += (i % 2 === 1 ? 4 : 2) * f(a + i * h);
  return s * h / 3;
}

const PRIORS: Prior[] = [
  { kind: "uniform", lo: -2, hi: 5 },
  { kind: "loguniform", lo: 0.1, hi: 1000 },
  { kind: "normal", mu: 3, sigma: 0.5 },
  { kind: "truncnormal", mu: 0, sigma: 1, lo: -0.5, hi: 2 },
  { kind: "truncnormal", mu: 0, sigma: 1, lo: 3, hi: 6 },
  { kind: "beta", a: 2.5, b: 4 },
  { kind: "beta", a: 0.867, b: 3.03 },
];

describe("normalCdf()", () => {
  test("normalCdf() matches Simpson integration of the normal density", () => {
    // Φ(z) = 1/2 + ∫₀^z φ(t) dt (definition), integrated numerically here.
    const phi = (t: number) => Math.exp(-0.5 * t * t) / Math.sqrt(2 * Math.PI);
    for (const z of [-6, -3.3, -1, -0.2, 0, 0.7, 1.96, 4, 8]) {
      const expected = 0.5 + Math.sign(z) * simpson(phi, 0, Math.abs(z), 4000);
      expect(Math.abs(normalCdf(z) - expected)).toBeLessThan(1e-14);
    }
  });

  test("erfc() keeps relative precision deep in the tail", () => {
    // Tail ratio against Simpson integration of e^{−t²}: erfc(x) = (2/√π) ∫_x^∞ e^{−t²} dt.
    for (const x of [2.5, 4, 6, 9]) {
      // Simpson error ≈ (h·2x)⁴/180 relative: 2e-14 with h = 8e-5 at x = 9.
      const expected = 2 / Math.sqrt(Math.PI) * simpson((t) => Math.exp(-t * t), x, x + 8, 100000);
      expect(Math.abs(erfc(x) / expected - 1)).toBeLessThan(1e-12);
    }
    expect(erfc(0)).toBe(1);
    expect(erfc(-Infinity)).toBe(2);
  });
});

describe("normalQuantile()", () => {
  test("normalQuantile() inverts normalCdf() from 1e-300 to 1 − 1e-16", () => {
    for (const p of [1e-300, 1e-100, 1e-20, 1e-5, 0.02, 0.3, 0.5, 0.8, 0.975, 0.99999, 1 - 1e-12]) {
      const z = normalQuantile(p);
      const back = z < 0 ? normalCdf(z) : 1 - normalCdf(-z);
      expect(Math.abs(back - p) / Math.min(p, 1 - p)).toBeLessThan(1e-12);
    }
    expect(normalQuantile(0.5)).toBe(0);
    expect(normalQuantile(0)).toBe(-Infinity);
    expect(normalQuantile(1)).toBe(Infinity);
    expect(normalQuantile(1.5)).toBeNaN();
  });
});

describe("lnGamma()", () => {
  test("lnGamma() gives ln (n − 1)! and ln √π", () => {
    // Γ(n) = (n − 1)!, Γ(1/2) = √π (analytic).
    let fact = 1;
    for (let n = 1; n <= 30; n++) {
      if (n > 1) fact *= n - 1;
      expect(Math.abs(lnGamma(n) - Math.log(fact))).toBeLessThan(
        1e-13 * Math.max(1, Math.log(fact)),
      );
    }
    expect(Math.abs(lnGamma(0.5) - 0.5 * Math.log(Math.PI))).toBeLessThan(1e-14);
  });
});

describe("incompleteBeta()", () => {
  test("incompleteBeta() matches closed forms for beta(1,1), beta(2,1), beta(1,2), beta(1/2,1/2)", () => {
    // I_x(1,1) = x; I_x(2,1) = x²; I_x(1,2) = 1 − (1 − x)²;
    // I_x(1/2,1/2) = (2/π) asin √x (arcsine law). Analytic. Tolerance 5e-15
    // (~20 ε): ln B(a, b) from three ln Γ values carries a few ulps.
    for (let i = 1; i < 100; i++) {
      const x = i / 100;
      expect(Math.abs(incompleteBeta(x, 1, 1) - x)).toBeLessThan(5e-15);
      expect(Math.abs(incompleteBeta(x, 2, 1) - x * x)).toBeLessThan(5e-15);
      expect(Math.abs(incompleteBeta(x, 1, 2) - (1 - (1 - x) ** 2))).toBeLessThan(5e-15);
      expect(Math.abs(incompleteBeta(x, 0.5, 0.5) - 2 / Math.PI * Math.asin(Math.sqrt(x))))
        .toBeLessThan(1e-14);
    }
  });

  test("incompleteBeta() matches Simpson integration of the beta density", () => {
    for (const [a, b] of [[2.5, 4], [3, 7.5], [10, 2]] as const) {
      const lnB = lnGamma(a) + lnGamma(b) - lnGamma(a + b);
      const pdf = (t: number) => Math.exp((a - 1) * Math.log(t) + (b - 1) * Math.log1p(-t) - lnB);
      for (const x of [0.05, 0.3, 0.6, 0.95]) {
        // Simpson's own error here is ~1e-12 (h⁴ f⁗/180 with h = x/20000).
        const expected = simpson(pdf, 0, x, 20000);
        expect(Math.abs(incompleteBeta(x, a, b) - expected)).toBeLessThan(1e-11);
      }
    }
  });

  test("inverseIncompleteBeta() inverts incompleteBeta()", () => {
    for (const [a, b] of [[0.867, 3.03], [2, 1], [0.5, 0.5], [30, 40]] as const) {
      for (const p of [1e-8, 0.01, 0.25, 0.5, 0.9, 0.999999]) {
        const x = inverseIncompleteBeta(p, a, b);
        // x is known to an ulp at best, which moves I_x by ε·x·pdf(x): allow 16 of those.
        const pdf = Math.exp(logPriorDensity({ kind: "beta", a, b }, x));
        expect(Math.abs(incompleteBeta(x, a, b) - p)).toBeLessThan(
          1e-12 + 16 * Number.EPSILON * x * pdf,
        );
      }
    }
  });
});

describe("logPriorDensity()", () => {
  test("logPriorDensity() integrates to one over the support", () => {
    for (const prior of PRIORS) {
      let [lo, hi] = priorSupport(prior);
      if (prior.kind === "normal") {
        [lo, hi] = [prior.mu - 12 * prior.sigma, prior.mu + 12 * prior.sigma];
      }
      let total: number;
      if (prior.kind === "loguniform") {
        // Substitute x = eᵘ (dx = eᵘ du) to integrate smoothly.
        total = simpson(
          (u) => Math.exp(logPriorDensity(prior, Math.exp(u)) + u),
          Math.log(lo),
          Math.log(hi),
          2000,
        );
      } else if (prior.kind === "beta" && prior.a < 1) {
        // Substitute x = t^{1/a} to remove the x^{a−1} singularity at 0.
        const a = prior.a;
        // The integrand is smooth and finite at t = 0; evaluate it just above 0 there.
        const g = (t: number) => {
          const s = Math.max(t, 1e-200);
          return Math.exp(logPriorDensity(prior, s ** (1 / a)) + (1 / a - 1) * Math.log(s)) / a;
        };
        total = simpson(g, 0, 1, 20000);
      } else {
        total = simpson((x) => Math.exp(logPriorDensity(prior, x)), lo, hi, 20000);
      }
      expect(Math.abs(total - 1)).toBeLessThan(1e-9);
    }
  });

  test("logPriorDensity() is the derivative of priorCdf()", () => {
    // Central difference of the CDF against the density (independent of normalisation code paths).
    for (const prior of PRIORS) {
      for (const u of [0.1, 0.35, 0.6, 0.9]) {
        const x = priorQuantile(prior, u);
        const h = 1e-5 * Math.max(1, Math.abs(x));
        const slope = (priorCdf(prior, x + h) - priorCdf(prior, x - h)) / (2 * h);
        expect(Math.abs(slope / Math.exp(logPriorDensity(prior, x)) - 1)).toBeLessThan(1e-6);
      }
    }
  });

  test("logPriorDensity() is -Infinity outside the support and for NaN", () => {
    expect(logPriorDensity({ kind: "uniform", lo: 0, hi: 1 }, 1.5)).toBe(-Infinity);
    expect(logPriorDensity({ kind: "loguniform", lo: 1, hi: 10 }, 0.5)).toBe(-Infinity);
    expect(logPriorDensity({ kind: "beta", a: 2, b: 2 }, -0.1)).toBe(-Infinity);
    expect(logPriorDensity({ kind: "truncnormal", mu: 0, sigma: 1, lo: 0, hi: 1 }, 1.01)).toBe(
      -Infinity,
    );
    expect(logPriorDensity({ kind: "normal", mu: 0, sigma: 1 }, NaN)).toBe(-Infinity);
    expect(logPriorDensity({ kind: "fixed", value: 2 }, 2)).toBe(0);
    expect(logPriorDensity({ kind: "fixed", value: 2 }, 2.1)).toBe(-Infinity);
    // Uniform density is 1/(hi − lo) (analytic).
    expect(logPriorDensity({ kind: "uniform", lo: 2, hi: 6 }, 3)).toBe(-Math.log(4));
  });
});

describe("priorQuantile()", () => {
  test("priorQuantile() inverts priorCdf() for every kind", () => {
    for (const prior of PRIORS) {
      for (const u of [0.001, 0.2, 0.5, 0.77, 0.999]) {
        const x = priorQuantile(prior, u);
        expect(Math.abs(priorCdf(prior, x) - u)).toBeLessThan(1e-11);
      }
    }
    expect(priorQuantile({ kind: "fixed", value: 3 }, 0.4)).toBe(3);
    expect(priorQuantile({ kind: "uniform", lo: 0, hi: 1 }, 2)).toBeNaN();
  });
});

describe("validatePrior()", () => {
  test("validatePrior() throws RangeError for impossible parameters", () => {
    const bad: Prior[] = [
      { kind: "uniform", lo: 1, hi: 1 },
      { kind: "uniform", lo: 0, hi: Infinity },
      { kind: "loguniform", lo: 0, hi: 1 },
      { kind: "loguniform", lo: -1, hi: 1 },
      { kind: "normal", mu: 0, sigma: 0 },
      { kind: "truncnormal", mu: 0, sigma: -1, lo: 0, hi: 1 },
      { kind: "truncnormal", mu: 0, sigma: 1, lo: 2, hi: 1 },
      { kind: "beta", a: 0, b: 1 },
      { kind: "beta", a: 1, b: -2 },
      { kind: "fixed", value: NaN },
    ];
    for (const prior of bad) expect(() => validatePrior(prior)).toThrow(RangeError);
    expect(() => validatePrior({ kind: "uniform", lo: 2, hi: 1 })).toThrow(
      "Cannot use uniform prior as lo must be below hi: lo=2, hi=1",
    );
    for (const prior of PRIORS) expect(() => validatePrior(prior)).not.toThrow();
  });
});
