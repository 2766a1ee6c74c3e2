/**
 * Autocorrelation function and integrated autocorrelation time of an
 * ensemble chain.
 * @module
 */

import type { ChainView } from "./chain_view.ts";
import { checkArgs } from "./_args.ts";
import { extractChains } from "./_core.ts";
import { averagedAcf, type TauEstimate, tauOfChains } from "./_tau.ts";

export type { TauEstimate } from "./_tau.ts";

/** Options of {@link autocorrelation}. */
export interface AutocorrelationOptions {
  /** Steps discarded from the start of every walker. @default 0 */
  burn?: number;
}

/**
 * Walker-averaged autocorrelation function of one column: the mean over
 * walkers of each walker's normalised autocorrelation
 * rho_w(t) = acov_w(t) / acov_w(0), acov_w the biased (1/N) autocovariance
 * computed by a radix-2 FFT (Press et al. 2007, Numerical Recipes 3rd ed.,
 * sec. 13.2). Length = steps after burn; element 0 is 1.
 *
 * All NaN when any value is non-finite or every walker is constant.
 * @throws {TypeError} on a malformed view; {RangeError} on a bad column or burn.
 */
export function autocorrelation(
  view: ChainView,
  column: number,
  options: AutocorrelationOptions = {},
): Float64Array {
  const burn = checkArgs(view, column, options.burn);
  return averagedAcf(extractChains(view, column, burn)).acf;
}

/** Options of {@link integratedAutocorrTime}. */
export interface TauOptions extends AutocorrelationOptions {
  /** Sokal window factor c in M >= c tau(M). @default 5 */
  factor?: number;
}

/**
 * Integrated autocorrelation time tau (in steps) of one column, with Sokal's
 * automatic window on the walker-averaged autocorrelation function; tau is
 * 1 + 2 sum rho(t), so an AR(1) chain has tau = (1 + rho)/(1 - rho). See
 * `TauEstimate` for the window, and the kernel's doc comment for the expected
 * error sqrt(2(2M+1)/(N W)) · tau (Sokal 1997, sec. 3).
 *
 * NaN when fewer than 2 steps remain, any value is non-finite, or every
 * walker is constant.
 * @throws {TypeError} on a malformed view; {RangeError} on a bad column, burn
 * or factor.
 */
export function integratedAutocorrTime(
  view: ChainView,
  column: number,
  options: TauOptions = {},
): TauEstimate {
  const burn = checkArgs(view, column, options.burn);
  const factor = options.factor ?? 5;
  if (!(factor > 0) || !Number.isFinite(factor)) {
    throw new RangeError(
      `Cannot choose autocorrelation window as factor is not positive: factor=${factor}`,
    );
  }
  return tauOfChains(extractChains(view, column, burn), factor);
}
