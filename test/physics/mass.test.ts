import { describe, expect, test } from "vitest";
import {
  AU,
  earthToSolarMasses,
  GM_EARTH,
  GM_JUPITER,
  GM_SUN,
  jupiterToSolarMasses,
  R_SUN,
  solarToEarthMasses,
  solarToJupiterMasses,
} from "../../src/physics/constants.ts";
import {
  massFunction,
  minimumMass,
  semiAmplitudeFromMass,
  semiMajorAxis,
  trueMass,
} from "../../src/physics/mass.ts";

// Orbital elements from the NASA Planetary Fact Sheets (D. R. Williams, NSSDCA;
// values recalled from memory): Jupiter sidereal period 4332.589 d,
// eccentricity 0.0489, semi-major axis 778.57e6 km; Earth 365.256 d, 0.0167,
// 149.598e6 km.
const JUPITER = { period: 4332.589, eccentricity: 0.0489 };
const EARTH = { period: 365.256, eccentricity: 0.0167 };

describe("constants", () => {
  test("constants carry the IAU nominal values", () => {
    // IAU 2015 Resolution B3; IAU 2012 Resolution B2.
    expect(GM_SUN).toBe(1.3271244e20);
    expect(GM_JUPITER).toBe(1.2668653e17);
    expect(GM_EARTH).toBe(3.986004e14);
    expect(R_SUN).toBe(6.957e8);
    expect(AU).toBe(149597870700);
  });

  test("solarToJupiterMasses() gives about 1047.6 Jupiter masses per Sun", () => {
    // M☉/M♃ ≈ 1047.57 (IAU 2015 B3 nominal ratio; recalled from memory).
    expect(Math.abs(solarToJupiterMasses(1) - 1047.57)).toBeLessThan(0.01);
    expect(Math.abs(solarToEarthMasses(1) - 332946)).toBeLessThan(1);
    expect(jupiterToSolarMasses(solarToJupiterMasses(0.3))).toBeCloseTo(0.3, 15);
    expect(earthToSolarMasses(solarToEarthMasses(0.3))).toBeCloseTo(0.3, 15);
  });
});

describe("semiAmplitudeFromMass()", () => {
  test("semiAmplitudeFromMass() gives about 12.5 m/s for Jupiter around the Sun", () => {
    const k = semiAmplitudeFromMass(jupiterToSolarMasses(1), { ...JUPITER, starMass: 1 });
    // ≈ 12.5 m/s; and "a Jupiter moves a Sun-like star by roughly 10 m/s" is a
    // fact of the trade (common practice, no source).
    expect(Math.abs(k - 12.5)).toBeLessThan(0.1);
    expect(k).toBeGreaterThan(10);
    expect(k).toBeLessThan(15);
  });

  test("semiAmplitudeFromMass() gives about 0.09 m/s for Earth around the Sun", () => {
    const k = semiAmplitudeFromMass(earthToSolarMasses(1), { ...EARTH, starMass: 1 });
    expect(Math.abs(k - 0.09)).toBeLessThan(0.001);
  });

  test("semiAmplitudeFromMass() scales with sin i and returns NaN for e >= 1", () => {
    const base = { period: 10, eccentricity: 0.3, starMass: 1 };
    const m = jupiterToSolarMasses(2);
    const k90 = semiAmplitudeFromMass(m, base);
    const k30 = semiAmplitudeFromMass(m, { ...base, inclination: Math.PI / 6 });
    expect(k30 / k90).toBeCloseTo(0.5, 14);
    expect(semiAmplitudeFromMass(m, { ...base, eccentricity: 1 })).toBeNaN();
  });
});

describe("minimumMass()", () => {
  test("minimumMass() round-trips K from 1 Earth mass to 80 Jupiter masses to 1e-10", () => {
    const lo = Math.log(earthToSolarMasses(1));
    const hi = Math.log(jupiterToSolarMasses(80));
    let worst = 0;
    for (let i = 0; i <= 60; i++) {
      const m = Math.exp(lo + (hi - lo) * i / 60);
      for (const period of [0.7, 12, 3000]) {
        for (const e of [0, 0.5, 0.9]) {
          for (const starMass of [0.1, 1, 2.5]) {
            const k = semiAmplitudeFromMass(m, { period, eccentricity: e, starMass });
            const msini = minimumMass({ period, semiAmplitude: k, eccentricity: e }, starMass);
            const back = semiAmplitudeFromMass(msini, { period, eccentricity: e, starMass });
            worst = Math.max(worst, Math.abs(back / k - 1), Math.abs(msini / m - 1));
          }
        }
      }
    }
    expect(worst).toBeLessThan(1e-10);
  });

  test("minimumMass() solves the full mass function, not the small-planet approximation", () => {
    // 80 M♃ around a 0.1 M☉ star: m is comparable to M★.
    const starMass = 0.1;
    const orbit = { period: 30, semiAmplitude: 5000, eccentricity: 0.2 };
    const f = massFunction(orbit);
    const m = minimumMass(orbit, starMass);
    // The defining relation m³/(M★ + m)² = f holds to rounding.
    expect(Math.abs(m ** 3 / (starMass + m) ** 2 / f - 1)).toBeLessThan(1e-13);
    // The approximation m ≈ f^{1/3} M★^{2/3} is far off here (> 10 %).
    const approx = Math.cbrt(f * starMass * starMass);
    expect(m / approx).toBeGreaterThan(1.1);
  });

  test("trueMass() equals minimumMass() edge-on and m sin i otherwise", () => {
    const orbit = { period: 100, semiAmplitude: 50, eccentricity: 0.4 };
    expect(trueMass(orbit, 1.1, { inclination: Math.PI / 2 })).toBeCloseTo(
      minimumMass(orbit, 1.1),
      16,
    );
    const inc = 0.4;
    const m = trueMass(orbit, 1.1, { inclination: inc });
    const k = semiAmplitudeFromMass(m, {
      period: 100,
      eccentricity: 0.4,
      starMass: 1.1,
      inclination: inc,
    });
    expect(Math.abs(k / 50 - 1)).toBeLessThan(1e-12);
    expect(trueMass(orbit, 1.1, { inclination: 0 })).toBeNaN();
  });

  test("minimumMass() returns NaN for invalid input", () => {
    expect(minimumMass({ period: 10, semiAmplitude: 5, eccentricity: 1 }, 1)).toBeNaN();
    expect(minimumMass({ period: -1, semiAmplitude: 5, eccentricity: 0 }, 1)).toBeNaN();
    expect(minimumMass({ period: 10, semiAmplitude: 5, eccentricity: 0 }, 0)).toBeNaN();
    expect(minimumMass({ period: 10, semiAmplitude: 0, eccentricity: 0 }, 1)).toBe(0);
  });
});

describe("semiMajorAxis()", () => {
  test("semiMajorAxis() gives 1 au for Earth and 5.20 au for Jupiter", () => {
    // Fact-sheet semi-major axes (see top): 149.598e6 km, 778.57e6 km.
    const aEarth = semiMajorAxis(EARTH.period, 1, { planetMass: earthToSolarMasses(1) });
    expect(Math.abs(aEarth - 149.598e9 / AU)).toBeLessThan(1e-4);
    const aJupiter = semiMajorAxis(JUPITER.period, 1, { planetMass: jupiterToSolarMasses(1) });
    expect(Math.abs(aJupiter / (778.57e9 / AU) - 1)).toBeLessThan(1e-3);
    expect(semiMajorAxis(0, 1)).toBeNaN();
  });
});
