import { describe, expect, test } from "vitest";
import { parseRvCsv } from "../../src/data/mod.ts";
import { draftSpec, type SpecDraft, specToml, withDraftStarts } from "../../src/search/mod.ts";
import { parseSpecText } from "../../src/spec/mod.ts";

/** A draft using every prior kind, both epochs, an RM block, a trend and sampler settings. */
const DRAFT: SpecDraft = {
  title: 'Invented "Marrow-5" \\ test',
  comments: ["first line", "", "third line"],
  star: {
    massMsun: { prior: { kind: "normal", mu: 0.91, sigma: 0.04 } },
    radiusRsun: { prior: { kind: "truncnormal", mu: 0.95, sigma: 0.05, lo: 0.5, hi: 1.5 } },
    rotationPeriodDays: { prior: { kind: "loguniform", lo: 5, hi: 50 }, start: 21.5 },
  },
  dataFiles: ["data/a.csv", "/abs/b.csv"],
  instruments: [
    {
      name: "spec A",
      offset: { prior: { kind: "uniform", lo: -120, hi: 80 }, start: -12.25 },
      jitter: { prior: { kind: "loguniform", lo: 0.01, hi: 100 }, start: 1.5 },
    },
    {
      name: "specB",
      offset: { prior: { kind: "uniform", lo: -1e3, hi: 1e3 } },
      jitter: { prior: { kind: "fixed", value: 2 } },
    },
  ],
  planets: [
    {
      name: "b",
      comment: "a comment",
      period: { prior: { kind: "loguniform", lo: 3.1, hi: 4.4 }, start: 3.7000000001 },
      epochKind: "tc",
      epoch: { prior: { kind: "uniform", lo: 2460001.1234, hi: 2460004.9 }, start: 2460003 },
      semiAmplitude: { prior: { kind: "loguniform", lo: 0.1, hi: 1e-7 + 60 } },
      eccentricity: { prior: { kind: "beta", a: 0.867, b: 3.03 }, start: 0.05 },
      omegaDeg: { prior: { kind: "fixed", value: -90 } },
      rm: {
        lambdaDeg: { prior: { kind: "uniform", lo: -180, hi: 180 }, start: 10 },
        vsiniKms: { prior: { kind: "uniform", lo: 0.1, hi: 20 } },
        radiusRatio: { prior: { kind: "uniform", lo: 0.01, hi: 0.3 } },
        aOverRstar: { prior: { kind: "normal", mu: 9.5, sigma: 0.4 } },
        impact: { prior: { kind: "uniform", lo: 0, hi: 1 } },
        u1: { prior: { kind: "fixed", value: 0.45 } },
        u2: { prior: { kind: "truncnormal", mu: 0.2, sigma: 0.1, lo: -1, hi: 1 } },
        exposureS: 600,
      },
    },
    {
      name: "c",
      period: { prior: { kind: "fixed", value: 123.25 } },
      epochKind: "tp",
      epoch: { prior: { kind: "normal", mu: 2460100, sigma: 3 }, start: 2460101.5 },
      semiAmplitude: { prior: { kind: "uniform", lo: 0, hi: 30 }, start: 7 },
      eccentricity: { prior: { kind: "fixed", value: 0 } },
      omegaDeg: { prior: { kind: "fixed", value: 90 } },
    },
  ],
  trend: {
    slope: { prior: { kind: "uniform", lo: -0.5, hi: 0.5 }, start: 1e-7 },
    quadratic: { prior: { kind: "uniform", lo: -2e-5, hi: 2e-5 } },
    referenceTime: 2460050.5,
  },
  sampler: { walkers: 40, steps: 1234, seed: 9 },
};

