import { describe, expect, test } from "vitest";
import { addRmAnomaly, type RmParams } from "../../src/model/rm.ts";

// ---------------------------------------------------------------------------
// Independent reference: the sky geometry and the disk integral written here
// from the physics, sharing no code with src/model/rm.ts.
// ---------------------------------------------------------------------------

const DEG = Math.PI / 180;

/** Eccentric anomaly by plain bisection on E − e sin E − M (monotone in E). */
function keplerBisection(meanAnomaly: number, e: number): number {
  const m = meanAnomaly - 2 * Math.PI * Math.floor(meanAnomaly / (2 * Math.PI)); // [0, 2π)
  let lo = 0;
  let hi = 2 * Math.PI;
  for (let i = 0; i < 200; i++) {
    const mid = 0.5 * (lo + hi);
    if (mid - e * Math.sin(mid) - m > 0) hi = mid;
    else lo = mid;
  }
  return 0.5 * (lo + hi);
}

interface Sky {
  x: number;
  y: number;
  z: number;
}

/**
 * Planet position relative to the star in stellar radii. Winn 2010
 * (arXiv:1001.2010) eqs. 2–4 (recalled): X = −r cos(ω+ν), Y = −r sin(ω+ν) cos i,
 * Z = r sin(ω+ν) sin i, +Z toward the observer, ω the star's argument of
 * periastron as in the RV formula, conjunction at ν = π/2 − ω. The inclination is
 * found here from its definition — b is the sky separation at conjunction,
 * r_c cos i with r_c = a(1 − e²)/(1 + e cos ν_c) (ellipse equation) — rather
 * than from a quoted formula.
 */
function skyPosition(t: number, p: RmParams): Sky {
  const e = p.eccentricity;
  const w = p.argPeriastron;
  const nuC = Math.PI / 2 - w;
  const rC = (p.aOverRstar * (1 - e * e)) / (1 + e * Math.cos(nuC));
  const cosI = p.impact / rC;
  const sinI = Math.sqrt(1 - cosI * cosI);
  // Mean anomaly at conjunction via the half-angle relation
  // tan(E/2) = √((1−e)/(1+e)) tan(ν/2) (Murray & Dermott 1999, eq. 2.46, recalled).
  const eC = 2 * Math.atan(Math.sqrt((1 - e) / (1 + e)) * Math.tan(nuC / 2));
  const mC = eC - e * Math.sin(eC);
  const m = mC + (2 * Math.PI * (t - p.timeConjunction)) / p.period;
  const ecc = keplerBisection(m, e);
  const r = p.aOverRstar * (1 - e * Math.cos(ecc));
  const nu = 2 *
    Math.atan2(Math.sqrt(1 + e) * Math.sin(ecc / 2), Math.sqrt(1 - e) * Math.cos(ecc / 2));
  const u = w + nu;
  return { x: -r * Math.cos(u), y: -r * Math.sin(u) * cosI, z: r * Math.sin(u) * sinI };
}

/**
 * Brute-force RM anomaly on a cell-centred grid of the stellar disk.
 *
 * Definition (the same physical quantity the kernel claims to compute; Ohta,
 * Taruya & Suto 2005, ApJ 622, 1118, Sect. 2, first moment of the line):
 *   ΔV = −(Σ_hidden I v) / (Σ_star I − Σ_hidden I).
 * Intensity: quadratic limb darkening I = 1 − u1(1 − μ) − u2(1 − μ)², μ = √(1 − X² − Y²)
 * (Kopal 1950). Velocity: rigid rotation v_eq (ŝ × r) of the visible surface
 * point r = (X, Y, Z), Z = √(1 − X² − Y²), with the spin axis ŝ =
 * (sin i★ sin λ, sin i★ cos λ, cos i★): its sky projection is the orbit normal
 * (+Y) turned clockwise by λ, so λ runs from the spin to the orbit normal
 * counterclockwise as seen from +Z. The radial velocity is positive receding,
 * i.e. minus the Z component. i★ = 55° is used with v_eq = v sin i★ / sin i★ to
 * show that only v sin i★ matters.
 */
