import { describe, expect, test } from "vitest";
import {
  atLeastMark,
  correlation,
  densityLevels,
  displayRange,
  etaSeconds,
  histogram,
  histogram2d,
  LOWER_68,
  progressFraction,
  quantileSorted,
  rhatMark,
  smoothGrid,
  sortedFinite,
  summarizeSorted,
  UPPER_68,
  worstMark,
} from "../../tui/stats.ts";
import { seededNormal } from "./_fixtures.ts";

describe("quantileSorted", () => {
  test("quantileSorted() matches Hyndman & Fan definition 7 on hand-computed cases", () => {
    // Hyndman & Fan 1996, Am. Stat. 50(4), 361, Definition 7: h = (n-1)p,
    // Q = x[floor h] + (h - floor h)(x[floor h + 1] - x[floor h]). Hand computation:
    // x = 1..10, p = 0.16: h = 1.44, Q = 2 + 0.44 * (3 - 2) = 2.44.
    const x = Float64Array.from({ length: 10 }, (_, i) => i + 1);
    expect(quantileSorted(x, 0.16)).toBeCloseTo(2.44, 12);
    // p = 0.5: h = 4.5, Q = 5 + 0.5 = 5.5 (the usual even-n median).
    expect(quantileSorted(x, 0.5)).toBe(5.5);
    expect(quantileSorted(x, 0)).toBe(1);
    expect(quantileSorted(x, 1)).toBe(10);
    // Sorted [1, 1, 2, 3, 4, 5, 6, 9], p = 0.25: h = 1.75, Q = 1 + 0.75 * (2 - 1) = 1.75.
    const y = sortedFinite([3, 1, 4, 1, 5, 9, 2, 6]);
    expect(quantileSorted(y, 0.25)).toBeCloseTo(1.75, 12);
  });

  test("quantileSorted() returns NaN for an empty array or p outside [0, 1]", () => {
    expect(quantileSorted(new Float64Array(0), 0.5)).toBeNaN();
    expect(quantileSorted(Float64Array.of(1, 2), -0.1)).toBeNaN();
    expect(quantileSorted(Float64Array.of(1, 2), 1.1)).toBeNaN();
    expect(quantileSorted(Float64Array.of(1, 2), NaN)).toBeNaN();
  });

  test("sortedFinite() drops NaN and infinities and sorts", () => {
    expect(Array.from(sortedFinite([3, NaN, -1, Infinity, 2, -Infinity]))).toEqual([-1, 2, 3]);
  });
});

describe("68% interval", () => {
  test("LOWER_68 and UPPER_68 equal the normal CDF at -1 and +1", () => {
    // Independent computation: Simpson's rule on the standard normal density
    // from -12 to -1 (the tail beyond -12 is below 1e-32).
    const pdf = (z: number) => Math.exp(-z * z / 2) / Math.sqrt(2 * Math.PI);
    const n = 20000;
    const a = -12;
    const b = -1;
    const h = (b - a) / n;
    let sum = pdf(a) + pdf(b);
    for (let i = 1; i < n; i++) sum += (i % 2 === 1 ? 4 : 2) * pdf(a + i * h);
    const phiMinus1 = (sum * h) / 3;
    expect(LOWER_68).toBeCloseTo(phiMinus1, 12);
    expect(UPPER_68).toBeCloseTo(1 - phiMinus1, 12);
  });

  test("summarizeSorted() finds median 0 and interval near -1, +1 for normal draws", () => {
    // Fixed seed. Monte Carlo error of a sample p-quantile: sqrt(p(1-p)/n) / pdf(z_p)
    // (asymptotic normality of sample quantiles, e.g. van der Vaart 1998, Asymptotic
    // Statistics, Cor. 21.5; recalled from memory). n = 20000: median sd = 0.0089,
    // 16% quantile sd = 0.0107; tolerance 4 sd.
    const z = seededNormal(42);
    const draws = Float64Array.from({ length: 20000 }, () => z());
    const s = summarizeSorted(sortedFinite(draws));
    expect(s.count).toBe(20000);
    expect(Math.abs(s.median)).toBeLessThan(4 * 0.0089);
    expect(Math.abs(s.lower + 1)).toBeLessThan(4 * 0.0107);
    expect(Math.abs(s.upper - 1)).toBeLessThan(4 * 0.0107);
  });

  test("summarizeSorted() gives NaN figures for no draws", () => {
    const s = summarizeSorted(new Float64Array(0));
    expect(s.count).toBe(0);
    expect(s.median).toBeNaN();
    expect(s.lower).toBeNaN();
  });
});

