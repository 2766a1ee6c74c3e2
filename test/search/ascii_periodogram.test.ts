import { describe, expect, test } from "vitest";
import { asciiPeriodogram } from "../../src/search/mod.ts";

/** Periods 1..1000 d log-spaced with one narrow peak at 10 d and a smaller one at 200 d. */
function fixture(): { periods: Float64Array; power: Float64Array } {
  const n = 2000;
  const periods = Float64Array.from({ length: n }, (_, k) => Math.pow(10, 3 * k / (n - 1)));
  const power = periods.map((p) =>
    0.05 + 0.8 * Math.exp(-((Math.log10(p) - 1) ** 2) / 1e-5) +
    0.4 * Math.exp(-((Math.log10(p) - Math.log10(200)) ** 2) / 1e-5)
  );
  return { periods, power };
}

describe("asciiPeriodogram()", () => {
  test("asciiPeriodogram() draws plain ASCII lines no wider than width", () => {
    const { periods, power } = fixture();
    const lines = asciiPeriodogram(periods, power, { width: 60, height: 10, marks: [10, 200] });
    // 10 plot rows + axis + ticks + marks.
    expect(lines.length).toBe(13);
    for (const line of lines) {
      expect(line.length).toBeLessThanOrEqual(60);
      expect(/^[\x20-\x7e]*$/.test(line)).toBe(true);
    }
    const max = power.reduce((a, b) => Math.max(a, b), 0);
    expect(lines[0]!.trimStart().startsWith(`${Number(max.toPrecision(3))} |`)).toBe(true);
    expect(lines[10]!.trimStart().startsWith("0 +")).toBe(true); // axis row
  });

  test("asciiPeriodogram() puts the highest peak at its log-period column and marks it", () => {
    const { periods, power } = fixture();
    const lines = asciiPeriodogram(periods, power, { width: 72, height: 8, marks: [10, 200] });
    const top = lines[0]!;
    const peakCol = top.indexOf("#");
    expect(peakCol).toBeGreaterThan(0);
    expect(top.indexOf("#", peakCol + 1)).toBe(-1); // only the 10-d peak reaches the top row
    // Column of 10 d on a log axis from 1 to 1000 d is 1/3 of the plot width.
    const axis = lines[8]!;
    const origin = axis.indexOf("+") + 1;
    const cols = axis.length - origin;
    expect(Math.abs(peakCol - (origin + Math.round((cols - 1) / 3)))).toBeLessThanOrEqual(1);
    const markRow = lines[10]!;
    expect(markRow[peakCol]).toBe("1");
    // The 200-d peak (0.45 of 0.85 -> 4 of 8 rows) is marked with "2" under its bar.
    const col2 = markRow.indexOf("2");
    expect(lines[8 - 4]![col2]).toBe("#");
    expect(lines[8 - 5]![col2] ?? " ").toBe(" ");
    // Decade ticks 10 and 100 appear in the tick row.
    expect(lines[9]!).toMatch(/10 .*100/);
  });

  test("asciiPeriodogram() draws a level line and rejects tiny sizes", () => {
    const { periods, power } = fixture();
    const lines = asciiPeriodogram(periods, power, { height: 10, level: 0.425 });
    // 0.425 / 0.85 * 10 = 5 rows from the bottom: row index 10 - 5 = 5.
    expect(lines[5]!.split(".").length).toBeGreaterThan(30);
    expect(() => asciiPeriodogram(periods, power, { width: 10 })).toThrow(RangeError);
    expect(() => asciiPeriodogram(periods, power.subarray(1))).toThrow(TypeError);
  });
});
