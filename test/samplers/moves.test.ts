import { describe, expect, test } from "vitest";
import {
  complementSpread,
  createRng,
  differentialEvolutionMove,
  type HalfStep,
  stretchMove,
} from "../../samplers/mod.ts";

/** A half-step over `walkers` random positions: first half active, second half complementary. */
function makeHalf(walkers: number, dims: number, seed: number): HalfStep {
  const rng = createRng(seed);
  const positions = new Float64Array(walkers * dims);
  for (let i = 0; i < positions.length; i++) positions[i] = 3 * rng.normal() + i;
  const half = walkers / 2;
  return {
    dimensions: dims,
    positions,
    activeStart: 0,
    complementStart: half,
    complementCount: half,
    proposals: new Float64Array(half * dims),
    spread: new Float64Array(dims),
    rng,
  };
}

describe("stretchMove()", () => {
  test("stretchMove() draws z from g(z) ∝ 1/√z on [1/a, a]", () => {
    // Goodman & Weare (2010), CAMCoS 5, 65: g(z) ∝ 1/√z on [1/a, a]. Derived here:
    // normaliser 2(√a − 1/√a); CDF G(z) = (√z − 1/√a)/(√a − 1/√a);
    // E z = (a + 1 + 1/a)/3 and E z² = (a² + a + 1 + 1/a + 1/a²)/5 (from (x³ − y³)/(x − y)
    // and (x⁵ − y⁵)/(x − y) with x = √a, y = 1/√a). z is recovered from the returned
    // log Hastings term (D − 1) ln z. Draws are independent, so ESS = n; tolerance 4·sd/√n.
    const a = 2.5;
    const dims = 3;
    const half = makeHalf(10, dims, 1);
    const n = 100_000;
    const quartiles = [0.25, 0.5, 0.75].map((q) => {
      const root = q * (Math.sqrt(a) - 1 / Math.sqrt(a)) + 1 / Math.sqrt(a);
      return root * root;
    });
    const below = [0, 0, 0];
    let sum = 0;
    let min = Infinity;
    let max = -Infinity;
    for (let i = 0; i < n; i++) {
      const z = Math.exp(stretchMove(half, 2, { scale: a }) / (dims - 1));
      sum += z;
      min = Math.min(min, z);
      max = Math.max(max, z);
      for (let q = 0; q < 3; q++) if (z < quartiles[q]!) below[q]!++;
    }
    const mean = (a + 1 + 1 / a) / 3;
    const second = (a * a + a + 1 + 1 / a + 1 / (a * a)) / 5;
    const sd = Math.sqrt(second - mean * mean);
    expect(min).toBeGreaterThanOrEqual(1 / a - 1e-12);
    expect(max).toBeLessThanOrEqual(a + 1e-12);
    expect(Math.abs(sum / n - mean)).toBeLessThan((4 * sd) / Math.sqrt(n));
    [0.25, 0.5, 0.75].forEach((q, i) => {
      expect(Math.abs(below[i]! / n - q)).toBeLessThan((4 * Math.sqrt(q * (1 - q))) / Math.sqrt(n));
    });
  });

  test("stretchMove() proposes on the line from a complementary walker through the moving walker", () => {
    // Goodman & Weare (2010), eq. 7: Y = X_j + z (X_k − X_j), X_j from the complementary half.
    const dims = 4;
    const walkers = 12;
    const half = makeHalf(walkers, dims, 2);
    const x = half.positions;
    const chosen = new Set<number>();
    for (let trial = 0; trial < 300; trial++) {
      const k = trial % (walkers / 2);
      const z = Math.exp(stretchMove(half, k) / (dims - 1));
      const row = k * dims;
      // Find the complementary walker j for which Y − X_j = z (X_k − X_j) in every dimension.
      let found = -1;
      for (let j = 0; j < walkers; j++) {
        let worst = 0;
        for (let d = 0; d < dims; d++) {
          const expected = x[j * dims + d]! + z * (x[k * dims + d]! - x[j * dims + d]!);
          worst = Math.max(worst, Math.abs(half.proposals[row + d]! - expected));
        }
        if (worst < 1e-9 && j !== k) found = j;
      }
      expect(found).toBeGreaterThanOrEqual(walkers / 2);
      chosen.add(found);
    }
    // Every complementary walker is used (6 of them, 300 draws: missing one has probability < 1e-20).
    expect(chosen.size).toBe(walkers / 2);
  });
});

