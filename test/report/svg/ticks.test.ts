import { describe, expect, test } from "vitest";
import {
  formatLogTick,
  formatTick,
  labelReference,
  logTicks,
  minorStep,
  niceNumber,
  niceTicks,
} from "../../../src/report/svg/ticks.ts";

// Heckbert (1990), "Nice numbers for graph labels", Graphics Gems, pp. 61–63:
// nicenum(x, round) picks 1, 2, 5 or 10 × 10^⌊log10 x⌋; loose labelling takes
// range = nicenum(hi − lo, false), d = nicenum(range/(n − 1), true), and ticks
// from ⌊lo/d⌋d to ⌈hi/d⌉d. Each expected value below is worked by hand from
// those rules (shown in the comment), not taken from the code.
describe("niceNumber()", () => {
  const cases: [number, boolean, number, string][] = [
    [438, false, 500, "f = 4.38 ≤ 5 → 5 × 100"],
    [125, true, 100, "f = 1.25 < 1.5 → 1 × 100"],
    [0.25, true, 0.2, "f = 2.5 < 3 → 2 × 0.1"],
    [1, false, 1, "f = 1 ≤ 1 → 1"],
    [10.2, false, 20, "f = 1.02 ≤ 2 → 2 × 10"],
    [7, true, 10, "f = 7 ≥ 7 → 10"],
    [0.00333, false, 0.005, "f = 3.33 ≤ 5 → 5 × 0.001"],
  ];
  for (const [x, round, want, why] of cases) {
    test(`niceNumber() gives ${want} for ${x} (round=${round}): ${why}`, () => {
      expect(niceNumber(x, round)).toBe(want);
    });
  }
  test("niceNumber() is NaN for non-positive input", () => {
    expect(niceNumber(0, true)).toBeNaN();
    expect(niceNumber(-3, false)).toBeNaN();
  });
});

describe("niceTicks()", () => {
  const loose: [number, number, number, number[], number, string][] = [
    // range = nice(438,false) = 500; d = nice(125,true) = 100; 100..600
    [105, 543, 5, [100, 200, 300, 400, 500, 600], 0, "hand-worked case"],
    // range = nice(1,false) = 1; d = nice(0.25,true) = 0.2
    [0, 1, 5, [0, 0.2, 0.4, 0.6, 0.8, 1], 1, "unit interval"],
    // range = nice(10.2,false) = 20; d = nice(5,true) = 5; ⌊−2.3/5⌋ = −1, ⌈7.9/5⌉ = 2
    [-2.3, 7.9, 5, [-5, 0, 5, 10], 0, "negative start"],
    // range = nice(889.5,false) = 1000; d = nice(250,true) = 200; 2460000..2461000
    [2460001.2, 2460890.7, 5, [2460000, 2460200, 2460400, 2460600, 2460800, 2461000], 0, "BJD"],
    // range = nice(0.00333,false) = 0.005; d = nice(0.00125,true) = 0.001; 0.001..0.005
    [0.00123, 0.00456, 5, [0.001, 0.002, 0.003, 0.004, 0.005], 3, "small numbers"],
  ];
  for (const [lo, hi, n, want, decimals, what] of loose) {
    test(`niceTicks() loose labels [${lo}, ${hi}] (${what})`, () => {
      const t = niceTicks(lo, hi, { count: n, mode: "loose" });
      expect(t.values).toEqual(want);
      expect(t.decimals).toBe(decimals);
      expect([t.lo, t.hi]).toEqual([want[0], want[want.length - 1]]);
    });
  }
  test("niceTicks() tight mode keeps the padded data range and the ticks inside it", () => {
    // [−22, 22] padded by 8% → [−25.52, 25.52]; step = nice(51.04/2, true) = 20 (f = 2.55 < 3).
    const t = niceTicks(-22, 22, { count: 3, mode: "tight", pad: 0.08 });
    expect(t.lo).toBeCloseTo(-25.52, 12);
    expect(t.hi).toBeCloseTo(25.52, 12);
    expect(t.values).toEqual([-20, 0, 20]);
    expect(Object.is(t.values[1], -0)).toBe(false);
  });
  test("niceTicks() tight mode refines the step until two ticks fit", () => {
    // [0.31, 0.39], pad 0: step = nice(0.08/2, true) = 0.05 (f = 4 < 7) gives only 0.35;
    // the next finer nice step, 0.02, gives 0.32, 0.34, 0.36, 0.38.
    const t = niceTicks(0.31, 0.39, { count: 3, mode: "tight", pad: 0 });
    expect(t.values).toEqual([0.32, 0.34, 0.36, 0.38]);
    expect(t.decimals).toBe(2);
  });
  test("niceTicks() widens a zero-width range by ±10% (±1 at zero)", () => {
    // [45, 55]: range = nice(10, false) = 10; d = nice(2.5, true) = 2; 44..56.
    expect(niceTicks(50, 50, { mode: "loose" }).values).toEqual([44, 46, 48, 50, 52, 54, 56]);
    expect(niceTicks(0, 0, { mode: "loose" }).values[0]).toBeLessThanOrEqual(-1);
  });
  test("niceTicks() refuses a non-finite range", () => {
    expect(() => niceTicks(0, Infinity)).toThrow(RangeError);
  });
});

