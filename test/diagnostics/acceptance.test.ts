import { describe, expect, test } from "vitest";
import seedrandom from "seedrandom";
import { acceptanceFractions, findStuckWalkers } from "../../src/diagnostics/mod.ts";

// Walkers accepting with known probabilities; column 0 flag, column 1 the
// running count of the same flags.
function acceptView(probs: readonly number[], steps: number, seed: string) {
  const rng = seedrandom(seed);
  const walkers = probs.length;
  const data = new Float64Array(steps * walkers * 2);
  const counts = new Float64Array(walkers);
  for (let s = 0; s < steps; s++) {
    for (let w = 0; w < walkers; w++) {
      const a = rng() < probs[w]! ? 1 : 0;
      counts[w] = counts[w]! + a;
      data[(s * walkers + w) * 2] = a;
      data[(s * walkers + w) * 2 + 1] = counts[w]!;
    }
  }
  return { data, steps, walkers, columns: 2 };
}

describe("acceptanceFractions()", () => {
  test("acceptanceFractions() recovers the acceptance probability within binomial error", () => {
    // Binomial sd sqrt(p(1-p)/n); tolerance 4 sd.
    const probs = [0.1, 0.3, 0.5, 0.7];
    const steps = 5000;
    const acc = acceptanceFractions(acceptView(probs, steps, "acc"), { column: 0 });
    probs.forEach((p, w) => {
      expect(Math.abs(acc[w]! - p)).toBeLessThan(4 * Math.sqrt((p * (1 - p)) / steps));
    });
  });

  test("acceptanceFractions() gives the same answer from flags and from cumulative counts", () => {
    const view = acceptView([0.2, 0.4, 0.25], 300, "acc-cum");
    for (const burn of [0, 1, 120]) {
      const flags = acceptanceFractions(view, { column: 0, burn });
      const cum = acceptanceFractions(view, { column: 1, cumulative: true, burn });
      for (let w = 0; w < 3; w++) expect(Math.abs(flags[w]! - cum[w]!)).toBeLessThan(1e-15);
    }
  });
});

describe("findStuckWalkers()", () => {
  test("findStuckWalkers() flags the walker far below the ensemble median", () => {
    const probs = new Array(32).fill(0.3);
    probs[7] = 0.005;
    const acc = acceptanceFractions(acceptView(probs, 2000, "stuck"), { column: 0 });
    expect(findStuckWalkers(acc)).toEqual([7]);
  });

  test("findStuckWalkers() flags nobody when all walkers accept alike, even rarely", () => {
    // Median 0.03: every walker is under the 5 % floor but none is under
    // 1/4 of the median, so the rule flags none.
    const acc = acceptanceFractions(acceptView(new Array(16).fill(0.03), 4000, "slow"), {
      column: 0,
    });
    expect(findStuckWalkers(acc)).toEqual([]);
  });
});
