/**
 * The RM anomaly wired through the spec and the compiled model, and through a
 * real run: `[planet.rm]` → CompiledModel.predict() → run manifest → summary.
 *
 * Reference computations are written here: the Keplerian with a bisection
 * Kepler solver, the time of periastron from the time of conjunction and the
 * orbital inclination from the impact parameter, each from its textbook
 * definition. The RM anomaly itself is checked against a brute-force disk
 * integration in rm.test.ts; here addRmAnomaly() is called directly with the
 * physical parameters, so what is tested is the wiring (units, slot order,
 * epoch conversion, transit window, fixed versus sampled values).
 */
import seedrandom from "seedrandom";
import { describe, expect, test } from "vitest";
import { runCli } from "../_cli.ts";
import { parseRvCsv } from "../../src/data/mod.ts";
import { CompiledModel } from "../../src/model/posterior.ts";
import { addRmAnomaly, type RmParams } from "../../src/model/rm.ts";
import { parseSpecText, resolveProblem } from "../../src/spec/mod.ts";

const DEG = Math.PI / 180;

// The planted system (invented; no real star).
const TRUTH = {
  period: 2.83,
  tc: 2460100.37,
  semiAmplitude: 120,
  eccentricity: 0.12,
  omegaDeg: 65,
  lambdaDeg: 30,
  vsini: 7,
  radiusRatio: 0.11,
  aOverRstar: 7.5,
  impact: 0.45,
  u1: 0.35,
  u2: 0.28,
  exposureS: 600,
  offsetA: -15.5,
  offsetB: 22.25,
};

// ---------------------------------------------------------------------------
// Independent reference geometry.
// ---------------------------------------------------------------------------

/** Eccentric anomaly by bisection on E − e sin E − M, monotone in E (Kepler's equation). */
function eccentricAnomaly(meanAnomaly: number, e: number): number {
  const m = meanAnomaly - 2 * Math.PI * Math.floor(meanAnomaly / (2 * Math.PI));
  let lo = 0;
  let hi = 2 * Math.PI;
  for (let i = 0; i < 200; i++) {
    const mid = 0.5 * (lo + hi);
    if (mid - e * Math.sin(mid) - m > 0) hi = mid;
    else lo = mid;
  }
  return 0.5 * (lo + hi);
}

/** True anomaly from E: tan(ν/2) = √((1+e)/(1−e)) tan(E/2) (Murray & Dermott 1999, eq. 2.46; recalled). */
function trueAnomaly(ecc: number, e: number): number {
  return 2 * Math.atan2(Math.sqrt(1 + e) * Math.sin(ecc / 2), Math.sqrt(1 - e) * Math.cos(ecc / 2));
}

/**
 * Time of periastron from the time of conjunction. Conjunction (transit) is
 * where the star's RV v = K[cos(ν + ω) + e cos ω] has its cos(ν + ω) term at a
 * falling zero, ν = π/2 − ω (common practice, no source); the mean anomaly
 * there follows from the half-angle relation inverted and Kepler's equation.
 */
function periastronFromConjunction(tc: number, period: number, e: number, omega: number): number {
  const nu = Math.PI / 2 - omega;
  const ecc = 2 * Math.atan(Math.sqrt((1 - e) / (1 + e)) * Math.tan(nu / 2));
  const m = ecc - e * Math.sin(ecc);
  return tc - (period * m) / (2 * Math.PI);
}

/** Keplerian RV (m/s): v = K[cos(ν + ω) + e cos ω] (Lovis & Fischer 2010, in Exoplanets, ed. Seager; recalled). */
function keplerianAt(t: number, tp: number): number {
  const { period, semiAmplitude: k, eccentricity: e } = TRUTH;
  const omega = TRUTH.omegaDeg * DEG;
  const nu = trueAnomaly(eccentricAnomaly((2 * Math.PI * (t - tp)) / period, e), e);
  return k * (Math.cos(nu + omega) + e * Math.cos(omega));
}

/**
 * Sky separation (stellar radii) of planet and star and whether the planet is
 * in front: X = −r cos(ω+ν), Y = −r sin(ω+ν) cos i, Z = r sin(ω+ν) sin i
 * (Winn 2010, arXiv:1001.2010, eqs. 2–4; recalled), r from the ellipse
 * equation r = a(1 − e²)/(1 + e cos ν), cos i from b = r(ν = π/2 − ω) cos i.
 */
