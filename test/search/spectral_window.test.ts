import { describe, expect, test } from "vitest";
import { frequencyGrid, spectralWindow } from "../../src/search/mod.ts";
import { randomTimes, testRandom } from "./_random.ts";

describe("spectralWindow()", () => {
  test("spectralWindow() equals the Fejér kernel for even sampling", () => {
    // t_j = j * dt, j = 0..N-1: |sum exp(-2 pi i f t_j)|^2 / N^2
    //   = sin^2(pi f N dt) / (N^2 sin^2(pi f dt))  (finite geometric series; analytic).
    const n = 40, dt = 1.5;
    const time = Float64Array.from({ length: n }, (_, j) => 2456000 + j * dt);
    const grid = frequencyGrid(time, { minPeriod: 3.1, maxPeriod: 50, oversample: 7 });
    const w = spectralWindow(time, grid);
    let worst = 0;
    for (let k = 0; k < grid.count; k++) {
      const f = grid.frequencies[k]!;
      const expected = Math.sin(Math.PI * f * n * dt) ** 2 /
        (n * n * Math.sin(Math.PI * f * dt) ** 2);
      worst = Math.max(worst, Math.abs(w[k]! - expected));
    }
    expect(worst).toBeLessThan(1e-12);
  });

  test("spectralWindow() is 1 at zero frequency and at the sampling frequency of integer days", () => {
    // Nightly sampling at integer days: every phase 2 pi f t_j is a multiple of 2 pi at f = 1/d.
    const random = testRandom("window-daily");
    const time = Float64Array.from(
      { length: 30 },
      () => 2457000 + Math.floor(500 * random.uniform()),
    );
    const w = spectralWindow(time, new Float64Array([0, 1, 2]));
    for (let k = 0; k < 3; k++) expect(Math.abs(w[k]! - 1)).toBeLessThan(1e-12);
  });

  test("spectralWindow() with weights equals the direct weighted sum", () => {
    const random = testRandom("window-weights");
    const time = randomTimes(random, 50, 2450000, 700);
    const weights = Float64Array.from({ length: 50 }, () => 0.1 + random.uniform());
    const freqs = Float64Array.from({ length: 100 }, (_, k) => 0.003 * k + 0.0017);
    const w = spectralWindow(time, freqs, { weights });
    const total = weights.reduce((s, a) => s + a, 0);
    for (let k = 0; k < freqs.length; k++) {
      let re = 0, im = 0;
      for (let i = 0; i < 50; i++) {
        re += weights[i]! * Math.cos(-2 * Math.PI * freqs[k]! * time[i]!);
        im += weights[i]! * Math.sin(-2 * Math.PI * freqs[k]! * time[i]!);
      }
      expect(Math.abs(w[k]! - (re * re + im * im) / (total * total))).toBeLessThan(1e-10);
    }
  });

  test("spectralWindow() rejects negative weights", () => {
    expect(() =>
      spectralWindow(new Float64Array([0, 1]), new Float64Array([0.1]), {
        weights: new Float64Array([1, -1]),
      })
    ).toThrow(RangeError);
  });
});
