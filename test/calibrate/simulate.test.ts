import { describe, expect, test } from "vitest";
import {
  calibrationKeys,
  derivedFunction,
  drawFromPrior,
  instrumentJitters,
  simulateData,
} from "../../src/calibrate/mod.ts";
import { CompiledModel } from "../../src/model/posterior.ts";
import { minimumMass, solarToJupiterMasses } from "../../src/physics/mod.ts";
import { loadProblem } from "../../src/spec/mod.ts";
import { createRng } from "../../samplers/mod.ts";

const ECCENTRIC = new URL("./fixtures/eccentric/spec.toml", import.meta.url).pathname;

async function eccentricModel(): Promise<CompiledModel> {
  const problem = await loadProblem(ECCENTRIC);
  return new CompiledModel({ spec: problem.spec, data: problem.data });
}

function meanAndVariance(x: Float64Array): { mean: number; variance: number } {
  let m = 0;
  for (const v of x) m += v;
  m /= x.length;
  let s = 0;
  for (const v of x) s += (v - m) * (v - m);
  return { mean: m, variance: s / (x.length - 1) };
}

describe("drawFromPrior()", () => {
  test("drawFromPrior() reproduces the moments of each prior", async () => {
    const model = await eccentricModel();
    const keys = model.keys;
    const n = 4000;
    const cols = keys.map(() => new Float64Array(n));
    const star = new Float64Array(n);
    const rng = createRng("prior-moments");
    for (let i = 0; i < n; i++) {
      const d = drawFromPrior(model, rng);
      d.physical.forEach((v, k) => (cols[k]![i] = v));
      star[i] = d.starMass;
    }
    const col = (key: string) => cols[keys.indexOf(key)]!;
    // Exact moments of the fixture's priors (textbook formulas):
    // uniform [a, b]: mean (a+b)/2, var (b−a)²/12; loguniform [a, b]: ln x uniform
    // on [ln a, ln b]; Beta(α, β): mean α/(α+β), var αβ/((α+β)²(α+β+1));
    // normal [1.0, 0.05]. Tolerance: 4 sd of the sample mean, 4·sd/√n.
    const checks: [Float64Array, number, number][] = [
      [col("echelleX.offset"), 0, 40 / Math.sqrt(12)],
      [col("b.tc"), 2460128.5, 5 / Math.sqrt(12)],
      [col("b.omega_deg"), 0, 360 / Math.sqrt(12)],
      [
        col("b.period").map(Math.log),
        (Math.log(9.6) + Math.log(10.4)) / 2,
        Math.log(10.4 / 9.6) / Math.sqrt(12),
      ],
      [
        col("echelleX.jitter").map(Math.log),
        (Math.log(0.1) + Math.log(10)) / 2,
        Math.log(100) / Math.sqrt(12),
      ],
      [col("b.eccentricity"), 0.867 / 3.897, Math.sqrt((0.867 * 3.03) / (3.897 ** 2 * 4.897))],
      [star, 1.0, 0.05],
    ];
    for (const [x, mean, sd] of checks) {
      const m = meanAndVariance(x);
      expect(Math.abs(m.mean - mean)).toBeLessThan((4 * sd) / Math.sqrt(n));
      // Variance: sd of the sample variance ≤ σ²·√(2/(n−1) + κ/n) with excess
      // kurtosis κ ≤ 3 for these laws; 4 of those sd.
      expect(Math.abs(m.variance - sd * sd)).toBeLessThan(4 * sd * sd * Math.sqrt(5 / n));
    }
  });
});

describe("simulateData()", () => {
  test("simulateData() adds Gaussian noise of variance error² + jitter² to the model", async () => {
    const model = await eccentricModel();
    const rng = createRng("noise");
    const mean = new Float64Array(model.data.count);
    const z: number[] = [];
    for (let s = 0; s < 200; s++) {
      const truth = drawFromPrior(model, rng);
      const sim = simulateData(model, truth.physical, rng);
      expect(sim.time).toBe(model.data.time);
      expect(sim.rvErr).toBe(model.data.rvErr);
      model.predict(truth.physical, mean);
      const jitter = instrumentJitters(model, truth.physical)[0]!;
      expect(jitter).toBe(truth.physical[model.keys.indexOf("echelleX.jitter")]);
      for (let i = 0; i < sim.count; i++) {
        const e = sim.rvErr[i]!;
        z.push((sim.rv[i]! - mean[i]!) / Math.sqrt(e * e + jitter * jitter));
      }
    }
    // Standardised residuals are N(0, 1): mean 0 ± 4/√n, variance 1 ± 4·√(2/n).
    const m = meanAndVariance(Float64Array.from(z));
    expect(Math.abs(m.mean)).toBeLessThan(4 / Math.sqrt(z.length));
    expect(Math.abs(m.variance - 1)).toBeLessThan(4 * Math.sqrt(2 / z.length));
  });
});

describe("derivedFunction()", () => {
  test("derivedFunction() gives m sin i from the full mass function", async () => {
    const model = await eccentricModel();
    const keys = model.keys;
    expect(calibrationKeys(model)).toEqual([...keys, "b.msini_mjup"]);
    const draw = drawFromPrior(model, createRng("derived"));
    const out = derivedFunction(model)(draw, new Float64Array(1));
    const x = draw.physical;
    const expected = solarToJupiterMasses(minimumMass({
      period: x[keys.indexOf("b.period")]!,
      semiAmplitude: x[keys.indexOf("b.semi_amplitude")]!,
      eccentricity: x[keys.indexOf("b.eccentricity")]!,
    }, draw.starMass));
    expect(out[0]).toBe(expected);
    expect(out[0]).toBeGreaterThan(0);
  });
});
