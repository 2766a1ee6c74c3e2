import { describe, expect, test } from "vitest";
import { convergenceReport, DEFAULT_THRESHOLDS } from "../../src/diagnostics/mod.ts";
import { ar1View } from "./_chains.ts";

describe("convergenceReport()", () => {
  test("convergenceReport() declares a long well-mixed run converged", () => {
    // AR(1) rho=0.5 (tau = 3), 32 walkers x 3000 steps: steps/tau ≈ 1000,
    // ESS ≈ 32000, R-hat - 1 = O(1e-3): every default threshold holds.
    const view = ar1View(0.5, 3000, 32, "conv-ok", 3, 1);
    const report = convergenceReport(view, { columns: [1], burn: 0, names: ["b.period"] });
    expect(report.converged).toBe(true);
    expect(report.reasons).toEqual([]);
    expect(report.thresholds).toEqual(DEFAULT_THRESHOLDS);
    const c = report.columns[0]!;
    expect(c.name).toBe("b.period");
    expect(c.rhat).toBe(Math.max(c.rhatBulk, c.rhatTail));
    expect(c.stepsPerTau).toBe(3000 / c.tau);
    expect(c.mcseMean).toBe(c.sd / Math.sqrt(c.essMean));
    expect(report.maxRhat).toBe(c.rhat);
    expect(report.minEssBulk).toBe(c.essBulk);
  });

  test("convergenceReport() lists each failed criterion for a short, slowly mixing run", () => {
    // AR(1) rho=0.99 (tau = 199) over 600 steps: fewer than 50 tau, bulk ESS
    // ≈ 8 · 600 / 199 ≈ 24 and walkers still far apart.
    const view = ar1View(0.99, 600, 8, "conv-bad");
    const report = convergenceReport(view, { columns: [0], burn: 0, names: ["k"] });
    expect(report.converged).toBe(false);
    expect(report.reasons.some((r) => r.startsWith("R-hat of k"))).toBe(true);
    expect(report.reasons.some((r) => r.startsWith("bulk ESS of k"))).toBe(true);
    expect(report.reasons.some((r) => r.startsWith("steps/tau of k"))).toBe(true);
  });

  test("convergenceReport() applies overridden thresholds", () => {
    const view = ar1View(0.5, 3000, 32, "conv-thr");
    const strict = convergenceReport(view, {
      columns: [0],
      burn: 0,
      thresholds: { stepsPerTau: 1e6 },
    });
    expect(strict.converged).toBe(false);
    expect(strict.reasons).toHaveLength(1);
    expect(strict.reasons[0]).toMatch(/^steps\/tau of column 0 is .*, needs > 1000000$/);
    expect(strict.thresholds.rhat).toBe(1.01);
  });

  test("convergenceReport() takes extremes over columns", () => {
    const view = ar1View(0.3, 2000, 8, "conv-ext", 2, 0);
    const g = ar1View(0.8, 2000, 8, "conv-ext2", 2, 1);
    for (let i = 1; i < view.data.length; i += 2) view.data[i] = g.data[i]!;
    const report = convergenceReport(view, { columns: [0, 1], burn: 100 });
    const [a, b] = report.columns;
    expect(report.maxTau).toBe(Math.max(a!.tau, b!.tau));
    expect(report.minStepsPerTau).toBe(Math.min(a!.stepsPerTau, b!.stepsPerTau));
    expect(report.minEssTail).toBe(Math.min(a!.essTail, b!.essTail));
    expect(b!.tau).toBeGreaterThan(a!.tau); // rho 0.8 (tau 9) vs 0.3 (tau 1.86)
    expect(report.steps).toBe(1900);
  });
});
