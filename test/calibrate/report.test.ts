import { describe, expect, test } from "vitest";
import {
  calibrationJson,
  type CalibrationResult,
  calibrationText,
  histogramBars,
  rankHistogramSvg,
} from "../../src/calibrate/mod.ts";

function fakeResult(): CalibrationResult {
  const ranks = Array.from({ length: 40 }, (_, i) => (i * 37) % 100);
  const q = (pValue: number) => ({
    ranks,
    counts: [8, 9, 7, 8, 8],
    chiSquare: 0.25,
    df: 4,
    pValue,
    contraction: 0.8,
  });
  return {
    keys: ["b.period", "inst.jitter"],
    parameters: { "b.period": q(0.99), "inst.jitter": q(0.001) },
    simulations: 40,
    draws: 99,
    bins: 5,
    band: [2, 15],
    steps: 100,
    burn: 50,
    walkers: 16,
    seed: 1,
    start: "prior",
    diagnostics: {
      tauMedian: 10,
      tauMax: 12,
      keptPerTauMin: 4.2,
      shortPools: 0,
      rhatMedian: 1.01,
      rhatMax: 1.2,
      rhatAbove: 1,
      acceptanceMedian: 0.4,
      relocatedSimulations: 2,
    },
    seconds: 1.23,
  };
}

describe("histogramBars()", () => {
  test("histogramBars() scales block heights to the larger of the counts and the band", () => {
    // top = max(10, band top 10) = 10: levels round(8·c/10) = 0, 4, 8.
    expect(histogramBars([0, 5, 10], [2, 10])).toEqual({ bars: " ▄█", marks: "!  " });
    expect(histogramBars([3, 12], [2, 10]).marks).toBe(" !");
  });
});

describe("calibrationText()", () => {
  test("calibrationText() lists every quantity and flags small p-values", () => {
    const text = calibrationText(fakeResult()).join("\n");
    expect(text).toContain("b.period");
    expect(text).toContain("0.9900");
    expect(text).toContain("inst.jitter");
    expect(text).toContain("← p < 0.01");
    expect(text).toContain("1 of 2 quantities have p < 0.01");
  });
});

describe("calibrationJson()", () => {
  test("calibrationJson() has the documented shape", () => {
    const json = JSON.parse(JSON.stringify(calibrationJson(fakeResult())));
    expect(Object.keys(json.parameters)).toEqual(["b.period", "inst.jitter"]);
    expect(json.parameters["b.period"].p_value).toBe(0.99);
    expect(json.parameters["b.period"].ranks.length).toBe(40);
    expect(json.simulations).toBe(40);
  });
});

describe("rankHistogramSvg()", () => {
  test("rankHistogramSvg() draws one bar per bin with heights proportional to counts", () => {
    const counts = [8, 16, 4, 8, 4];
    const svg = rankHistogramSvg({
      key: "b.period",
      counts,
      draws: 99,
      simulations: 40,
      band: [2, 15],
      pValue: 0.0123,
      chiSquare: 12,
      df: 4,
    });
    expect(svg.startsWith("<?xml")).toBe(true);
    expect(svg.trimEnd().endsWith("</svg>")).toBe(true);
    expect(svg).toContain("b.period: χ² uniformity p = 0.0123");
    const heights = [...svg.matchAll(/<rect [^>]*height="([\d.]+)"[^>]*class="bin"/g)].map((m) =>
      Number(m[1])
    );
    expect(heights.length).toBe(5);
    // Pixel heights are rounded to 0.01 px: ratios hold to 0.01/h.
    for (let i = 0; i < 5; i++) {
      expect(Math.abs(heights[i]! / heights[1]! - counts[i]! / 16)).toBeLessThan(0.01 / 10);
    }
    const widths = [...svg.matchAll(/<rect [^>]*width="([\d.]+)"[^>]*class="bin"/g)].map((m) =>
      Number(m[1])
    );
    expect(new Set(widths).size).toBe(1);
  });
});
