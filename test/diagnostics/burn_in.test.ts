import { describe, expect, test } from "vitest";
import { chooseBurnIn, convergenceReport } from "../../src/diagnostics/mod.ts";
import { gaussian } from "./_chains.ts";

// Column 0: iid N(0,1) parameter; column 1: log-posterior relaxing as
// -50 - A exp(-s/L) + N(0, sigma^2) noise per walker.
function relaxingView(steps: number, walkers: number, amp: number, scale: number, sigma: number) {
  const g = gaussian(`burn-${amp}-${scale}`);
  const data = new Float64Array(steps * walkers * 2);
  for (let s = 0; s < steps; s++) {
    for (let w = 0; w < walkers; w++) {
      data[(s * walkers + w) * 2] = g();
      data[(s * walkers + w) * 2 + 1] = -50 - amp * Math.exp(-s / scale) + sigma * g();
    }
  }
  return { data, steps, walkers, columns: 2 };
}

describe("chooseBurnIn()", () => {
  test("chooseBurnIn() ends burn-in where the log-posterior transient falls below 5 sd", () => {
    // Independent expectation: the walker-mean has noise sd sigma/sqrt(W);
    // the transient A exp(-s/L) drops below 5 sd at s* = L ln(A sqrt(W)/(5 sigma)).
    // Near s* the transient falls by 5 sd per L steps, so noise moves the
    // crossing by about L/5 steps; tolerance 4 · L/5.
    const walkers = 32;
    const amp = 500;
    const scale = 100;
    const sigma = 3;
    const view = relaxingView(4000, walkers, amp, scale, sigma);
    const got = chooseBurnIn(view, { columns: [0], logPosteriorColumn: 1 });
    const expected = scale * Math.log((amp * Math.sqrt(walkers)) / (5 * sigma));
    expect(Math.abs(got.settleStep - expected)).toBeLessThan(4 * (scale / 5));
    expect(got.burn).toBe(Math.max(got.settleStep, Math.ceil(2 * got.tauMax)));
    expect(got.capped).toBe(false);
  });

  test("chooseBurnIn() caps the burn-in at half the chain", () => {
    // An iid parameter has tau ≈ 1, so asking for 400 tau wants ~400 steps
    // of a 600-step chain: the rule must stop at 300.
    const view = relaxingView(600, 8, 0, 1, 1);
    const got = chooseBurnIn(view, { columns: [0], logPosteriorColumn: 1, tauMultiple: 400 });
    expect(got.tauMax).toBeGreaterThan(0.5);
    expect(got.burn).toBe(300);
    expect(got.capped).toBe(true);
  });

  test("chooseBurnIn() uses 2 tau_max without a log-posterior column", () => {
    const view = relaxingView(2000, 8, 0, 1, 1);
    const got = chooseBurnIn(view, { columns: [0] });
    expect(got.settleStep).toBeNaN();
    expect(got.burn).toBe(Math.ceil(2 * got.tauMax));
  });

  test("convergenceReport() applies chooseBurnIn() when no burn is given", () => {
    const view = relaxingView(3000, 16, 500, 100, 3);
    const chosen = chooseBurnIn(view, { columns: [0], logPosteriorColumn: 1 });
    const report = convergenceReport(view, { columns: [0], logPosteriorColumn: 1 });
    expect(report.burn).toBe(chosen.burn);
    expect(report.steps).toBe(3000 - chosen.burn);
  });
});