describe("logTicks()", () => {
  test("logTicks() puts majors at decades and minors at 2..9 for a wide range", () => {
    // 1.3 .. 1470 spans decades 10^0..10^4: 4 decades ≥ 3, so no 2 and 5 majors.
    const t = logTicks(1.3, 1470);
    expect(t.values).toEqual([1, 10, 100, 1000, 10000]);
    expect(t.minor.slice(0, 8)).toEqual([2, 3, 4, 5, 6, 7, 8, 9]);
    expect([t.lo, t.hi]).toEqual([1, 10000]);
  });
  test("logTicks() adds 2 and 5 for a range under three decades", () => {
    // 0.3 .. 9 spans decades 10^−1..10^1 (two).
    expect(logTicks(0.3, 9).values).toEqual([0.1, 0.2, 0.5, 1, 2, 5, 10]);
    // 0.3 .. 40 spans three decades: majors at decades only.
    expect(logTicks(0.3, 40).values).toEqual([0.1, 1, 10, 100]);
  });
  test("logTicks() refuses non-positive bounds", () => {
    expect(() => logTicks(0, 10)).toThrow(RangeError);
  });
});

describe("tick labels", () => {
  test("formatTick() uses a true minus sign and never prints −0", () => {
    expect(formatTick(-20, 0)).toBe("\u221220");
    expect(formatTick(-0.0001, 2)).toBe("0.00");
    expect(formatTick(0.25, 2)).toBe("0.25");
  });
  test("formatLogTick() writes plain numbers in range and powers of ten outside", () => {
    expect(formatLogTick(0.01)).toBe("0.01");
    expect(formatLogTick(1000)).toBe("1000");
    expect(formatLogTick(1e6)).toBe("10^6");
    expect(formatLogTick(1e-5)).toBe("10^\u22125");
  });
  test("minorStep() splits 1 and 5 steps in fifths and 2 steps in quarters", () => {
    expect(minorStep(100)).toBe(20);
    expect(minorStep(0.5)).toBe(0.1);
    expect(minorStep(20)).toBe(5);
  });
  test("labelReference() picks a round time origin for BJD-like values", () => {
    // span 889.5 → 10^2; ⌊2460001.2/100⌋·100 = 2460000.
    expect(labelReference(2460001.2, 2460890.7)).toBe(2460000);
    // size/span = 0.0045/0.0033 < 1000: no reference.
    expect(labelReference(0.0012, 0.0045)).toBe(0);
    // span 0.012 → 10^−2; ⌊12.3655/0.01⌋·0.01 = 12.36.
    expect(labelReference(12.3655, 12.3775, { ratio: 1 })).toBe(12.36);
  });
});