function skySeparation(t: number, tp: number): { d: number; front: boolean } {
  const { period, eccentricity: e, aOverRstar: a, impact: b } = TRUTH;
  const omega = TRUTH.omegaDeg * DEG;
  const nu = trueAnomaly(eccentricAnomaly((2 * Math.PI * (t - tp)) / period, e), e);
  const r = (a * (1 - e * e)) / (1 + e * Math.cos(nu));
  const rc = (a * (1 - e * e)) / (1 + e * Math.sin(omega));
  const cosI = b / rc;
  const x = -r * Math.cos(omega + nu);
  const y = -r * Math.sin(omega + nu) * cosI;
  return { d: Math.hypot(x, y), front: Math.sin(omega + nu) > 0 };
}

// ---------------------------------------------------------------------------
// The problem: two instruments, one dense transit night, a month of nights.
// ---------------------------------------------------------------------------

const TIMES: number[] = [];
const INST: string[] = [];
{
  const rng = seedrandom("rm-integration-times");
  for (let i = 0; i < 24; i++) {
    TIMES.push(2460090 + 40 * rng());
    INST.push("specA");
  }
  // The transit two periods after tc, 600 s exposures every 650 s.
  const mid = TRUTH.tc + 2 * TRUTH.period;
  for (let i = 0; i < 36; i++) {
    TIMES.push(mid - 0.16 + (i * 650) / 86400);
    INST.push("specB");
  }
}

function csvText(): string {
  const rows = TIMES.map((t, i) => `${t.toFixed(6)},0,2,${INST[i]}`);
  return ["time,rv,rv_err,instrument", ...rows].join("\n") + "\n";
}

function value(x: number, free: boolean, range: [number, number]): string {
  return free ? `{ uniform = [${range[0]}, ${range[1]}], start = ${x} }` : `${x}`;
}

/** Spec text; `freeRm` samples the RM quantities, `rm: false` drops the table. */
function specText(
  options: { freeRm: boolean; rm?: boolean; lambdaDeg?: number; epoch?: "tc" | "tp" },
): string {
  const f = options.freeRm;
  const lambdaDeg = options.lambdaDeg ?? TRUTH.lambdaDeg;
  const epoch = options.epoch === "tp"
    ? `tp = { uniform = [2460099, 2460101] }`
    : `tc = { uniform = [2460100, 2460101] }`;
  const rm = options.rm === false ? "" : `
[planet.rm]
lambda_deg = ${value(lambdaDeg, f, [-180, 180])}
vsini_kms = ${value(TRUTH.vsini, f, [0.5, 30])}
radius_ratio = ${value(TRUTH.radiusRatio, f, [0.01, 0.3])}
a_over_rstar = ${value(TRUTH.aOverRstar, f, [2, 30])}
impact = ${value(TRUTH.impact, f, [0, 1])}
limb_darkening = [${value(TRUTH.u1, f, [0, 1])}, ${value(TRUTH.u2, f, [-0.5, 1])}]
exposure_s = ${TRUTH.exposureS}
`;
  return `
title = "rm integration (invented)"
[star]
mass_msun = { normal = [1.0, 0.05] }
[data]
files = ["data.csv"]
[[instrument]]
name = "specA"
offset = { uniform = [-100, 100] }
jitter = { loguniform = [0.1, 10] }
[[instrument]]
name = "specB"
offset = { uniform = [-100, 100] }
jitter = { loguniform = [0.1, 10] }
[[planet]]
name = "b"
period = { uniform = [2.5, 3.0] }
${epoch}
semi_amplitude = { uniform = [1, 300] }
eccentricity = { uniform = [0, 0.5] }
omega_deg = { uniform = [-180, 180] }
${rm}`;
}

function compile(spec: string): CompiledModel {
  const written = parseSpecText(spec, { file: "inline.toml", dir: "/nonexistent" });
  const problem = resolveProblem(written, parseRvCsv(csvText(), { file: "data.csv" }));
  return new CompiledModel({ spec: problem.spec, data: problem.data });
}

/** Physical free vector from named values (every free key must be named). */
function physOf(model: CompiledModel, values: Record<string, number>): Float64Array {
  return Float64Array.from(model.keys, (k) => {
    const v = values[k];
    if (v === undefined) throw new Error(`test has no value for ${k}`);
    return v;
  });
}