describe("differentialEvolutionMove()", () => {
  test("differentialEvolutionMove() steps by γ times the difference of two distinct complementary walkers", () => {
    // ter Braak (2006), Stat. Comput. 16, 239: Y = X_k + γ (X_j − X_m), γ = 2.38/√(2D), or γ = 1
    // with probability hopProbability. With noise 0 the pair and γ are identified exactly;
    // the share of γ = 1 steps is binomial, tolerance 4·√(p(1 − p)/n).
    const dims = 3;
    const walkers = 10;
    const half = makeHalf(walkers, dims, 3);
    const x = half.positions;
    const gamma = 2.38 / Math.sqrt(2 * dims);
    const hop = 0.3;
    const n = 2000;
    let hops = 0;
    for (let trial = 0; trial < n; trial++) {
      const k = trial % (walkers / 2);
      expect(differentialEvolutionMove(half, k, { hopProbability: hop, noise: 0 })).toBe(0);
      let match = "";
      for (let j = walkers / 2; j < walkers; j++) {
        for (let m = walkers / 2; m < walkers; m++) {
          if (j === m) continue;
          for (const g of [gamma, 1]) {
            let worst = 0;
            for (let d = 0; d < dims; d++) {
              const expected = x[k * dims + d]! + g * (x[j * dims + d]! - x[m * dims + d]!);
              worst = Math.max(worst, Math.abs(half.proposals[k * dims + d]! - expected));
            }
            if (worst < 1e-9) match = g === 1 ? "hop" : "plain";
          }
        }
      }
      expect(match).not.toBe("");
      if (match === "hop") hops++;
    }
    expect(Math.abs(hops / n - hop)).toBeLessThan(4 * Math.sqrt((hop * (1 - hop)) / n));
  });

  test("differentialEvolutionMove() adds Gaussian noise of sd noise × complement spread", () => {
    // With a complementary half of two walkers the pair is (j, m) or (m, j); the residual
    // Y − X_k − γ(X_j − X_m) (γ = 0.5, no hops) divided by noise·spread_d must be N(0, 1):
    // mean within 4/√n, mean square within 4·√2/√n (independent draws, ESS = n).
    // The spread is the population sd of the two walkers, |x_j − x_m|/2, computed here.
    const dims = 2;
    const half = makeHalf(4, dims, 4);
    complementSpread(half);
    const x = half.positions;
    for (let d = 0; d < dims; d++) {
      expect(half.spread[d]).toBeCloseTo(Math.abs(x[2 * dims + d]! - x[3 * dims + d]!) / 2, 12);
    }
    const noise = 1e-3;
    const n = 20_000;
    let sum = 0;
    let sum2 = 0;
    for (let trial = 0; trial < n; trial++) {
      differentialEvolutionMove(half, 1, { gamma: 0.5, hopProbability: 0, noise });
      // Residuals for the two orders; the noise is far smaller than the difference, so the
      // smaller residual identifies the order drawn.
      let best: number[] = [];
      let bestSize = Infinity;
      for (const [j, m] of [[2, 3], [3, 2]] as const) {
        const r = [0, 1].map((d) =>
          (half.proposals[dims + d]! - x[dims + d]! - 0.5 * (x[j * dims + d]! - x[m * dims + d]!)) /
          (noise * half.spread[d]!)
        );
        const size = Math.abs(r[0]!) + Math.abs(r[1]!);
        if (size < bestSize) [best, bestSize] = [r, size];
      }
      for (const r of best) {
        sum += r;
        sum2 += r * r;
      }
    }
    const count = n * dims;
    expect(Math.abs(sum / count)).toBeLessThan(4 / Math.sqrt(count));
    expect(Math.abs(sum2 / count - 1)).toBeLessThan((4 * Math.SQRT2) / Math.sqrt(count));
  });
});
