/**
 * Fixture run snapshots for the dashboard tests, generated deterministically
 * from a small seeded generator. All names and numbers are invented; no
 * real star or real data.
 * @module
 */

import type { RunSnapshot, SnapshotDiagnostics, SnapshotParameter } from "../../tui/snapshot.ts";

/**
 * Small seeded uniform generator on [0, 1): the "mulberry32" 32-bit mixer
 * (a public-domain construction; common practice, no source). Good enough
 * for fixtures, not for science.
 */
export function seededUniform(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/**
 * Standard normal deviates by the Box–Muller transform (Box & Muller 1958,
 * Ann. Math. Statist. 29(2), 610): z = √(−2 ln u1) cos(2π u2).
 */
export function seededNormal(seed: number): () => number {
  const u = seededUniform(seed);
  return () => {
    const u1 = 1 - u(); // in (0, 1], so the log is finite
    const u2 = u();
    return Math.sqrt(-2 * Math.log(u1)) * Math.cos(2 * Math.PI * u2);
  };
}

/** Draws per parameter in the fixtures. */
export const FIXTURE_DRAWS = 2000;

/**
 * Earth masses per Jupiter mass from the IAU 2015 Resolution B3 nominal
 * values (GM)J = 1.2668653e17 m³/s² and (GM)E = 3.986004e14 m³/s²
 * (recalled from memory; only used to fill fixtures).
 */
const EARTH_PER_JUPITER = 1.2668653e17 / 3.986004e14;

interface ParameterPlan {
  readonly key: string;
  readonly unit: string;
  readonly mean: number;
  readonly sd: number;
}

const PLAN: readonly ParameterPlan[] = [
  { key: "b.period", unit: "d", mean: 3.524746, sd: 0.000021 },
  { key: "b.tc", unit: "d", mean: 2459000.42131, sd: 0.00042 },
  { key: "b.semiAmplitude", unit: "m/s", mean: 56.3, sd: 1.2 },
  { key: "b.sqrtEcosOmega", unit: "", mean: 0.05, sd: 0.06 },
  { key: "b.sqrtEsinOmega", unit: "", mean: -0.02, sd: 0.07 },
  { key: "b.lambda", unit: "deg", mean: 12.0, sd: 4.0 },
  { key: "b.vsini", unit: "km/s", mean: 4.3, sd: 0.3 },
  { key: "c.period", unit: "d", mean: 41.83, sd: 0.05 },
  { key: "c.semiAmplitude", unit: "m/s", mean: 12.1, sd: 1.5 },
  { key: "c.sqrtEcosOmega", unit: "", mean: 0.3, sd: 0.08 },
  { key: "c.sqrtEsinOmega", unit: "", mean: 0.2, sd: 0.09 },
  { key: "spectroA.offset", unit: "m/s", mean: -15.2, sd: 0.6 },
  { key: "spectroA.jitter", unit: "m/s", mean: 2.1, sd: 0.4 },
  { key: "spectroB.offset", unit: "m/s", mean: 3.4, sd: 0.9 },
  { key: "spectroB.jitter", unit: "m/s", mean: 3.3, sd: 0.6 },
];

/** Index of each fixture parameter by key. */
export const PARAMETER_INDEX: Readonly<Record<string, number>> = Object.fromEntries(
  PLAN.map((p, i) => [p.key, i]),
);

/** Correlation planted between c.sqrtEcosOmega and c.sqrtEsinOmega. */
export const PLANTED_CORRELATION = 0.6;

function makeDraws(seed: number, stuckFraction: number): Float64Array[] {
  const z = seededNormal(seed);
  const u = seededUniform(seed + 1);
  const draws = PLAN.map(() => new Float64Array(FIXTURE_DRAWS));
  const ci = PARAMETER_INDEX["c.sqrtEcosOmega"]!;
  const si = PARAMETER_INDEX["c.sqrtEsinOmega"]!;
  for (let k = 0; k < FIXTURE_DRAWS; k++) {
    const stuck = u() < stuckFraction;
    let previous = 0;
    PLAN.forEach((p, i) => {
      let e = z();
      if (i === si) {
        e = PLANTED_CORRELATION * previous + Math.sqrt(1 - PLANTED_CORRELATION ** 2) * e;
      }
      if (i === ci) previous = e;
      // A stuck walker sits 8 sd away from the bulk.
      draws[i]![k] = p.mean + p.sd * (stuck ? 8 : e);
    });
  }
  return draws;
}

function planetDraws(draws: readonly Float64Array[], seed: number) {
  const z = seededNormal(seed);
  const get = (key: string) => draws[PARAMETER_INDEX[key]!]!;
  const eccentricity = (prefix: string) => {
    const c = get(`${prefix}.sqrtEcosOmega`);
    const s = get(`${prefix}.sqrtEsinOmega`);
    return c.map((v, k) => v * v + s[k]! * s[k]!);
  };
  const msiniB = new Float64Array(FIXTURE_DRAWS).map(() => 0.482 + 0.012 * z());
  const msiniC = new Float64Array(FIXTURE_DRAWS).map(() => 0.291 + 0.036 * z());
  return [
    {
      name: "b",
      msiniMjup: msiniB,
      msiniMearth: msiniB.map((m) => m * EARTH_PER_JUPITER),
      aAu: new Float64Array(FIXTURE_DRAWS).map(() => 0.0451 + 0.0006 * z()),
      eccentricity: eccentricity("b"),
      lambdaDeg: get("b.lambda").slice(),
      psiDeg: new Float64Array(FIXTURE_DRAWS).map(() => 24 + 9 * z()),
    },
    {
      name: "c",
      msiniMjup: msiniC,
      msiniMearth: msiniC.map((m) => m * EARTH_PER_JUPITER),
      aAu: new Float64Array(FIXTURE_DRAWS).map(() => 0.232 + 0.003 * z()),
      eccentricity: eccentricity("c"),
    },
  ];
}

function trace(seed: number, lastStep: number, every: number, plateau: number) {
  const z = seededNormal(seed);
  const n = Math.floor(lastStep / every) + 1;
  const steps = new Float64Array(n);
  const values = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    steps[i] = i * every;
    values[i] = plateau - 900 * Math.exp(-steps[i]! / 1500) + 3 * z();
  }
  return { steps, values };
}

