import { describe, expect, test } from "vitest";
import type { RvTable } from "../../src/data/mod.ts";
import { parseRvCsv } from "../../src/data/mod.ts";
import { CompiledModel } from "../../src/model/posterior.ts";
import { fillStartValues, mapFit } from "../../src/search/mod.ts";
import { loadProblem, parseSpecText, resolveProblem } from "../../src/spec/mod.ts";
import { readTruth, THREE_PLANETS } from "./_cli.ts";
import { leastSquaresChi2, randomTimes, testRandom } from "./_random.ts";

/** Invented two-instrument data with a linear trend and no planet. */
function trendTable(): { table: RvTable; tRef: number; jitter: number } {
  const random = testRandom("map-fit-trend");
  const n = 40;
  const time = randomTimes(random, n, 2458000, 900);
  const tRef = 2458450, jitter = 1.5;
  const rows = ["time,rv,rv_err,instrument"];
  for (let i = 0; i < n; i++) {
    const inst = i % 3 === 0 ? "specB" : "specA";
    const err = Number((1 + random.uniform()).toFixed(3));
    const offset = inst === "specA" ? 12.5 : -40;
    const v = offset + 0.021 * (time[i]! - tRef) +
      Math.sqrt(err ** 2 + jitter ** 2) * random.normal();
    rows.push(`${time[i]!.toFixed(5)},${v.toFixed(4)},${err},${inst}`);
  }
  return { table: parseRvCsv(rows.join("\n"), { file: "invented.csv" }), tRef, jitter };
}

/** Inverse of a small symmetric positive-definite matrix by Gauss–Jordan elimination. */
function inverse(a: number[][]): number[][] {
  const p = a.length;
  const m = a.map((row, i) => [...row, ...row.map((_, j) => (i === j ? 1 : 0))]);
  for (let k = 0; k < p; k++) {
    const piv = m[k]![k]!;
    for (let c = 0; c < 2 * p; c++) m[k]![c]! /= piv;
    for (let r = 0; r < p; r++) {
      if (r === k) continue;
      const f = m[r]![k]!;
      for (let c = 0; c < 2 * p; c++) m[r]![c]! -= f * m[k]![c]!;
    }
  }
  return m.map((row) => row.slice(p));
}

describe("mapFit()", () => {
  test("mapFit() finds the weighted least-squares offsets and slope of a linear model", () => {
    // With flat (uniform) priors, fixed jitter and identity transforms the log-posterior is
    // -chi^2/2 + const, so its maximum is the weighted least-squares solution (Gauss-Markov;
    // e.g. Press et al. 2007, Numerical Recipes 3rd ed., Sect. 15.4), computed here
    // independently by the normal equations.
    const { table, tRef, jitter } = trendTable();
    const text = `title = "invented"
[star]
mass_msun = 1.0
[data]
files = ["none.csv"]
[[instrument]]
name = "specA"
offset = { uniform = [-500, 500], start = 0 }
jitter = ${jitter}
[[instrument]]
name = "specB"
offset = { uniform = [-500, 500], start = 0 }
jitter = ${jitter}
[trend]
slope = { uniform = [-1, 1], start = 0 }
reference_time = ${tRef}
`;
    const problem = resolveProblem(parseSpecText(text, { file: "t.toml", dir: "/" }), table);
    const model = new CompiledModel({ spec: problem.spec, data: problem.data });
    expect(model.keys).toEqual(["specA.offset", "specB.offset", "trend.slope"]);
    const result = mapFit(model, model.startInternal());

    const n = table.time.length;
    const cols = [new Float64Array(n), new Float64Array(n), new Float64Array(n)];
    const w = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      cols[table.instruments[table.instrumentIndex[i]!] === "specA" ? 0 : 1]![i] = 1;
      cols[2]![i] = table.time[i]! - tRef;
      w[i] = 1 / (table.rvErr[i]! ** 2 + jitter ** 2);
    }
    const wls = leastSquaresChi2(cols, table.rv, w);
    // Standard errors: sqrt of the diagonal of (X^T W X)^-1 (same source).
    const normal = cols.map((a) =>
      cols.map((b) => a.reduce((s, x, i) => s + w[i]! * x * b[i]!, 0))
    );
    const cov = inverse(normal);
    // Bound: the simplex stops when values agree to ~1e-12 relative, i.e. within ~1e-5 of a
    // standard error of the optimum; allow 1e-3 standard errors.
    for (let j = 0; j < 3; j++) {
      const se = Math.sqrt(cov[j]![j]!);
      expect(Math.abs(result.physical[j]! - wls.beta[j]!)).toBeLessThan(1e-3 * se);
    }
    const atWls = model.logPosterior(Float64Array.from(wls.beta));
    expect(Math.abs(result.logPosterior - atWls)).toBeLessThan(1e-6);
    expect(result.logPosterior).toBeGreaterThan(result.startLogPosterior);
  });

  test("mapFit() throws RangeError for a start outside the prior", () => {
    const { table } = trendTable();
    const text = `title = "invented"
[star]
mass_msun = 1.0
[data]
files = ["none.csv"]
[[instrument]]
name = "specA"
offset = { uniform = [-500, 500] }
[[instrument]]
name = "specB"
offset = { uniform = [-500, 500] }
`;
    const problem = resolveProblem(parseSpecText(text, { file: "t.toml", dir: "/" }), table);
    const model = new CompiledModel({ spec: problem.spec, data: problem.data });
    const start = model.startInternal();
    start[0] = 600; // outside uniform [-500, 500]
    expect(() => mapFit(model, start)).toThrow(RangeError);
    expect(() => mapFit(model, new Float64Array(1))).toThrow(RangeError);
  });
});

