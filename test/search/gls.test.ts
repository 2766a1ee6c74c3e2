import { describe, expect, test } from "vitest";
import { frequencyGrid, glsPeriodogram, type RvSeries } from "../../src/search/mod.ts";
import { leastSquaresChi2, randomTimes, testRandom } from "./_random.ts";

/** Invented series: uneven times, unequal errors, several instruments with offsets. */
function makeSeries(seed: string, count: number, instruments: number): RvSeries {
  const random = testRandom(seed);
  const time = randomTimes(random, count, 2455000, 800);
  const rv = new Float64Array(count), rvErr = new Float64Array(count);
  const instrument = new Int32Array(count);
  const offsets = [-1520, 35, 7.5];
  for (let i = 0; i < count; i++) {
    instrument[i] = Math.floor(random.uniform() * instruments);
    rvErr[i] = 1 + 4 * random.uniform();
    rv[i] = offsets[instrument[i]!]! + 6 * Math.sin(2 * Math.PI * time[i]! / 23.1 + 0.4) +
      rvErr[i]! * random.normal();
  }
  return { time, rv, rvErr, instrument, count, instruments };
}

/**
 * Power from two independent direct least-squares fits (see _random.ts):
 * null model = indicator column per instrument (+ trend columns),
 * full model = null + cos + sin; p = (chi2_null - chi2_full) / chi2_null
 * (Zechmeister & Kürster 2009, A&A 496, 577, Sect. 2 definition of p).
 */
function directPower(series: RvSeries, f: number, trendDegree: number, offsets = true): number {
  const n = series.count;
  const w = Array.from(series.rvErr, (s) => 1 / (s * s));
  const nullCols: Float64Array[] = [];
  if (offsets) {
    for (let k = 0; k < series.instruments; k++) {
      nullCols.push(Float64Array.from(series.instrument, (j) => (j === k ? 1 : 0)));
    }
  }
  for (let d = 1; d <= trendDegree; d++) {
    nullCols.push(Float64Array.from(series.time, (t) => ((t - 2455400) / 400) ** d));
  }
  const cos = new Float64Array(n), sin = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    cos[i] = Math.cos(2 * Math.PI * f * series.time[i]!);
    sin[i] = Math.sin(2 * Math.PI * f * series.time[i]!);
  }
  const chi2Null = nullCols.length > 0
    ? leastSquaresChi2(nullCols, series.rv, w).chi2
    : series.rv.reduce((s, y, i) => s + w[i]! * y * y, 0);
  const chi2Full = leastSquaresChi2([...nullCols, cos, sin], series.rv, w).chi2;
  return (chi2Null - chi2Full) / chi2Null;
}

