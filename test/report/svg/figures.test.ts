import { describe, expect, test } from "vitest";
import seedrandom from "seedrandom";
import {
  cornerFigure,
  type DataSeries,
  periodogramFigure,
  phaseFigure,
  rmFigure,
  rvFigure,
  traceFigure,
} from "../../../src/report/svg/mod.ts";
import { byClass, parseXml, texts } from "./_xml.ts";

const MINUS = "\u2212";

/** Seeded standard normal (Box–Muller). */
function normals(seed: string) {
  const rng = seedrandom(seed);
  return () => Math.sqrt(-2 * Math.log(1 - rng())) * Math.cos(2 * Math.PI * rng());
}

/** An invented sinusoid sampled by two invented instruments. */
function series(): DataSeries[] {
  const z = normals("figures");
  const make = (name: string, t0: number, n: number): DataSeries => {
    const x = Array.from({ length: n }, (_, i) => t0 + i * 17.3);
    const y = x.map((t) => 20 * Math.sin((2 * Math.PI * t) / 50) + 2 * z());
    return {
      name,
      x,
      y,
      error: x.map(() => 1.5),
      errorWithJitter: x.map(() => 2.5),
      residual: x.map(() => 2 * z()),
    };
  };
  return [make("inventA", 2460012, 30), make("inventB", 2460100, 20)];
}

function band(x: number[], f: (t: number) => number) {
  return {
    x,
    median: x.map(f),
    lo: x.map((t) => f(t) - 1),
    hi: x.map((t) => f(t) + 1),
  };
}

describe("rvFigure()", () => {
  const grid = Array.from({ length: 500 }, (_, k) => 2460005 + k * 1.2);
  const svg = rvFigure({
    title: "Invented star: RVs",
    instruments: series(),
    model: band(grid, (t) => 20 * Math.sin((2 * Math.PI * t) / 50)),
  });
  const root = parseXml(svg);
  const all = texts(root);

  test("rvFigure() writes well-formed SVG with its size on the root", () => {
    expect(root.name).toBe("svg");
    expect(root.attrs.xmlns).toBe("http://www.w3.org/2000/svg");
    expect(Number(root.attrs.width)).toBeGreaterThan(0);
    expect(root.attrs["font-family"]).toContain("sans-serif");
  });
  test("rvFigure() labels the axes with units and a time origin, and has a title", () => {
    expect(all).toContain("Time − 2460000 [d]");
    expect(all).toContain("RV [m/s]");
    expect(all).toContain("O − C [m/s]");
    expect(all).toContain("Invented star: RVs");
  });
  test("rvFigure() labels ticks: time from the origin and signed velocities", () => {
    // Only the residual panel labels its x ticks.
    const xTicks = texts(byClass(root, "x-tick-labels")[0]!);
    // Times 2460005..2460610 shown from 2460000: nice steps of 100 (hand-worked: span ≈ 605·1.04
    // over 6 intervals ≈ 105 → nice 100).
    expect(xTicks).toEqual(["0", "100", "200", "300", "400", "500", "600"]);
    const yTicks = texts(byClass(root, "y-tick-labels")[0]!);
    expect(yTicks).toContain(`${MINUS}20`);
    expect(yTicks).toContain("0");
  });
  test("rvFigure() names every instrument and the model in the legend", () => {
    const legend = texts(byClass(root, "legend")[0]!);
    expect(legend).toEqual(
      expect.arrayContaining(["inventA", "inventB", "posterior median model"]),
    );
    expect(byClass(root, "model-band").length).toBe(1);
    expect(byClass(root, "model-median").length).toBe(1);
  });
});

describe("phaseFigure()", () => {
  test("phaseFigure() has phase ticks from −0.5 to 0.5 and its planet in the title", () => {
    const ph = Array.from({ length: 101 }, (_, k) => -0.5 + k / 100);
    const s = series().map((d) => ({ ...d, x: Array.from(d.x, (t) => ((t / 50) % 1) - 0.5) }));
    const root = parseXml(
      phaseFigure({
        planet: "b",
        instruments: s,
        model: band(ph, (p) => 20 * Math.sin(2 * Math.PI * p)),
      }),
    );
    const all = texts(root);
    expect(all).toContain("Planet b, phase-folded");
    expect(all).toContain("Phase (0 = conjunction)");
    expect(texts(byClass(root, "x-tick-labels")[0]!)).toEqual([
      `${MINUS}0.50`,
      `${MINUS}0.25`,
      "0.00",
      "0.25",
      "0.50",
    ]);
  });
});

describe("rmFigure()", () => {
  test("rmFigure() shows hours from mid-transit, contacts and the Keplerian alone", () => {
    const h = Array.from({ length: 41 }, (_, k) => -4 + k * 0.2);
    const s: DataSeries[] = [{
      name: "nightX",
      x: h,
      y: h.map((t) => -5 * t),
      error: h.map(() => 2),
      residual: h.map(() => 0),
    }];
    const root = parseXml(rmFigure({
      planet: "b",
      instruments: s,
      model: band(h, (t) => -5 * t),
      keplerian: { x: h, y: h.map((t) => -5 * t) },
      contacts: [-1.5, 1.5],
    }));
    const all = texts(root);
    expect(all).toContain("Time from mid-transit [h]");
    expect(all).toContain("Planet b: transit night (Rossiter–McLaughlin)");
    expect(all).toEqual(expect.arrayContaining(["ingress", "egress", "Keplerian alone"]));
    expect(texts(byClass(root, "x-tick-labels")[0]!)).toContain(`${MINUS}4`);
  });
});

