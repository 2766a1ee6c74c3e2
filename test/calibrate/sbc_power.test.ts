import { describe, expect, test } from "vitest";
import { calibrate } from "../../src/calibrate/mod.ts";
import { describeResult, fixtureProblem } from "./_fixtures.ts";
import { WITHOUT_JITTER_JACOBIAN } from "./_wrong_density.ts";

// Power of the check: the same calibration as sbc_circular.test.ts (same
// fixture, seed, N = 200, 16 walkers × 2000 steps) but sampling a log-density
// that drops the log-Jacobian of the log-sampled jitter. The implied jitter
// prior gains a factor 1/s, so posteriors sit too low and the true jitter
// ranks high among the draws.
describe("calibrate() with a wrong Jacobian", () => {
  test("calibrate() flags a log-density that drops the jitter's log-Jacobian", async () => {
    const problem = await fixtureProblem("circular");
    const result = await calibrate(problem, {
      simulations: 200,
      steps: 2000,
      threads: 2,
      density: WITHOUT_JITTER_JACOBIAN,
    });
    console.log(describeResult("circular with the jitter Jacobian dropped, N = 200", result));
    const jitter = result.parameters["echelleX.jitter"]!;
    expect(jitter.pValue).toBeLessThan(0.001);
    // The direction: truths above the draws, mean rank above L/2 = 49.5 by more
    // than 4 sd of the mean of 200 uniform ranks (sd 28.9/√200 = 2.04).
    const meanRank = jitter.ranks.reduce((a, b) => a + b, 0) / jitter.ranks.length;
    expect(meanRank).toBeGreaterThan(49.5 + 4 * 2.04);
  }, 900_000);
});
