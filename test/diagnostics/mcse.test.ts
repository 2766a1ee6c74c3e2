import { describe, expect, test } from "vitest";
import { mcseMean, mcseQuantile, normalQuantile } from "../../src/diagnostics/mod.ts";
import { ar1View, normalView } from "./_chains.ts";

describe("mcseMean()", () => {
  test("mcseMean() matches sqrt(var · tau / S) for AR(1) rho=0.8", () => {
    // Analytic: var = 1/(1 - rho^2), tau = (1 + rho)/(1 - rho), and
    // S var(mean) -> var · tau (Brockwell & Davis 1991, Thm 7.1.1, recalled
    // from memory). The estimate's relative error is half that of its ESS,
    // sqrt(2(2K+1)/S)/2 with K <= 10 tau + 10 lags (Sokal 1997, sec. 3),
    // plus the sd's own error sqrt(tau/(2S)); tolerance 4 sd.
    const rho = 0.8;
    const steps = 20000;
    const walkers = 8;
    const total = steps * walkers;
    const tau = (1 + rho) / (1 - rho);
    const expected = Math.sqrt(tau / (1 - rho * rho) / total);
    const k = 10 * tau + 10;
    const rel = 0.5 * Math.sqrt((2 * (2 * k + 1)) / total) + Math.sqrt(tau / (2 * total));
    const got = mcseMean(ar1View(rho, steps, walkers, "mcse-mean"), 0);
    expect(Math.abs(got / expected - 1)).toBeLessThan(4 * rel);
  });
});

describe("mcseQuantile()", () => {
  for (const prob of [0.5, 0.05]) {
    test(`mcseQuantile() matches the asymptotic sd of the ${prob} sample quantile for iid normal draws`, () => {
      // Analytic: sd(q_p) = sqrt(p(1-p)/S) / f(q_p) (van der Vaart 1998,
      // Asymptotic Statistics, Cor. 21.5; recalled from memory). The
      // estimate is half the gap between order statistics about
      // 2 sqrt(S p (1-p)) apart, so its relative error is about
      // 1/sqrt(2 sqrt(S p (1-p))) from the spacings, plus half the relative
      // error of the indicator ESS, sqrt(2·41/S)/2; tolerance 4 sd.
      const walkers = 8;
      const steps = 10000;
      const total = walkers * steps;
      const view = normalView(
        steps,
        new Array(walkers).fill(0),
        new Array(walkers).fill(1),
        `mq-${prob}`,
      );
      const z = normalQuantile(prob);
      const density = Math.exp(-0.5 * z * z) / Math.sqrt(2 * Math.PI);
      const expected = Math.sqrt((prob * (1 - prob)) / total) / density;
      const gap = 2 * Math.sqrt(total * prob * (1 - prob));
      const rel = 1 / Math.sqrt(gap) + 0.5 * Math.sqrt(82 / total);
      const got = mcseQuantile(view, 0, { prob });
      expect(Math.abs(got / expected - 1)).toBeLessThan(4 * rel);
    });
  }
});
