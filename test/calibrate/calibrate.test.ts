import { describe, expect, test } from "vitest";
import { calibrate, runSimulation } from "../../src/calibrate/mod.ts";
import { fixtureProblem } from "./_fixtures.ts";

describe("calibrate()", () => {
  test("calibrate() gives the same ranks with 1 and 2 threads", async () => {
    const problem = await fixtureProblem("circular");
    const options = { simulations: 4, steps: 200, draws: 19, seed: 42 };
    const one = await calibrate(problem, { ...options, threads: 1 });
    const two = await calibrate(problem, { ...options, threads: 2 });
    for (const key of one.keys) {
      expect(two.parameters[key]!.ranks).toEqual(one.parameters[key]!.ranks);
      for (const r of one.parameters[key]!.ranks) {
        expect(Number.isInteger(r) && r >= 0 && r <= 19).toBe(true);
      }
    }
    expect(two.diagnostics).toEqual(one.diagnostics);
  }, 120_000);

  test("calibrate() reports progress once per simulation", async () => {
    const problem = await fixtureProblem("circular");
    const seen: number[] = [];
    await calibrate(problem, {
      simulations: 3,
      steps: 40,
      draws: 9,
      threads: 2,
      onProgress: (p) => {
        expect(p.total).toBe(3);
        seen.push(p.done);
      },
    });
    expect(seen).toEqual([1, 2, 3]);
  }, 120_000);

  test("calibrate() rejects invalid options before simulating", async () => {
    const problem = await fixtureProblem("circular");
    await expect(calibrate(problem, { walkers: 15 })).rejects.toThrow(/walkers/);
    await expect(calibrate(problem, { walkers: 10 })).rejects.toThrow(/walkers/);
    await expect(calibrate(problem, { bins: 7 })).rejects.toThrow(RangeError);
    await expect(calibrate(problem, { simulations: 0 })).rejects.toThrow(/simulations/);
    await expect(calibrate(problem, { burnFraction: 1 })).rejects.toThrow(/burn-in/);
    await expect(calibrate(problem, { steps: 2 })).rejects.toThrow(/fewer than 2/);
  });
});

describe("runSimulation()", () => {
  test("runSimulation() is a deterministic function of seed and index", async () => {
    const problem = await fixtureProblem("eccentric");
    const settings = {
      seed: 9,
      walkers: 24,
      steps: 60,
      burn: 30,
      draws: 9,
      moves: problem.spec.sampler.moves,
    };
    const a = await runSimulation(problem, { ...settings, index: 3 });
    const b = await runSimulation(problem, { ...settings, index: 3 });
    const c = await runSimulation(problem, { ...settings, index: 4 });
    expect(b).toEqual(a);
    expect(c.truth).not.toEqual(a.truth);
    expect(a.ranks.length).toBe(8);
    expect(a.truth.length).toBe(8);
  }, 120_000);

  test("runSimulation() can start the walkers at the spec's start values", async () => {
    const problem = await fixtureProblem("circular");
    const r = await runSimulation(problem, {
      seed: 9,
      walkers: 16,
      steps: 80,
      burn: 40,
      draws: 9,
      moves: problem.spec.sampler.moves,
      start: "spec",
      index: 0,
    });
    for (const rank of r.ranks) expect(Number.isInteger(rank) && rank >= 0 && rank <= 9).toBe(true);
    expect(r.acceptance).toBeGreaterThan(0);
  }, 120_000);
});
