import seedrandom from "seedrandom";
import { describe, expect, test } from "vitest";
import { type Prior, priorCdf } from "../../src/model/priors.ts";
import {
  fromSqrtEccentricity,
  internalLogPrior,
  logJacobian,
  type ScalarTransform,
  SQRT_ECC_LOG_JACOBIAN,
  sqrtEccentricityLogPrior,
  toInternal,
  toPhysical,
  toSqrtEccentricity,
} from "../../src/model/transforms.ts";

/**
 * Random-walk Metropolis (Metropolis et al. 1953) written here, on the
 * sampler's internal space, with Gaussian proposals (Box–Muller). Returns every
 * `thin`-th state after `burn` steps.
 */
function metropolis(
  logTarget: (x: Float64Array) => number,
  start: number[],
  options: { step: number[]; draws: number; thin: number; burn: number; seed: string },
): Float64Array[] {
  const rng = seedrandom(options.seed);
  const gauss = () => Math.sqrt(-2 * Math.log(1 - rng())) * Math.cos(2 * Math.PI * rng());
  let x = Float64Array.from(start);
  let lp = logTarget(x);
  const out: Float64Array[] = [];
  const total = options.burn + options.draws * options.thin;
  for (let it = 1; it <= total; it++) {
    const y = x.map((v, i) => v + options.step[i]! * gauss());
    const ly = logTarget(y);
    if (Math.log(rng()) < ly - lp) {
      x = y;
      lp = ly;
    }
    if (it > options.burn && (it - options.burn) % options.thin === 0) {
      out.push(Float64Array.from(x));
    }
  }
  return out;
}

/** Kolmogorov–Smirnov statistic D = sup |F_n − F|. */
function ksStatistic(sample: number[], cdf: (x: number) => number): number {
  const s = [...sample].sort((a, b) => a - b);
  const n = s.length;
  let d = 0;
  for (let i = 0; i < n; i++) {
    const f = cdf(s[i]!);
    d = Math.max(d, f - i / n, (i + 1) / n - f);
  }
  return d;
}

// Draws are thinned by 40 (well beyond the autocorrelation time of these 1- and
// 2-D random walks, ~5–15 steps) so they are treated as independent. Critical
// value at α = 0.001: D > 1.949/√n (Kolmogorov's limiting distribution,
// K(1.949) = 0.999; e.g. Press et al. 2007, Numerical Recipes 3rd ed., §14.3.3).
const DRAWS = 2000;
const THIN = 40;
const KS_CRITICAL = 1.949 / Math.sqrt(DRAWS);

const CASES: { prior: Prior; kind: ScalarTransform; start: number; step: number }[] = [
  { prior: { kind: "uniform", lo: -3, hi: 4 }, kind: "identity", start: 0, step: 3 },
  { prior: { kind: "loguniform", lo: 0.5, hi: 5000 }, kind: "log", start: 2, step: 4 },
  { prior: { kind: "normal", mu: 10, sigma: 2 }, kind: "identity", start: 10, step: 5 },
  {
    prior: { kind: "truncnormal", mu: 1, sigma: 3, lo: 0.2, hi: 9 },
    kind: "log",
    start: 1,
    step: 1.5,
  },
  {
    prior: { kind: "truncnormal", mu: 0, sigma: 1, lo: -1, hi: 2 },
    kind: "identity",
    start: 0,
    step: 1.5,
  },
  { prior: { kind: "beta", a: 2, b: 5 }, kind: "identity", start: 0.3, step: 0.4 },
  { prior: { kind: "uniform", lo: 1, hi: 300 }, kind: "log", start: 3, step: 3 },
  { prior: { kind: "normal", mu: 20, sigma: 4 }, kind: "log", start: 3, step: 0.5 },
];

describe("internalLogPrior()", () => {
  for (const [index, c] of CASES.entries()) {
    test(`internalLogPrior() samples reproduce the ${c.prior.kind} prior through the ${c.kind} transform`, () => {
      const draws = metropolis(
        (u) => internalLogPrior(c.prior, c.kind, u[0]!),
        [toInternal(c.kind, c.start)],
        { step: [c.step], draws: DRAWS, thin: THIN, burn: 2000, seed: `prior-${index}` },
      );
      const physical = draws.map((u) => toPhysical(c.kind, u[0]!));
      const d = ksStatistic(physical, (x) => priorCdf(c.prior, x));
      expect(d).toBeLessThan(KS_CRITICAL);
    });
  }

  test("internalLogPrior() without the log-Jacobian fails the same KS test (negative control)", () => {
    // Dropping ln|dx/du| = u turns a loguniform prior into a uniform one in
    // ln x times 1/x — visibly wrong; the test must detect it.
    const prior: Prior = { kind: "loguniform", lo: 0.5, hi: 5000 };
    const draws = metropolis(
      (u) => internalLogPrior(prior, "log", u[0]!) - logJacobian("log", u[0]!),
      [Math.log(2)],
      { step: [4], draws: DRAWS, thin: THIN, burn: 2000, seed: "negative" },
    );
    const d = ksStatistic(draws.map((u) => Math.exp(u[0]!)), (x) => priorCdf(prior, x));
    expect(d).toBeGreaterThan(KS_CRITICAL);
  });
});

