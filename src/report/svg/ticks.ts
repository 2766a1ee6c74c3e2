/**
 * Axis ticks at "nice" numbers (1, 2, 5 × 10ᵏ) and their labels.
 * @module
 */

/**
 * The nice number near `x` > 0: 1, 2, 5 or 10 times a power of ten. With
 * `round`, the nearest one (thresholds 1.5, 3, 7 on the fraction); without, the
 * smallest one not below `x`.
 *
 * Heckbert (1990), "Nice numbers for graph labels", in Graphics Gems, ed.
 * A. S. Glassner, Academic Press, pp. 61–63 (function `nicenum`; thresholds
 * recalled from memory). Returns NaN for `x` ≤ 0 or non-finite.
 */
export function niceNumber(x: number, round: boolean): number {
  if (!(x > 0) || !Number.isFinite(x)) return NaN;
  const exponent = Math.floor(Math.log10(x));
  const power = 10 ** exponent;
  const f = x / power;
  let nice: number;
  if (round) nice = f < 1.5 ? 1 : f < 3 ? 2 : f < 7 ? 5 : 10;
  else nice = f <= 1 ? 1 : f <= 2 ? 2 : f <= 5 ? 5 : 10;
  // Multiply through an exact decimal to avoid 5 × 0.1 = 0.5000000000000001.
  return exponent >= 0 ? nice * power : nice / 10 ** -exponent;
}

/** Ticks of one axis. */
export interface Ticks {
  /** Axis range (the ticks' outer values for `loose`, the padded data range for `tight`). */
  readonly lo: number;
  readonly hi: number;
  readonly step: number;
  readonly values: readonly number[];
  /** Decimals needed to tell the ticks apart. */
  readonly decimals: number;
}

/** Options of {@link niceTicks}. */
export interface NiceTickOptions {
  /** Wanted number of ticks (a hint). @default 5 */
  count?: number;
  /**
   * `loose`: the axis runs from a tick below the data to a tick above (Heckbert's
   * loose labelling). `tight`: the axis is the data range widened by `pad` on
   * each side, with the ticks that fall inside. @default "loose"
   */
  mode?: "loose" | "tight";
  /** Fraction of the range added on each side in `tight` mode. @default 0.04 */
  pad?: number;
}

/**
 * Nice ticks covering [lo, hi].
 *
 * Method (Heckbert 1990, Graphics Gems, "loose labeling"): range =
 * nice(hi − lo, not rounded); step = nice(range/(count − 1), rounded); the
 * ticks are the multiples of step from ⌊lo/step⌋·step to ⌈hi/step⌉·step,
 * labelled with max(0, −⌊log₁₀ step⌋) decimals. In `tight` mode (ours, not
 * Heckbert's) step = nice(padded range/(count − 1), rounded), made one nice
 * number finer at a time until at least two ticks fall inside. A zero-width range is widened
 * to ±10% of |lo| (±1 when lo = 0) first. Throws RangeError for non-finite bounds.
 */
export function niceTicks(lo: number, hi: number, options: NiceTickOptions = {}): Ticks {
  if (!Number.isFinite(lo) || !Number.isFinite(hi)) {
    throw new RangeError(`Cannot place ticks as the range is not finite: lo=${lo}, hi=${hi}`);
  }
  if (hi < lo) [lo, hi] = [hi, lo];
  if (hi === lo) {
    const w = lo === 0 ? 1 : Math.abs(lo) * 0.1;
    lo -= w;
    hi += w;
  }
  const count = Math.max(2, options.count ?? 5);
  const mode = options.mode ?? "loose";
  let a = lo;
  let b = hi;
  if (mode === "tight") {
    const pad = (options.pad ?? 0.04) * (hi - lo);
    a = lo - pad;
    b = hi + pad;
  }
  // Loose: Heckbert's recipe. Tight: the step comes from the padded range
  // itself (no rounding of the range first), made finer until two ticks fit.
  let step = mode === "loose"
    ? niceNumber(niceNumber(b - a, false) / (count - 1), true)
    : niceNumber((b - a) / (count - 1), true);
  const inside = (st: number) => Math.floor(b / st + 1e-9) - Math.ceil(a / st - 1e-9) + 1;
  if (mode === "tight") { while (inside(step) < 2) step = finerNice(step); }
  const decimals = Math.max(0, -Math.floor(Math.log10(step) + 1e-9));
  const first = mode === "loose" ? Math.floor(a / step + 1e-9) : Math.ceil(a / step - 1e-9);
  const last = mode === "loose" ? Math.ceil(b / step - 1e-9) : Math.floor(b / step + 1e-9);
  const values: number[] = [];
  for (let k = first; k <= last; k++) values.push(multiple(k, step, decimals));
  return mode === "loose"
    ? { lo: values[0]!, hi: values[values.length - 1]!, step, values, decimals }
    : { lo: a, hi: b, step, values, decimals };
}

