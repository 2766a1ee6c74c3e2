import { describe, expect, test } from "vitest";
import {
  acceptanceFractions,
  type ChainView,
  convergenceReport,
  StreamingDiagnostics,
} from "../../src/diagnostics/mod.ts";
import { ar1View } from "./_chains.ts";

function block(view: ChainView, from: number, to: number): ChainView {
  const row = view.walkers * view.columns;
  return {
    data: view.data.slice(from * row, to * row),
    steps: to - from,
    walkers: view.walkers,
    columns: view.columns,
  };
}

describe("StreamingDiagnostics", () => {
  test("StreamingDiagnostics keeps exactly the steps at multiples of thin", () => {
    const full = ar1View(0.5, 1000, 3, "stream-keep", 2, 0);
    const stream = new StreamingDiagnostics(3, 2, { capacity: 16 });
    let s = 0;
    for (const size of [1, 7, 100, 3, 250, 639]) {
      stream.push(block(full, s, s + size));
      s += size;
      const v = stream.view();
      const thin = stream.thin;
      expect(v.steps).toBeLessThanOrEqual(16);
      expect(v.steps).toBe(Math.ceil(s / thin));
      if (thin > 1) expect(v.steps).toBeGreaterThanOrEqual(8);
      const row = 6;
      for (let k = 0; k < v.steps; k++) {
        for (let j = 0; j < row; j++) {
          expect(v.data[k * row + j]).toBe(full.data[k * thin * row + j]);
        }
      }
    }
    expect(stream.stepsSeen).toBe(1000);
    expect(stream.thin).toBe(64); // 1000 steps in at most 16 kept: 16 · 64 >= 1000 > 16 · 32
  });

  test("StreamingDiagnostics.report() equals convergenceReport() on the thinned chain, rescaled", () => {
    const full = ar1View(0.9, 5000, 8, "stream-report");
    const stream = new StreamingDiagnostics(8, 1, { capacity: 256 });
    for (let s = 0; s < 5000; s += 500) stream.push(block(full, s, s + 500));
    const r = stream.report({ columns: [0], burn: 0 });
    const thinned = convergenceReport(stream.view(), { columns: [0], burn: 0 });
    expect(r.thin).toBe(32);
    expect(r.columns[0]!.rhat).toBe(thinned.columns[0]!.rhat);
    expect(r.columns[0]!.essBulk).toBe(thinned.columns[0]!.essBulk);
    expect(r.columns[0]!.tau).toBe(thinned.columns[0]!.tau * 32);
    expect(r.steps).toBe(5000);
  });

  test("StreamingDiagnostics.report() tau errs high, as documented, for AR(1)", () => {
    // For AR(1) thinned by k, tau_k = (1 + rho^k)/(1 - rho^k) and the
    // reported k tau_k >= (1 + rho)/(1 - rho) (class doc comment). Expected
    // k tau_k here: rho = 0.99, k = 4 (20000 steps, 8192 kept max):
    // 4 (1 + 0.9606)/(1 - 0.9606) ≈ 199.1 vs 199. Tolerance: Sokal's
    // sd sqrt(2(2M+1)/(N W)) on the thinned chain, 4 sd, plus the
    // mean-subtraction bias 2M/N.
    const rho = 0.99;
    const steps = 20000;
    const walkers = 16;
    const full = ar1View(rho, steps, walkers, "stream-tau");
    const stream = new StreamingDiagnostics(walkers, 1, { capacity: 8192 });
    for (let s = 0; s < steps; s += 1000) stream.push(block(full, s, s + 1000));
    const k = stream.thin;
    const r = stream.report({ columns: [0], burn: 0 });
    const expected = k * (1 + rho ** k) / (1 - rho ** k);
    const kept = stream.keptSteps;
    const m = 5 * r.columns[0]!.tau / k;
    const tol = expected * (4 * Math.sqrt((2 * (2 * m + 1)) / (kept * walkers)) + (2 * m) / kept);
    expect(k).toBe(4);
    expect(Math.abs(r.columns[0]!.tau - expected)).toBeLessThan(tol);
  });

  test("StreamingDiagnostics.acceptance() is exact over all steps seen", () => {
    const steps = 3000;
    const walkers = 4;
    const data = new Float64Array(steps * walkers * 2);
    for (let s = 0; s < steps; s++) {
      for (let w = 0; w < walkers; w++) {
        data[(s * walkers + w) * 2 + 1] = (s * (w + 1)) % 7 < 2 ? 1 : 0;
      }
    }
    const full = { data, steps, walkers, columns: 2 };
    const stream = new StreamingDiagnostics(walkers, 2, { capacity: 32, acceptedColumn: 1 });
    for (let s = 0; s < steps; s += 300) stream.push(block(full, s, s + 300));
    expect(Array.from(stream.acceptance())).toEqual(
      Array.from(acceptanceFractions(full, { column: 1 })),
    );
  });

  test("StreamingDiagnostics rejects blocks of another shape", () => {
    const stream = new StreamingDiagnostics(4, 2);
    expect(() => stream.push({ data: new Float64Array(6), steps: 1, walkers: 3, columns: 2 }))
      .toThrow(TypeError);
    expect(() => new StreamingDiagnostics(4, 2, { capacity: 3 })).toThrow(RangeError);
  });
});
