import { describe, expect, test } from "vitest";
import { normalQuantile } from "../../src/diagnostics/mod.ts";

// Independent standard normal CDF written here for the check.
// |x| <= 3: Maclaurin series of erf (Abramowitz & Stegun 1964, eq. 7.1.5);
// x < -3: Laplace's continued fraction for the Mills ratio (A&S eq. 26.2.14,
// equation number recalled from memory; the fraction itself is standard).
function phi(x: number): number {
  return Math.exp(-0.5 * x * x) / Math.sqrt(2 * Math.PI);
}
function normalCdf(x: number): number {
  if (x > 3) return 1 - normalCdf(-x);
  if (x < -3) {
    const t = -x;
    let f = t;
    for (let k = 300; k >= 1; k--) f = t + k / f;
    return phi(t) / f;
  }
  const z = x / Math.SQRT2;
  let term = z;
  let sum = z;
  for (let n = 1; n < 200; n++) {
    term *= (-z * z) / n;
    sum += term / (2 * n + 1);
  }
  return 0.5 * (1 + (2 / Math.sqrt(Math.PI)) * sum);
}

describe("normalQuantile()", () => {
  test("normalQuantile() inverts an independent normal CDF within Acklam's stated error", () => {
    // Acklam (2003) states |relative error in x| < 1.15e-9, so
    // |Φ(x̂) - p| <= φ(x̂) · 1.15e-9 · |x̂| to first order; 1e-13·p covers
    // the rounding of the series and continued fraction above.
    const ps = [
      1e-300,
      1e-12,
      1e-6,
      1e-3,
      0.02,
      0.02425,
      0.1,
      0.3,
      0.5,
      0.7,
      0.9,
      0.975,
      0.98,
      0.999,
    ];
    for (const p of ps) {
      const x = normalQuantile(p);
      const tail = Math.min(p, 1 - p);
      const err = Math.abs(x < 0 ? normalCdf(x) - p : (1 - normalCdf(x)) - (1 - p));
      expect(err).toBeLessThanOrEqual(phi(x) * 1.2e-9 * Math.abs(x) + 1e-13 * tail + 1e-16);
    }
  });

  test("normalQuantile() gives the tabulated 97.5 % point", () => {
    // 1.959963984540054: the 97.5 % standard normal point, recalled from
    // memory (e.g. any statistical table); Acklam's relative error 1.15e-9.
    expect(Math.abs(normalQuantile(0.975) - 1.959963984540054)).toBeLessThan(1.15e-9 * 1.96);
  });

  test("normalQuantile() is odd about 1/2", () => {
    for (const p of [1e-8, 0.01, 0.2, 0.4]) {
      expect(Math.abs(normalQuantile(p) + normalQuantile(1 - p))).toBeLessThan(
        3e-9 * Math.abs(normalQuantile(p)),
      );
    }
    expect(normalQuantile(0.5)).toBe(0);
  });

  test("normalQuantile() returns infinities at 0 and 1 and NaN outside", () => {
    expect(normalQuantile(0)).toBe(-Infinity);
    expect(normalQuantile(1)).toBe(Infinity);
    expect(normalQuantile(-0.1)).toBeNaN();
    expect(normalQuantile(1.5)).toBeNaN();
    expect(normalQuantile(NaN)).toBeNaN();
  });
});
