/**
 * Generates the invented three-planet example (no real star): the fictitious
 * star Quellan-318 observed by two invented spectrographs, with three planted
 * Keplerian planets, a linear trend (an unseen distant companion), per-instrument
 * offsets and jitter. Sampling is nightly (near local midnight) with a yearly
 * gap when the star is behind the Sun, so the window function has its usual
 * 1-day and 1-year peaks.
 * Deterministic: `deno run -A examples/three_planets/make_data.ts` rewrites
 * data.csv and truth.json byte for byte (seedrandom seed "quellan-318").
 * @module
 */
import seedrandom from "seedrandom";
import { plantedRv } from "../_planted.ts";

const SEED = "quellan-318";
const rng = seedrandom(SEED);
/** Standard normal deviate (Box & Muller 1958, Ann. Math. Stat. 29, 610). */
const normal = () => {
  const u = 1 - rng();
  const v = rng();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
};

export const TRUTH = {
  star: "Quellan-318 (invented)",
  /** Used only for derived masses (no effect on the velocities). */
  star_mass_msun: 0.87,
  seed: SEED,
  planets: [
    {
      name: "b",
      period: 6.842,
      tc: 2459603.415,
      semi_amplitude: 5.6,
      eccentricity: 0.06,
      omega_deg: 70,
    },
    {
      name: "c",
      period: 52.71,
      tc: 2459631.2,
      semi_amplitude: 8.3,
      eccentricity: 0.22,
      omega_deg: -40,
    },
    {
      name: "d",
      period: 812.0,
      tc: 2460118.0,
      semi_amplitude: 21.4,
      eccentricity: 0.18,
      omega_deg: 150,
    },
  ],
  /** Linear trend slope, m/s/d, about reference_time. */
  trend: { slope: 0.0112, reference_time: 2460200 },
  instruments: [
    {
      name: "lyraSpec",
      offset: 21.3,
      jitter: 1.5,
      n: 115,
      from: 2459000,
      to: 2461400,
      err: [1.4, 2.8],
    },
    {
      name: "corvoHRS",
      offset: -105.8,
      jitter: 2.5,
      n: 75,
      from: 2460150,
      to: 2461400,
      err: [2.2, 3.8],
    },
  ],
};

/** Days of each year (phase from this epoch) when the star is too close to the Sun. */
const GAP = { epoch: 2459100, length: 95 };
const YEAR = 365.25;

const rows: { t: number; v: number; s: number; inst: string }[] = [];
for (const ins of TRUTH.instruments) {
  const times = new Float64Array(ins.n);
  for (let i = 0; i < ins.n;) {
    const night = Math.floor(ins.from + (ins.to - ins.from) * rng());
    const phase = (((night - GAP.epoch) % YEAR) + YEAR) % YEAR;
    if (phase < GAP.length) continue; // not observable
    // Within three hours of local midnight (night + 0.5 d), rounded to ~9 s.
    const t = night + 0.5 + (rng() - 0.5) * 0.25;
    times[i++] = Math.round(t * 1e4) / 1e4;
  }
  times.sort();
  const model = plantedRv(times, TRUTH.planets);
  for (let i = 0; i < ins.n; i++) {
    const s = ins.err[0]! + (ins.err[1]! - ins.err[0]!) * rng();
    const noise = Math.sqrt(s * s + ins.jitter * ins.jitter) * normal();
    const trend = TRUTH.trend.slope * (times[i]! - TRUTH.trend.reference_time);
    rows.push({ t: times[i]!, v: model[i]! + ins.offset + trend + noise, s, inst: ins.name });
  }
}
rows.sort((a, b) => a.t - b.t);

if (import.meta.main) {
  const dir = new URL(".", import.meta.url).pathname;
  const csv = [
    "# Invented example data: star Quellan-318 and its instruments are fictitious.",
    "# Three planted planets and a linear trend; see truth.json and make_data.ts.",
    "time,rv,rv_err,instrument",
    ...rows.map((r) => `${r.t.toFixed(4)},${r.v.toFixed(2)},${r.s.toFixed(2)},${r.inst}`),
  ].join("\n") + "\n";
  await Deno.writeTextFile(`${dir}data.csv`, csv);
  await Deno.writeTextFile(`${dir}truth.json`, JSON.stringify(TRUTH, null, 2) + "\n");
  console.log(`wrote ${rows.length} rows to ${dir}data.csv`);
}