describe("sqrtEccentricityLogPrior()", () => {
  const eccentricityPrior: Prior = { kind: "beta", a: 0.867, b: 3.03 };
  const argPeriastronPrior: Prior = { kind: "uniform", lo: 0, hi: 2 * Math.PI };
  const pair = new Float64Array(2);

  test("sqrtEccentricityLogPrior() samples reproduce the e and ω priors", () => {
    // Beta(0.867, 3.03) is the eccentricity prior of Kipping 2013, MNRAS 434, L51
    // (values recalled from memory; any beta would do here).
    const draws = metropolis(
      (u) => sqrtEccentricityLogPrior(u[0]!, u[1]!, { eccentricityPrior, argPeriastronPrior }),
      [0.2, 0.1],
      { step: [0.5, 0.5], draws: DRAWS, thin: THIN, burn: 2000, seed: "pair" },
    );
    const es: number[] = [];
    const ws: number[] = [];
    for (const u of draws) {
      fromSqrtEccentricity(u[0]!, u[1]!, { out: pair, omegaLow: 0 });
      es.push(pair[0]!);
      ws.push(pair[1]!);
    }
    expect(ksStatistic(es, (x) => priorCdf(eccentricityPrior, x))).toBeLessThan(KS_CRITICAL);
    expect(ksStatistic(ws, (x) => priorCdf(argPeriastronPrior, x))).toBeLessThan(KS_CRITICAL);
    expect(Math.min(...ws)).toBeGreaterThanOrEqual(0);
    expect(Math.max(...ws)).toBeLessThan(2 * Math.PI);
  });

  test("sqrtEccentricityLogPrior() with a wrong Jacobian fails the KS test (negative control)", () => {
    // A wrong Jacobian (an extra factor e, as if the Jacobian were not constant)
    // must make the e marginal fail.
    const draws = metropolis(
      (u) => {
        const e = u[0]! * u[0]! + u[1]! * u[1]!;
        return sqrtEccentricityLogPrior(u[0]!, u[1]!, { eccentricityPrior, argPeriastronPrior }) +
          Math.log(e);
      },
      [0.2, 0.1],
      { step: [0.5, 0.5], draws: DRAWS, thin: THIN, burn: 2000, seed: "pair-negative" },
    );
    const es = draws.map((u) => u[0]! * u[0]! + u[1]! * u[1]!);
    expect(ksStatistic(es, (x) => priorCdf(eccentricityPrior, x))).toBeGreaterThan(KS_CRITICAL);
  });

  test("SQRT_ECC_LOG_JACOBIAN is ln of the numerical Jacobian determinant", () => {
    // Central differences of (h, k) → (e, ω), independent of the derivation.
    const out = new Float64Array(2);
    for (const [h, k] of [[0.3, 0.2], [-0.5, 0.1], [0.05, -0.7]] as const) {
      const eps = 1e-6;
      const at = (hh: number, kk: number) => {
        fromSqrtEccentricity(hh, kk, { out, omegaLow: -Math.PI });
        return [out[0]!, out[1]!];
      };
      const [e1, w1] = at(h + eps, k);
      const [e0, w0] = at(h - eps, k);
      const [e3, w3] = at(h, k + eps);
      const [e2, w2] = at(h, k - eps);
      const det = ((e1! - e0!) * (w3! - w2!) - (e3! - e2!) * (w1! - w0!)) / (4 * eps * eps);
      expect(Math.abs(Math.log(Math.abs(det)) - SQRT_ECC_LOG_JACOBIAN)).toBeLessThan(1e-8);
    }
  });

  test("fromSqrtEccentricity() inverts toSqrtEccentricity() and wraps ω into the window", () => {
    const out = new Float64Array(2);
    for (const e of [0.01, 0.4, 0.95]) {
      for (const w of [0.1, 3, 6.2]) {
        toSqrtEccentricity(e, w, { out: pair });
        fromSqrtEccentricity(pair[0]!, pair[1]!, { out, omegaLow: 0 });
        expect(out[0]).toBeCloseTo(e, 14);
        expect(out[1]).toBeCloseTo(w, 12);
      }
    }
    fromSqrtEccentricity(-0.5, -0.1, { out });
    expect(out[1]!).toBeGreaterThanOrEqual(-Math.PI);
    expect(out[1]!).toBeLessThan(Math.PI);
    expect(sqrtEccentricityLogPrior(1, 0.1, { eccentricityPrior, argPeriastronPrior })).toBe(
      -Infinity,
    );
  });
});

describe("toPhysical()", () => {
  test("toPhysical() inverts toInternal()", () => {
    for (const x of [1e-9, 0.3, 7, 1e12]) {
      expect(Math.abs(toPhysical("log", toInternal("log", x)) / x - 1)).toBeLessThan(1e-14);
      expect(toPhysical("identity", toInternal("identity", -x))).toBe(-x);
    }
    expect(logJacobian("identity", 3)).toBe(0);
  });
});
