import { describe, expect, test } from "vitest";
import { frequencyGrid } from "../../src/search/mod.ts";

describe("frequencyGrid()", () => {
  test("frequencyGrid() spaces frequencies by 1/(oversample * span) from 1/maxPeriod", () => {
    const time = new Float64Array([100, 350, 130, 1100, 600]); // span 1000 d
    const grid = frequencyGrid(time, { minPeriod: 2, maxPeriod: 500, oversample: 4 });
    expect(grid.step).toBeCloseTo(1 / 4000, 15);
    expect(grid.start).toBeCloseTo(1 / 500, 15);
    // Last point is the largest start + k step <= 1/2: k = floor((0.5 - 0.002) * 4000) = 1992.
    expect(grid.count).toBe(1993);
    expect(grid.frequencies[grid.count - 1]!).toBeLessThanOrEqual(0.5 + 1e-15);
    expect(grid.frequencies[17]!).toBeCloseTo(1 / 500 + 17 / 4000, 15);
  });

  test("frequencyGrid() defaults to periods from 1 d to the span, oversample 5", () => {
    const grid = frequencyGrid(new Float64Array([0, 200]));
    expect(grid.start).toBeCloseTo(1 / 200, 15);
    expect(grid.step).toBeCloseTo(1 / 1000, 15);
    expect(grid.count).toBe(Math.floor((1 - 1 / 200) * 1000) + 1);
  });

  test("frequencyGrid() rejects inverted periods, a zero span and oversized grids", () => {
    expect(() => frequencyGrid(new Float64Array([0, 10]), { minPeriod: 5, maxPeriod: 2 })).toThrow(
      RangeError,
    );
    expect(() => frequencyGrid(new Float64Array([3, 3]))).toThrow(RangeError);
    expect(() => frequencyGrid(new Float64Array([0, 10]), { oversample: 0.5 })).toThrow(RangeError);
    expect(() =>
      frequencyGrid(new Float64Array([0, 1e6]), { minPeriod: 0.01, maxFrequencies: 1000 })
    ).toThrow(RangeError);
  });
});