class BruteForceDisk {
  readonly cells: number;
  readonly h: number;
  readonly totalFlux: number;
  readonly u1: number;
  readonly u2: number;

  constructor(cells: number, u1: number, u2: number) {
    this.cells = cells;
    this.h = 2 / cells;
    this.u1 = u1;
    this.u2 = u2;
    let total = 0;
    for (let i = 0; i < cells; i++) {
      const x = -1 + (i + 0.5) * this.h;
      for (let j = 0; j < cells; j++) {
        const y = -1 + (j + 0.5) * this.h;
        const rr = x * x + y * y;
        if (rr < 1) total += this.intensity(rr);
      }
    }
    this.totalFlux = total;
  }

  intensity(rr: number): number {
    const om = 1 - Math.sqrt(1 - rr);
    return 1 - this.u1 * om - this.u2 * om * om;
  }

  anomaly(p: RmParams, sky: Sky): number {
    if (!(sky.z > 0)) return 0;
    const k = p.radiusRatio;
    const starInclination = 55 * DEG;
    const vEq = (1000 * p.vsini) / Math.sin(starInclination); // m/s
    const sx = Math.sin(starInclination) * Math.sin(p.lambda);
    const sy = Math.sin(starInclination) * Math.cos(p.lambda);
    const h = this.h;
    const iLo = Math.max(0, Math.floor((sky.x - k + 1) / h));
    const iHi = Math.min(this.cells - 1, Math.ceil((sky.x + k + 1) / h));
    const jLo = Math.max(0, Math.floor((sky.y - k + 1) / h));
    const jHi = Math.min(this.cells - 1, Math.ceil((sky.y + k + 1) / h));
    let hidden = 0;
    let hiddenVelocity = 0;
    for (let i = iLo; i <= iHi; i++) {
      const x = -1 + (i + 0.5) * h;
      for (let j = jLo; j <= jHi; j++) {
        const y = -1 + (j + 0.5) * h;
        const rr = x * x + y * y;
        if (rr >= 1) continue;
        const dx = x - sky.x;
        const dy = y - sky.y;
        if (dx * dx + dy * dy >= k * k) continue;
        const intensity = this.intensity(rr);
        // (ŝ × r)_Z = sx·Y − sy·X; receding velocity is −v_eq (ŝ × r)_Z.
        const v = -vEq * (sx * y - sy * x);
        hidden += intensity;
        hiddenVelocity += intensity * v;
      }
    }
    if (hidden === 0) return 0;
    return -hiddenVelocity / (this.totalFlux - hidden);
  }
}

/** First and fourth contact times found from the test's own geometry. */
function contactTimes(p: RmParams): [number, number] {
  const overlaps = (t: number) => {
    const s = skyPosition(t, p);
    return s.z > 0 && Math.hypot(s.x, s.y) < 1 + p.radiusRatio;
  };
  // Scan ±0.25 P around conjunction on a grid fine enough to find the transit.
  const step = p.period / 20000;
  let first = NaN;
  let last = NaN;
  for (
    let t = p.timeConjunction - 0.25 * p.period;
    t < p.timeConjunction + 0.25 * p.period;
    t += step
  ) {
    if (overlaps(t)) {
      if (Number.isNaN(first)) first = t;
      last = t;
    }
  }
  const refine = (inside: number, outside: number) => {
    for (let i = 0; i < 80; i++) {
      const mid = 0.5 * (inside + outside);
      if (overlaps(mid)) inside = mid;
      else outside = mid;
    }
    return 0.5 * (inside + outside);
  };
  return [refine(first, first - step), refine(last, last + step)];
}

function anomalyCurve(times: Float64Array, p: RmParams): Float64Array {
  const out = new Float64Array(times.length);
  addRmAnomaly(times, p, { out });
  return out;
}

function linspace(a: number, b: number, n: number): Float64Array {
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) out[i] = a + ((b - a) * i) / (n - 1);
  return out;
}

function maxAbs(values: Float64Array): number {
  let m = 0;
  for (const v of values) m = Math.max(m, Math.abs(v));
  return m;
}

