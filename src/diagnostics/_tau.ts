/**
 * Integrated autocorrelation time kernel. Private to `src/diagnostics/`.
 * @module
 */

import type { Chains } from "./_core.ts";
import { accumulateAutocovariance } from "./_fft.ts";

/** Result of the windowed estimate. */
export interface TauEstimate {
  /** tau = 1 + 2 sum_{t=1}^{M} rho(t), in steps; NaN when undefined. */
  readonly tau: number;
  /** The window M used. */
  readonly window: number;
  /** False when no M < n satisfied M >= c tau(M); tau is then from M = n - 1. */
  readonly windowFound: boolean;
}

/** Walker-averaged normalised autocorrelation function; `used` = chains averaged. */
export function averagedAcf(c: Chains): { acf: Float64Array; used: number } {
  const acf = new Float64Array(c.n);
  if (!c.finite || c.n < 1) return { acf: acf.fill(NaN), used: 0 };
  const used = accumulateAutocovariance(c.x, c.m, c.n, acf, true);
  if (used === 0) return { acf: acf.fill(NaN), used };
  for (let t = 0; t < c.n; t++) acf[t] = acf[t]! / used;
  return { acf, used };
}

/**
 * Sokal's automatic window on the walker-averaged autocorrelation function.
 *
 * Method: rho(t) is the mean over walkers of each walker's normalised
 * autocorrelation function (walkers with zero variance are left out);
 * tau(M) = 1 + 2 sum_{t=1}^{M} rho(t), and M is the smallest window with
 * M >= c tau(M) (Sokal 1997, "Monte Carlo Methods in Statistical Mechanics:
 * Foundations and New Algorithms", in Functional Integration, Plenum, sec. 3;
 * Sokal writes tau_int = tau / 2 and uses c of about 4–10 in his units).
 * Averaging over the ensemble follows Goodman & Weare 2010 (Comm. App. Math.
 * Comp. Sci. 5, 65) and the practice of Foreman-Mackey et al. 2013 (PASP 125,
 * 306) and its documentation (averaging per-walker functions rather than
 * taking the function of the walker-mean trace).
 *
 * Statistical error (Sokal 1997, sec. 3, after Priestley 1981): for N steps
 * per walker and W independent walkers, sd(tau) / tau ≈ sqrt(2(2M+1)/(N W));
 * bias ≈ -2 sum_{t>M} rho(t) from the window, and about -2 M tau / N from
 * subtracting each walker's own mean.
 *
 * Short chains: a mean-subtracted autocorrelation function sums to zero over
 * all lags, so when the chain is not much longer than tau, tau(M) turns down
 * and the window closes early with tau biased low; M >= c tau and M < n then
 * keep n / tau above c only modestly (about 2c in practice), so a
 * steps/tau > 50 criterion still fails, as it should.
 *
 * NaN when fewer than 2 steps, any non-finite value, or every walker constant.
 */
export function tauOfChains(c: Chains, factor: number): TauEstimate {
  if (!c.finite || c.n < 2) return { tau: NaN, window: 0, windowFound: false };
  const { acf, used } = averagedAcf(c);
  if (used === 0) return { tau: NaN, window: 0, windowFound: false };
  let tau = 1;
  for (let m = 1; m < c.n; m++) {
    tau += 2 * acf[m]!;
    if (m >= factor * tau) return { tau, window: m, windowFound: true };
  }
  return { tau, window: c.n - 1, windowFound: false };
}