describe("fillStartValues()", () => {
  test("fillStartValues() fills missing starts on the three-planet data and beats the planted orbit", async () => {
    // Invented data of examples/three_planets (make_data.ts, seed "quellan-318"). Priors are
    // wide and not centred on the truth; only lyraSpec.jitter has a start.
    const truth = await readTruth();
    const text = `title = "invented"
[star]
mass_msun = { normal = [0.9, 0.05] }
[data]
files = ["data.csv"]
[[instrument]]
name = "lyraSpec"
offset = { uniform = [-300, 300] }
jitter = { loguniform = [0.01, 100], start = 2.5 }
[[instrument]]
name = "corvoHRS"
offset = { uniform = [-300, 300] }
jitter = { loguniform = [0.01, 100] }
[[planet]]
name = "long"
period = { loguniform = [500, 1200] }
tc = { uniform = [2459700, 2460900] }
semi_amplitude = { loguniform = [0.1, 300] }
eccentricity = { uniform = [0, 0.95] }
omega_deg = { uniform = [-180, 180] }
[[planet]]
name = "mid"
period = { loguniform = [30, 90] }
tc = { uniform = [2460150, 2460250] }
semi_amplitude = { loguniform = [0.1, 300] }
eccentricity = { uniform = [0, 0.95] }
omega_deg = { uniform = [-180, 180] }
[[planet]]
name = "short"
period = { loguniform = [4, 10] }
tc = { uniform = [2460195, 2460207] }
semi_amplitude = { loguniform = [0.1, 300] }
eccentricity = { uniform = [0, 0.95] }
omega_deg = { uniform = [-180, 180] }
[trend]
slope = { uniform = [-1, 1] }
`;
    const table = parseRvCsv(await Deno.readTextFile(`${THREE_PLANETS}data.csv`), {
      file: "data.csv",
    });
    const problem = resolveProblem(
      parseSpecText(text, { file: "t.toml", dir: THREE_PLANETS }),
      table,
    );
    const filled = fillStartValues(problem);
    const model = new CompiledModel({ spec: filled.problem.spec, data: filled.problem.data });
    // Every free parameter now has a written start; the given one is kept.
    const starts = new Map<string, number | undefined>();
    for (const p of filled.problem.spec.planets) {
      for (const [q, ps] of Object.entries({ period: p.period, tc: p.epoch, k: p.semiAmplitude })) {
        starts.set(`${p.name}.${q}`, ps.start);
      }
    }
    for (const ins of filled.problem.spec.instruments) {
      starts.set(`${ins.name}.offset`, ins.offset.start);
      starts.set(`${ins.name}.jitter`, ins.jitter.start);
    }
    starts.set("trend.slope", filled.problem.spec.trend!.slope.start);
    for (const [key, v] of starts) expect(v, key).toBeTypeOf("number");
    expect(starts.get("lyraSpec.jitter")).toBe(2.5);
    expect(filled.filled).not.toContain("lyraSpec.jitter");
    expect(filled.filled.length).toBe(model.dimensions - 1);

    // Periods within 1 % of the planted ones.
    const byName: Record<string, string> = { long: "d", mid: "c", short: "b" };
    for (const [name, planted] of Object.entries(byName)) {
      const p = truth.planets.find((q) => q.name === planted)!;
      expect(Math.abs(starts.get(`${name}.period`)! / p.period - 1), name).toBeLessThan(0.01);
    }

    // The MAP point must score at least as well as the planted orbit itself (an independent
    // point of the same posterior), with lyraSpec.jitter free here as in the fit.
    const planted = new Float64Array(model.dimensions);
    model.parameters.forEach((par, i) => {
      const [owner, q] = par.key.split(".") as [string, string];
      const planet = truth.planets.find((p) => p.name === byName[owner]);
      const ins = truth.instruments.find((x) => x.name === owner);
      if (planet !== undefined) {
        const value: Record<string, number> = {
          period: planet.period,
          tc: planet.tc,
          semi_amplitude: planet.semi_amplitude,
          eccentricity: planet.eccentricity,
          omega_deg: planet.omega_deg,
        };
        let v = value[q]!;
        if (q === "tc") {
          const prior = par.prior as { lo: number; hi: number };
          v += planet.period * Math.round((0.5 * (prior.lo + prior.hi) - v) / planet.period);
        }
        planted[i] = v;
      } else if (ins !== undefined) {
        // Offsets in the spec are values at the trend's reference time.
        planted[i] = q === "offset"
          ? ins.offset +
            truth.trend.slope * (model.spec.trend!.referenceTime - truth.trend.reference_time)
          : ins.jitter;
      } else {
        planted[i] = truth.trend.slope;
      }
    });
    const atPlanted = model.logPosterior(model.toInternal(planted));
    expect(Number.isFinite(atPlanted)).toBe(true);
    expect(filled.map!.logPosterior).toBeGreaterThanOrEqual(atPlanted);
    // And it is a maximum: fitting again from the MAP point gains (almost) nothing.
    const again = mapFit(model, filled.map!.internal, { rounds: 1 });
    expect(again.logPosterior - filled.map!.logPosterior).toBeLessThan(1e-3);
    expect(filled.report.some((l) => l.startsWith("maximum a posteriori"))).toBe(true);
  });

  test("fillStartValues() returns the problem unchanged when every start is given", async () => {
    const problem = await loadProblem(
      new URL("../../examples/demo/spec.toml", import.meta.url).pathname,
    );
    const filled = fillStartValues(problem);
    expect(filled.problem).toBe(problem);
    expect(filled.map).toBeNull();
    expect(filled.filled).toEqual([]);
  });

  test("fillStartValues() removes a strong signal before searching a weaker planet listed first", async () => {
    // examples/demo (invented, Tavi-2207): planet b (12.37 d, K 14.2 m/s) is listed before
    // planet c (428 d, K 37.5 m/s, e 0.41). With every start removed, b's window [11, 14] d
    // holds c's leakage too; taking c first leaves b's true peak.
    const truth = JSON.parse(
      await Deno.readTextFile(new URL("../../examples/demo/truth.json", import.meta.url)),
    ) as { planets: { name: string; period: number }[] };
    const dir = new URL("../../examples/demo/", import.meta.url).pathname;
    const text = (await Deno.readTextFile(`${dir}spec.toml`)).replace(/, start = [-+0-9.e]+/g, "");
    expect(text).not.toMatch(/start =/);
    const table = parseRvCsv(await Deno.readTextFile(`${dir}data.csv`), { file: "data.csv" });
    const problem = resolveProblem(parseSpecText(text, { file: "spec.toml", dir }), table);
    const filled = fillStartValues(problem);
    expect(filled.report[0]).toMatch(/^c: /);
    for (const p of filled.problem.spec.planets) {
      const planted = truth.planets.find((q) => q.name === p.name)!;
      expect(Math.abs(p.period.start! / planted.period - 1), p.name).toBeLessThan(0.01);
    }
  });

  test("fillStartValues() takes the median of a period prior narrower than the frequency grid", async () => {
    // examples/rm_demo (invented, Veyra-0312): the period prior is normal (3.41868, 1.5e-5) d,
    // as a transit would give it; a periodogram of one season cannot resolve that.
    const dir = new URL("../../examples/rm_demo/", import.meta.url).pathname;
    const text = (await Deno.readTextFile(`${dir}spec.toml`)).replace(/, start = [-+0-9.e]+/g, "");
    const table = parseRvCsv(await Deno.readTextFile(`${dir}data.csv`), { file: "data.csv" });
    const problem = resolveProblem(parseSpecText(text, { file: "spec.toml", dir }), table);
    const filled = fillStartValues(problem);
    expect(filled.report[0]).toContain("prior median");
    const prior = problem.spec.planets[0]!.period.prior as { mu: number; sigma: number };
    const start = filled.problem.spec.planets[0]!.period.start!;
    // The MAP may move the period, but not far beyond the prior's width.
    expect(Math.abs(start - prior.mu)).toBeLessThan(5 * prior.sigma);
    expect(filled.map!.logPosterior).toBeGreaterThan(filled.map!.startLogPosterior);
  });
});
