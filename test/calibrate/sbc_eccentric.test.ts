import { describe, expect, test } from "vitest";
import { calibrate } from "../../src/calibrate/mod.ts";
import { describeResult, fixtureProblem } from "./_fixtures.ts";

// Simulation-based calibration (Talts et al. 2018, arXiv:1804.06788) of a
// one-planet eccentric model (e ~ Beta(0.867, 3.03), ω uniform, sampled as
// √e cos ω, √e sin ω), one instrument, 24 invented epochs. Settings fixed in
// advance: N = 200, L = 99, B = 20, 24 walkers × 3000 steps (first 1500
// burn-in; median τ ≈ 67 steps, so burn-in ≈ 22 τ and the kept half ≈ 22 τ),
// seed 5 from the fixture spec. Each p-value is uniform under calibration;
// with 8 quantities the chance that any falls below 0.01 is ≤ 8 %.
describe("calibrate() on an eccentric one-planet model", () => {
  test("calibrate() finds uniform ranks for every parameter of an eccentric orbit", async () => {
    const problem = await fixtureProblem("eccentric");
    const result = await calibrate(problem, { simulations: 200, steps: 3000, threads: 2 });
    console.log(describeResult("eccentric, N = 200", result));
    expect(result.keys).toEqual([
      "b.period",
      "b.tc",
      "b.semi_amplitude",
      "b.eccentricity",
      "b.omega_deg",
      "echelleX.offset",
      "echelleX.jitter",
      "b.msini_mjup",
    ]);
    for (const key of result.keys) {
      const q = result.parameters[key]!;
      expect(q.ranks.length).toBe(200);
      expect(q.pValue).toBeGreaterThan(0.01);
    }
    // The chains moved away from their prior-draw starts (see sbc_circular).
    expect(result.parameters["b.semi_amplitude"]!.contraction).toBeGreaterThan(0.5);
    expect(result.parameters["echelleX.offset"]!.contraction).toBeGreaterThan(0.5);
    expect(result.diagnostics.shortPools).toBe(0);
  }, 900_000);
});
