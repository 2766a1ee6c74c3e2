/**
 * Rounding values by their uncertainty for tables.
 *
 * Convention (common practice, no single source): the smaller of the two
 * errors is given two significant digits, the larger error and the value are
 * rounded to the same decimal place. Zero or non-finite errors fall back to
 * six significant digits for the value.
 * @module
 */

/** Rounded strings for `value −minus +plus` (minus and plus are positive). */
export interface Rounded {
  readonly value: string;
  readonly minus: string;
  readonly plus: string;
  /** Decimal places used (negative: rounded to tens, hundreds, …). */
  readonly decimals: number;
}

/** Round `value` with asymmetric errors as described in the module doc. */
export function roundByUncertainty(value: number, minus: number, plus: number): Rounded {
  const err = Math.min(Math.abs(minus), Math.abs(plus));
  if (!Number.isFinite(value)) {
    return { value: String(value), minus: "?", plus: "?", decimals: 0 };
  }
  if (!(err > 0) || !Number.isFinite(err)) {
    return { value: toSig(value, 6), minus: "0", plus: "0", decimals: 0 };
  }
  // Position of the second significant digit of err.
  let decimals = 1 - Math.floor(Math.log10(err));
  // Rounding can carry err up a decade (0.0996 → 0.10): recompute once.
  if (roundTo(err, decimals) >= 10 ** (2 - decimals)) decimals -= 1;
  return {
    value: fixed(value, decimals),
    minus: fixed(Math.abs(minus), decimals),
    plus: fixed(Math.abs(plus), decimals),
    decimals,
  };
}

function roundTo(x: number, decimals: number): number {
  const f = 10 ** decimals;
  return Math.round(x * f) / f;
}

function fixed(x: number, decimals: number): string {
  if (decimals >= 0) return roundTo(x, decimals).toFixed(Math.min(decimals, 20));
  const f = 10 ** -decimals;
  return String(Math.round(x / f) * f);
}

function toSig(x: number, digits: number): string {
  return Number(x.toPrecision(digits)).toString();
}
