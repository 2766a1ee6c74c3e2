import { describe, expect, test } from "vitest";
import {
  binomialBand,
  defaultBins,
  rankCounts,
  rankUniformity,
  sbcRank,
  validateBinning,
} from "../../src/calibrate/mod.ts";
import { erfc } from "../../src/model/mod.ts";
import { createRng } from "../../samplers/mod.ts";

describe("sbcRank()", () => {
  test("sbcRank() counts the draws below the truth", () => {
    const draws = Float64Array.from([0.5, -1, 3, 2, 7]);
    expect(sbcRank(2.5, draws)).toBe(3);
    expect(sbcRank(-5, draws)).toBe(0);
    expect(sbcRank(10, draws)).toBe(5);
    expect(sbcRank(2.5, draws, { count: 2 })).toBe(2);
  });

  test("sbcRank() splits ties by the tie-break deviate", () => {
    // 1 draw below, 3 tied: rank = 1 + ⌊u · 4⌋ ∈ {1, …, 4}.
    const draws = Float64Array.from([0, 1, 1, 1]);
    expect(sbcRank(1, draws, { tieBreak: 0 })).toBe(1);
    expect(sbcRank(1, draws, { tieBreak: 0.3 })).toBe(2);
    expect(sbcRank(1, draws, { tieBreak: 0.999 })).toBe(4);
  });

  test("sbcRank() returns NaN for NaN truth or draws and rejects a bad count", () => {
    expect(sbcRank(NaN, Float64Array.from([1]))).toBeNaN();
    expect(sbcRank(0, Float64Array.from([1, NaN]))).toBeNaN();
    expect(() => sbcRank(0, Float64Array.from([1]), { count: 2 })).toThrow(RangeError);
  });

  test("sbcRank() of exchangeable draws is uniform on 0..L", () => {
    // Talts et al. 2018 (arXiv:1804.06788), Theorem 1: the truth and L draws
    // i.i.d. from one law give ranks uniform on 0..L. 4000 replications of L = 9,
    // 10 bins: each frequency 0.1 ± 4·√(0.1·0.9/4000) = ±0.019 (4 sd).
    const rng = createRng("rank-uniform");
    const counts = new Float64Array(10);
    const draws = new Float64Array(9);
    const n = 4000;
    for (let i = 0; i < n; i++) {
      for (let l = 0; l < 9; l++) draws[l] = rng.normal();
      const r = sbcRank(rng.normal(), draws);
      counts[r] = counts[r]! + 1;
    }
    for (const c of counts) expect(Math.abs(c / n - 0.1)).toBeLessThan(4 * Math.sqrt(0.09 / n));
  });
});

describe("rankCounts()", () => {
  test("rankCounts() puts (L + 1)/B consecutive ranks in each bin", () => {
    const ranks = Array.from({ length: 100 }, (_, r) => r);
    const counts = rankCounts(ranks, { draws: 99, bins: 20 });
    expect(Array.from(counts)).toEqual(new Array(20).fill(5));
    expect(Array.from(rankCounts([0, 4, 5, 99], { draws: 99, bins: 20 }))).toEqual([
      2,
      1,
      ...new Array(17).fill(0),
      1,
    ]);
  });

  test("rankCounts() rejects ranks outside 0..L and bins that do not divide L + 1", () => {
    expect(() => rankCounts([100], { draws: 99, bins: 20 })).toThrow(RangeError);
    expect(() => rankCounts([1.5], { draws: 99, bins: 20 })).toThrow(RangeError);
    expect(() => validateBinning({ draws: 99, bins: 7 })).toThrow(RangeError);
    expect(() => validateBinning({ draws: 0, bins: 1 })).toThrow(RangeError);
  });
});