/** The next nice number below a nice `step`: 10 → 5 → 2 → 1 → 0.5 … */
function finerNice(step: number): number {
  const exponent = Math.floor(Math.log10(step) + 1e-9);
  const lead = Math.round(step / 10 ** exponent);
  const next = lead === 1 ? 5 : lead === 2 ? 1 : 2;
  const e = lead === 1 ? exponent - 1 : exponent;
  return e >= 0 ? next * 10 ** e : next / 10 ** -e;
}

/** Minor tick spacing for a nice major step: a fifth (a quarter for 2 × 10ᵏ). */
export function minorStep(step: number): number {
  const exponent = Math.floor(Math.log10(step) + 1e-9);
  const lead = Math.round(step / 10 ** exponent);
  return step / (lead === 2 ? 4 : 5);
}

/** k·step without binary fuzz, rounded to `decimals`. */
function multiple(k: number, step: number, decimals: number): number {
  const v = k * step;
  const r = decimals > 0 ? Number(v.toFixed(decimals)) : Math.round(v);
  return r === 0 ? 0 : r;
}

/** Ticks of a log axis: major values (powers of ten, or 1-2-5 for short ranges) and minor ones. */
export interface LogTicks {
  readonly lo: number;
  readonly hi: number;
  readonly values: readonly number[];
  readonly minor: readonly number[];
}

/**
 * Ticks of a logarithmic axis over [lo, hi] (both > 0): the axis runs from the
 * decade at or below lo to the decade at or above hi; majors at each decade
 * (every second or third decade when there are more than eight), plus 2 and 5
 * of each decade when it spans fewer than three; minors at 2…9 × 10ᵏ. Common
 * practice, no source. Throws RangeError unless 0 < lo ≤ hi < ∞.
 */
export function logTicks(lo: number, hi: number): LogTicks {
  if (!(lo > 0) || !(hi >= lo) || !Number.isFinite(hi)) {
    throw new RangeError(
      `Cannot place log ticks as the range must be positive: lo=${lo}, hi=${hi}`,
    );
  }
  const k0 = Math.floor(Math.log10(lo) + 1e-9);
  let k1 = Math.ceil(Math.log10(hi) - 1e-9);
  if (k1 === k0) k1 += 1;
  const decades = k1 - k0;
  const every = decades > 16 ? 3 : decades > 8 ? 2 : 1;
  const values: number[] = [];
  const minor: number[] = [];
  for (let k = k0; k <= k1; k++) {
    const p = decade(k);
    if ((k - k0) % every === 0) values.push(p);
    if (k === k1) break;
    for (let m = 2; m <= 9; m++) {
      const v = Number((m * p).toPrecision(12));
      if (decades < 3 && (m === 2 || m === 5)) values.push(v);
      else minor.push(v);
    }
  }
  return { lo: decade(k0), hi: decade(k1), values, minor };
}

function decade(k: number): number {
  return k >= 0 ? 10 ** k : 1 / 10 ** -k;
}

/** The typographic minus sign used in tick labels. */
export const MINUS = "\u2212";

/**
 * Tick label: fixed decimals, a true minus sign, and no "−0". Very large or
 * very small magnitudes (≥ 1e6 with no decimals needed is kept as is) use the
 * shortest exact form.
 */
export function formatTick(value: number, decimals: number): string {
  let s = value.toFixed(Math.max(0, Math.min(decimals, 20)));
  if (/^-0(\.0+)?$/.test(s)) s = s.slice(1);
  return s.replace(/^-/, MINUS);
}

/**
 * Label of a log-axis tick: plain numbers between 0.001 and 10⁵ ("0.01", "20",
 * "1000"), otherwise "10^k" for powers of ten (the caller may typeset the
 * exponent) and the shortest exact form for others.
 */
export function formatLogTick(value: number): string {
  if (value >= 1e-3 && value < 1e5) return String(Number(value.toPrecision(12)));
  const k = Math.round(Math.log10(value));
  if (Math.abs(value / 10 ** k - 1) < 1e-9) return `10^${k}`.replace("-", MINUS);
  return String(value).replace("-", MINUS);
}

/**
 * A round reference to subtract from values whose spread is tiny beside their
 * size (times as BJD, 2460512.3 ± 0.01), so tick labels stay short: 0 when
 * max(|lo|, |hi|) < ratio × (hi − lo); otherwise lo rounded down to a multiple
 * of 10^⌊log₁₀(hi − lo)⌋ (of 10^(⌊log₁₀|lo|⌋ − 3) for a zero range).
 */
export function labelReference(lo: number, hi: number, options: { ratio?: number } = {}): number {
  const ratio = options.ratio ?? 1000;
  const span = hi - lo;
  const size = Math.max(Math.abs(lo), Math.abs(hi));
  if (!Number.isFinite(span) || !Number.isFinite(size)) return 0;
  if (span > 0 && size < ratio * span) return 0;
  if (size === 0) return 0;
  const k = span > 0 ? Math.floor(Math.log10(span)) : Math.floor(Math.log10(size)) - 3;
  const unit = 10 ** k;
  const ref = Math.floor(lo / unit) * unit;
  return k >= 0 ? ref : Number(ref.toFixed(-k));
}