describe("specToml()", () => {
  test("specToml() writes text that parseSpecText() reads back to the same spec", () => {
    const text = specToml(DRAFT);
    const back = parseSpecText(text, { file: "/x/spec.toml", dir: "/x" });
    expect(back.title).toBe(DRAFT.title);
    expect(back.star).toEqual(DRAFT.star);
    expect(back.dataFiles).toEqual(["/x/data/a.csv", "/abs/b.csv"]);
    expect(back.writtenInstruments).toEqual(
      DRAFT.instruments.map((i) => ({ name: i.name, offset: i.offset, jitter: i.jitter })),
    );
    expect(back.planets).toEqual(DRAFT.planets.map(({ comment: _c, ...p }) => p));
    expect(back.trend).toEqual(DRAFT.trend);
    expect(back.sampler.walkers).toBe(40);
    expect(back.sampler.steps).toBe(1234);
    expect(back.sampler.seed).toBe(9);
    expect(text.startsWith("# first line\n#\n# third line\n")).toBe(true);
    expect(text).toContain("# a comment\n[[planet]]");
  });

  test("specToml() throws RangeError for a non-finite number", () => {
    const bad: SpecDraft = {
      ...DRAFT,
      trend: { slope: { prior: { kind: "uniform", lo: -Infinity, hi: 1 } } },
    };
    expect(() => specToml(bad)).toThrow(RangeError);
  });
});

/** Invented rows: specA around +10 m/s, specB around -300 m/s, 300 d apart in time. */
const TABLE = parseRvCsv(
  [
    "time,rv,rv_err,instrument",
    "2460000.5,12.0,1.5,specA",
    "2460010.5,7.5,1.5,specA",
    "2460050.5,-298.0,2.0,specB",
    "2460120.5,11.0,1.5,specA",
    "2460200.5,-305.5,2.0,specB",
    "2460300.5,9.0,1.5,specA",
  ].join("\n"),
  { file: "invented.csv" },
);

