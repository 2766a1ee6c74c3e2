import { describe, expect, test } from "vitest";
import {
  addKeplerianRv,
  meanAnomalyAtConjunction,
  type Orbit,
  timeConjunctionFromPeriastron,
  timePeriastronFromConjunction,
} from "../../src/model/keplerian.ts";
import { GM_SUN } from "../../src/physics/constants.ts";
import { semiAmplitudeFromMass } from "../../src/physics/mass.ts";

/**
 * Independent two-body integration: classical fourth-order Runge–Kutta (Kutta
 * 1901; e.g. Press et al. 2007, Numerical Recipes 3rd ed., eq. 17.1.3) on the
 * relative orbit r̈ = −μ r/|r|³ in the orbital plane, fixed small steps. Returns
 * the star's line-of-sight velocity (Z away from the observer, positive =
 * receding) and the planet-minus-star position on the sky (X along the line of
 * nodes, Z along the line of sight) at the requested times.
 *
 * Geometry (Murray & Dermott 1999, Solar System Dynamics, eq. 2.122 with
 * Ω = 0; recalled from memory): a vector with in-plane components (p, q) along
 * the star's periastron direction and its direction of motion there has sky
 * components X = p cos ω − q sin ω, Z = (p sin ω + q cos ω) sin i.
 */
function integrateTwoBody(
  setup: { period: number; e: number; omega: number; inc: number; mStar: number; mPlanet: number },
  times: number[],
): { vz: number[]; relX: number[]; relZ: number[] } {
  const { period, e, omega, inc, mStar, mPlanet } = setup;
  const day = 86400;
  const mu = GM_SUN * (mStar + mPlanet) * day * day; // m³ d⁻²
  const a = Math.cbrt(mu * period * period / (4 * Math.PI * Math.PI));
  // Relative vector r = planet − star. Star at periastron at t = 0 means the
  // planet is at −p̂ at distance a(1 − e), moving along −q̂ with vis-viva speed.
  let x = -a * (1 - e);
  let y = 0;
  let vx = 0;
  let vy = -Math.sqrt(mu * (1 + e) / (a * (1 - e)));
  const stepsPerPeriod = 400_000;
  const h = period / stepsPerPeriod;
  const acc = (px: number, py: number): [number, number] => {
    const r2 = px * px + py * py;
    const f = -mu / (r2 * Math.sqrt(r2));
    return [f * px, f * py];
  };
  const starFraction = mPlanet / (mStar + mPlanet);
  const vz: number[] = [];
  const relX: number[] = [];
  const relZ: number[] = [];
  let t = 0;
  for (const target of times) {
    while (t < target - 1e-12) {
      const dt = Math.min(h, target - t);
      const [a1x, a1y] = acc(x, y);
      const [a2x, a2y] = acc(x + 0.5 * dt * vx, y + 0.5 * dt * vy);
      const [a3x, a3y] = acc(
        x + 0.5 * dt * (vx + 0.5 * dt * a1x),
        y + 0.5 * dt * (vy + 0.5 * dt * a1y),
      );
      const [a4x, a4y] = acc(x + dt * (vx + 0.5 * dt * a2x), y + dt * (vy + 0.5 * dt * a2y));
      x += dt * (vx + dt * (a1x + a2x + a3x) / 6);
      y += dt * (vy + dt * (a1y + a2y + a3y) / 6);
      vx += dt * (a1x + 2 * a2x + 2 * a3x + a4x) / 6;
      vy += dt * (a1y + 2 * a2y + 2 * a3y + a4y) / 6;
      t += dt;
    }
    // Star velocity about the barycentre = −m/(M + m) × relative velocity (m/d → m/s).
    const sp = -starFraction * vx / day;
    const sq = -starFraction * vy / day;
    vz.push((sp * Math.sin(omega) + sq * Math.cos(omega)) * Math.sin(inc));
    relX.push(x * Math.cos(omega) - y * Math.sin(omega));
    relZ.push((x * Math.sin(omega) + y * Math.cos(omega)) * Math.sin(inc));
  }
  return { vz, relX, relZ };
}