describe("cornerFigure()", () => {
  const z = normals("corner");
  const n = 4000;
  const a = Float64Array.from({ length: n }, () => 2460512.31 + 0.004 * z());
  const b = Float64Array.from({ length: n }, () => 14 + 0.5 * z());
  const c = Float64Array.from({ length: n }, (_, i) => 0.1 + 0.02 * z() + 0.01 * (b[i]! - 14));
  const svg = cornerFigure([
    { key: "b.tc", unit: "d", draws: a },
    { key: "b.semi_amplitude", unit: "m/s", draws: b, truth: 14.2 },
    { key: "b.eccentricity", unit: "", draws: c },
  ]);
  const root = parseXml(svg);
  const all = texts(root);

  test("cornerFigure() draws three histograms and two contours in each of three pairs", () => {
    expect(byClass(root, "histogram").length).toBe(3);
    expect(byClass(root, "contour").length).toBe(6);
  });
  test("cornerFigure() labels axes with units and shortens BJD ticks with an origin", () => {
    // A long label is split before its unit over two lines (joined here without a space).
    const tc = all.find((t) => t.startsWith("b.tc − "));
    expect(tc).toMatch(/^b\.tc − 2460512\.\d+\s*\[d\]$/);
    // Its ticks then read as small numbers (hundredths of a day), not 2460512.30.
    const bottomLeft = byClass(root, "x-tick-labels")[0]!;
    for (const t of texts(bottomLeft)) expect(t.length).toBeLessThanOrEqual(5);
    expect(all).toContain("b.eccentricity");
    expect(all).toContain("Posterior: marginal and joint distributions");
    // The semi-amplitude (≈ 14 ± 0.5) keeps plain tick labels.
    expect(all).toEqual(expect.arrayContaining(["13", "14", "15"]));
  });
  test("cornerFigure() prints the median and errors above each diagonal panel", () => {
    const values = byClass(root, "value").map((e) => e.text);
    expect(values.length).toBe(3);
    // Median 14 with σ = 0.5 from 4000 draws: two significant digits on the error.
    expect(values[1]).toMatch(/^1[34]\.\d\d [±+]/);
  });
  test("cornerFigure() refuses draws of unequal length", () => {
    expect(() =>
      cornerFigure([{ key: "a", unit: "", draws: [1, 2] }, { key: "b", unit: "", draws: [1] }])
    ).toThrow(RangeError);
  });
});

describe("traceFigure()", () => {
  test("traceFigure() has one panel per quantity on a shared Step axis with burn-in marked", () => {
    const z = normals("trace");
    const steps = Array.from({ length: 200 }, (_, s) => s * 5);
    const walkers = (m: number) => Array.from({ length: 4 }, () => steps.map(() => m + z()));
    const root = parseXml(traceFigure({
      steps,
      panels: [
        { key: "log posterior", unit: "", walkers: walkers(-340) },
        { key: "b.period", unit: "d", walkers: walkers(12) },
      ],
      burn: 300,
    }));
    const all = texts(root);
    expect(all).toEqual(expect.arrayContaining(["Traces", "Step", "burn-in", "b.period [d]"]));
    expect(byClass(root, "walkers").length).toBe(2);
    // Steps 0..995 padded by 1%: 1015/6 ≈ 169 → nice step 200 (hand-worked); the padded range reaches 1005.
    expect(texts(byClass(root, "x-tick-labels")[0]!)).toEqual([
      "0",
      "200",
      "400",
      "600",
      "800",
      "1000",
    ]);
  });
});

describe("periodogramFigure()", () => {
  test("periodogramFigure() uses a log period axis with decade labels and marks", () => {
    const period = Array.from({ length: 300 }, (_, k) => 10 ** (k / 100)); // 1 .. ~1000 d
    const power = period.map((p) => Math.exp(-((Math.log10(p) - 1.1) ** 2) / 0.001));
    const root = parseXml(periodogramFigure({
      title: "Periodogram of the residuals",
      period,
      power,
      marks: [{ period: 12.4, label: "b" }],
      levels: [{ power: 0.3, label: "FAP 1%" }],
    }));
    const all = texts(root);
    expect(all).toEqual(
      expect.arrayContaining([
        "Period [d]",
        "GLS power",
        "Periodogram of the residuals",
        "b",
        "FAP 1%",
      ]),
    );
    expect(texts(byClass(root, "x-tick-labels")[0]!)).toEqual(["1", "10", "100"]);
  });
});

describe("parseXml() (the test's checker)", () => {
  test("parseXml() rejects malformed documents", () => {
    expect(() => parseXml("<svg><g></svg>")).toThrow(SyntaxError);
    expect(() => parseXml('<svg a="1" a="2"/>')).toThrow(SyntaxError);
    expect(() => parseXml("<svg>a & b</svg>")).toThrow(SyntaxError);
    expect(() => parseXml("<svg x=1/>")).toThrow(SyntaxError);
    expect(() => parseXml("<svg/><svg/>")).toThrow(SyntaxError);
    expect(parseXml("<svg><text>a &amp; b</text></svg>").children[0]!.text).toBe("a & b");
  });
});
