import { describe, expect, test } from "vitest";
import {
  chiSquareSurvival,
  regularizedGammaP,
  regularizedGammaQ,
} from "../../src/calibrate/mod.ts";
import { erfc } from "../../src/model/mod.ts";

// Tolerance: the series and continued fraction stop at a relative step of
// 1e-16 and ln Γ (Lanczos) carries ~1e-15 relative error, amplified by the
// exponent a·ln x − x − ln Γ(a) (magnitude up to ~700 here) → a documented
// relative bound of 1e-12.
const REL = 1e-12;

function close(actual: number, expected: number, rel = REL): void {
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(rel * Math.abs(expected));
}

const XS = [1e-6, 0.01, 0.3, 1, 1.999, 2, 2.001, 3, 5, 10, 20, 50, 100, 300, 1000];

describe("chiSquareSurvival()", () => {
  test("chiSquareSurvival() equals exp(-x/2) for 2 degrees of freedom", () => {
    // Closed form: χ²(2) is the exponential with mean 2, Pr(X > x) = e^{-x/2}
    // (Abramowitz & Stegun 1964, eq. 26.4.21 with ν = 2, recalled from memory;
    // also immediate from the density e^{-x/2}/2).
    for (const x of XS) close(chiSquareSurvival(x, 2), Math.exp(-x / 2));
  });

  test("chiSquareSurvival() equals the Poisson sum for even degrees of freedom", () => {
    // Q(χ²|ν) = e^{-x/2} Σ_{j<ν/2} (x/2)^j / j! for even ν (A&S 1964, eq.
    // 26.4.21, recalled; it follows from repeated integration by parts).
    for (const nu of [4, 6, 10, 20, 38]) {
      for (const x of XS) {
        let term = 1;
        let sum = 1;
        for (let j = 1; j < nu / 2; j++) {
          term *= x / 2 / j;
          sum += term;
        }
        close(chiSquareSurvival(x, nu), Math.exp(-x / 2) * sum);
      }
    }
  });

  test("chiSquareSurvival() equals erfc(sqrt(x/2)) for 1 degree of freedom", () => {
    // χ²(1) = Z²: Pr(Z² > x) = 2 Pr(Z > √x) = erfc(√(x/2)) (A&S 26.4.20 with
    // ν = 1). erfc is the independent implementation in src/model/priors.ts.
    for (const x of XS.filter((v) => v <= 300)) {
      close(chiSquareSurvival(x, 1), erfc(Math.sqrt(x / 2)));
    }
  });

  test("chiSquareSurvival() matches the closed form for 3 degrees of freedom", () => {
    // Q(χ²|3) = erfc(√(x/2)) + √(2x/π) e^{-x/2} (A&S 26.4.20 with ν = 3,
    // recalled; differentiate to get the χ²(3) density √x e^{-x/2}/√(2π)).
    for (const x of XS.filter((v) => v <= 300)) {
      close(
        chiSquareSurvival(x, 3),
        erfc(Math.sqrt(x / 2)) + Math.sqrt((2 * x) / Math.PI) * Math.exp(-x / 2),
      );
    }
  });

  test("chiSquareSurvival() keeps relative precision far in the tail", () => {
    // e^{-700} ≈ 9.86e-305 is still a normal double.
    close(chiSquareSurvival(1400, 2), Math.exp(-700));
  });

  test("chiSquareSurvival() handles the edges", () => {
    expect(chiSquareSurvival(0, 5)).toBe(1);
    expect(chiSquareSurvival(-3, 5)).toBe(1);
    expect(chiSquareSurvival(Infinity, 5)).toBe(0);
    expect(chiSquareSurvival(NaN, 5)).toBeNaN();
    expect(chiSquareSurvival(1, 0)).toBeNaN();
    expect(chiSquareSurvival(1, -1)).toBeNaN();
    expect(chiSquareSurvival(1, NaN)).toBeNaN();
  });
});

describe("regularizedGammaP()", () => {
  test("regularizedGammaP() equals 1 - exp(-x) for a = 1", () => {
    // γ(1, x) = ∫₀ˣ e^{-t} dt = 1 − e^{-x}.
    for (const x of XS.filter((v) => v <= 30)) close(regularizedGammaP(1, x), -Math.expm1(-x));
  });

  test("regularizedGammaP() and regularizedGammaQ() sum to 1 on both sides of x = a + 1", () => {
    for (const a of [0.1, 0.5, 1, 2.5, 9.5, 50]) {
      for (const x of [a * 0.5, a + 0.999, a + 1, a + 1.001, a * 2 + 3]) {
        expect(Math.abs(regularizedGammaP(a, x) + regularizedGammaQ(a, x) - 1)).toBeLessThan(
          1e-14,
        );
      }
    }
  });

  test("regularizedGammaP() is continuous across the switch between series and fraction", () => {
    // The two methods meet at x = a + 1; the value just below and just above
    // must agree to within the derivative × step (density ≤ 1 here) + 1e-12.
    for (const a of [0.5, 3, 9.5, 40]) {
      const below = regularizedGammaP(a, a + 1 - 1e-9);
      const above = regularizedGammaP(a, a + 1 + 1e-9);
      expect(Math.abs(above - below)).toBeLessThan(2e-9 + 1e-12);
    }
  });

  test("regularizedGammaP() returns NaN for invalid arguments", () => {
    expect(regularizedGammaP(0, 1)).toBeNaN();
    expect(regularizedGammaP(-1, 1)).toBeNaN();
    expect(regularizedGammaP(1, -1)).toBeNaN();
    expect(regularizedGammaQ(1, NaN)).toBeNaN();
    expect(regularizedGammaP(2, 0)).toBe(0);
    expect(regularizedGammaQ(2, 0)).toBe(1);
  });
});
