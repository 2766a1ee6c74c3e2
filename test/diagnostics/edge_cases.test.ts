import { describe, expect, test } from "vitest";
import {
  convergenceReport,
  essBulk,
  essMean,
  essTail,
  mcseMean,
  rankNormalizedRhat,
  splitRhat,
} from "../../src/diagnostics/mod.ts";
import { ar1View, normalView } from "./_chains.ts";

// Edge cases named in STYLE.md (constant chain, one chain, very short chain,
// NaN); documented values: NaN where undefined, Infinity for R-hat when each
// half-chain is constant but they differ.
describe("diagnostics edge cases", () => {
  test("splitRhat() and friends return NaN on a constant chain without throwing", () => {
    const view = { data: new Float64Array(4 * 100).fill(3.25), steps: 100, walkers: 4, columns: 1 };
    expect(splitRhat(view, 0)).toBeNaN();
    const r = rankNormalizedRhat(view, 0);
    expect(r.rhat).toBeNaN();
    expect(essBulk(view, 0)).toBeNaN();
    expect(essTail(view, 0)).toBeNaN();
    expect(essMean(view, 0)).toBeNaN();
    expect(mcseMean(view, 0)).toBeNaN();
    const report = convergenceReport(view, { columns: [0], burn: 0 });
    expect(report.converged).toBe(false);
    expect(report.reasons.some((s) => s.includes("undefined"))).toBe(true);
  });

  test("splitRhat() is Infinity when walkers are stuck at different values", () => {
    const steps = 50;
    const data = new Float64Array(steps * 2);
    for (let s = 0; s < steps; s++) data[s * 2 + 1] = 1;
    const view = { data, steps, walkers: 2, columns: 1 };
    expect(splitRhat(view, 0)).toBe(Infinity);
    expect(rankNormalizedRhat(view, 0).rhat).toBe(Infinity);
  });

  test("rankNormalizedRhat() works with one chain by comparing its halves", () => {
    const iid = ar1View(0, 4000, 1, "one-iid");
    expect(rankNormalizedRhat(iid, 0).rhat).toBeLessThan(1.01);
    // A drifting single chain: halves differ in mean, so split R-hat flags it.
    const steps = 2000;
    const drift = normalView(steps, [0], [1], "one-drift");
    for (let s = 0; s < steps; s++) drift.data[s] = drift.data[s]! + (3 * s) / steps;
    expect(rankNormalizedRhat(drift, 0).rhat).toBeGreaterThan(1.1);
    expect(Number.isFinite(essBulk(drift, 0))).toBe(true);
  });

  test("splitRhat() is NaN below 4 steps and finite from 4", () => {
    for (const steps of [0, 1, 2, 3]) {
      const view = normalView(steps, [0, 0, 0], [1, 1, 1], `short-${steps}`);
      expect(splitRhat(view, 0)).toBeNaN();
      expect(rankNormalizedRhat(view, 0).rhat).toBeNaN();
      expect(essBulk(view, 0)).toBeNaN();
      const report = convergenceReport(view, { columns: [0], burn: 0 });
      expect(report.converged).toBe(false);
    }
    const four = normalView(4, [0, 0, 0], [1, 1, 1], "short-4");
    expect(Number.isFinite(splitRhat(four, 0))).toBe(true);
    expect(Number.isFinite(essBulk(four, 0))).toBe(true);
  });

  test("splitRhat() is NaN when a draw is not finite", () => {
    const view = normalView(100, [0, 0], [1, 1], "nan");
    view.data[17] = NaN;
    expect(splitRhat(view, 0)).toBeNaN();
    expect(rankNormalizedRhat(view, 0).rhat).toBeNaN();
    view.data[17] = Infinity;
    expect(essMean(view, 0)).toBeNaN();
  });

  test("splitRhat() throws built-in errors naming the bad argument", () => {
    const view = normalView(10, [0, 0], [1, 1], "bad");
    expect(() => splitRhat(view, 1)).toThrow(RangeError);
    expect(() => splitRhat(view, 1)).toThrow("column=1, columns=1");
    expect(() => splitRhat(view, 0, { burn: 11 })).toThrow("burn=11, steps=10");
    expect(() => splitRhat({ ...view, steps: 9 }, 0)).toThrow(TypeError);
    expect(() => convergenceReport(view, { columns: [0], names: ["a", "b"] })).toThrow(TypeError);
  });
});
