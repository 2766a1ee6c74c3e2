import { describe, expect, test } from "vitest";
import { fitSinusoids, type RvSeries, searchSignals } from "../../src/search/mod.ts";
import { randomTimes, testRandom } from "./_random.ts";

/** Invented star "Tessaly-7": three circular planets, a linear trend, two instruments. */
const PLANETS = [
  { period: 4.3, semiAmplitude: 3.5, conjunction: 2456001.3 },
  { period: 37, semiAmplitude: 7, conjunction: 2456020.0 },
  { period: 410, semiAmplitude: 12, conjunction: 2456250.0 },
];
const OFFSETS = [-1234.5, 42];
const SLOPE = 0.012; // m/s/d about T_TREND
const T_TREND = 2456000;

function threePlanetSeries(seed: string, count: number): RvSeries {
  const random = testRandom(seed);
  const time = randomTimes(random, count, 2455700, 1500);
  const rv = new Float64Array(count), rvErr = new Float64Array(count);
  const instrument = new Int32Array(count);
  for (let i = 0; i < count; i++) {
    const t = time[i]!;
    instrument[i] = random.uniform() < 0.4 ? 0 : 1;
    rvErr[i] = 1 + 1.5 * random.uniform();
    let v = OFFSETS[instrument[i]!]! + SLOPE * (t - T_TREND);
    // Circular Keplerian: v = -K sin(2 pi (t - Tc)/P).
    for (const p of PLANETS) {
      v -= p.semiAmplitude * Math.sin(2 * Math.PI * (t - p.conjunction) / p.period);
    }
    rv[i] = v + rvErr[i]! * random.normal();
  }
  return { time, rv, rvErr, instrument, count, instruments: 2 };
}

describe("searchSignals()", () => {
  test("searchSignals() finds three planted periods within 1 % with a trend and two instruments", () => {
    // Invented data: 220 points over 1500 d, sigma in [1, 2.5] m/s. The search model has a
    // linear trend (trendDegree 1) besides the two offsets. Default FAP threshold 1e-3.
    const series = threePlanetSeries("three-planets", 220);
    const result = searchSignals(series, { minPeriod: 1.5, trendDegree: 1, maxSignals: 6 });
    expect(result.signals.length).toBe(3);
    expect(result.nextPeak).not.toBeNull();
    expect(result.nextPeak!.fap).toBeGreaterThan(1e-3);
    expect(result.periodograms.length).toBe(4);
    // Semi-amplitude sd for a sinusoid fit ~ sqrt(2 / sum w) (var of a, b is 2/sum w for
    // uniformly spread phases; common practice, no source); accept 5 sd.
    const sumW = series.rvErr.reduce((s, e) => s + 1 / (e * e), 0);
    const kTol = 5 * Math.sqrt(2 / sumW);
    for (const planet of PLANETS) {
      const match = result.signals.find((s) => Math.abs(s.period / planet.period - 1) < 0.01);
      expect(match, `period ${planet.period} d`).toBeDefined();
      expect(match!.fap).toBeLessThan(1e-3);
      expect(Math.abs(match!.semiAmplitude - planet.semiAmplitude)).toBeLessThan(kTol);
    }
    // Slope sd = 1/sqrt(sum w (t - tbar_w)^2) for weighted linear regression; accept 5 sd.
    let tbar = 0;
    for (let i = 0; i < series.count; i++) tbar += series.time[i]! / series.rvErr[i]! ** 2 / sumW;
    let stt = 0;
    for (let i = 0; i < series.count; i++) {
      stt += (series.time[i]! - tbar) ** 2 / series.rvErr[i]! ** 2;
    }
    expect(Math.abs(result.trend[0]! - SLOPE)).toBeLessThan(5 / Math.sqrt(stt));
    // Residual rms close to the noise level: rms of sigma_i within 15 %.
    const noiseRms = Math.sqrt(series.rvErr.reduce((s, e) => s + e * e, 0) / series.count);
    expect(Math.abs(result.residualRms / noiseRms - 1)).toBeLessThan(0.15);
  });

  test("searchSignals() accepts nothing in pure noise", () => {
    const random = testRandom("search-noise");
    const count = 100;
    const time = randomTimes(random, count, 2457000, 900);
    const rvErr = new Float64Array(count).fill(2);
    const rv = Float64Array.from({ length: count }, () => 2 * random.normal());
    const result = searchSignals(
      { time, rv, rvErr, instrument: new Int32Array(count), count, instruments: 1 },
      { minPeriod: 2 },
    );
    expect(result.signals.length).toBe(0);
    expect(result.nextPeak!.fap).toBeGreaterThan(1e-3);
    expect(result.periodograms.length).toBe(1);
  });

  test("searchSignals() stops at maxSignals", () => {
    const series = threePlanetSeries("three-planets", 220);
    const result = searchSignals(series, { minPeriod: 1.5, trendDegree: 1, maxSignals: 1 });
    expect(result.signals.length).toBe(1);
    expect(result.nextPeak!.fap).toBeLessThan(1e-3);
  });
});