describe("draftSpec()", () => {
  test("draftSpec() puts the priors init promises around each signal", () => {
    const signals = [
      { period: 10.37, timeOfConjunction: 2460100.123456, semiAmplitude: 3.2 },
      { period: 880, timeOfConjunction: 2460150, semiAmplitude: 41 },
    ];
    const draft = draftSpec(signals, TABLE, {
      periodRange: [1, 1000],
      trendDegree: 1,
      starMass: [0.8, 0.05],
      dataFiles: ["rv.csv"],
    });
    expect(draft.planets.map((p) => p.name)).toEqual(["b", "c"]);
    const [b, c] = draft.planets as [SpecDraft["planets"][0], SpecDraft["planets"][0]];
    // Period: loguniform within +-25 %, bounds rounded outward by < 0.1 %, clipped to the range.
    const pb = b.period.prior as { kind: string; lo: number; hi: number };
    expect(pb.kind).toBe("loguniform");
    expect(pb.lo).toBeLessThanOrEqual(0.75 * 10.37);
    expect(pb.lo).toBeGreaterThan(0.999 * 0.75 * 10.37);
    expect(pb.hi).toBeGreaterThanOrEqual(1.25 * 10.37);
    expect(pb.hi).toBeLessThan(1.001 * 1.25 * 10.37);
    expect((c.period.prior as { hi: number }).hi).toBe(1000);
    // tc: uniform over one period centred on the conjunction (bounds to 1e-4 d).
    const tb = b.epoch.prior as { kind: string; lo: number; hi: number };
    expect(tb.kind).toBe("uniform");
    expect(Math.abs(tb.hi - tb.lo - 10.37)).toBeLessThanOrEqual(2e-4 + 1e-9);
    expect(Math.abs(0.5 * (tb.lo + tb.hi) - 2460100.123456)).toBeLessThanOrEqual(1e-4);
    // K loguniform [0.1, 10 K + 10]; e uniform [0, 0.95]; omega uniform [-180, 180].
    expect(b.semiAmplitude.prior).toEqual({ kind: "loguniform", lo: 0.1, hi: 42 });
    expect(c.semiAmplitude.prior).toEqual({ kind: "loguniform", lo: 0.1, hi: 420 });
    expect(b.eccentricity.prior).toEqual({ kind: "uniform", lo: 0, hi: 0.95 });
    expect(b.omegaDeg.prior).toEqual({ kind: "uniform", lo: -180, hi: 180 });
    // Offsets: mean +- (10 sd + 100) per instrument, computed here independently.
    for (const ins of draft.instruments) {
      const rows = [];
      for (let i = 0; i < TABLE.time.length; i++) {
        if (TABLE.instruments[TABLE.instrumentIndex[i]!] === ins.name) rows.push(TABLE.rv[i]!);
      }
      const mean = rows.reduce((a, v) => a + v, 0) / rows.length;
      const sd = Math.sqrt(rows.reduce((a, v) => a + (v - mean) ** 2, 0) / (rows.length - 1));
      const o = ins.offset.prior as { lo: number; hi: number };
      expect(o.lo).toBeLessThanOrEqual(mean - (10 * sd + 100));
      expect(o.lo).toBeGreaterThan(mean - (10 * sd + 100) - 1.5);
      expect(o.hi).toBeGreaterThanOrEqual(mean + (10 * sd + 100) - 0.5);
      expect(ins.jitter.prior).toEqual({ kind: "loguniform", lo: 0.01, hi: 100 });
    }
    expect(draft.instruments.map((i) => i.name)).toEqual(["specA", "specB"]);
    // Trend: slope within +-10 (rv range)/span, rounded up; reference time mid-span.
    const range = 12 - -305.5, span = 300;
    const slope = draft.trend!.slope.prior as { lo: number; hi: number };
    expect(slope.hi).toBeGreaterThanOrEqual(10 * range / span);
    expect(slope.hi).toBeLessThan(1.1 * 10 * range / span);
    expect(slope.lo).toBe(-slope.hi);
    expect(draft.trend!.referenceTime).toBe(2460150.5);
    expect(draft.star.massMsun.prior).toEqual({ kind: "normal", mu: 0.8, sigma: 0.05 });
    // 2 planets x 5 + 2 instruments x 2 + slope = 15 free parameters: max(32, 45) walkers.
    expect(draft.sampler?.walkers).toBe(46);
    // The draft is a valid spec.
    const back = parseSpecText(specToml(draft), { file: "/s/spec.toml", dir: "/s" });
    expect(back.planets.length).toBe(2);
  });

  test("draftSpec() throws RangeError for a signal with a non-finite period", () => {
    expect(() => draftSpec([{ period: NaN, timeOfConjunction: 0, semiAmplitude: 1 }], TABLE))
      .toThrow(RangeError);
  });
});

describe("withDraftStarts()", () => {
  test("withDraftStarts() sets starts by key and keeps them strictly inside the priors", () => {
    const draft = draftSpec(
      [{ period: 10, timeOfConjunction: 2460100, semiAmplitude: 3 }],
      TABLE,
    );
    const starts = new Map([
      ["b.period", 10.1],
      ["b.tc", 2460090], // below the window [2460095, 2460105]
      ["b.semi_amplitude", 3.3],
      ["b.eccentricity", 0], // on the lower bound
      ["b.omega_deg", 33],
      ["specA.offset", 10.5],
      ["specB.jitter", 2.25],
    ]);
    const filled = withDraftStarts(draft, starts);
    const b = filled.planets[0]!;
    expect(b.period.start).toBe(10.1);
    expect(b.epoch.start).toBeGreaterThan(2460095);
    expect(b.epoch.start).toBeLessThan(2460095.001);
    expect(b.eccentricity.start).toBeGreaterThan(0);
    expect(b.eccentricity.start).toBeLessThan(1e-6);
    expect(filled.instruments[0]!.offset.start).toBe(10.5);
    expect(filled.instruments[0]!.jitter.start).toBeUndefined();
    expect(filled.instruments[1]!.jitter.start).toBe(2.25);
    const back = parseSpecText(specToml(filled), { file: "/s/spec.toml", dir: "/s" });
    expect(back.planets[0]!.epoch.start).toBe(b.epoch.start);
  });
});
