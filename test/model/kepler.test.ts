import { describe, expect, test } from "vitest";
import {
  cbrtPositive,
  solveKepler,
  solveKeplerBatch,
  solveKeplerSinCos,
} from "../../src/model/kepler.ts";

const DEG = Math.PI / 180;

/** Independent root by bisection on [M − 1, M + 1] (E − M = e sin E ∈ [−e, e]). */
function bisect(meanAnomaly: number, e: number): number {
  let lo = meanAnomaly - 1;
  let hi = meanAnomaly + 1;
  for (let k = 0; k < 200; k++) {
    const mid = 0.5 * (lo + hi);
    if (mid - e * Math.sin(mid) - meanAnomaly > 0) hi = mid;
    else lo = mid;
  }
  return 0.5 * (lo + hi);
}

describe("solveKepler()", () => {
  test("solveKepler() reproduces Meeus's worked example 30.a", () => {
    // Meeus 1998, Astronomical Algorithms 2nd ed., ch. 30, Example 30.a:
    // e = 0.100, M = 5° gives E = 5.554589° (recalled from memory; the identity
    // below checks the root independently of that memory).
    const e = 0.1;
    const m = 5 * DEG;
    const root = solveKepler(m, e);
    expect(Math.abs(root / DEG - 5.554589)).toBeLessThan(5e-7);
    expect(Math.abs(root - e * Math.sin(root) - m)).toBeLessThanOrEqual(1e-15);
  });

  test("solveKepler() reproduces Vallado's Example 2-1", () => {
    // Vallado 2013, Fundamentals of Astrodynamics and Applications 4th ed.,
    // Example 2-1: M = 235.4°, e = 0.4 gives E = 220.512074767522°
    // (recalled from memory). Our root lies in (−π, π]: add 360°.
    const e = 0.4;
    const m = 235.4 * DEG;
    const root = solveKepler(m, e);
    expect(Math.abs(root / DEG + 360 - 220.512074767522)).toBeLessThan(1e-9);
    // Identity modulo 2π.
    const r = root - e * Math.sin(root) - m;
    expect(Math.abs(r - 2 * Math.PI * Math.round(r / (2 * Math.PI)))).toBeLessThan(1e-14);
  });

  test("solveKepler() satisfies E − e sin E = M to 1e-12 on a dense grid up to e = 0.99", () => {
    // Identity of Kepler's equation itself; 199 eccentricities × 2001 mean anomalies.
    let worst = 0;
    let worstError = 0;
    for (let i = 0; i <= 198; i++) {
      const e = i * 0.005;
      for (let j = -1000; j <= 1000; j++) {
        const m = (j / 1000) * (Math.PI - 1e-12);
        const root = solveKepler(m, e);
        worst = Math.max(worst, Math.abs(root - e * Math.sin(root) - m));
        if (j % 50 === 0) worstError = Math.max(worstError, Math.abs(root - bisect(m, e)));
      }
    }
    expect(worst).toBeLessThanOrEqual(1e-12);
    // The root itself (not just the residual) against independent bisection.
    expect(worstError).toBeLessThanOrEqual(1e-12);
  });

  test("solveKepler() converges for eccentricity 0.99 near periastron", () => {
    const e = 0.99;
    for (const m of [1e-12, 1e-8, 1e-5, 1e-3, 0.01, 0.1]) {
      const root = solveKepler(m, e);
      expect(Math.abs(root - bisect(m, e))).toBeLessThanOrEqual(1e-12);
      expect(Math.abs(root - e * Math.sin(root) - m)).toBeLessThanOrEqual(1e-15);
    }
  });

  test("solveKepler() is exact at e = 0", () => {
    for (let j = -999; j <= 999; j += 7) {
      const m = j * Math.PI / 1000;
      expect(solveKepler(m, 0)).toBe(m);
    }
  });

  test("solveKepler() range-reduces any mean anomaly", () => {
    const e = 0.7;
    for (const turns of [-1000, -3, 1, 25, 1e5]) {
      const m = 0.4 + turns * 2 * Math.PI;
      const root = solveKepler(m, e);
      expect(Math.abs(root - solveKepler(0.4, e))).toBeLessThan(
        1e-9 * Math.max(1, Math.abs(turns)),
      );
    }
  });

  test("solveKepler() returns NaN outside 0 <= e < 1 and for non-finite M", () => {
    expect(solveKepler(1, 1)).toBeNaN();
    expect(solveKepler(1, -0.1)).toBeNaN();
    expect(solveKepler(1, NaN)).toBeNaN();
    expect(solveKepler(NaN, 0.3)).toBeNaN();
    expect(solveKepler(Infinity, 0.3)).toBeNaN();
  });
});

describe("solveKeplerSinCos()", () => {
  test("solveKeplerSinCos() returns sin E and cos E consistent with Math", () => {
    const out = new Float64Array(2);
    const options = { out };
    let worst = 0;
    for (let i = 0; i <= 99; i++) {
      const e = i * 0.01;
      for (let j = -200; j <= 200; j++) {
        const root = solveKeplerSinCos(j * 0.0157, e, options);
        worst = Math.max(
          worst,
          Math.abs(out[0]! - Math.sin(root)),
          Math.abs(out[1]! - Math.cos(root)),
        );
      }
    }
    expect(worst).toBeLessThan(2e-15);
  });
});

describe("solveKeplerBatch()", () => {
  test("solveKeplerBatch() agrees with the scalar solver and honours count", () => {
    const n = 600;
    const m = new Float64Array(n).map((_, i) => -40 + i * 0.137);
    const sinE = new Float64Array(n + 1).fill(7);
    const cosE = new Float64Array(n + 1).fill(7);
    const ecc = new Float64Array(n + 1).fill(7);
    solveKeplerBatch(m, 0.83, { sinE, cosE, eccentricAnomaly: ecc, count: n });
    for (let i = 0; i < n; i++) {
      expect(ecc[i]).toBe(solveKepler(m[i]!, 0.83));
      expect(Math.abs(sinE[i]! - Math.sin(ecc[i]!))).toBeLessThan(2e-15);
    }
    expect(sinE[n]).toBe(7); // nothing written past count
  });

  test("solveKeplerBatch() writes NaN for an invalid eccentricity", () => {
    const sinE = new Float64Array(3);
    const cosE = new Float64Array(3);
    solveKeplerBatch(new Float64Array([0.1, 0.2, 0.3]), 1.2, { sinE, cosE });
    expect([...sinE].every(Number.isNaN)).toBe(true);
    expect([...cosE].every(Number.isNaN)).toBe(true);
  });
});

describe("cbrtPositive()", () => {
  test("cbrtPositive() cubes back to its argument", () => {
    for (let k = -300; k <= 300; k += 3) {
      const x = 1.7 * 10 ** k;
      const y = cbrtPositive(x);
      expect(Math.abs(y * y * y / x - 1)).toBeLessThan(1e-13);
    }
    expect(cbrtPositive(0)).toBe(0);
  });
});