const parameters: readonly SnapshotParameter[] = PLAN.map((p) => ({ key: p.key, unit: p.unit }));

/** A finished, converged two-planet run; planet b has lambda and psi. */
export function convergedSnapshot(): RunSnapshot {
  const draws = makeDraws(20240611, 0);
  const u = seededUniform(7);
  const diagnostics: SnapshotDiagnostics[] = PLAN.map(() => {
    const tau = 35 + 25 * u();
    return {
      rhat: 1.001 + 0.005 * u(),
      essBulk: 1800 + 1700 * u(),
      essTail: 1500 + 1500 * u(),
      tau,
      stepsPerTau: 18000 / tau,
    };
  });
  return {
    dir: "runs/kestrel-41-two-planets",
    title: "Kestrel-41 (invented star), two planets + RM",
    state: "finished",
    step: 20000,
    totalSteps: 20000,
    walkers: 64,
    threads: 2,
    stepsPerSecond: 412.5,
    burn: 2000,
    acceptance: 0.318,
    stuckWalkers: [],
    parameters,
    draws,
    diagnostics,
    logPosteriorTrace: trace(99, 20000, 50, -1204.7),
    planets: planetDraws(draws, 31),
    thresholds: { rhat: 1.01, essBulk: 400, stepsPerTau: 50 },
    converged: true,
  };
}

/** Diagnostics of b.period in the unconverged fixture. */
export const UNCONVERGED_PERIOD: SnapshotDiagnostics = {
  rhat: 1.3,
  essBulk: 45,
  essTail: 31,
  tau: 120,
  stepsPerTau: 7.5,
};

/** Diagnostics of spectroA.jitter in the unconverged fixture: all in the warning bands. */
export const WARNING_JITTER: SnapshotDiagnostics = {
  rhat: 1.05,
  essBulk: 260,
  essTail: 210,
  tau: 30,
  stepsPerTau: 30,
};

/**
 * An early, unconverged run: b.period with R-hat 1.3 and low ESS,
 * spectroA.jitter in the warning bands, c.period not yet known (NaN),
 * walker 7 stuck (1/32 of the draws sit 8 sd away).
 */
export function unconvergedSnapshot(): RunSnapshot {
  const draws = makeDraws(777, 1 / 32);
  const diagnostics: SnapshotDiagnostics[] = PLAN.map((p) => {
    if (p.key === "b.period") return UNCONVERGED_PERIOD;
    if (p.key === "spectroA.jitter") return WARNING_JITTER;
    if (p.key === "c.period") {
      return { rhat: NaN, essBulk: NaN, essTail: NaN, tau: NaN, stepsPerTau: NaN };
    }
    return { rhat: 1.002, essBulk: 520, essTail: 480, tau: 14, stepsPerTau: 64 };
  });
  return {
    dir: "runs/kestrel-41-early",
    title: "Kestrel-41 (invented star), early look",
    state: "running",
    step: 1200,
    totalSteps: 20000,
    walkers: 32,
    threads: 2,
    stepsPerSecond: 85,
    burn: 300,
    acceptance: 0.142,
    stuckWalkers: [7],
    parameters,
    draws,
    diagnostics,
    logPosteriorTrace: trace(5, 1200, 10, -1230),
    planets: planetDraws(draws, 13),
    thresholds: { rhat: 1.01, essBulk: 400, stepsPerTau: 50 },
    converged: false,
  };
}
