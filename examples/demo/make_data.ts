/**
 * Generates the invented demo data set (no real star): the fictitious star
 * Tavi-2207 observed by two invented spectrographs, with two planted planets.
 * Deterministic: `deno run -A examples/demo/make_data.ts` rewrites data.csv
 * and truth.json byte for byte.
 * @module
 */
import seedrandom from "seedrandom";
import { plantedRv } from "../_planted.ts";

const rng = seedrandom("tavi-2207-demo-2");
const normal = () => {
  const u = 1 - rng();
  const v = rng();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
};

export const TRUTH = {
  star: "Tavi-2207 (invented)",
  planets: [
    {
      name: "b",
      period: 12.37,
      tc: 2460512.31,
      semi_amplitude: 14.2,
      eccentricity: 0.08,
      omega_deg: 40,
    },
    {
      name: "c",
      period: 428.0,
      tc: 2460705.8,
      semi_amplitude: 37.5,
      eccentricity: 0.41,
      omega_deg: 118,
    },
  ],
  instruments: [
    {
      name: "spectroA",
      offset: -12.4,
      jitter: 2.0,
      n: 70,
      from: 2459800,
      to: 2461300,
      err: [1.2, 2.5],
    },
    {
      name: "spectroB",
      offset: 31.7,
      jitter: 3.2,
      n: 50,
      from: 2460400,
      to: 2461300,
      err: [2.5, 4.0],
    },
  ],
};

const rows: { t: number; v: number; s: number; inst: string }[] = [];
for (const ins of TRUTH.instruments) {
  const times = new Float64Array(ins.n);
  for (let i = 0; i < ins.n; i++) {
    // Nightly-ish sampling: uniform in time, rounded to 4 decimals (about 9 s).
    times[i] = Math.round((ins.from + (ins.to - ins.from) * rng()) * 1e4) / 1e4;
  }
  times.sort();
  const model = plantedRv(times, TRUTH.planets);
  for (let i = 0; i < ins.n; i++) {
    const s = ins.err[0]! + (ins.err[1]! - ins.err[0]!) * rng();
    const noise = Math.sqrt(s * s + ins.jitter * ins.jitter) * normal();
    rows.push({ t: times[i]!, v: model[i]! + ins.offset + noise, s, inst: ins.name });
  }
}
rows.sort((a, b) => a.t - b.t);

if (import.meta.main) {
  const dir = new URL(".", import.meta.url).pathname;
  const csv = [
    "# Invented demo data: star Tavi-2207 and its instruments are fictitious.",
    "time,rv,rv_err,instrument",
    ...rows.map((r) => `${r.t.toFixed(4)},${r.v.toFixed(2)},${r.s.toFixed(2)},${r.inst}`),
  ].join("\n") + "\n";
  await Deno.writeTextFile(`${dir}data.csv`, csv);
  await Deno.writeTextFile(`${dir}truth.json`, JSON.stringify(TRUTH, null, 2) + "\n");
  console.log(`wrote ${rows.length} rows to ${dir}data.csv`);
}