describe("histogram", () => {
  test("histogram() puts values in half-open bins with the right edge in the last bin", () => {
    // Hand count over [0, 4] with 4 bins of width 1:
    // [0,1): 0, 0.5; [1,2): 1, 1.5; [2,3): 2, 2.5; [3,4]: 3, 3.9, 4. Out of range and NaN dropped.
    const values = [0, 0.5, 1, 1.5, 2, 2.5, 3, 3.9, 4, -0.1, 4.1, NaN];
    expect(Array.from(histogram(values, 4, { min: 0, max: 4 }))).toEqual([2, 2, 2, 3]);
  });

  test("histogram() defaults to the finite range and handles all-equal values", () => {
    expect(Array.from(histogram([1, 2, 3, Infinity], 2))).toEqual([1, 2]);
    expect(Array.from(histogram([5, 5, 5], 3))).toEqual([3, 0, 0]);
    expect(histogram([], 3).length).toBe(3);
  });

  test("histogram2d() places pairs by column and row with row 0 at the lowest y", () => {
    const counts = histogram2d([0.1, 0.9, 0.9, 0.2], [0.1, 0.1, 0.9, 0.95], {
      columns: 2,
      rows: 2,
      xRange: [0, 1],
      yRange: [0, 1],
    });
    // (0.1,0.1) -> row 0 col 0; (0.9,0.1) -> row 0 col 1; (0.9,0.9) -> row 1 col 1; (0.2,0.95) -> row 1 col 0.
    expect(Array.from(counts)).toEqual([1, 1, 1, 1]);
    const skewed = histogram2d([0.1, 0.1, 0.9], [0.9, 0.8, 0.1], {
      columns: 2,
      rows: 2,
      xRange: [0, 1],
      yRange: [0, 1],
    });
    expect(Array.from(skewed)).toEqual([0, 1, 2, 0]);
  });

  test("displayRange() drops the outer 0.5% at each end and widens a zero span", () => {
    const x = sortedFinite(Float64Array.from({ length: 201 }, (_, i) => i));
    // h = 200 * 0.005 = 1 and 200 * 0.995 = 199 exactly.
    expect(displayRange(x)).toEqual([1, 199]);
    const [lo, hi] = displayRange(Float64Array.of(2, 2, 2));
    expect(lo).toBeLessThan(2);
    expect(hi).toBeGreaterThan(2);
  });
});

describe("densityLevels", () => {
  test("densityLevels() marks the highest-density regions on a hand-computed grid", () => {
    // Counts 10, 5, 3, 1, 1, 0 (total 20). The 50% region needs 10 counts: only the cell with 10.
    // The 90% region needs 18: cells 10 + 5 + 3. Levels count the regions a cell is in.
    const levels = densityLevels([1, 10, 0, 3, 5, 1], [0.5, 0.9]);
    expect(Array.from(levels)).toEqual([0, 2, 0, 1, 1, 0]);
  });

  test("densityLevels() returns zeros for an empty grid", () => {
    expect(Array.from(densityLevels([0, 0], [0.5]))).toEqual([0, 0]);
  });

  test("smoothGrid() keeps the total of a grid away from its edges and spreads a spike", () => {
    const counts = new Float64Array(25);
    counts[12] = 16; // centre of a 5 x 5 grid
    const s = smoothGrid(counts, 5, 5);
    // Binomial kernel [1 2 1]^T [1 2 1] / 16 applied to a spike of 16 reproduces the kernel.
    expect(s[12]).toBeCloseTo(4, 12);
    expect(s[11]).toBeCloseTo(2, 12);
    expect(s[6]).toBeCloseTo(1, 12);
    expect(s.reduce((a, b) => a + b, 0)).toBeCloseTo(16, 12);
  });
});

describe("correlation", () => {
  test("correlation() is +1, -1 on exact lines and 0.5 on a hand-computed case", () => {
    expect(correlation([1, 2, 3, 4], [3, 5, 7, 9])).toBeCloseTo(1, 14);
    expect(correlation([1, 2, 3], [3, 2, 1])).toBeCloseTo(-1, 14);
    // x = 1,2,3; y = 1,3,2: sxy = 1, sxx = syy = 2, r = 1 / 2.
    expect(correlation([1, 2, 3], [1, 3, 2])).toBeCloseTo(0.5, 14);
    expect(correlation([1], [2])).toBeNaN();
    expect(correlation([1, 1, 1], [1, 2, 3])).toBeNaN();
  });
});

describe("etaSeconds", () => {
  test("etaSeconds() divides the steps left by the speed", () => {
    // (20000 - 12000) / 400 = 20 s.
    expect(etaSeconds(12000, 20000, 400)).toBe(20);
    expect(etaSeconds(20000, 20000, 400)).toBe(0);
    expect(etaSeconds(100, 20000, NaN)).toBeNaN();
    expect(etaSeconds(100, 20000, 0)).toBeNaN();
  });

  test("progressFraction() clamps to [0, 1]", () => {
    expect(progressFraction(5000, 20000)).toBe(0.25);
    expect(progressFraction(30000, 20000)).toBe(1);
    expect(progressFraction(5, 0)).toBe(0);
  });
});

describe("marks", () => {
  test("rhatMark() is good to the threshold, warns up to 1.1 and is bad beyond", () => {
    expect(rhatMark(1.005, 1.01)).toBe("good");
    expect(rhatMark(1.01, 1.01)).toBe("good");
    expect(rhatMark(1.05, 1.01)).toBe("warn");
    expect(rhatMark(1.3, 1.01)).toBe("bad");
    expect(rhatMark(NaN, 1.01)).toBe("unknown");
  });

  test("atLeastMark() is good at the threshold, warns from half of it", () => {
    expect(atLeastMark(400, 400)).toBe("good");
    expect(atLeastMark(260, 400)).toBe("warn");
    expect(atLeastMark(45, 400)).toBe("bad");
    expect(atLeastMark(NaN, 400)).toBe("unknown");
  });

  test("worstMark() orders bad > warn > unknown > good", () => {
    expect(worstMark([])).toBe("good");
    expect(worstMark(["good", "unknown"])).toBe("unknown");
    expect(worstMark(["unknown", "warn", "good"])).toBe("warn");
    expect(worstMark(["warn", "bad", "good"])).toBe("bad");
  });
});
