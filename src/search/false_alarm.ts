/**
 * Analytic false-alarm probability of the highest periodogram peak.
 * @module
 */

/** What the false-alarm probability needs to know about a periodogram (a GlsResult has it). */
export interface FapInputs {
  /** Number of points N. */
  readonly count: number;
  /** Free parameters of the null model, d_H (offsets + trend terms). */
  readonly nullParameters: number;
  /** Searched frequency range f_max - f_min, 1/d. */
  readonly bandwidth: number;
  /** Weighted variance of the observation times D_t, d^2. */
  readonly timeVariance: number;
}

/** Options of {@linkcode falseAlarmProbability}. */
export interface FapOptions {
  /**
   * Parameters already spent on signals fitted and removed before this
   * periodogram (added to d_H). searchSignals passes 3 per removed sinusoid
   * (amplitude, phase, frequency). @default 0
   */
  extraParameters?: number;
}

/**
 * Probability that pure noise yields a highest peak >= `power` anywhere in the
 * searched band: the Davies-type upper bound of Baluev (2008).
 *
 * Power is the relative chi^2 reduction p in [0, 1] of {@linkcode glsPeriodogram}.
 * Degrees of freedom: N_H = N - d_H (d_H = offsets + trend terms
 * + `extraParameters`), N_K = N_H - 2 (a sinusoid adds two linear parameters).
 *
 * Method (Baluev 2008, MNRAS 385, 1279, doi:10.1111/j.1365-2966.2008.12689.x,
 * Sects. 2–4; equation numbers not verified, formulas recalled from memory and
 * checked by the Monte Carlo calibration test):
 * - Baluev's "relative" periodogram z_1 = (N_H/2) p.
 * - Single-frequency tail: under Gaussian noise p ~ Beta(1, N_K/2) (the chi^2_2
 *   reduction over the independent chi^2_{N_K} residual), so
 *   P_single(p) = (1 - p)^(N_K/2); for one instrument this is
 *   Zechmeister & Kürster (2009) Prob(p > p_0) = (1 - p_0)^((N-3)/2).
 * - Expected number of up-crossings of the level (Rice/Davies):
 *   tau(z) = gamma_H W (1 - 2z/N_H)^((N_K - 1)/2) sqrt(z),
 *   gamma_H = sqrt(2/N_H) Gamma(N_H/2) / Gamma((N_H - 1)/2),
 *   W = (f_max - f_min) T_eff,  T_eff = sqrt(4 pi D_t).
 * - Davies bound (Davies 1977, Biometrika 64, 247): FAP <= P_single + tau,
 *   returned capped at 1. It is an upper bound that becomes tight for small
 *   FAP, so a calibrated test sees at most the nominal rate.
 *
 * Returns NaN for NaN power or power outside [0, 1], or when N_K < 1.
 */
export function falseAlarmProbability(
  power: number,
  inputs: FapInputs,
  options: FapOptions = {},
): number {
  const nH = inputs.count - inputs.nullParameters - (options.extraParameters ?? 0);
  const nK = nH - 2;
  if (!(power >= 0 && power <= 1) || !(nK >= 1)) return NaN;
  const single = Math.pow(1 - power, nK / 2);
  const z = nH * power / 2;
  const w = inputs.bandwidth * Math.sqrt(4 * Math.PI * inputs.timeVariance);
  const tau = gammaH(nH) * w * Math.pow(1 - power, (nK - 1) / 2) * Math.sqrt(z);
  const fap = single + tau;
  return fap > 1 ? 1 : fap;
}

/**
 * Power level whose {@linkcode falseAlarmProbability} equals `fap` (for drawing
 * 1 %, 0.1 % lines on a plot), by bisection to 1e-12 in power. Returns NaN for
 * fap outside (0, 1) or when the FAP is undefined.
 */
export function powerAtFalseAlarm(
  fap: number,
  inputs: FapInputs,
  options: FapOptions = {},
): number {
  if (!(fap > 0 && fap < 1)) return NaN;
  if (Number.isNaN(falseAlarmProbability(0.5, inputs, options))) return NaN;
  let lo = 0, hi = 1;
  while (hi - lo > 1e-12) {
    const mid = 0.5 * (lo + hi);
    if (falseAlarmProbability(mid, inputs, options) > fap) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}

/**
 * gamma_H = sqrt(2/N) Gamma(N/2) / Gamma((N-1)/2) for integer N >= 2.
 * The ratio R(x) = Gamma(x + 1/2)/Gamma(x), x = (N-1)/2, obeys
 * R(x + 1) = R(x) (x + 1/2)/x (from Gamma(y + 1) = y Gamma(y)); it starts at
 * R(1/2) = 1/sqrt(pi) (N = 2) or R(1) = sqrt(pi)/2 (N = 3), which are exact
 * (Gamma(1/2) = sqrt(pi)). O(N) multiplications, relative error ~N eps.
 */
function gammaH(nH: number): number {
  const n = Math.round(nH);
  let x: number, ratio: number;
  if (n % 2 === 0) {
    x = 0.5;
    ratio = 1 / Math.sqrt(Math.PI);
  } else {
    x = 1;
    ratio = Math.sqrt(Math.PI) / 2;
  }
  const target = (n - 1) / 2;
  while (x < target - 0.25) {
    ratio *= (x + 0.5) / x;
    x += 1;
  }
  return Math.sqrt(2 / n) * ratio;
}