function baseParams(over: Partial<RmParams>): RmParams {
  return {
    period: 2.5,
    timeConjunction: 1000.3,
    eccentricity: 0,
    argPeriastron: 90 * DEG,
    lambda: 0,
    vsini: 6,
    radiusRatio: 0.1,
    aOverRstar: 7,
    impact: 0.3,
    u1: 0.4,
    u2: 0.25,
    ...over,
  };
}

// ---------------------------------------------------------------------------

describe("addRmAnomaly()", () => {
  const cases: Array<[string, Partial<RmParams>]> = [
    ["aligned, b = 0.3", { lambda: 0, impact: 0.3, radiusRatio: 0.1 }],
    ["lambda = 40 deg, b = 0.5", {
      lambda: 40 * DEG,
      impact: 0.5,
      radiusRatio: 0.08,
      u1: 0.6,
      u2: 0.1,
    }],
    ["lambda = -70 deg, b = 0.2, large planet", {
      lambda: -70 * DEG,
      impact: 0.2,
      radiusRatio: 0.15,
      u1: 0.3,
      u2: 0.3,
    }],
    ["lambda = 130 deg, b = 0.85", {
      lambda: 130 * DEG,
      impact: 0.85,
      radiusRatio: 0.12,
      u1: 0.5,
      u2: 0.2,
    }],
    ["grazing chord, b = 1.0", { lambda: 30 * DEG, impact: 1.0, radiusRatio: 0.1 }],
    ["grazing chord, b = 0.97, Rp/R* = 0.2", {
      lambda: -50 * DEG,
      impact: 0.97,
      radiusRatio: 0.2,
      u1: 0.7,
      u2: 0,
    }],
    ["eccentric, e = 0.35, omega = 60 deg", {
      lambda: 20 * DEG,
      impact: 0.4,
      eccentricity: 0.35,
      argPeriastron: 60 * DEG,
    }],
  ];

  // Brute force vs kernel. Grid of 3000 × 3000 cells (h = 6.7e-4 R★); the
  // pixelisation error of the hidden area is far below 1% of the amplitude
  // (a few boundary cells out of ~2e4 hidden cells for Rp/R★ ≥ 0.08).
  test.each(cases)(
    "addRmAnomaly() agrees with a brute-force disk integration within one percent of the amplitude (%s)",
    (_name, over) => {
      const p = baseParams(over);
      const disk = new BruteForceDisk(3000, p.u1, p.u2);
      const [t1, t4] = contactTimes(p);
      const margin = 0.03 * (t4 - t1);
      const times = linspace(t1 - margin, t4 + margin, 60);
      const model = anomalyCurve(times, p);
      const reference = new Float64Array(times.length);
      let inTransit = 0;
      for (let i = 0; i < times.length; i++) {
        reference[i] = disk.anomaly(p, skyPosition(times[i]!, p));
        if (reference[i] !== 0) inTransit++;
      }
      expect(inTransit).toBeGreaterThanOrEqual(50);
      const amplitude = maxAbs(reference);
      expect(amplitude).toBeGreaterThan(1); // m/s: the case is not trivially zero
      for (let i = 0; i < times.length; i++) {
        expect(Math.abs(model[i]! - reference[i]!)).toBeLessThanOrEqual(0.01 * amplitude);
      }
    },
  );

  // Gaudi & Winn 2007, ApJ 655, 550, Sect. 2 (recalled; equation number not
  // verified): ΔV ≈ (Rp/R★)² v sin i★ √(1 − b²) for a uniform disk and small
  // Rp/R★. Neglected terms, derived here for a uniform disk (ΔV = v sin i★ ×
  // [∫_hidden X dA]/(π − A)): with the planet fully inside at second contact,
  // X = √((1 − k)² − b²), A = πk², so ΔV ≥ k² v sin i★ √((1 − k)² − b²)/(1 − k²);
  // and always ∫ X dA ≤ X_max A with A ≤ πk², X_max ≤ √(1 − (b − k)²) (X_max ≤ 1
  // for b < k), so ΔV ≤ k² v sin i★ √(1 − max(0, b − k)²)/(1 − k²). Both bounds
  // are within O(k) (b = 0) of the approximation, which is therefore exact to
  // within 1% for k = 0.01.
  test.each([
    [0.01, 0],
    [0.03, 0],
    [0.01, 0.5],
  ])(
    "addRmAnomaly() matches the Gaudi & Winn (2007) amplitude for Rp/R* = %f, b = %f on a uniform disk",
    (k, b) => {
      const p = baseParams({ radiusRatio: k, impact: b, u1: 0, u2: 0, lambda: 0, aOverRstar: 20 });
      const [t1, t4] = contactTimes(p);
      // Second contact (planet just fully inside), from the test's own geometry.
      let inside = p.timeConjunction;
      let outside = t1;
      for (let i = 0; i < 80; i++) {
        const mid = 0.5 * (inside + outside);
        const s = skyPosition(mid, p);
        if (Math.hypot(s.x, s.y) <= 1 - k) inside = mid;
        else outside = mid;
      }
      const t2 = inside;
      // Whole transit plus a dense grid across second contact, where the curve
      // has its kink and (just outside it) its maximum.
      const ingress = t2 - t1;
      const times = new Float64Array([
        ...linspace(t1, t4, 20001),
        ...linspace(t2 - ingress, t2 + ingress, 4001),
        t2,
      ]);
      const amplitude = maxAbs(anomalyCurve(times, p));
      const scale = k * k * 1000 * p.vsini; // m/s
      const lower = (scale * Math.sqrt((1 - k) ** 2 - b * b)) / (1 - k * k);
      const upper = (scale * Math.sqrt(1 - Math.max(0, b - k) ** 2)) / (1 - k * k);
      // The lower bound is the anomaly at t2 itself (in the sample); 1e-6 allows for
      // the 16-node quadrature and for t2 being bisected to ~1e-13 d.
      expect(amplitude).toBeGreaterThanOrEqual(lower * (1 - 1e-6));
      expect(amplitude).toBeLessThanOrEqual(upper);
      const gaudiWinn = scale * Math.sqrt(1 - b * b);
      if (b === 0) {
        // |relative deviation| ≤ k/(1 + k) < k from the bounds above.
        expect(Math.abs(amplitude / gaudiWinn - 1)).toBeLessThanOrEqual(k);
      }
    },
  );

  test("addRmAnomaly() is antisymmetric about mid-transit for lambda = 0, b = 0", () => {
    // Symmetry of the geometry (common practice, no source): reflecting X → −X
    // maps the chord onto itself and v → −v.
    const p = baseParams({ lambda: 0, impact: 0 });
    const [t1, t4] = contactTimes(p);
    const half = 0.5 * (t4 - t1) * 1.05;
    const offsets = linspace(0, half, 60);
    const before = new Float64Array(offsets.length);
    const after = new Float64Array(offsets.length);
    for (let i = 0; i < offsets.length; i++) {
      before[i] = p.timeConjunction - offsets[i]!;
      after[i] = p.timeConjunction + offsets[i]!;
    }
    const vBefore = anomalyCurve(before, p);
    const vAfter = anomalyCurve(after, p);
    const amplitude = maxAbs(vBefore);
    expect(amplitude).toBeGreaterThan(10);
    for (let i = 0; i < offsets.length; i++) {
      // Only rounding in t ± offset and the Kepler solve breaks exactness.
      expect(Math.abs(vBefore[i]! + vAfter[i]!)).toBeLessThanOrEqual(1e-7 * amplitude);
    }
    // Aligned prograde orbit: the approaching (blue) half is covered first, so the
    // anomaly is positive before mid-transit (Queloz et al. 2000, A&A 359, L13,
    // Fig. 2 shape; common practice).
    expect(vBefore[30]!).toBeGreaterThan(0);
    expect(vAfter[30]!).toBeLessThan(0);
  });

  test("addRmAnomaly() is one-signed for lambda = +90 deg and -90 deg with opposite signs", () => {
    const plus = baseParams({ lambda: 90 * DEG, impact: 0.4 });
    const minus = baseParams({ lambda: -90 * DEG, impact: 0.4 });
    const [t1, t4] = contactTimes(plus);
    const times = linspace(t1, t4, 80);
    const vPlus = anomalyCurve(times, plus);
    const vMinus = anomalyCurve(times, minus);
    for (let i = 1; i < times.length - 1; i++) {
      expect(vPlus[i]!).toBeLessThan(0); // chord over the receding half (sign convention)
      expect(vMinus[i]!).toBeGreaterThan(0);
      expect(Math.abs(vPlus[i]! + vMinus[i]!)).toBeLessThanOrEqual(1e-9 * Math.abs(vPlus[i]!));
    }
  });

  test("addRmAnomaly() flips the sign when lambda goes to lambda + 180 deg", () => {
    for (const lambdaDeg of [0, 25, -110]) {
      const p = baseParams({ lambda: lambdaDeg * DEG, impact: 0.45 });
      const q = baseParams({ lambda: (lambdaDeg + 180) * DEG, impact: 0.45 });
      const [t1, t4] = contactTimes(p);
      const times = linspace(t1, t4, 60);
      const a = anomalyCurve(times, p);
      const b = anomalyCurve(times, q);
      const amplitude = maxAbs(a);
      for (let i = 0; i < times.length; i++) {
        expect(Math.abs(a[i]! + b[i]!)).toBeLessThanOrEqual(1e-9 * amplitude);
      }
    }
  });

  test("addRmAnomaly() is negative at mid-transit for b > 0 and lambda > 0", () => {
    // The fixed sign convention of issue 8 / the module documentation.
    for (const lambdaDeg of [10, 45, 135]) {
      for (const impact of [0.2, 0.7]) {
        const p = baseParams({ lambda: lambdaDeg * DEG, impact });
        expect(anomalyCurve(new Float64Array([p.timeConjunction]), p)[0]!).toBeLessThan(0);
        const q = baseParams({ lambda: -lambdaDeg * DEG, impact });
        expect(anomalyCurve(new Float64Array([q.timeConjunction]), q)[0]!).toBeGreaterThan(0);
      }
    }
  });

  test("addRmAnomaly() adds nothing outside transit or during the occultation", () => {
    const p = baseParams({
      lambda: 30 * DEG,
      impact: 0.1,
      eccentricity: 0.2,
      argPeriastron: 200 * DEG,
    });
    const [t1, t4] = contactTimes(p);
    const tc = p.timeConjunction;
    // Just outside the contacts, far away, and across the occultation (the planet
    // behind the star overlaps the disk on the sky but hides nothing).
    const times = new Float64Array([
      t1 - 1e-6,
      t4 + 1e-6,
      tc - 0.3 * p.period,
      tc + 0.3 * p.period,
    ]);
    const occultation = linspace(tc + 0.25 * p.period, tc + 0.75 * p.period, 2001);
    const all = new Float64Array([...times, ...occultation, ...times.map((t) => t + 7 * p.period)]);
    let behindOverlap = 0;
    for (const t of occultation) {
      const s = skyPosition(t, p);
      if (s.z < 0 && Math.hypot(s.x, s.y) < 1 + p.radiusRatio) behindOverlap++;
    }
    expect(behindOverlap).toBeGreaterThan(10); // the occultation is really sampled
    const out = new Float64Array(all.length).fill(123.25);
    addRmAnomaly(all, p, { out });
    for (const v of out) expect(v).toBe(123.25);
    // And just inside the contacts it does add something.
    const inside = anomalyCurve(new Float64Array([t1 + 1e-4, t4 - 1e-4]), p);
    expect(inside[0]).not.toBe(0);
    expect(inside[1]).not.toBe(0);
  });

  test("addRmAnomaly() transit duration follows the eccentric orbit", () => {
    // Contacts from the kernel (first/last time it adds a non-zero value, found by
    // bisection) against the test's own geometry; and the duration against Winn
    // 2010 (arXiv:1001.2010) eqs. 14 and 16 (recalled): T14 ≈ (P/π) asin[√((1+k)² − b²)
    // /((a/R★) sin i)] · √(1 − e²)/(1 + e sin ω). Eq. 16 assumes r constant during
    // transit; for a/R★ = 15 the transit spans < 3% of the orbit and the error is
    // well below 1%, the tolerance used.
    const kernelContacts = (p: RmParams): [number, number] => {
      const adds = (t: number) => anomalyCurve(new Float64Array([t]), p)[0] !== 0;
      const [g1, g4] = contactTimes(p);
      const bisect = (inside: number, outside: number) => {
        for (let i = 0; i < 80; i++) {
          const mid = 0.5 * (inside + outside);
          if (adds(mid)) inside = mid;
          else outside = mid;
        }
        return inside;
      };
      const c = 0.5 * (g1 + g4);
      return [bisect(c, c - p.period / 4), bisect(c, c + p.period / 4)];
    };
    const durations: number[] = [];
    for (const [e, omegaDeg] of [[0, 90], [0.4, 90], [0.4, -90], [0.3, 20]] as const) {
      const p = baseParams({
        eccentricity: e,
        argPeriastron: omegaDeg * DEG,
        aOverRstar: 15,
        impact: 0.3,
      });
      const [k1, k4] = kernelContacts(p);
      const [g1, g4] = contactTimes(p);
      expect(Math.abs(k1 - g1)).toBeLessThan(1e-7);
      expect(Math.abs(k4 - g4)).toBeLessThan(1e-7);
      const sinW = Math.sin(p.argPeriastron);
      const cosI = (p.impact * (1 + e * sinW)) / (p.aOverRstar * (1 - e * e)); // Winn 2010 eq. 7
      const sinI = Math.sqrt(1 - cosI * cosI);
      const winn = (p.period / Math.PI) *
        Math.asin(Math.sqrt((1 + p.radiusRatio) ** 2 - p.impact ** 2) / (p.aOverRstar * sinI)) *
        (Math.sqrt(1 - e * e) / (1 + e * sinW));
      expect(Math.abs((k4 - k1) / winn - 1)).toBeLessThan(0.01);
      durations.push(k4 - k1);
    }
    // Transit near periastron (ω = 90°) is shorter, near apoastron (ω = −90°) longer.
    expect(durations[1]!).toBeLessThan(durations[0]!);
    expect(durations[2]!).toBeGreaterThan(durations[0]!);
  });

  describe("exposure smearing", () => {
    const p = baseParams({ lambda: 35 * DEG, impact: 0.4 });
    const exposure = 1800; // s
    const exposureDays = exposure / 86400;
    const [t1, t4] = contactTimes(p);
    const times = linspace(t1 - 0.6 * exposureDays, t4 + 0.6 * exposureDays, 61);

    /** Average of the unsmeared kernel over each exposure, composite trapezoid rule. */
    function fineAverage(nodes: number): Float64Array {
      const out = new Float64Array(times.length);
      const sub = new Float64Array(nodes);
      for (let i = 0; i < times.length; i++) {
        for (let j = 0; j < nodes; j++) {
          sub[j] = times[i]! + (j / (nodes - 1) - 0.5) * exposureDays;
        }
        const v = anomalyCurve(sub, p);
        let s = 0.5 * (v[0]! + v[nodes - 1]!);
        for (let j = 1; j < nodes - 1; j++) s += v[j]!;
        out[i] = s / (nodes - 1);
      }
      return out;
    }
    const reference = fineAverage(3001);
    const amplitude = maxAbs(reference);

    test("addRmAnomaly() with a long exposure equals the average of the unsmeared curve", () => {
      // 301 midpoint sub-exposures (6 s each) vs a 3001-node trapezoid: both rules
      // err by O(h²) on the smooth parts and O(h²·jump in slope) at the four
      // contacts; with h ≤ 6 s against an ingress of ~20 min the difference is
      // < 1e-5 of the amplitude. 1e-4 leaves room.
      const smeared = anomalyCurve(times, { ...p, exposure, supersample: 301 });
      for (let i = 0; i < times.length; i++) {
        expect(Math.abs(smeared[i]! - reference[i]!)).toBeLessThanOrEqual(1e-4 * amplitude);
      }
      // Smearing matters at this exposure: the unsmeared curve differs by > 1%.
      const sharp = anomalyCurve(times, p);
      let largest = 0;
      for (let i = 0; i < times.length; i++) {
        largest = Math.max(largest, Math.abs(sharp[i]! - reference[i]!));
      }
      expect(largest).toBeGreaterThan(0.01 * amplitude);
    });

    test("addRmAnomaly() defaults to an odd number of 2-minute sub-exposures", () => {
      // ceil(1800 / 120) = 15 (already odd).
      const byDefault = anomalyCurve(times, { ...p, exposure });
      const explicit = anomalyCurve(times, { ...p, exposure, supersample: 15 });
      expect(Array.from(byDefault)).toEqual(Array.from(explicit));
      // ceil(240 / 120) = 2 → 3.
      const short = anomalyCurve(times, { ...p, exposure: 240 });
      const short3 = anomalyCurve(times, { ...p, exposure: 240, supersample: 3 });
      expect(Array.from(short)).toEqual(Array.from(short3));
      // Midpoint rule with h = 120 s: smooth-part error ≤ h²|f''|/24 and a kink of
      // slope jump Δf' costs ≤ h·Δf'·h/8 over the exposure T; with |f'| ≲ A/(20 min)
      // these are ≲ 1e-3 A. Tolerance 0.5% of the amplitude.
      for (let i = 0; i < times.length; i++) {
        expect(Math.abs(byDefault[i]! - reference[i]!)).toBeLessThanOrEqual(0.005 * amplitude);
      }
    });

    test("addRmAnomaly() with exposure 0 is the unsmeared curve", () => {
      expect(Array.from(anomalyCurve(times, { ...p, exposure: 0 }))).toEqual(
        Array.from(anomalyCurve(times, p)),
      );
    });
  });

  test("addRmAnomaly() adds NaN for invalid parameters", () => {
    const times = new Float64Array([1000.3, 1001]);
    for (
      const over of [
        { eccentricity: 1 },
        { eccentricity: -0.1 },
        { period: 0 },
        { radiusRatio: 1 },
        { impact: -0.1 },
        { vsini: -1 },
        { aOverRstar: 0.9 },
        { impact: 8 }, // needs cos i > 1 with a/R★ = 7
        { u1: 2, u2: 3 }, // negative total flux, 1 − u1/3 − u2/6 < 0
        { lambda: NaN },
      ] as Partial<RmParams>[]
    ) {
      const out = new Float64Array(2).fill(1);
      addRmAnomaly(times, baseParams(over), { out });
      expect(Number.isNaN(out[0])).toBe(true);
      expect(Number.isNaN(out[1])).toBe(true);
    }
    const out = new Float64Array(2);
    addRmAnomaly(new Float64Array([NaN, 1001]), baseParams({}), { out });
    expect(Number.isNaN(out[0])).toBe(true);
    expect(out[1]).toBe(0);
  });

  test("addRmAnomaly() processes only count entries and rejects bad shapes", () => {
    const p = baseParams({ lambda: 20 * DEG });
    const times = new Float64Array([
      p.timeConjunction - 0.02,
      p.timeConjunction + 0.02,
      p.timeConjunction,
    ]);
    const out = new Float64Array(3);
    addRmAnomaly(times, p, { out, count: 2 });
    expect(out[0]).not.toBe(0);
    expect(out[2]).toBe(0);
    expect(() => addRmAnomaly(times, p, { out: new Float64Array(2) })).toThrow(RangeError);
    expect(() => addRmAnomaly(times, p, { out, count: 4 })).toThrow(RangeError);
    expect(() => addRmAnomaly(times, { ...p, exposure: -1 }, { out })).toThrow(RangeError);
    expect(() => addRmAnomaly(times, { ...p, exposure: 600, supersample: 2.5 }, { out })).toThrow(
      RangeError,
    );
  });
});