function namedValues(epochValue: number, lambdaDeg = TRUTH.lambdaDeg): Record<string, number> {
  return {
    "b.period": TRUTH.period,
    "b.tc": epochValue,
    "b.tp": epochValue,
    "b.semi_amplitude": TRUTH.semiAmplitude,
    "b.eccentricity": TRUTH.eccentricity,
    "b.omega_deg": TRUTH.omegaDeg,
    "b.lambda_deg": lambdaDeg,
    "b.vsini_kms": TRUTH.vsini,
    "b.radius_ratio": TRUTH.radiusRatio,
    "b.a_over_rstar": TRUTH.aOverRstar,
    "b.impact": TRUTH.impact,
    "b.u1": TRUTH.u1,
    "b.u2": TRUTH.u2,
    "specA.offset": TRUTH.offsetA,
    "specA.jitter": 1,
    "specB.offset": TRUTH.offsetB,
    "specB.jitter": 1,
  };
}

function predictAll(model: CompiledModel, phys: Float64Array): Float64Array {
  const out = new Float64Array(model.data.count);
  expect(model.predict(phys, out)).toBe(true);
  return out;
}

/** The RM anomaly at the model's data times, from addRmAnomaly() with physical inputs. */
function directAnomaly(model: CompiledModel, lambdaDeg = TRUTH.lambdaDeg): Float64Array {
  const params: RmParams = {
    period: TRUTH.period,
    timeConjunction: TRUTH.tc,
    eccentricity: TRUTH.eccentricity,
    argPeriastron: TRUTH.omegaDeg * DEG,
    lambda: lambdaDeg * DEG,
    vsini: TRUTH.vsini,
    radiusRatio: TRUTH.radiusRatio,
    aOverRstar: TRUTH.aOverRstar,
    impact: TRUTH.impact,
    u1: TRUTH.u1,
    u2: TRUTH.u2,
    exposure: TRUTH.exposureS,
  };
  const out = new Float64Array(model.data.count);
  addRmAnomaly(model.data.time, params, { out });
  return out;
}

/**
 * Split the data into points whose whole exposure is clear of the stellar disk
 * (or behind it) and points whose mid-exposure is well inside the transit,
 * from the reference geometry (61 samples across each 600 s exposure).
 */
function transitMembership(
  times: Float64Array,
  tp: number,
): { inside: number[]; outside: number[] } {
  const inside: number[] = [];
  const outside: number[] = [];
  const k = TRUTH.radiusRatio;
  const half = TRUTH.exposureS / 2 / 86400;
  times.forEach((t, i) => {
    let clear = true;
    for (let j = 0; j <= 60; j++) {
      const s = skySeparation(t - half + (j / 60) * 2 * half, tp);
      if (s.front && s.d < 1 + k + 1e-3) clear = false;
    }
    const mid = skySeparation(t, tp);
    if (clear) outside.push(i);
    else if (mid.front && mid.d < 1 - k) inside.push(i);
  });
  return { inside, outside };
}

// Absolute times near 2.46e6 d carry a rounding of ~4.7e-10 d (one ulp); the
// steepest RM slope here is below ~1e4 m/s/d and the Keplerian's ~3e2 m/s/d,
// and the bisection solver is exact to ~1e-15 rad. So independent routes to
// the same prediction agree to ~1e-5 m/s; 1e-4 m/s is the bound used.
const ROUTE_TOLERANCE = 1e-4;