describe("addKeplerianRv()", () => {
  // Invented system: a 0.01 M☉ companion on a 10-day, e = 0.6 orbit.
  const setup = { period: 10, e: 0.6, omega: 1.1, inc: 1.05, mStar: 1, mPlanet: 0.01 };
  const k = semiAmplitudeFromMass(setup.mPlanet, {
    period: setup.period,
    eccentricity: setup.e,
    starMass: setup.mStar,
    inclination: setup.inc,
  });
  const orbit: Orbit = {
    period: setup.period,
    timePeriastron: 0,
    semiAmplitude: k,
    eccentricity: setup.e,
    argPeriastron: setup.omega,
  };

  test("addKeplerianRv() matches a numerically integrated two-body orbit to 1e-9 of K", () => {
    const times = Array.from({ length: 151 }, (_, i) => i * 0.1);
    const numeric = integrateTwoBody(setup, times);
    const out = new Float64Array(times.length);
    addKeplerianRv(new Float64Array(times), orbit, { out });
    let worst = 0;
    for (let i = 0; i < times.length; i++) {
      worst = Math.max(worst, Math.abs(out[i]! - numeric.vz[i]!));
    }
    // Relative to the amplitude K (the velocity itself crosses zero).
    expect(worst / k).toBeLessThan(1e-9);
    // The curve is not trivially small: K is about 1.6 km/s here.
    expect(k).toBeGreaterThan(1000);
  });

  test("timeConjunctionFromPeriastron() puts the planet in front of the star", () => {
    // At inferior conjunction the planet sits on the line of sight between star
    // and observer: sky X = 0 and Z < 0 (Z points away from the observer).
    const tc = timeConjunctionFromPeriastron(0, orbit);
    const numeric = integrateTwoBody(setup, [tc < 0 ? tc + setup.period : tc]);
    const a = Math.cbrt(GM_SUN * 1.01 * (10 * 86400) ** 2 / (4 * Math.PI ** 2));
    expect(Math.abs(numeric.relX[0]!) / a).toBeLessThan(1e-9);
    expect(numeric.relZ[0]!).toBeLessThan(0);
  });

  test("timePeriastronFromConjunction() inverts timeConjunctionFromPeriastron()", () => {
    for (const e of [0, 0.1, 0.5, 0.9, 0.99]) {
      for (const w of [-3, -1, 0, 0.5, 2, 3.1]) {
        const o = { period: 7.3, eccentricity: e, argPeriastron: w };
        const tp = timePeriastronFromConjunction(1234.5, o);
        expect(Math.abs(timeConjunctionFromPeriastron(tp, o) - 1234.5)).toBeLessThan(1e-10);
        expect(Math.abs(tp - 1234.5)).toBeLessThanOrEqual(7.3 / 2 + 1e-12);
      }
    }
  });

  test("meanAnomalyAtConjunction() gives π/2 − ω for a circular orbit", () => {
    // e = 0: M = E = ν (analytic).
    expect(meanAnomalyAtConjunction({ eccentricity: 0, argPeriastron: 0.3 })).toBeCloseTo(
      Math.PI / 2 - 0.3,
      14,
    );
    expect(meanAnomalyAtConjunction({ eccentricity: 1, argPeriastron: 0.3 })).toBeNaN();
  });

  test("addKeplerianRv() gives K cos(2π(t − tp)/P + ω) for a circular orbit", () => {
    // e = 0: ν = M, so v = K cos(M + ω) (analytic).
    const n = 700; // more than one internal chunk
    const times = new Float64Array(n).map((_, i) => 3 + i * 0.37);
    const out = new Float64Array(n).fill(5);
    const o: Orbit = {
      period: 4.2,
      timePeriastron: 1.1,
      semiAmplitude: 30,
      eccentricity: 0,
      argPeriastron: 2,
    };
    addKeplerianRv(times, o, { out });
    for (let i = 0; i < n; i++) {
      const m = 2 * Math.PI * (times[i]! - 1.1) / 4.2;
      const expected = 5 + 30 * Math.cos(m + 2);
      // Both sides round M (up to ~400 rad here): tolerance 50 ε K |M|.
      expect(Math.abs(out[i]! - expected)).toBeLessThan(50 * Number.EPSILON * 30 * Math.max(1, m));
    }
  });

  test("addKeplerianRv() adds only count points and NaN for an invalid orbit", () => {
    const times = new Float64Array([0, 1, 2, 3]);
    const out = new Float64Array(4);
    addKeplerianRv(times, { ...orbit, eccentricity: 1 }, { out, count: 2 });
    expect(out[0]).toBeNaN();
    expect(out[1]).toBeNaN();
    expect(out[2]).toBe(0);
    const out2 = new Float64Array(4);
    addKeplerianRv(times, orbit, { out: out2, count: 3 });
    expect(out2[3]).toBe(0);
    expect(out2[2]).not.toBe(0);
  });
});
