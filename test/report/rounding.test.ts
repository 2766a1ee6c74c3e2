import { describe, expect, test } from "vitest";
import { roundByUncertainty } from "../../src/report/rounding.ts";
import { interval, quantileSorted } from "../../src/report/quantiles.ts";

describe("roundByUncertainty()", () => {
  // Convention (stated in the module): two significant digits on the smaller error.
  const cases: [number, number, number, string, string, string][] = [
    [905.3456, 1.234, 1.456, "905.3", "1.2", "1.5"],
    [0.123456, 0.0123, 0.0456, "0.123", "0.012", "0.046"],
    [2460512.3123, 0.0042, 0.0051, "2460512.3123", "0.0042", "0.0051"],
    [12345.6, 123, 456, "12350", "120", "460"],
    [1.0, 0.0996, 0.2, "1.00", "0.10", "0.20"],
    [-3.14159, 0.5, 0.5, "-3.14", "0.50", "0.50"],
  ];
  for (const [v, m, p, ev, em, ep] of cases) {
    test(`roundByUncertainty() rounds ${v} −${m} +${p}`, () => {
      const r = roundByUncertainty(v, m, p);
      expect([r.value, r.minus, r.plus]).toEqual([ev, em, ep]);
    });
  }
  test("roundByUncertainty() falls back to six significant digits without an error", () => {
    expect(roundByUncertainty(1.23456789, 0, 0).value).toBe("1.23457");
    expect(roundByUncertainty(NaN, 1, 1).value).toBe("NaN");
  });
});

describe("quantileSorted()", () => {
  test("quantileSorted() matches Hyndman & Fan (1996) definition 7 by hand", () => {
    // x = 1..5: h = (n−1)p; p = 0.16 → h = 0.64 → 1.64; p = 0.5 → 3; p = 0.975 → h = 3.9 → 4.9.
    const x = Float64Array.of(1, 2, 3, 4, 5);
    expect(quantileSorted(x, 0.16)).toBeCloseTo(1.64, 14);
    expect(quantileSorted(x, 0.5)).toBe(3);
    expect(quantileSorted(x, 0.975)).toBeCloseTo(4.9, 14);
    expect(quantileSorted(x, 0)).toBe(1);
    expect(quantileSorted(x, 1)).toBe(5);
    expect(quantileSorted(new Float64Array(0), 0.5)).toBeNaN();
  });
  test("interval() ignores NaN draws and sorts numerically", () => {
    const iv = interval(Float64Array.of(10, NaN, 2, 1, 100), "d");
    expect(iv.median).toBe(6); // sorted 1,2,10,100: h = 1.5 → 2 + 0.5·8
    expect(iv.unit).toBe("d");
  });
});