describe("CompiledModel.predict() with a [planet.rm] table", () => {
  const tp = periastronFromConjunction(
    TRUTH.tc,
    TRUTH.period,
    TRUTH.eccentricity,
    TRUTH.omegaDeg * DEG,
  );

  test("CompiledModel.predict() equals Keplerian + addRmAnomaly() + offset, recomputed independently", () => {
    const model = compile(specText({ freeRm: true }));
    const predicted = predictAll(model, physOf(model, namedValues(TRUTH.tc)));
    const rm = directAnomaly(model);
    const { inside, outside } = transitMembership(model.data.time, tp);
    // The scenario must exercise both sides, else the test could not fail.
    expect(inside.length).toBeGreaterThanOrEqual(10);
    expect(outside.length).toBeGreaterThanOrEqual(24 + 10);
    let maxRm = 0;
    for (let i = 0; i < model.data.count; i++) {
      const t = model.data.time[i]!;
      const offset = model.data.instrument[i] === 0 ? TRUTH.offsetA : TRUTH.offsetB;
      const expected = keplerianAt(t, tp) + rm[i]! + offset;
      expect(Math.abs(predicted[i]! - expected)).toBeLessThan(ROUTE_TOLERANCE);
      maxRm = Math.max(maxRm, Math.abs(rm[i]!));
    }
    // Nothing added outside the transit; a real anomaly inside it.
    for (const i of outside) expect(rm[i]).toBe(0);
    for (const i of inside) expect(Math.abs(rm[i]!)).toBeGreaterThan(1);
    // Order of magnitude of the anomaly, (Rp/R★)² v sin i★ (Gaudi & Winn 2007,
    // ApJ 655, 550, eq. 1 without the √(1 − b²) and limb-darkening factors):
    // 0.0121 · 7000 m/s ≈ 85 m/s; the peak lies between a third and all of it.
    const scale = TRUTH.radiusRatio ** 2 * TRUTH.vsini * 1000;
    expect(maxRm).toBeGreaterThan(scale / 3);
    expect(maxRm).toBeLessThan(scale);
  });

  test("CompiledModel.predict() is exactly the Keplerian model outside the transit", () => {
    const withRm = compile(specText({ freeRm: true }));
    const without = compile(specText({ freeRm: true, rm: false }));
    const a = predictAll(withRm, physOf(withRm, namedValues(TRUTH.tc)));
    const b = predictAll(without, physOf(without, namedValues(TRUTH.tc)));
    const rm = directAnomaly(withRm);
    const { inside, outside } = transitMembership(withRm.data.time, tp);
    for (const i of outside) expect(a[i]).toBe(b[i]);
    // Inside, the difference is the anomaly (one rounding of a sum of ~100 m/s terms).
    for (const i of inside) expect(Math.abs(a[i]! - b[i]! - rm[i]!)).toBeLessThan(1e-9);
    // And the Keplerian-only model matches the reference Keplerian everywhere.
    for (let i = 0; i < without.data.count; i++) {
      const offset = without.data.instrument[i] === 0 ? TRUTH.offsetA : TRUTH.offsetB;
      const t = without.data.time[i]!;
      expect(Math.abs(b[i]! - keplerianAt(t, tp) - offset)).toBeLessThan(ROUTE_TOLERANCE);
    }
  });

  test("CompiledModel.predict() gives the same numbers for fixed RM values and sampled ones", () => {
    const fixed = compile(specText({ freeRm: false }));
    const free = compile(specText({ freeRm: true }));
    const rmKeys = [
      "b.lambda_deg",
      "b.vsini_kms",
      "b.radius_ratio",
      "b.a_over_rstar",
      "b.impact",
      "b.u1",
      "b.u2",
    ];
    for (const k of rmKeys) {
      expect(fixed.keys).not.toContain(k);
      expect(free.keys).toContain(k);
    }
    expect(free.dimensions - fixed.dimensions).toBe(rmKeys.length);
    const a = predictAll(fixed, physOf(fixed, namedValues(TRUTH.tc)));
    const b = predictAll(free, physOf(free, namedValues(TRUTH.tc)));
    for (let i = 0; i < a.length; i++) expect(a[i]).toBe(b[i]);
    // Moving a sampled RM value changes only in-transit predictions.
    const shifted = predictAll(free, physOf(free, namedValues(TRUTH.tc, TRUTH.lambdaDeg + 20)));
    const { inside, outside } = transitMembership(free.data.time, tp);
    for (const i of outside) expect(shifted[i]).toBe(b[i]);
    expect(inside.some((i) => Math.abs(shifted[i]! - b[i]!) > 1)).toBe(true);
  });

  test("CompiledModel.predict() with a tp epoch matches the tc epoch it converts to", () => {
    const byTc = compile(specText({ freeRm: true }));
    const byTp = compile(specText({ freeRm: true, epoch: "tp" }));
    const a = predictAll(byTc, physOf(byTc, namedValues(TRUTH.tc)));
    const b = predictAll(byTp, physOf(byTp, namedValues(tp)));
    for (let i = 0; i < a.length; i++) {
      expect(Math.abs(a[i]! - b[i]!)).toBeLessThan(ROUTE_TOLERANCE);
    }
  });

  test("CompiledModel.predict() makes the mid-transit anomaly negative for b > 0, λ > 0", () => {
    // Sign convention of issue 8: with b > 0 and λ > 0 the chord lies more over
    // the receding half, so the anomaly at mid-transit is negative; λ → −λ
    // mirrors it.
    const withRm = compile(specText({ freeRm: true }));
    const without = compile(specText({ freeRm: true, rm: false }));
    const times = withRm.data.time;
    const mid = TRUTH.tc + 2 * TRUTH.period;
    let iMid = 0;
    for (let i = 0; i < times.length; i++) {
      if (Math.abs(times[i]! - mid) < Math.abs(times[iMid]! - mid)) iMid = i;
    }
    const base = predictAll(without, physOf(without, namedValues(TRUTH.tc)))[iMid]!;
    const plus = predictAll(withRm, physOf(withRm, namedValues(TRUTH.tc, 30)))[iMid]! - base;
    const minus = predictAll(withRm, physOf(withRm, namedValues(TRUTH.tc, -30)))[iMid]! - base;
    expect(plus).toBeLessThan(-1);
    expect(minus).toBeGreaterThan(1);
  });
});

