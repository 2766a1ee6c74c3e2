import { describe, expect, test } from "vitest";
import { nelderMead } from "../../src/search/mod.ts";

describe("nelderMead()", () => {
  test("nelderMead() finds the Rosenbrock minimum (1, 1)", () => {
    // Rosenbrock 1960, Computer Journal 3, 175: f = 100 (y - x^2)^2 + (1 - x)^2, minimum
    // f = 0 at (1, 1); start (-1.2, 1) as in Moré, Garbow & Hillstrom 1981, ACM TOMS 7, 17.
    // Tolerance 1e-6 per coordinate: near the minimum f ~ (dx)^2 scale, and the default
    // function tolerance (1e-12 relative spread) resolves |dx| to ~1e-6 or better.
    const rosenbrock = (x: Float64Array) => 100 * (x[1]! - x[0]! ** 2) ** 2 + (1 - x[0]!) ** 2;
    const result = nelderMead(rosenbrock, [-1.2, 1], { scale: 0.5 });
    expect(result.converged).toBe(true);
    expect(Math.abs(result.x[0]! - 1)).toBeLessThan(1e-6);
    expect(Math.abs(result.x[1]! - 1)).toBeLessThan(1e-6);
    expect(result.value).toBeLessThan(1e-12);
  });

  test("nelderMead() finds the minimum of a correlated 5-D quadratic", () => {
    // f = (x - c)^T A (x - c), A = B^T B + I (symmetric positive definite), minimum at c
    // (analytic). Smallest eigenvalue of A >= 1, so f - min <= 1e-14 implies |x - c| <= 1e-7;
    // we accept 1e-6 per coordinate.
    const c = [1.5, -2, 0.25, 3, -0.75];
    const b = [
      [1, 0.5, 0, 0.2, 0],
      [0, 2, 0.3, 0, 0.1],
      [0.4, 0, 1, 0.5, 0],
      [0, 0.2, 0, 1.5, 0.6],
      [0.1, 0, 0.2, 0, 0.8],
    ];
    const a = c.map((_, i) =>
      c.map((_, j) => b.reduce((s, row) => s + row[i]! * row[j]!, 0) + (i === j ? 1 : 0))
    );
    const quadratic = (x: Float64Array) => {
      let f = 0;
      for (let i = 0; i < 5; i++) {
        for (let j = 0; j < 5; j++) f += (x[i]! - c[i]!) * a[i]![j]! * (x[j]! - c[j]!);
      }
      return f;
    };
    const result = nelderMead(quadratic, [0, 0, 0, 0, 0], { scale: 1, tolerance: 1e-14 });
    for (let i = 0; i < 5; i++) expect(Math.abs(result.x[i]! - c[i]!)).toBeLessThan(1e-6);
  });

  test("nelderMead() treats NaN as +Infinity and stays in the valid region", () => {
    // f = (ln x - 1)^2 is undefined (NaN) for x <= 0; minimum at x = e (analytic).
    const f = (x: Float64Array) => (Math.log(x[0]!) - 1) ** 2 + (x[1]! - 0.5) ** 2;
    const result = nelderMead(f, [0.05, 0], { scale: 0.5 });
    expect(Math.abs(result.x[0]! - Math.E)).toBeLessThan(1e-5);
    expect(Math.abs(result.x[1]! - 0.5)).toBeLessThan(1e-5);
  });

  test("nelderMead() minimises in one dimension with the standard coefficients", () => {
    const result = nelderMead((x) => (x[0]! - 4) ** 2 + 2, [0]);
    expect(Math.abs(result.x[0]! - 4)).toBeLessThan(1e-6);
    expect(Math.abs(result.value - 2)).toBeLessThan(1e-12);
  });

  test("nelderMead() respects the evaluation budget and is deterministic", () => {
    // Budget may be exceeded by at most n evaluations (a shrink step or restart simplex).
    let calls = 0;
    const f = (x: Float64Array) => {
      calls++;
      return 100 * (x[1]! - x[0]! ** 2) ** 2 + (1 - x[0]!) ** 2 + x[2]! ** 2;
    };
    const r1 = nelderMead(f, [-1.2, 1, 3], { maxEvaluations: 50 });
    expect(r1.evaluations).toBe(calls);
    expect(r1.evaluations).toBeLessThanOrEqual(50 + 3);
    expect(r1.converged).toBe(false);
    const r2 = nelderMead(f, [-1.2, 1, 3], { maxEvaluations: 50 });
    expect(Array.from(r2.x)).toEqual(Array.from(r1.x));
  });

  test("nelderMead() rejects an empty start and a non-positive scale", () => {
    expect(() => nelderMead(() => 0, [])).toThrow(RangeError);
    expect(() => nelderMead((x) => x[0]!, [1], { scale: 0 })).toThrow(RangeError);
    expect(() => nelderMead((x) => x[0]!, [NaN])).toThrow(RangeError);
  });
});
