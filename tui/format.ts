/**
 * Text helpers for the dashboard: fitting text to a column width, number and
 * duration formatting, progress bars. Every glyph used by the dashboard is
 * one terminal cell wide, so widths are counted in code points.
 * @module
 */

import type { Mark } from "./stats.ts";

/** Ellipsis marking truncated text. */
export const ELLIPSIS = "…";

/** Width of `text` in terminal cells (code points; the dashboard uses only narrow glyphs). */
export function textWidth(text: string): number {
  let n = 0;
  for (const _ of text) n++;
  return n;
}

/** Cut `text` to at most `width` cells, ending in "…" when something was cut. */
export function truncate(text: string, width: number): string {
  const w = Math.max(0, Math.floor(width));
  const chars = Array.from(text);
  if (chars.length <= w) return text;
  if (w === 0) return "";
  return chars.slice(0, w - 1).join("") + ELLIPSIS;
}

/** Options of {@link fit}. */
export interface FitOptions {
  /** Which side the padding goes on. @default "left" (text flush left) */
  readonly align?: "left" | "right";
}

/** Truncate or pad `text` to exactly `width` cells. */
export function fit(text: string, width: number, options: FitOptions = {}): string {
  const w = Math.max(0, Math.floor(width));
  const cut = truncate(text, w);
  const pad = " ".repeat(w - textWidth(cut));
  return options.align === "right" ? pad + cut : cut + pad;
}

/** Options of {@link formatNumber}. */
export interface FormatNumberOptions {
  /** Significant digits. @default 4 */
  readonly digits?: number;
}

/**
 * A number in at most about `digits` significant digits: fixed notation for
 * magnitudes from 1e-4 to 1e9 (integers beyond `digits` digits are shown in
 * full, rounded), exponent notation outside; "--" for NaN.
 */
export function formatNumber(x: number, options: FormatNumberOptions = {}): string {
  const digits = Math.max(1, Math.floor(options.digits ?? 4));
  if (Number.isNaN(x)) return "--";
  if (!Number.isFinite(x)) return x > 0 ? "inf" : "-inf";
  if (x === 0) return "0";
  const a = Math.abs(x);
  if (a >= 1e9 || a < 1e-4) return compactExponent(x.toExponential(digits - 1));
  const magnitude = Math.floor(Math.log10(a));
  const decimals = Math.min(12, Math.max(0, digits - 1 - magnitude));
  return x.toFixed(decimals);
}

function compactExponent(text: string): string {
  return text.replace("e+", "e");
}

/**
 * Decimals that show the smaller of two uncertainties with two significant
 * digits (common practice for quoting a value with its error, no source):
 * 1 − ⌊log10(min)⌋, clamped to [0, 8]. Falls back to `fallback` when neither
 * uncertainty is positive and finite.
 */
export function decimalsForError(errorLow: number, errorHigh: number, fallback = 3): number {
  const candidates = [errorLow, errorHigh].filter((e) => e > 0 && Number.isFinite(e));
  if (candidates.length === 0) return fallback;
  const smallest = Math.min(...candidates);
  return Math.min(8, Math.max(0, 1 - Math.floor(Math.log10(smallest))));
}

/**
 * `x` with a fixed number of decimals; exponent notation for magnitudes of
 * 1e9 and beyond; "--" for NaN.
 */
export function formatFixed(x: number, decimals: number): string {
  if (Number.isNaN(x)) return "--";
  if (!Number.isFinite(x)) return x > 0 ? "inf" : "-inf";
  if (Math.abs(x) >= 1e9) return compactExponent(x.toExponential(3));
  const text = x.toFixed(Math.min(12, Math.max(0, decimals)));
  return /^-0(\.0*)?$/.test(text) ? text.slice(1) : text;
}

/** Median and 68% interval as display strings sharing one precision. */
export interface FormattedSummary {
  readonly median: string;
  /** "[lower, upper]". */
  readonly interval: string;
  /** The interval relative to the median: "-(median − lower) +(upper − median)". */
  readonly errors: string;
  readonly decimals: number;
}

/**
 * Format a median with its central interval at the precision of the
 * smaller half-width ({@link decimalsForError}).
 */
export function formatSummary(median: number, lower: number, upper: number): FormattedSummary {
  const magnitude = Math.abs(median) > 0 ? Math.floor(Math.log10(Math.abs(median))) : 0;
  const decimals = decimalsForError(median - lower, upper - median, Math.max(0, 3 - magnitude));
  return {
    median: formatFixed(median, decimals),
    interval: `[${formatFixed(lower, decimals)}, ${formatFixed(upper, decimals)}]`,
    errors: `-${formatFixed(median - lower, decimals)} +${formatFixed(upper - median, decimals)}`,
    decimals,
  };
}

/**
 * A duration in seconds as a short text: "42s", "3m 05s", "2h 07m",
 * "3d 04h"; "--" when NaN or infinite.
 */
export function formatDuration(seconds: number): string {
  if (!Number.isFinite(seconds) || seconds < 0) return "--";
  const s = Math.round(seconds);
  if (s < 60) return `${s}s`;
  const two = (n: number) => String(n).padStart(2, "0");
  if (s < 3600) return `${Math.floor(s / 60)}m ${two(s % 60)}s`;
  if (s < 86400) return `${Math.floor(s / 3600)}h ${two(Math.floor((s % 3600) / 60))}m`;
  return `${Math.floor(s / 86400)}d ${two(Math.floor((s % 86400) / 3600))}h`;
}

/** A bar of `width` cells, filled in proportion to `fraction` (clamped to [0, 1]). */
export function progressBar(fraction: number, width: number): string {
  const w = Math.max(0, Math.floor(width));
  const f = Number.isFinite(fraction) ? Math.min(1, Math.max(0, fraction)) : 0;
  const filled = Math.round(f * w);
  return "█".repeat(filled) + "░".repeat(w - filled);
}

/** One-character flag after a figure: blank when good. Reads without colour. */
export const MARK_FLAG: Readonly<Record<Mark, string>> = {
  good: " ",
  warn: "~",
  bad: "!",
  unknown: "?",
};

/** Status word of a whole row. Reads without colour. */
export const MARK_WORD: Readonly<Record<Mark, string>> = {
  good: "ok",
  warn: "warn",
  bad: "BAD",
  unknown: "wait",
};

/**
 * Decimals for axis labels over a span: enough for three significant digits
 * of the span, 2 − ⌊log10(span)⌋, clamped to [0, 8]; 3 for an empty span.
 */
export function decimalsForSpan(span: number): number {
  if (!(span > 0) || !Number.isFinite(span)) return 3;
  return Math.min(8, Math.max(0, 2 - Math.floor(Math.log10(span))));
}
