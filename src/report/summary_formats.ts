/**
 * The summary as CSV, Markdown or LaTeX for papers: values rounded by their
 * uncertainty (the convention of `rounding.ts`: two significant digits on the
 * smaller error, value and other error to the same decimal place) with
 * asymmetric errors (16th and 84th percentiles about the median) and units,
 * sampled parameters first, then derived quantities.
 * @module
 */
import { InputError } from "../errors.ts";
import type { Interval } from "./quantiles.ts";
import { roundByUncertainty } from "./rounding.ts";
import type { Summary } from "./summary.ts";

/** Formats written here (text and JSON live elsewhere). */
export type SummaryFormat = "csv" | "md" | "latex";

/** Options of {@link formatSummary}. */
export interface FormatSummaryOptions {
  /**
   * Rows to show, in this order: exact keys (`b.period`) or globs where `*`
   * matches any run of characters (`b.*`, `*.jitter`). A pattern matching
   * nothing is an error. @default every parameter, then every derived quantity
   */
  params?: readonly string[];
}

/** One row of a table. */
interface Row {
  readonly key: string;
  readonly kind: "parameter" | "derived";
  readonly interval: Interval;
}

/**
 * Keys chosen by `patterns` (exact keys or `*` globs), in pattern order,
 * each key once. Throws {@link InputError} (field `--params`) naming a
 * pattern that matches no key.
 */
export function selectKeys(keys: readonly string[], patterns: readonly string[]): string[] {
  const out: string[] = [];
  for (const raw of patterns) {
    const pattern = raw.trim();
    if (pattern === "") continue;
    const re = new RegExp(
      "^" + pattern.split("*").map((s) => s.replace(/[.+?^${}()|[\]\\]/g, "\\$&")).join(".*") + "$",
    );
    const hits = keys.filter((k) => re.test(k));
    if (hits.length === 0) {
      throw new InputError(
        `found no key matching \`${pattern}\`: expected one of ${keys.join(", ")}`,
        { field: "--params" },
      );
    }
    for (const h of hits) if (!out.includes(h)) out.push(h);
  }
  return out;
}

/** The summary as a CSV, Markdown or LaTeX table. */
export function formatSummary(
  summary: Summary,
  format: SummaryFormat,
  options: FormatSummaryOptions = {},
): string {
  const all: Row[] = [
    ...Object.entries(summary.parameters).map(([key, interval]) => ({
      key,
      kind: "parameter" as const,
      interval,
    })),
    ...Object.entries(summary.derived).map(([key, interval]) => ({
      key,
      kind: "derived" as const,
      interval,
    })),
  ];
  let rows = all;
  if (options.params !== undefined && options.params.length > 0) {
    const byKey = new Map(all.map((r) => [r.key, r]));
    rows = selectKeys(all.map((r) => r.key), options.params).map((k) => byKey.get(k)!);
  }
  switch (format) {
    case "csv":
      return csv(rows);
    case "md":
      return markdown(rows, summary);
    case "latex":
      return latex(rows);
    default:
      throw new InputError(`found format \`${String(format)}\`: expected csv, md or latex`, {
        field: "--format",
      });
  }
}

/** Rounded median, errors and 95% bounds of an interval. */
function rounded(iv: Interval) {
  const minus = iv.median - iv.lo68;
  const plus = iv.hi68 - iv.median;
  const r = roundByUncertainty(iv.median, minus, plus);
  const lo95 = roundByUncertainty(iv.lo95, minus, plus).value;
  const hi95 = roundByUncertainty(iv.hi95, minus, plus).value;
  return { ...r, lo95, hi95 };
}

const CSV_HEADER = [
  "key",
  "median",
  "minus",
  "plus",
  "lo95",
  "hi95",
  "unit",
  "kind",
  "median_exact",
  "minus_exact",
  "plus_exact",
  "lo95_exact",
  "hi95_exact",
];