describe("glsPeriodogram()", () => {
  test("glsPeriodogram() equals a direct least-squares fit with per-instrument offsets", () => {
    // Independent computation in the test; tolerance 1e-8 in power as required by issue 10.
    const series = makeSeries("gls-direct", 90, 3);
    const grid = frequencyGrid(series.time, { minPeriod: 2, maxPeriod: 800, oversample: 5 });
    const gls = glsPeriodogram(series, grid); // evenly spaced grid: trig recurrence path
    expect(gls.nullParameters).toBe(3);
    let worst = 0;
    for (let k = 0; k < grid.count; k += 3) {
      worst = Math.max(
        worst,
        Math.abs(gls.power[k]! - directPower(series, grid.frequencies[k]!, 0)),
      );
    }
    expect(worst).toBeLessThan(1e-8);
  });

  test("glsPeriodogram() equals a direct least-squares fit with offsets and a quadratic trend", () => {
    const series = makeSeries("gls-trend", 70, 2);
    const freqs = new Float64Array(300);
    const random = testRandom("gls-trend-freqs");
    for (let k = 0; k < freqs.length; k++) freqs[k] = 1 / 800 + random.uniform() * 0.5;
    const gls = glsPeriodogram(series, freqs, { trendDegree: 2 }); // arbitrary frequencies: direct trig path
    expect(gls.nullParameters).toBe(4);
    let worst = 0;
    for (let k = 0; k < freqs.length; k++) {
      worst = Math.max(worst, Math.abs(gls.power[k]! - directPower(series, freqs[k]!, 2)));
    }
    expect(worst).toBeLessThan(1e-8);
  });

  test("glsPeriodogram() matches the Zechmeister & Kürster closed form for one instrument", () => {
    // ZK09 Sect. 2: w_i = (1/sigma_i^2)/W; Y = sum w y, C = sum w cos, S = sum w sin;
    // YY = sum w y^2 - Y^2, YC = sum w y cos - Y C, YS = sum w y sin - Y S,
    // CC = sum w cos^2 - C^2, SS = sum w sin^2 - S^2, CS = sum w cos sin - C S,
    // D = CC SS - CS^2, p = (SS YC^2 + CC YS^2 - 2 CS YC YS) / (YY D).
    // Written here from the paper's formulas (recalled from memory; equation numbers not checked).
    const series = makeSeries("gls-zk09", 60, 1);
    const grid = frequencyGrid(series.time, { minPeriod: 3, oversample: 3 });
    const gls = glsPeriodogram(series, grid);
    const n = series.count;
    let W = 0;
    for (let i = 0; i < n; i++) W += 1 / series.rvErr[i]! ** 2;
    let worst = 0;
    for (let k = 0; k < grid.count; k += 5) {
      const om = 2 * Math.PI * grid.frequencies[k]!;
      let Y = 0, C = 0, S = 0, YYh = 0, YCh = 0, YSh = 0, CCh = 0, SSh = 0, CSh = 0;
      for (let i = 0; i < n; i++) {
        const w = 1 / series.rvErr[i]! ** 2 / W, y = series.rv[i]!;
        const c = Math.cos(om * series.time[i]!), s = Math.sin(om * series.time[i]!);
        Y += w * y;
        C += w * c;
        S += w * s;
        YYh += w * y * y;
        YCh += w * y * c;
        YSh += w * y * s;
        CCh += w * c * c;
        SSh += w * s * s;
        CSh += w * c * s;
      }
      const YY = YYh - Y * Y, YC = YCh - Y * C, YS = YSh - Y * S;
      const CC = CCh - C * C, SS = SSh - S * S, CS = CSh - C * S;
      const D = CC * SS - CS * CS;
      const p = (SS * YC * YC + CC * YS * YS - 2 * CS * YC * YS) / (YY * D);
      worst = Math.max(worst, Math.abs(gls.power[k]! - p));
    }
    expect(worst).toBeLessThan(1e-8);
  });

  test("glsPeriodogram() reduces to the classical Lomb–Scargle periodogram without offsets", () => {
    // Scargle 1982, ApJ 263, 835, eqs. (10)–(11) (Lomb 1976, Ap&SS 39, 447, is equivalent):
    //   P_X(w) = 1/2 { [sum X_j cos w(t_j - tau)]^2 / sum cos^2 w(t_j - tau)
    //                + [sum X_j sin w(t_j - tau)]^2 / sum sin^2 w(t_j - tau) },
    //   tan(2 w tau) = sum sin 2 w t_j / sum cos 2 w t_j,
    // for mean-subtracted X. With equal weights and no constant term, the relative chi^2
    // reduction is p = 2 P_X / sum X_j^2 (ZK09 Sect. 2, normalisation by YY).
    const base = makeSeries("gls-classic", 75, 1);
    const n = base.count;
    const mean = base.rv.reduce((s, y) => s + y, 0) / n;
    const x = base.rv.map((y) => y - mean);
    const series: RvSeries = { ...base, rv: x, rvErr: new Float64Array(n).fill(2.5) };
    const grid = frequencyGrid(series.time, { minPeriod: 2, oversample: 4 });
    const gls = glsPeriodogram(series, grid, { offsets: false });
    expect(gls.nullParameters).toBe(0);
    const xx = x.reduce((s, v) => s + v * v, 0);
    let worst = 0;
    for (let k = 0; k < grid.count; k += 2) {
      const om = 2 * Math.PI * grid.frequencies[k]!;
      let s2 = 0, c2 = 0;
      for (let j = 0; j < n; j++) {
        s2 += Math.sin(2 * om * series.time[j]!);
        c2 += Math.cos(2 * om * series.time[j]!);
      }
      const tau = Math.atan2(s2, c2) / (2 * om);
      let xc = 0, xs = 0, cc = 0, ss = 0;
      for (let j = 0; j < n; j++) {
        const a = om * (series.time[j]! - tau);
        xc += x[j]! * Math.cos(a);
        xs += x[j]! * Math.sin(a);
        cc += Math.cos(a) ** 2;
        ss += Math.sin(a) ** 2;
      }
      const pX = 0.5 * (xc * xc / cc + xs * xs / ss);
      worst = Math.max(worst, Math.abs(gls.power[k]! - 2 * pX / xx));
    }
    expect(worst).toBeLessThan(1e-8);
  });

  test("glsPeriodogram() peaks at the planted period and is unchanged by a time shift", () => {
    // Power is a chi^2 ratio of a model containing both cos and sin, so it is invariant
    // under t -> t + const (analytic).
    const series = makeSeries("gls-shift", 80, 2);
    const grid = frequencyGrid(series.time, { minPeriod: 2, oversample: 10 });
    const gls = glsPeriodogram(series, grid);
    let best = 0;
    for (let k = 1; k < grid.count; k++) if (gls.power[k]! > gls.power[best]!) best = k;
    // Planted 23.1 d; grid step 1/(10*span) gives a period step 23.1^2/(10*~800) ~ 0.07 d.
    expect(Math.abs(1 / grid.frequencies[best]! - 23.1)).toBeLessThan(0.2);
    const shifted: RvSeries = { ...series, time: series.time.map((t) => t - 2455000) };
    const gls2 = glsPeriodogram(shifted, grid.frequencies.slice());
    let worst = 0;
    for (let k = 0; k < grid.count; k++) {
      worst = Math.max(worst, Math.abs(gls2.power[k]! - gls.power[k]!));
    }
    expect(worst).toBeLessThan(1e-9);
  });

  test("glsPeriodogram() returns NaN power when the offsets alone fit the data", () => {
    const series = makeSeries("gls-const", 20, 2);
    const rv = Float64Array.from(series.instrument, (k) => (k === 0 ? 5 : -3));
    const gls = glsPeriodogram({ ...series, rv }, new Float64Array([0.01, 0.1]));
    expect(gls.chi2Null).toBeLessThan(1e-20);
    expect(Number.isNaN(gls.power[0]!) && Number.isNaN(gls.power[1]!)).toBe(true);
  });

  test("glsPeriodogram() rejects bad errors, instrument indices and too few points", () => {
    const series = makeSeries("gls-bad", 10, 2);
    const f = new Float64Array([0.1]);
    const badErr = series.rvErr.slice();
    badErr[3] = 0;
    expect(() => glsPeriodogram({ ...series, rvErr: badErr }, f)).toThrow(RangeError);
    const badInst = series.instrument.slice();
    badInst[2] = 2;
    expect(() => glsPeriodogram({ ...series, instrument: badInst }, f)).toThrow(RangeError);
    expect(() => glsPeriodogram({ ...series, count: 4 }, f)).toThrow(RangeError);
    expect(() => glsPeriodogram({ ...series, count: 11 }, f)).toThrow(TypeError);
  });
});
