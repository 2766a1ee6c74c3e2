import { describe, expect, test } from "vitest";
import { CompiledModel } from "../../src/model/posterior.ts";
import { priorCdf } from "../../src/model/priors.ts";
import { parseRvCsv } from "../../src/data/mod.ts";
import { parseSpecText, resolveProblem } from "../../src/spec/mod.ts";
import { createEvaluator, initEnsemble, step } from "../../samplers/mod.ts";

const SPEC = `
[star]
mass_msun = { normal = [1.0, 0.05] }
[data]
files = ["d.csv"]
[[instrument]]
name = "A"
offset = { uniform = [-30, 30], start = 1 }
jitter = { loguniform = [0.1, 10], start = 1 }
[[instrument]]
name = "B"
offset = { normal = [5, 3], start = 4 }
jitter = { truncnormal = [2, 1, 0, 6], start = 2 }
[[planet]]
name = "b"
period = { loguniform = [5, 20], start = 10 }
tc = { uniform = [2460000, 2460010], start = 2460004 }
semi_amplitude = { uniform = [0.5, 40], start = 10 }
eccentricity = { beta = [0.867, 3.03], start = 0.1 }
omega_deg = { uniform = [-180, 180], start = 20 }
[trend]
slope = { normal = [0, 0.1] }
reference_time = 2460050
`;

function problem(errors: number) {
  const rows = ["time,rv,rv_err,instrument"];
  for (let i = 0; i < 12; i++) {
    rows.push(
      `${2460000 + 9.1 * i},${(3 * Math.sin(i)).toFixed(3)},${errors},${i % 3 ? "A" : "B"}`,
    );
  }
  const written = parseSpecText(SPEC, { file: "s.toml", dir: "/x" });
  return resolveProblem(written, parseRvCsv(rows.join("\n"), { file: "d.csv" }));
}