/** A CSV field, quoted when it holds a comma, quote or line break (RFC 4180). */
function csvField(s: string): string {
  return /[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

/** Shortest exact decimal form; empty for non-finite. */
function exact(x: number): string {
  return Number.isFinite(x) ? String(x) : "";
}

function csv(rows: readonly Row[]): string {
  const lines = [CSV_HEADER.join(",")];
  for (const { key, kind, interval: iv } of rows) {
    const r = rounded(iv);
    const ok = Number.isFinite(iv.median);
    lines.push(
      [
        key,
        ok ? r.value : "",
        ok ? r.minus : "",
        ok ? r.plus : "",
        ok ? r.lo95 : "",
        ok ? r.hi95 : "",
        iv.unit,
        kind,
        exact(iv.median),
        exact(iv.median - iv.lo68),
        exact(iv.hi68 - iv.median),
        exact(iv.lo95),
        exact(iv.hi95),
      ].map(csvField).join(","),
    );
  }
  return lines.join("\n") + "\n";
}

/** `905.3 +1.5 −1.2` or `905.3 ± 1.2` (Markdown, plain text). */
function plainValue(iv: Interval): string {
  if (!Number.isFinite(iv.median)) return "n/a";
  const r = rounded(iv);
  return r.minus === r.plus ? `${r.value} ± ${r.minus}` : `${r.value} +${r.plus} / −${r.minus}`;
}

function mdCell(s: string): string {
  return s.replace(/\|/g, "\\|");
}

function markdown(rows: readonly Row[], summary: Summary): string {
  const out: string[] = [];
  const table = (title: string, part: readonly Row[]) => {
    if (part.length === 0) return;
    out.push(`**${title}**`, "");
    out.push("| Parameter | Value | 95% interval | Unit |");
    out.push("|:--|--:|:--:|:--|");
    for (const { key, interval: iv } of part) {
      const r = rounded(iv);
      const ci = Number.isFinite(iv.lo95) ? `[${r.lo95}, ${r.hi95}]` : "n/a";
      out.push(`| \`${mdCell(key)}\` | ${plainValue(iv)} | ${ci} | ${mdCell(iv.unit)} |`);
    }
    out.push("");
  };
  table("Sampled parameters", rows.filter((r) => r.kind === "parameter"));
  table("Derived quantities", rows.filter((r) => r.kind === "derived"));
  out.push(
    `Median with 16th–84th percentile errors; 95% central interval. ${
      (summary.steps - summary.burn) * summary.walkers
    } draws after a burn-in of ${summary.burn} steps. Values are rounded so that the smaller error has two significant digits.`,
  );
  return out.join("\n") + "\n";
}

/** Characters special to LaTeX text mode, escaped. */
export function latexEscape(s: string): string {
  return s.replace(
    /[\\&%$#_{}~^]/g,
    (c) =>
      c === "\\"
        ? "\\textbackslash{}"
        : c === "~"
        ? "\\textasciitilde{}"
        : c === "^"
        ? "\\textasciicircum{}"
        : `\\${c}`,
  );
}

/** Units as astronomers set them in LaTeX; unknown units are escaped text. */
const LATEX_UNITS: Record<string, string> = {
  "m/s": "m\\,s$^{-1}$",
  "km/s": "km\\,s$^{-1}$",
  "m/s/d": "m\\,s$^{-1}$\\,d$^{-1}$",
  "m/s/d²": "m\\,s$^{-1}$\\,d$^{-2}$",
  "deg": "deg",
  "d": "d",
  "au": "au",
  "Mjup": "$M_\\mathrm{Jup}$",
  "Mearth": "$M_\\oplus$",
  "Msun": "$M_\\odot$",
  "Rsun": "$R_\\odot$",
};

function latexUnit(unit: string): string {
  return LATEX_UNITS[unit] ?? latexEscape(unit);
}

/** `$905.3^{+1.5}_{-1.2}$`, or `$905.3 \pm 1.2$` when the errors round alike. */
export function latexValue(iv: Interval): string {
  if (!Number.isFinite(iv.median)) return "--";
  const r = rounded(iv);
  return r.minus === r.plus
    ? `$${r.value} \\pm ${r.minus}$`
    : `$${r.value}^{+${r.plus}}_{-${r.minus}}$`;
}

function latex(rows: readonly Row[]): string {
  const out: string[] = [];
  out.push("\\begin{table}");
  out.push("\\centering");
  out.push("\\begin{tabular}{lcl}");
  out.push("\\hline");
  out.push("Parameter & Value & Unit \\\\");
  out.push("\\hline");
  const part = (kind: Row["kind"]) => rows.filter((r) => r.kind === kind);
  for (const { key, interval: iv } of part("parameter")) {
    out.push(`${latexEscape(key)} & ${latexValue(iv)} & ${latexUnit(iv.unit)} \\\\`);
  }
  const derived = part("derived");
  if (derived.length > 0) {
    out.push("\\hline");
    out.push("\\multicolumn{3}{l}{\\textit{Derived}} \\\\");
    for (const { key, interval: iv } of derived) {
      out.push(`${latexEscape(key)} & ${latexValue(iv)} & ${latexUnit(iv.unit)} \\\\`);
    }
  }
  out.push("\\hline");
  out.push("\\end{tabular}");
  out.push("\\end{table}");
  return out.join("\n") + "\n";
}
