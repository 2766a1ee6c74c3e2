import { describe, expect, test } from "vitest";
import {
  decimalsForError,
  decimalsForSpan,
  fit,
  formatDuration,
  formatFixed,
  formatNumber,
  formatSummary,
  progressBar,
  textWidth,
  truncate,
} from "../../tui/format.ts";

describe("text fitting", () => {
  test("truncate() cuts to the width and ends in an ellipsis", () => {
    expect(truncate("abcdef", 4)).toBe("abc…");
    expect(truncate("abc", 3)).toBe("abc");
    expect(truncate("abc", 0)).toBe("");
    expect(textWidth(truncate("⣿⣿⣿⣿⣿", 3))).toBe(3);
  });

  test("fit() pads to exactly the width on either side", () => {
    expect(fit("ab", 4)).toBe("ab  ");
    expect(fit("ab", 4, { align: "right" })).toBe("  ab");
    expect(fit("abcdef", 4)).toBe("abc…");
  });
});

describe("numbers", () => {
  test("formatNumber() keeps four significant digits and switches to exponents far out", () => {
    expect(formatNumber(3.14159265)).toBe("3.142");
    expect(formatNumber(-1234.5)).toBe("-1235");
    expect(formatNumber(123456)).toBe("123456");
    expect(formatNumber(0.000012346)).toBe("1.235e-5");
    expect(formatNumber(2.5e10)).toBe("2.500e10");
    expect(formatNumber(NaN)).toBe("--");
    expect(formatNumber(0)).toBe("0");
  });

  test("decimalsForError() shows the smaller error with two significant digits", () => {
    // 0.021 -> log10 = -1.68, floor -2 -> 1 - (-2) = 3 decimals ("0.021").
    expect(decimalsForError(0.021, 0.03)).toBe(3);
    // 1.2 -> floor(log10) = 0 -> 1 decimal.
    expect(decimalsForError(1.5, 1.2)).toBe(1);
    // 35 -> 1 - 1 = 0 decimals (clamped at 0).
    expect(decimalsForError(35, 120)).toBe(0);
    expect(decimalsForError(0, NaN, 5)).toBe(5);
  });

  test("formatSummary() quotes median, interval and errors at one precision", () => {
    const f = formatSummary(12.3456, 12.3266, 12.3696);
    expect(f.decimals).toBe(3);
    expect(f.median).toBe("12.346");
    expect(f.interval).toBe("[12.327, 12.370]");
    expect(f.errors).toBe("-0.019 +0.024");
  });

  test("formatFixed() never prints negative zero", () => {
    expect(formatFixed(-0.0001, 2)).toBe("0.00");
    expect(formatFixed(-1.5, 1)).toBe("-1.5");
  });

  test("decimalsForSpan() resolves a span to three significant digits", () => {
    expect(decimalsForSpan(0.000108)).toBe(6);
    expect(decimalsForSpan(450)).toBe(0);
    expect(decimalsForSpan(0)).toBe(3);
  });
});

describe("durations and bars", () => {
  test("formatDuration() writes seconds, minutes, hours and days", () => {
    expect(formatDuration(42)).toBe("42s");
    expect(formatDuration(185)).toBe("3m 05s");
    // 3725 s = 1 h 2 min 5 s.
    expect(formatDuration(3725)).toBe("1h 02m");
    // 273600 s = 3 d 4 h.
    expect(formatDuration(273600)).toBe("3d 04h");
    expect(formatDuration(NaN)).toBe("--");
  });

  test("progressBar() fills in proportion and keeps its width", () => {
    expect(progressBar(0.25, 8)).toBe("██░░░░░░");
    expect(progressBar(2, 4)).toBe("████");
    expect(progressBar(NaN, 3)).toBe("░░░");
  });
});
