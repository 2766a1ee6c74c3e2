import { describe, expect, test } from "vitest";
import { essBulk, essMean, essQuantile, essTail } from "../../src/diagnostics/mod.ts";
import { ar1View } from "./_chains.ts";

// Analytic target: an AR(1) chain has tau = (1 + rho)/(1 - rho) (geometric
// series of rho(t) = rho^|t|; Brockwell & Davis 1991, Time Series: Theory and
// Methods, 2nd ed., Thm 7.1.1, recalled from memory), so the ESS of S draws
// is S (1 - rho)/(1 + rho) (Vehtari et al. 2021, arXiv:1903.08008, sec. 3.2).
// Expected error: Geyer's truncated sum over K lags has
// sd(tau)/tau ≈ sqrt(2(2K+1)/S) (Sokal 1997, sec. 3, recalled from memory).
// K is not returned, so we use K = 10 tau + 10, an upper bound for these
// lengths: the pair sums P_k = (1 + rho) rho^(2k) fall to the noise level
// sqrt(tau/S) well before lag 10 tau. Tolerance = 4 sd on tau, mapped to ESS.
function essWindow(rho: number, total: number): [number, number] {
  const tau = (1 + rho) / (1 - rho);
  const k = 10 * tau + 10;
  const sd = tau * Math.sqrt((2 * (2 * k + 1)) / total);
  return [total / (tau + 4 * sd), total / Math.max(tau - 4 * sd, 1e-9)];
}

describe("essMean()", () => {
  const cases: [number, number, number][] = [
    [0, 10000, 8],
    [0.5, 10000, 8],
    [0.9, 20000, 16],
    [0.99, 100000, 32],
  ];
  for (const [rho, steps, walkers] of cases) {
    test(`essMean() recovers S(1-rho)/(1+rho) for AR(1) rho=${rho}`, () => {
      const ess = essMean(ar1View(rho, steps, walkers, `ess-${rho}`), 0);
      const [lo, hi] = essWindow(rho, steps * walkers);
      expect(ess).toBeGreaterThan(lo);
      expect(ess).toBeLessThan(hi);
    });
  }

  test("essMean() exceeds the number of draws for anticorrelated AR(1) rho=-0.3", () => {
    // tau = 0.7/1.3 = 0.538, so ESS ≈ 1.86 S. For tau < 1 Sokal's relative
    // formula is not apt; instead the sd of each rho-hat(t) is about
    // sqrt((1 + rho^2)/((1 - rho^2) S)) (Bartlett 1946, J. R. Stat. Soc. B 8,
    // 27, large-lag form, recalled from memory) and a sum over K <= 10 lags
    // has sd(tau) <= 2 K that (Cauchy–Schwarz). Tolerance 4 sd.
    const rho = -0.3;
    const steps = 20000;
    const walkers = 8;
    const total = steps * walkers;
    const ess = essMean(ar1View(rho, steps, walkers, "ess-neg"), 0);
    const tau = (1 + rho) / (1 - rho);
    const sdTau = 2 * 10 * Math.sqrt((1 + rho * rho) / ((1 - rho * rho) * total));
    expect(ess).toBeGreaterThan(total);
    expect(ess).toBeGreaterThan(total / (tau + 4 * sdTau));
    expect(ess).toBeLessThan(total / (tau - 4 * sdTau));
  });
});

describe("essBulk()", () => {
  test("essBulk() matches the AR(1) ESS within its expected error for rho=0.9", () => {
    // Rank normalisation is a monotone map of a Gaussian AR(1) chain; its
    // autocorrelation differs little from the raw one for a Gaussian process
    // (the rank-normal transform of a Gaussian is nearly the identity), so
    // the same tolerance applies.
    const ess = essBulk(ar1View(0.9, 20000, 16, "bulk-0.9"), 0);
    const [lo, hi] = essWindow(0.9, 20000 * 16);
    expect(ess).toBeGreaterThan(lo);
    expect(ess).toBeLessThan(hi);
  });

  test("essBulk() is invariant under a strictly increasing transform", () => {
    // Ranks are unchanged by exp(), so the bulk ESS must be identical
    // (Vehtari et al. 2021, sec. 4.1: rank normalisation).
    const view = ar1View(0.7, 3000, 6, "bulk-exp");
    const transformed = { ...view, data: view.data.map(Math.exp) };
    expect(essBulk(transformed, 0)).toBe(essBulk(view, 0));
  });
});

describe("essTail()", () => {
  test("essTail() is the smaller of the 5 % and 95 % quantile ESS", () => {
    const view = ar1View(0.6, 4000, 8, "tail-min");
    const q05 = essQuantile(view, 0, { prob: 0.05 });
    const q95 = essQuantile(view, 0, { prob: 0.95 });
    expect(essTail(view, 0)).toBe(Math.min(q05, q95));
  });

  test("essQuantile() of iid draws is near the number of draws", () => {
    // Indicators of iid draws are iid Bernoulli(p): tau = 1, ESS = S;
    // tolerance from the same Sokal bound with K = 20 lags.
    const total = 20000 * 4;
    const ess = essQuantile(ar1View(0, 20000, 4, "tail-iid"), 0, { prob: 0.05 });
    const sd = Math.sqrt((2 * (2 * 20 + 1)) / total);
    expect(Math.abs(ess / total - 1)).toBeLessThan(4 * sd);
  });

  test("essQuantile() rejects a probability outside (0, 1)", () => {
    const view = ar1View(0, 100, 2, "tail-prob");
    expect(() => essQuantile(view, 0, { prob: 1 })).toThrow(RangeError);
    expect(() => essQuantile(view, 0, { prob: 1 })).toThrow(/prob=1/);
  });
});