describe("parseSpecText() on [planet.rm]", () => {
  test("parseSpecText() rejects a negative exposure_s and reads 0 as no smearing", () => {
    const withExposure = (x: number) =>
      specText({ freeRm: false }).replace(/exposure_s = .*/, `exposure_s = ${x}`);
    expect(() => parseSpecText(withExposure(-600), { file: "inline.toml", dir: "/x" }))
      .toThrow(/exposure_s.*found -600: expected seconds ≥ 0/);
    const written = parseSpecText(withExposure(0), { file: "inline.toml", dir: "/x" });
    expect(written.planets[0]!.rm!.exposureS).toBe(0);
  });
});

// ---------------------------------------------------------------------------
// A real (short) run through the CLI.
// ---------------------------------------------------------------------------

const cli = (args: string[]) => runCli(args);

/** Quantile by Hyndman & Fan (1996, Am. Stat. 50, 361) definition 7, written here. */
function quantile(values: number[], p: number): number {
  const s = [...values].sort((a, b) => a - b);
  const h = (s.length - 1) * p;
  const lo = Math.floor(h);
  const hi = Math.min(lo + 1, s.length - 1);
  return s[lo]! + (h - lo) * (s[hi]! - s[lo]!);
}

const RUN_SPEC = `
title = "rm cli integration (invented star)"
[star]
mass_msun = { normal = [1.0, 0.05] }
radius_rsun = { normal = [1.0, 0.05] }
rotation_period_days = { normal = [10, 0.5] }
[data]
files = ["data.csv"]
[[instrument]]
name = "specA"
offset = { uniform = [-100, 100], start = 0 }
jitter = { loguniform = [0.1, 10], start = 1 }
[[instrument]]
name = "specB"
offset = { uniform = [-100, 100], start = 0 }
jitter = { loguniform = [0.1, 10], start = 1 }
[[planet]]
name = "b"
period = { normal = [${TRUTH.period}, 0.0005] }
tc = { normal = [${TRUTH.tc}, 0.001] }
semi_amplitude = { uniform = [1, 300], start = 110 }
eccentricity = { uniform = [0, 0.5], start = 0.1 }
omega_deg = { uniform = [-180, 180], start = 60 }
[planet.rm]
lambda_deg = { uniform = [-180, 180], start = 20 }
vsini_kms = { uniform = [0.5, 30], start = 4 }
radius_ratio = { normal = [${TRUTH.radiusRatio}, 0.003] }
a_over_rstar = { normal = [${TRUTH.aOverRstar}, 0.2] }
impact = { truncnormal = [${TRUTH.impact}, 0.05, 0, 1] }
limb_darkening = [${TRUTH.u1}, ${TRUTH.u2}]
exposure_s = ${TRUTH.exposureS}
`;