describe("fitSinusoids()", () => {
  test("fitSinusoids() recovers K and the time of conjunction from noiseless data", () => {
    // Noise-free circular orbits v = -K sin(2 pi (t - Tc)/P) plus offsets and trend: the
    // linear fit at the true periods is exact up to rounding (tolerance 1e-8).
    const random = testRandom("fit-exact");
    const count = 60;
    const time = randomTimes(random, count, 2456000, 600);
    const instrument = Int32Array.from({ length: count }, (_, i) => i % 2);
    const rv = new Float64Array(count);
    for (let i = 0; i < count; i++) {
      const t = time[i]!;
      rv[i] = OFFSETS[instrument[i]!]! + SLOPE * (t - T_TREND) -
        PLANETS[0]!.semiAmplitude * Math.sin(2 * Math.PI * (t - PLANETS[0]!.conjunction) / 4.3) -
        PLANETS[1]!.semiAmplitude * Math.sin(2 * Math.PI * (t - PLANETS[1]!.conjunction) / 37);
    }
    const series = {
      time,
      rv,
      rvErr: new Float64Array(count).fill(1),
      instrument,
      count,
      instruments: 2,
    };
    const fit = fitSinusoids(series, [4.3, 37], { trendDegree: 1 });
    expect(fit.chi2).toBeLessThan(1e-12);
    expect(Math.abs(fit.trend[0]! - SLOPE)).toBeLessThan(1e-10);
    // Offsets are referred to referenceTime: offset + slope * (tRef - T_TREND).
    const drift = SLOPE * (fit.referenceTime - T_TREND);
    expect(Math.abs(fit.offsets[0]! - (OFFSETS[0]! + drift))).toBeLessThan(1e-8);
    expect(Math.abs(fit.offsets[1]! - (OFFSETS[1]! + drift))).toBeLessThan(1e-8);
    for (let j = 0; j < 2; j++) {
      const planet = PLANETS[j]!, s = fit.sinusoids[j]!;
      expect(Math.abs(s.semiAmplitude - planet.semiAmplitude)).toBeLessThan(1e-8);
      const dt = (s.timeOfConjunction - planet.conjunction) / planet.period;
      expect(Math.abs(dt - Math.round(dt))).toBeLessThan(1e-9);
      expect(Math.abs(s.timeOfConjunction - fit.referenceTime)).toBeLessThanOrEqual(
        planet.period / 2,
      );
    }
  });

  test("fitSinusoids() returns NaN chi2 for two equal periods", () => {
    const random = testRandom("fit-singular");
    const time = randomTimes(random, 20, 0, 100);
    const series = {
      time,
      rv: time.map((t) => Math.sin(t)),
      rvErr: new Float64Array(20).fill(1),
      instrument: new Int32Array(20),
      count: 20,
      instruments: 1,
    };
    expect(Number.isNaN(fitSinusoids(series, [7, 7]).chi2)).toBe(true);
  });
});
