import { describe, expect, test } from "vitest";
import { addKeplerianRv, type Orbit } from "../../src/model/keplerian.ts";
import {
  addOffsets,
  addTrend,
  gaussianLogLikelihood,
  type RvData,
  rvLogLikelihood,
} from "../../src/model/likelihood.ts";

function makeData(n: number): RvData {
  const time = new Float64Array(n);
  const rv = new Float64Array(n);
  const rvErr = new Float64Array(n);
  const instrument = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    time[i] = 1000 + i * 1.37 + 0.2 * Math.sin(i);
    rv[i] = 10 * Math.cos(0.7 * i) + 3;
    rvErr[i] = 0.5 + (i % 5) * 0.7;
    instrument[i] = i % 3;
  }
  return { time, rv, rvErr, instrument, count: n };
}

/** ln of the normal density written out as ln(exp(−r²/2v)/√(2πv)). */
function lnNormalPdf(r: number, variance: number): number {
  return Math.log(Math.exp(-r * r / (2 * variance)) / Math.sqrt(2 * Math.PI * variance));
}

describe("gaussianLogLikelihood()", () => {
  test("gaussianLogLikelihood() equals the sum of log normal densities", () => {
    // Definition of independent Gaussian errors; common practice, no source.
    const data = makeData(50);
    const model = new Float64Array(50).map((_, i) => 2 * Math.sin(i));
    const jitter = new Float64Array([0.3, 1.5, 0]);
    let expected = 0;
    for (let i = 0; i < 50; i++) {
      const v = data.rvErr[i]! ** 2 + jitter[data.instrument[i]!]! ** 2;
      expected += lnNormalPdf(data.rv[i]! - model[i]!, v);
    }
    const got = gaussianLogLikelihood(data, { model, jitter });
    expect(Math.abs(got - expected)).toBeLessThan(1e-12 * Math.abs(expected));
  });

  test("gaussianLogLikelihood() is −N/2 ln 2π for zero residuals and unit variance", () => {
    // Analytic: r = 0, σ² = 1 for every point.
    const n = 7;
    const data: RvData = {
      time: new Float64Array(n),
      rv: new Float64Array(n).fill(4),
      rvErr: new Float64Array(n).fill(1),
      instrument: new Int32Array(n),
      count: n,
    };
    const got = gaussianLogLikelihood(data, {
      model: new Float64Array(n).fill(4),
      jitter: new Float64Array([0]),
    });
    expect(got).toBeCloseTo(-n / 2 * Math.log(2 * Math.PI), 13);
  });

  test("gaussianLogLikelihood() keeps precision over many points with variances far apart", () => {
    // Exercises the running product of variances against a plain sum of logs.
    const n = 5000;
    const data = makeData(n);
    for (let i = 0; i < n; i++) data.rvErr[i] = 10 ** (((i * 37) % 11) - 4); // 1e-4 … 1e6
    const model = new Float64Array(n);
    const jitter = new Float64Array([0, 0, 0]);
    let expected = 0;
    for (let i = 0; i < n; i++) {
      const v = data.rvErr[i]! ** 2;
      expected += -0.5 * ((data.rv[i]! - model[i]!) ** 2 / v + Math.log(2 * Math.PI * v));
    }
    const got = gaussianLogLikelihood(data, { model, jitter });
    expect(Math.abs(got - expected)).toBeLessThan(1e-12 * Math.abs(expected));
  });

  test("gaussianLogLikelihood() returns -Infinity for a zero variance or a NaN model", () => {
    const data = makeData(3);
    data.rvErr[1] = 0;
    expect(gaussianLogLikelihood(data, { model: new Float64Array(3), jitter: new Float64Array(3) }))
      .toBe(-Infinity);
    const ok = makeData(3);
    expect(
      gaussianLogLikelihood(ok, {
        model: new Float64Array([0, NaN, 0]),
        jitter: new Float64Array(3),
      }),
    ).toBe(
      -Infinity,
    );
  });
});

describe("addTrend()", () => {
  test("addTrend() adds a quadratic about the reference time", () => {
    const times = new Float64Array([10, 12, 7]);
    const out = new Float64Array([1, 1, 1]);
    addTrend(times, { out, referenceTime: 10, linear: 0.5, quadratic: 0.25 });
    // 1 + 0.5 dt + 0.25 dt²: dt = 0, 2, −3 (hand computed).
    expect([...out]).toEqual([1, 3, 1.75]);
  });
});

describe("addOffsets()", () => {
  test("addOffsets() adds each point's instrument offset", () => {
    const out = new Float64Array(4);
    addOffsets(new Int32Array([0, 2, 1, 2]), new Float64Array([1, -2, 5]), { out });
    expect([...out]).toEqual([1, 5, -2, 5]);
  });
});

describe("rvLogLikelihood()", () => {
  const orbits: Orbit[] = [
    { period: 3.1, timePeriastron: 1001, semiAmplitude: 40, eccentricity: 0.2, argPeriastron: 1 },
    { period: 47, timePeriastron: 990, semiAmplitude: 12, eccentricity: 0.7, argPeriastron: -2 },
  ];

  test("rvLogLikelihood() equals offsets + trend + Keplerians fed to gaussianLogLikelihood()", () => {
    const data = makeData(400);
    const offsets = new Float64Array([1, -4, 2.5]);
    const jitter = new Float64Array([1, 2, 0.5]);
    const trend = { referenceTime: 1200, linear: 0.01, quadratic: -1e-5 };
    const model = new Float64Array(400);
    addOffsets(data.instrument, offsets, { out: model });
    addTrend(data.time, { out: model, ...trend });
    for (const o of orbits) addKeplerianRv(data.time, o, { out: model });
    const expected = gaussianLogLikelihood(data, { model, jitter });
    const scratch = new Float64Array(400);
    const got = rvLogLikelihood(data, { orbits, offsets, jitter, trend, scratch });
    expect(Math.abs(got - expected)).toBeLessThan(1e-12 * Math.abs(expected));
    for (let i = 0; i < 400; i++) expect(Math.abs(scratch[i]! - model[i]!)).toBeLessThan(1e-12);
  });

  test("rvLogLikelihood() returns -Infinity for an eccentricity of 1", () => {
    const data = makeData(10);
    const bad = [{ ...orbits[0]!, eccentricity: 1 }];
    const got = rvLogLikelihood(data, {
      orbits: bad,
      offsets: new Float64Array(3),
      jitter: new Float64Array(3),
      trend: { referenceTime: 0, linear: 0, quadratic: 0 },
      scratch: new Float64Array(10),
    });
    expect(got).toBe(-Infinity);
  });

  test("rvLogLikelihood() rejects a scratch buffer shorter than the data", () => {
    expect(() =>
      rvLogLikelihood(makeData(10), {
        orbits,
        offsets: new Float64Array(3),
        jitter: new Float64Array(3),
        trend: { referenceTime: 0, linear: 0, quadratic: 0 },
        scratch: new Float64Array(5),
      })
    ).toThrow(RangeError);
  });
});