describe("rvwalk run + summary on a spec with [planet.rm]", () => {
  test(
    "run writes RM keys as manifest columns and summary --json reports derived inclination, mass and ψ",
    async () => {
      // Invented data from the planted system (vsini 4 km/s so that with R★ = 1,
      // P_rot = 10 d the naive sin i★ = 0.79 < 1 and ψ is defined).
      const dir = await Deno.makeTempDir({ prefix: "rvwalk-rm-int-" });
      try {
        const model = compile(specText({ freeRm: true }));
        const values = { ...namedValues(TRUTH.tc), "b.vsini_kms": 4 };
        const clean = predictAll(model, physOf(model, values));
        const rng = seedrandom("rm-integration-noise");
        const rows = Array.from(model.data.time, (t, i) => {
          const noise = 2 * Math.sqrt(-2 * Math.log(1 - rng())) * Math.cos(2 * Math.PI * rng());
          const inst = model.data.instrument[i] === 0 ? "specA" : "specB";
          return `${t.toFixed(6)},${(clean[i]! + noise).toFixed(3)},2,${inst}`;
        });
        await Deno.writeTextFile(
          `${dir}/data.csv`,
          ["time,rv,rv_err,instrument", ...rows].join("\n"),
        );
        await Deno.writeTextFile(`${dir}/spec.toml`, RUN_SPEC);

        const run = await cli([
          "run",
          `${dir}/spec.toml`,
          "--out",
          `${dir}/run`,
          "--steps",
          "60",
          "--walkers",
          "32",
          "--threads",
          "1",
          "--no-ui",
        ]);
        expect(run.code, run.stderr).toBe(0);

        const manifest = JSON.parse(await Deno.readTextFile(`${dir}/run/manifest.json`));
        for (const k of ["lambda_deg", "vsini_kms", "radius_ratio", "a_over_rstar", "impact"]) {
          expect(manifest.columns).toContain(`b.${k}`);
        }

        const burn = 20;
        const summary = await cli(["summary", `${dir}/run`, "--json", "--burn", String(burn)]);
        expect(summary.code, summary.stderr).toBe(0);
        const s = JSON.parse(summary.stdout);
        for (const k of ["lambda_deg", "vsini_kms", "radius_ratio", "a_over_rstar", "impact"]) {
          expect(Number.isFinite(s.parameters[`b.${k}`].median)).toBe(true);
        }
        for (const k of ["inclination_deg", "mass_mjup", "psi_deg"]) {
          expect(s.derived, k).toHaveProperty(`b.${k}`);
        }

        // Derived inclination, sample by sample from the exported chain:
        // b = r_c cos i with r_c = a(1 − e²)/(1 + e sin ω) (ellipse at ν = π/2 − ω).
        const exported = await cli(["export", `${dir}/run`, "--csv", "-", "--burn", String(burn)]);
        expect(exported.code, exported.stderr).toBe(0);
        const [header, ...lines] = exported.stdout.trim().split("\n");
        const cols = header!.split(",");
        const col = (k: string) => cols.indexOf(k);
        const inclinations = lines.map((line) => {
          const f = line.split(",").map(Number);
          const e = f[col("b.eccentricity")]!;
          const w = f[col("b.omega_deg")]! * DEG;
          const cosI = (f[col("b.impact")]! * (1 + e * Math.sin(w))) /
            (f[col("b.a_over_rstar")]! * (1 - e * e));
          return Math.acos(cosI) / DEG;
        });
        expect(inclinations.length).toBe((60 - burn) * 32);
        const incl = s.derived["b.inclination_deg"];
        for (const [p, got] of [[0.16, incl.lo68], [0.5, incl.median], [0.84, incl.hi68]]) {
          const want = quantile(inclinations, p as number);
          expect(Math.abs((got as number) - want)).toBeLessThan(1e-9 * want);
        }
        // True mass ≥ m sin i, by ≈ 1/sin i (the planet-mass term of the mass
        // function changes this by ~m/M★ ≈ 1e-3; common practice, no source).
        const ratio = s.derived["b.mass_mjup"].median / s.derived["b.msini_mjup"].median;
        expect(Math.abs(ratio * Math.sin(incl.median * DEG) - 1)).toBeLessThan(5e-3);
        // ψ is an angle between two axes: within [0°, 180°].
        const psi = s.derived["b.psi_deg"];
        expect(psi.lo95).toBeGreaterThanOrEqual(0);
        expect(psi.hi95).toBeLessThanOrEqual(180);
      } finally {
        await Deno.remove(dir, { recursive: true });
      }
    },
    60_000,
  );
});
