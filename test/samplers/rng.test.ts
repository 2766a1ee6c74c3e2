import { describe, expect, test } from "vitest";
import { createRng, restoreRng, rngState } from "../../samplers/mod.ts";

/** Composite Simpson's rule with n (even) intervals (common practice, no source). */
function simpson(f: (x: number) => number, a: number, b: number, n: number): number {
  const h = (b - a) / n;
  let sum = f(a) + f(b);
  for (let i = 1; i < n; i++) sum += (i % 2 === 1 ? 4 : 2) * f(a + i * h);
  return (sum * h) / 3;
}

describe("rng", () => {
  test("createRng() gives equal streams for equal seeds and different streams for different seeds", () => {
    const a = createRng(42);
    const b = createRng("42");
    const c = createRng(43);
    const xa = Array.from({ length: 20 }, () => a.uniform());
    const xb = Array.from({ length: 20 }, () => b.uniform());
    const xc = Array.from({ length: 20 }, () => c.uniform());
    expect(xb).toEqual(xa);
    expect(xc).not.toEqual(xa);
  });

  test("createRng() rejects a seed that is not a finite number or string", () => {
    expect(() => createRng(Number.NaN)).toThrow(TypeError);
    expect(() => createRng({} as unknown as string)).toThrow(TypeError);
  });

  test("uniform() lies in [0, 1) with mean 1/2 and variance 1/12", () => {
    // U(0, 1): mean 1/2, variance 1/12, E[(u − 1/2)^2] = 1/12 (textbook results).
    // Independent draws, so ESS = n; tolerance 4·sd/√n with the sd of each statistic
    // (sd(u) = √(1/12); sd((u − 1/2)^2) = √(1/80 − 1/144) from E[(u − 1/2)^4] = 1/80).
    const rng = createRng("uniform");
    const n = 200_000;
    let sum = 0;
    let sum2 = 0;
    let min = 1;
    let max = 0;
    for (let i = 0; i < n; i++) {
      const u = rng.uniform();
      min = Math.min(min, u);
      max = Math.max(max, u);
      sum += u;
      sum2 += (u - 0.5) ** 2;
    }
    expect(min).toBeGreaterThanOrEqual(0);
    expect(max).toBeLessThan(1);
    expect(Math.abs(sum / n - 0.5)).toBeLessThan((4 * Math.sqrt(1 / 12)) / Math.sqrt(n));
    expect(Math.abs(sum2 / n - 1 / 12)).toBeLessThan(
      (4 * Math.sqrt(1 / 80 - 1 / 144)) / Math.sqrt(n),
    );
  });

  test("normal() has mean 0, variance 1 and P(|z| < 1) equal to the integral of the density", () => {
    // N(0, 1): E z = 0 (sd 1), E z² = 1 (sd √2 since E z⁴ = 3); P(|z| < 1) computed here by
    // Simpson's rule on the density (an independent computation), sd √(p(1 − p)).
    // Independent draws, ESS = n; tolerance 4·sd/√n.
    const p = simpson((x) => Math.exp(-0.5 * x * x) / Math.sqrt(2 * Math.PI), -1, 1, 1000);
    const rng = createRng(7);
    const n = 200_000;
    let sum = 0;
    let sum2 = 0;
    let inside = 0;
    for (let i = 0; i < n; i++) {
      const z = rng.normal();
      sum += z;
      sum2 += z * z;
      if (Math.abs(z) < 1) inside++;
    }
    expect(Math.abs(sum / n)).toBeLessThan(4 / Math.sqrt(n));
    expect(Math.abs(sum2 / n - 1)).toBeLessThan((4 * Math.SQRT2) / Math.sqrt(n));
    expect(Math.abs(inside / n - p)).toBeLessThan((4 * Math.sqrt(p * (1 - p))) / Math.sqrt(n));
  });

  test("restoreRng() continues the stream exactly, including a cached normal", () => {
    const rng = createRng("resume");
    for (let i = 0; i < 17; i++) rng.uniform();
    rng.normal(); // leaves the second Box–Muller value cached
    const saved = JSON.parse(JSON.stringify(rngState(rng)));
    expect(saved.spare).not.toBeNull();
    const copy = restoreRng(saved);
    const a = new Float64Array(1000);
    const b = new Float64Array(1000);
    for (let i = 0; i < 1000; i++) {
      a[i] = i % 3 === 0 ? rng.uniform() : rng.normal();
      b[i] = i % 3 === 0 ? copy.uniform() : copy.normal();
    }
    expect(new Uint8Array(b.buffer)).toEqual(new Uint8Array(a.buffer));
  });

  test("restoreRng() rejects a malformed state", () => {
    const good = rngState(createRng(1));
    expect(() => restoreRng({ ...good, algorithm: "arc4" } as unknown as typeof good)).toThrow(
      TypeError,
    );
    expect(() => restoreRng({ ...good, s1: Number.NaN })).toThrow(TypeError);
    expect(() => restoreRng({ ...good, spare: "x" } as unknown as typeof good)).toThrow(TypeError);
  });
});
