import { describe, expect, test } from "vitest";
import seedrandom from "seedrandom";
import { parseRvCsv } from "../../../src/data/rv_csv.ts";
import { parseSpecText, resolveProblem } from "../../../src/spec/mod.ts";
import { CompiledModel } from "../../../src/model/posterior.ts";
import {
  LEADING_COLUMNS,
  type Manifest,
  RUN_FORMAT_VERSION,
  RVWALK_VERSION,
  writeManifest,
} from "../../../src/run/manifest.ts";
import { appendBlock } from "../../../src/run/chain_file.ts";
import type { ChainData } from "../../../src/run/chain_file.ts";
import { pointwiseBand, runFigures } from "../../../src/report/svg/mod.ts";
import { plotCommand } from "../../../src/cli/plot.ts";
import { byClass, parseXml, texts } from "./_xml.ts";

// An invented system (fictitious star Ferro-9): one transiting planet with an
// RM model, observed by an invented spectrograph over 60 days and on one
// transit night by a second one. Data are the model at the planted values plus
// seeded noise; the "chain" is the planted values plus seeded scatter, enough
// to exercise the figures (this is not a sampler test).
const SPEC = `
title = "Ferro-9 (invented)"
[star]
mass_msun = { normal = [1.0, 0.05] }
[data]
files = ["data.csv"]
[[instrument]]
name = "specA"
offset = { uniform = [-50, 50] }
jitter = { loguniform = [0.01, 20] }
[[instrument]]
name = "nightB"
offset = { uniform = [-50, 50] }
jitter = { loguniform = [0.01, 20] }
[[planet]]
name = "b"
period = { uniform = [4.0, 4.2] }
tc = { uniform = [2460100.0, 2460101.0] }
semi_amplitude = { uniform = [1, 200] }
eccentricity = 0
omega_deg = 90
[planet.rm]
lambda_deg = { uniform = [-180, 180] }
vsini_kms = { uniform = [0.1, 20] }
radius_ratio = 0.1
a_over_rstar = 9
impact = 0.3
limb_darkening = [0.4, 0.25]
`;
const TRUTH: Record<string, number> = {
  "b.period": 4.1,
  "b.tc": 2460100.5,
  "b.semi_amplitude": 60,
  "b.lambda_deg": 30,
  "b.vsini_kms": 5,
  "specA.offset": 3,
  "specA.jitter": 1,
  "nightB.offset": -7,
  "nightB.jitter": 1,
};

function syntheticRun(): { manifest: Manifest; chain: ChainData } {
  const rng = seedrandom("ferro-9");
  const z = () => Math.sqrt(-2 * Math.log(1 - rng())) * Math.cos(2 * Math.PI * rng());
  const times: number[] = [];
  const inst: string[] = [];
  for (let i = 0; i < 25; i++) (times.push(2460090 + rng() * 60), inst.push("specA"));
  const mid = 2460100.5 + 10 * 4.1;
  for (let i = 0; i < 30; i++) (times.push(mid - 0.2 + (0.4 * i) / 29), inst.push("nightB"));
  // Model values at the truth through the model itself (zero first, then fill).
  const order = times.map((t, i) => [t, i] as const).sort((a, b) => a[0] - b[0]).map((p) => p[1]);
  const csv0 = ["time,rv,rv_err,instrument", ...order.map((i) => `${times[i]},0,2,${inst[i]}`)];
  const written = parseSpecText(SPEC, { file: "spec.toml", dir: "." });
  const p0 = resolveProblem(written, parseRvCsv(csv0.join("\n"), { file: "data.csv" }));
  const model = new CompiledModel({ spec: p0.spec, data: p0.data });
  const phys = Float64Array.from(model.keys, (k) => TRUTH[k]!);
  const rv = new Float64Array(p0.data.count);
  expect(model.predict(phys, rv)).toBe(true);
  const names = p0.spec.instruments.map((s) => s.name);
  const csv = ["time,rv,rv_err,instrument"];
  for (let i = 0; i < p0.data.count; i++) {
    csv.push(`${p0.data.time[i]},${rv[i]! + 2 * z()},2,${names[p0.data.instrument[i]!]}`);
  }
  const problem = resolveProblem(written, parseRvCsv(csv.join("\n"), { file: "data.csv" }));
  const walkers = 8;
  const steps = 40;
  const keys = model.keys;
  const columns = LEADING_COLUMNS.length + keys.length;
  const scale: Record<string, number> = {
    "b.period": 1e-4,
    "b.tc": 1e-3,
    "b.semi_amplitude": 0.5,
    "b.lambda_deg": 3,
    "b.vsini_kms": 0.2,
  };
  const data = new Float64Array(steps * walkers * columns);
  for (let r = 0; r < steps * walkers; r++) {
    data[r * columns] = -100 + z();
    data[r * columns + 1] = rng() < 0.3 ? 1 : 0;
    keys.forEach((k, j) => {
      data[r * columns + 2 + j] = TRUTH[k]! + (scale[k] ?? 0.1) * z();
    });
  }
  const manifest: Manifest = {
    format: "rvwalk-run",
    formatVersion: RUN_FORMAT_VERSION,
    rvwalkVersion: RVWALK_VERSION,
    createdAt: "2026-01-01T00:00:00Z",
    spec: problem.spec,
    data: {
      time: Array.from(problem.data.time),
      rv: Array.from(problem.data.rv),
      rvErr: Array.from(problem.data.rvErr),
      instrument: Array.from(problem.data.instrument),
    },
    dataHash: "test",
    modelHash: "test",
    parameters: model.parameters.map((p) => ({ key: p.key, unit: p.unit, transform: p.transform })),
    columns: [...LEADING_COLUMNS, ...keys],
    walkers,
    seed: 1,
    moves: problem.spec.sampler.moves,
  };
  return { manifest, chain: { data, steps, walkers, columns } };
}

