import { describe, expect, test } from "vitest";
import type { MoveMix } from "../../samplers/mod.ts";
import { targetSource } from "./_targets.ts";
import { runChain, seriesOf, summarise } from "./_stats.ts";

// Twisted Gaussian ("banana") of Haario, Saksman & Tamminen (1999), Comput. Stat. 14, 375
// (recalled from memory): θ ~ f_b with φ_b(θ) = (θ1, θ2 + b θ1² − 100 b) ~ N(0, diag(100, 1)).
// Moments derived here from y = φ_b(θ): θ1 = y1, θ2 = y2 − b y1² + 100 b, with y1 ~ N(0, 100),
// y2 ~ N(0, 1) independent, E y1² = 100, E y1⁴ = 3·100², Var y1² = 2·100²:
//   E θ1 = 0, E θ2 = −100 b + 100 b = 0,
//   Var θ1 = 100, Var θ2 = 1 + b² Var(y1²) = 1 + 2·10⁴ b²,
//   E θ1² θ2 = −b E y1⁴ + 100 b E y1² = −3·10⁴ b + 10⁴ b = −2·10⁴ b (the curvature).
// With b = 0.03: Var θ2 = 19, E θ1² θ2 = −600. Tolerance 4·MCSE (see _stats.ts).
const b = 0.03;
const dims = 2;
const walkers = 32;
const burn = 2000;
const steps = 40_000;

async function checkBanana(moves: MoveMix | undefined, seed: number) {
  const source = targetSource("twistedGaussian", { b, dimensions: dims, variance1: 100 });
  const run = await runChain(source, {
    walkers,
    seed,
    start: new Float64Array(dims),
    scale: new Float64Array(dims).fill(0.5),
    burn,
    steps,
    moves,
  });
  const checks: [string, (c: Float64Array, o: number) => number, number][] = [
    ["E θ1", (c, o) => c[o]!, 0],
    ["E θ2", (c, o) => c[o + 1]!, 0],
    ["Var θ1", (c, o) => c[o]! ** 2, 100],
    ["Var θ2", (c, o) => c[o + 1]! ** 2, 1 + 2e4 * b * b],
    ["E θ1² θ2", (c, o) => c[o]! ** 2 * c[o + 1]!, -2e4 * b],
  ];
  for (const [name, f, truth] of checks) {
    const s = summarise(seriesOf(run.chain, { dimensions: dims, f }), walkers);
    expect(Math.abs(s.mean - truth), `${name}: ${s.mean} vs ${truth}, mcse ${s.mcse}`)
      .toBeLessThanOrEqual(4 * s.mcse);
  }
  return run;
}

describe("step() on a twisted-Gaussian banana", () => {
  test("step() with the stretch move recovers the known marginal moments", async () => {
    const run = await checkBanana(undefined, 21);
    // Observed acceptance about 0.53 on this target; only checked to be a working chain.
    expect(run.acceptance).toBeGreaterThan(0.2);
  });

  test("step() with stretch and DE moves mixed recovers the known marginal moments", async () => {
    await checkBanana([{ kind: "stretch", weight: 1 }, { kind: "de", weight: 0.5 }], 22);
  });
});