describe("rankUniformity()", () => {
  test("rankUniformity() gives p = 1 for a perfectly flat histogram", () => {
    const ranks = Array.from({ length: 200 }, (_, i) => i % 100);
    const t = rankUniformity(ranks, { draws: 99, bins: 20 });
    expect(t.chiSquare).toBe(0);
    expect(t.df).toBe(19);
    expect(t.pValue).toBe(1);
  });

  test("rankUniformity() computes Pearson's statistic and its chi-square tail", () => {
    // L = 1, B = 2; 30 ranks 0 and 10 ranks 1: E = 20, X² = (10² + 10²)/20 = 10,
    // p = Pr(χ²(1) > 10) = erfc(√5) (χ²(1) = Z², A&S 26.4.20 with ν = 1).
    const ranks = [...new Array(30).fill(0), ...new Array(10).fill(1)];
    const t = rankUniformity(ranks, { draws: 1, bins: 2 });
    expect(t.chiSquare).toBeCloseTo(10, 12);
    expect(Math.abs(t.pValue - erfc(Math.sqrt(5)))).toBeLessThan(1e-12 * erfc(Math.sqrt(5)));
  });

  test("rankUniformity() p-values of uniform ranks are uniform", () => {
    // 1000 replications of N = 200 uniform ranks (L = 99, B = 20): Pr(p < 0.05)
    // = 0.05 up to the χ² approximation (E = 10 per bin), so the fraction is
    // 0.05 ± 4·√(0.05·0.95/1000) = ±0.028; likewise Pr(p < 0.5) = 0.5 ± 0.063.
    const rng = createRng("uniformity-null");
    let below05 = 0;
    let below50 = 0;
    const reps = 1000;
    const ranks = new Array<number>(200);
    for (let i = 0; i < reps; i++) {
      for (let j = 0; j < 200; j++) ranks[j] = Math.floor(rng.uniform() * 100);
      const p = rankUniformity(ranks, { draws: 99, bins: 20 }).pValue;
      if (p < 0.05) below05++;
      if (p < 0.5) below50++;
    }
    expect(Math.abs(below05 / reps - 0.05)).toBeLessThan(4 * Math.sqrt(0.05 * 0.95 / reps));
    expect(Math.abs(below50 / reps - 0.5)).toBeLessThan(4 * Math.sqrt(0.25 / reps));
  });
});

describe("binomialBand()", () => {
  test("binomialBand() finds the central interval of Binomial(10, 1/2)", () => {
    // Pr(X ≤ 1) = 11/1024 ≈ 0.0107 ≤ 0.05 < Pr(X ≤ 2) = 56/1024 ≈ 0.0547,
    // so at level 0.9 the band is [2, 8] (symmetric).
    expect(binomialBand(10, 0.5, 0.9)).toEqual([2, 8]);
  });

  test("binomialBand() holds at least the level with each tail at most half the rest", () => {
    // Independent pmf by the recursion pmf(k+1) = pmf(k) (n−k)/(k+1) · p/(1−p).
    const n = 200;
    const p = 0.05;
    const pmf = new Float64Array(n + 1);
    pmf[0] = Math.pow(1 - p, n);
    for (let k = 0; k < n; k++) pmf[k + 1] = (pmf[k]! * (n - k) * p) / ((k + 1) * (1 - p));
    const [lo, hi] = binomialBand(n, p, 0.99);
    const sum = (a: number, b: number) => {
      let s = 0;
      for (let k = a; k <= b; k++) s += pmf[k]!;
      return s;
    };
    expect(sum(0, lo - 1)).toBeLessThanOrEqual(0.005 + 1e-12);
    expect(sum(0, lo)).toBeGreaterThan(0.005);
    expect(sum(hi + 1, n)).toBeLessThanOrEqual(0.005 + 1e-12);
    expect(sum(hi, n)).toBeGreaterThan(0.005);
  });
});

describe("defaultBins()", () => {
  test("defaultBins() picks the largest divisor of L + 1 up to 20 with five expected per bin", () => {
    expect(defaultBins(200, 99)).toBe(20);
    expect(defaultBins(40, 99)).toBe(5);
    expect(defaultBins(3, 99)).toBe(2);
    expect(defaultBins(1000, 63)).toBe(16);
  });
});