describe("CompiledModel", () => {
  test("CompiledModel.logLikelihood() equals an independent Gaussian sum", () => {
    const p = problem(1.5);
    const m = new CompiledModel({ spec: p.spec, data: p.data });
    expect(m.keys).toEqual([
      "b.period",
      "b.tc",
      "b.semi_amplitude",
      "b.eccentricity",
      "b.omega_deg",
      "A.offset",
      "A.jitter",
      "B.offset",
      "B.jitter",
      "trend.slope",
    ]);
    const phys = Float64Array.of(9.3, 2460003.2, 7.5, 0.3, 40, 1.2, 0.8, 4.1, 1.9, 0.02);
    // Independent: Keplerian by bisection on Kepler's equation, true anomaly by atan2.
    const [P, tc, K, e, wDeg, offA, jitA, offB, jitB, slope] = Array.from(phys) as number[];
    const w = (wDeg! * Math.PI) / 180;
    const nuC = Math.PI / 2 - w;
    const eC = 2 * Math.atan(Math.sqrt((1 - e!) / (1 + e!)) * Math.tan(nuC / 2));
    const tp = tc! - (P! / (2 * Math.PI)) * (eC - e! * Math.sin(eC));
    let ll = 0;
    for (let i = 0; i < p.data.count; i++) {
      const t = p.data.time[i]!;
      let M = ((2 * Math.PI * (t - tp)) / P!) % (2 * Math.PI);
      if (M < 0) M += 2 * Math.PI;
      let lo = 0;
      let hi = 2 * Math.PI;
      for (let k = 0; k < 200; k++) {
        const mid = (lo + hi) / 2;
        if (mid - e! * Math.sin(mid) < M) lo = mid;
        else hi = mid;
      }
      const E = (lo + hi) / 2;
      const nu = 2 *
        Math.atan2(Math.sqrt(1 + e!) * Math.sin(E / 2), Math.sqrt(1 - e!) * Math.cos(E / 2));
      const inst = p.data.instrument[i]!;
      const model = K! * (Math.cos(nu + w) + e! * Math.cos(w)) + (inst === 0 ? offA! : offB!) +
        slope! * (t - 2460050);
      const variance = p.data.rvErr[i]! ** 2 + (inst === 0 ? jitA! : jitB!) ** 2;
      ll += -0.5 * ((p.data.rv[i]! - model) ** 2 / variance + Math.log(2 * Math.PI * variance));
    }
    expect(m.logLikelihood(phys)).toBeCloseTo(ll, 9);
  });

  test("CompiledModel.toPhysical() inverts toInternal() and returns the log-Jacobian", () => {
    const p = problem(1.5);
    const m = new CompiledModel({ spec: p.spec, data: p.data });
    const phys = Float64Array.of(9.3, 2460003.2, 7.5, 0.3, 40, 1.2, 0.8, 4.1, 1.9, 0.02);
    const back = new Float64Array(phys.length);
    const logJ = m.toPhysical(m.toInternal(phys), back);
    for (let i = 0; i < phys.length; i++) expect(back[i]).toBeCloseTo(phys[i]!, 10);
    // log transforms: period, K, jitter A, jitter B → Σ ln x; pair: ln 2 + ln(180/π).
    const expected = Math.log(9.3 * 7.5 * 0.8 * 1.9) + Math.log(2) + Math.log(180 / Math.PI);
    expect(logJ).toBeCloseTo(expected, 12);
  });

  test(
    "prior-only ensemble sampling through the transforms reproduces every declared prior (KS)",
    async () => {
      // With errors of 1e9 m/s the likelihood is flat to ~1e-16 over the priors, so the
      // sampler sees prior × Jacobian; a wrong Jacobian would distort the marginals.
      const p = problem(1e9);
      const payload = { spec: p.spec, data: p.data };
      const m = new CompiledModel(payload);
      const evaluator = await createEvaluator(
        {
          moduleUrl: new URL("../../src/model/posterior.ts", import.meta.url).href,
          exportName: "createLogPosterior",
          payload,
        },
        { threads: 1, dimensions: m.dimensions },
      );
      let state = await initEnsemble(m.startInternal(), {
        walkers: 40,
        seed: 5,
        scale: m.ballScales(),
        evaluator,
      });
      const moves = [{ kind: "stretch" as const, weight: 0.8, scale: 2 }, {
        kind: "de" as const,
        weight: 0.2,
      }];
      const draws: number[][] = m.parameters.map(() => []);
      const phys = new Float64Array(m.dimensions);
      const theta = new Float64Array(m.dimensions);
      for (let s = 0; s < 6000; s++) {
        state = (await step(state, { evaluator, moves })).state;
        // Burn 1000 steps, then keep every 50th step (several autocorrelation times
        // for this 10-D target) from every walker.
        if (s >= 1000 && s % 50 === 0) {
          for (let w = 0; w < 40; w++) {
            for (let d = 0; d < m.dimensions; d++) {
              theta[d] = state
                .positions[w * m.dimensions + d]!;
            }
            m.toPhysical(theta, phys);
            m.parameters.forEach((_, i) => draws[i]!.push(phys[i]!));
          }
        }
      }
      await evaluator.close();
      // n = 100 steps × 40 walkers = 4000 draws. Walkers of one ensemble are weakly
      // correlated, so the effective n is smaller; we use the critical value for
      // α = 0.001 (1.949/√n, Kolmogorov distribution; Massey 1951 table, recalled)
      // with n_eff = n/4 as a stated allowance for that correlation.
      const nEff = 4000 / 4;
      const crit = 1.949 / Math.sqrt(nEff);
      m.parameters.forEach((par, i) => {
        const x = Float64Array.from(draws[i]!).sort();
        let dmax = 0;
        for (let k = 0; k < x.length; k++) {
          const F = priorCdf(par.prior, x[k]!);
          dmax = Math.max(dmax, Math.abs(F - k / x.length), Math.abs(F - (k + 1) / x.length));
        }
        expect(dmax, `${par.key} KS distance`).toBeLessThan(crit);
      });
    },
    120_000,
  );
});