describe("runFigures()", () => {
  test("runFigures() draws every figure of an RM system and each parses as SVG", () => {
    const { manifest, chain } = syntheticRun();
    const figs = runFigures(manifest, chain, { burn: 10, draws: 12 });
    expect(figs.map((f) => f.file)).toEqual([
      "rv.svg",
      "phase_b.svg",
      "rm_b.svg",
      "corner.svg",
      "trace.svg",
      "periodogram.svg",
    ]);
    for (const f of figs) {
      const root = parseXml(f.svg);
      expect(root.name).toBe("svg");
      expect(byClass(root, "title").length).toBeGreaterThan(0);
    }
    const rm = texts(parseXml(figs[2]!.svg));
    expect(rm).toContain("Time from mid-transit [h]");
    expect(rm).toContain("nightB");
    // Only the night's instrument has points within the window.
    expect(rm).not.toContain("specA");
    const corner = texts(parseXml(figs[3]!.svg));
    // Default corner keys: period, semi-amplitude and λ (e is fixed here).
    expect(corner).toEqual(
      expect.arrayContaining(["b.period", "b.semi_amplitude", "b.lambda_deg"]),
    );
    const trace = texts(parseXml(figs[4]!.svg));
    expect(trace).toEqual(expect.arrayContaining(["log posterior", "Step"]));
  });

  test("runFigures() takes --params globs including derived keys for the corner plot", () => {
    const { manifest, chain } = syntheticRun();
    const [corner] = runFigures(manifest, chain, {
      burn: 10,
      draws: 5,
      params: ["*.offset", "b.msini_mjup"],
      only: ["corner"],
    });
    const all = texts(parseXml(corner!.svg));
    expect(all).toEqual(expect.arrayContaining(["specA.offset", "nightB.offset", "b.msini_mjup"]));
  });

  test("runFigures() refuses a burn-in that leaves nothing", () => {
    const { manifest, chain } = syntheticRun();
    expect(() =>
      runFigures(manifest, { ...chain, steps: 0, data: new Float64Array(0) }, { burn: 0 })
    )
      .toThrow(RangeError);
  });
});

describe("pointwiseBand()", () => {
  test("pointwiseBand() takes 16/50/84% per point over draws, skipping NaN", () => {
    // Draws of point 0: 1..5 → Hyndman–Fan type 7: median 3; 16% at h = 0.64 → 1.64; 84% at h = 3.36 → 4.36.
    // Point 1 has one NaN draw: 10, 20, 30, 40 → median 25.
    const v = Float64Array.of(1, 10, 2, 20, 3, NaN, 4, 30, 5, 40);
    const b = pointwiseBand(v, 5, 2);
    expect(b.median[0]).toBe(3);
    expect(b.lo[0]).toBeCloseTo(1.64, 12);
    expect(b.hi[0]).toBeCloseTo(4.36, 12);
    expect(b.median[1]).toBe(25);
  });
});

describe("plotCommand", () => {
  test("plotCommand writes the SVG files of a run directory and prints their paths", async () => {
    const { manifest, chain } = syntheticRun();
    const dir = await Deno.makeTempDir({ prefix: "rvwalk-plot-test-" });
    try {
      await writeManifest(dir, manifest);
      await appendBlock(dir, {
        firstStep: 0,
        steps: chain.steps,
        walkers: chain.walkers,
        columns: chain.columns,
      }, chain.data);
      const printed: string[] = [];
      const log = console.log;
      console.log = (...a: unknown[]) => printed.push(a.join(" "));
      let code: number;
      try {
        code = await plotCommand.run([dir, "--burn", "10", "--draws", "8", "--params", "b.*"]);
      } finally {
        console.log = log;
      }
      expect(code).toBe(0);
      for (const f of ["rv", "phase_b", "rm_b", "corner", "trace", "periodogram"]) {
        const path = `${dir}/plots/${f}.svg`;
        expect(printed.some((l) => l.startsWith(path))).toBe(true);
        parseXml(await Deno.readTextFile(path));
      }
    } finally {
      await Deno.remove(dir, { recursive: true });
    }
  });
});
