/**
 * Display-ready lines of the dashboard: `buildScreen(model)` lays the current
 * view out for the terminal size in the model. Every line it returns is at
 * most `model.columns` cells wide and the whole screen at most `model.rows`
 * lines high. Pure; components only draw these lines.
 * @module
 */

import {
  blockBars,
  brailleLines,
  brailleRaster,
  markColumn,
  plotCounts,
  plotLine,
  shadeLines,
} from "./draw.ts";
import {
  decimalsForSpan,
  fit,
  formatDuration,
  formatFixed,
  formatNumber,
  formatSummary,
  MARK_FLAG,
  MARK_WORD,
  progressBar,
  textWidth,
} from "./format.ts";
import {
  type ParameterStats,
  type QuantityStats,
  VIEW_LABELS,
  type ViewModel,
  VIEWS,
} from "./model.ts";
import type { RunSnapshot, RunState } from "./snapshot.ts";
import {
  atLeastMark,
  correlation,
  densityLevels,
  etaSeconds,
  histogram,
  histogram2d,
  type Mark,
  progressFraction,
  rhatMark,
  smoothGrid,
  worstMark,
} from "./stats.ts";

/** How a piece of text is emphasised; components map tones to colours only when colour is on. */
export type Tone = "plain" | "strong" | "dim" | "accent" | "good" | "warn" | "bad" | "cursor";

/** A run of text in one tone. */
export interface Segment {
  readonly text: string;
  readonly tone: Tone;
}

/** One screen line as segments. */
export type Line = readonly Segment[];

/** The body of the screen for the current view (or help / waiting). */
export type Body =
  | { readonly kind: "waiting"; readonly lines: readonly Line[] }
  | { readonly kind: "help"; readonly lines: readonly Line[] }
  | {
    readonly kind: "convergence";
    readonly heading: Line;
    readonly rows: readonly Line[];
    readonly legend: readonly Line[];
  }
  | {
    readonly kind: "posterior";
    readonly heading: Line;
    readonly rows: readonly Line[];
    readonly detail: readonly Line[];
  }
  | PlotBody<"pair">
  | PlotBody<"trace">
  | {
    readonly kind: "planets";
    readonly heading: Line;
    readonly rows: readonly Line[];
    readonly note: readonly Line[];
  };

/** A plot view: heading, plot lines with axes, legend. */
export interface PlotBody<K extends "pair" | "trace"> {
  readonly kind: K;
  readonly heading: Line;
  readonly plot: readonly Line[];
  readonly legend: readonly Line[];
}

/** The whole dashboard, top to bottom. */
export interface Screen {
  readonly columns: number;
  readonly rows: number;
  readonly color: boolean;
  readonly header: readonly Line[];
  readonly tabs: Line;
  readonly body: Body;
  readonly footer: Line;
}

/** Join a line's text. */
export function lineText(line: Line): string {
  return line.map((s) => s.text).join("");
}

/** Cut a line to `width` cells across its segments; the last kept cell becomes "…". */
export function fitLine(line: Line, width: number): Line {
  const total = line.reduce((n, s) => n + textWidth(s.text), 0);
  if (total <= width) return line;
  const out: Segment[] = [];
  let room = Math.max(0, width - 1);
  for (const s of line) {
    if (room <= 0) break;
    const chars = Array.from(s.text);
    const take = chars.slice(0, room).join("");
    out.push({ text: take, tone: s.tone });
    room -= Math.min(room, chars.length);
  }
  if (width > 0) {
    const last = out[out.length - 1];
    if (last) out[out.length - 1] = { text: last.text + "…", tone: last.tone };
    else out.push({ text: "…", tone: "dim" });
  }
  return out;
}

const seg = (text: string, tone: Tone = "plain"): Segment => ({ text, tone });

const MARK_TONE: Readonly<Record<Mark, Tone>> = {
  good: "good",
  warn: "warn",
  bad: "bad",
  unknown: "dim",
};

const STATE_TONE: Readonly<Record<RunState, Tone>> = {
  starting: "dim",
  running: "accent",
  finished: "good",
  stopped: "warn",
  failed: "bad",
  stale: "warn",
};

/** Probability masses of the shaded regions: 1 − exp(−k²/2) for k = 1, 1.5, 2, 3 (2-D Gaussian σ contours). */
export const DENSITY_FRACTIONS: readonly number[] = [1, 1.5, 2, 3].map((k) =>
  1 - Math.exp(-k * k / 2)
);

/** Lay out the current view of `model`. */
export function buildScreen(model: ViewModel): Screen {
  const { columns, rows } = model;
  const header = headerLines(model).map((l) => fitLine(l, columns));
  const tabs = fitLine(tabLine(model), columns);
  const footer = fitLine(footerLine(model), columns);
  const height = Math.max(0, rows - header.length - 2);
  const body = fitBody(bodyFor(model, height), columns, height);
  return { columns, rows, color: model.color, header, tabs, body, footer };
}

function bodyFor(model: ViewModel, height: number): Body {
  if (model.help) return { kind: "help", lines: helpLines(model) };
  const snap = model.snapshot;
  if (!snap) {
    return {
      kind: "waiting",
      lines: [[seg("Waiting for the first snapshot of the run directory…", "dim")]],
    };
  }
  switch (model.view) {
    case "convergence":
      return convergenceBody(model, snap, height);
    case "posterior":
      return posteriorBody(model, height);
    case "pair":
      return pairBody(model, snap, height);
    case "trace":
      return traceBody(model, snap, height);
    case "planets":
      return planetsBody(model, height);
  }
}

/** Clip every line to the width and the body to the height (legends first to go). */
function fitBody(body: Body, columns: number, height: number): Body {
  const f = (lines: readonly Line[]) => lines.map((l) => fitLine(l, columns));
  switch (body.kind) {
    case "waiting":
    case "help":
      return { kind: body.kind, lines: f(body.lines).slice(0, height) };
    case "convergence": {
      const rows = f(body.rows).slice(0, Math.max(0, height - 1));
      const legend = f(body.legend).slice(0, Math.max(0, height - 1 - rows.length));
      return { kind: body.kind, heading: fitLine(body.heading, columns), rows, legend };
    }
    case "posterior": {
      const rows = f(body.rows).slice(0, Math.max(0, height - 1));
      const detail = f(body.detail).slice(0, Math.max(0, height - 1 - rows.length));
      return { kind: body.kind, heading: fitLine(body.heading, columns), rows, detail };
    }
    case "pair":
      return fitPlot(body, columns, height);
    case "trace":
      return fitPlot(body, columns, height);
    case "planets": {
      const rows = f(body.rows).slice(0, Math.max(0, height - 1));
      const note = f(body.note).slice(0, Math.max(0, height - 1 - rows.length));
      return { kind: body.kind, heading: fitLine(body.heading, columns), rows, note };
    }
  }
}

function fitPlot<K extends "pair" | "trace">(
  body: PlotBody<K>,
  columns: number,
  height: number,
): PlotBody<K> {
  const plot = body.plot.map((l) => fitLine(l, columns)).slice(0, Math.max(0, height - 1));
  const legend = body.legend.map((l) => fitLine(l, columns)).slice(
    0,
    Math.max(0, height - 1 - plot.length),
  );
  return { kind: body.kind, heading: fitLine(body.heading, columns), plot, legend };
}

// ---------------------------------------------------------------- header

function headerLines(model: ViewModel): Line[] {
  const snap = model.snapshot;
  const columns = model.columns;
  if (!snap) {
    const lines: Line[] = [[seg("rvwalk", "strong"), seg("  waiting for data", "dim")]];
    if (model.loadError) lines.push([seg(`! ${model.loadError}`, "bad")]);
    return lines;
  }
  const state = snap.state.toUpperCase();
  const left = `${snap.title}  ${snap.dir}`;
  const title: Line = [
    seg(fit(left, Math.max(0, columns - state.length - 1)), "strong"),
    seg(" "),
    seg(state, STATE_TONE[snap.state]),
  ];

  const fraction = progressFraction(snap.step, snap.totalSteps);
  const eta = snap.state === "finished"
    ? "done"
    : snap.state === "running" || snap.state === "starting"
    ? formatDuration(etaSeconds(snap.step, snap.totalSteps, snap.stepsPerSecond))
    : "--";
  const speed = Number.isFinite(snap.stepsPerSecond)
    ? formatNumber(snap.stepsPerSecond, { digits: 3 })
    : "--";
  const rest =
    ` ${(fraction * 100).toFixed(1).padStart(5)}%  step ${snap.step}/${snap.totalSteps}` +
    `  ${speed} steps/s  ETA ${eta}`;
  const barWidth = Math.max(10, Math.min(60, columns - textWidth(rest)));
  const progress: Line = [seg(progressBar(fraction, barWidth), "accent"), seg(rest)];

  const details: Line = [
    seg(
      `walkers ${snap.walkers}  threads ${snap.threads}  accept ${
        formatFixed(snap.acceptance, 3)
      }` +
        `  burn ${snap.burn}  draws ${model.parameters[0]?.sorted.length ?? 0}  converged `,
    ),
    snap.converged ? seg("yes", "good") : seg("no", "warn"),
  ];
  const lines: Line[] = [title, progress, details];

  const alerts: Segment[] = [];
  if (snap.stuckWalkers.length > 0) {
    const n = snap.stuckWalkers.length;
    alerts.push(
      seg(
        `! ${n} stuck walker${n === 1 ? "" : "s"}: ${
          snap.stuckWalkers.map((w) => `#${w}`).join(" ")
        }  `,
        "warn",
      ),
    );
  }
  if (
    snap.message && (snap.state === "failed" || snap.state === "stale" || snap.state === "stopped")
  ) {
    alerts.push(seg(`! ${snap.message}  `, snap.state === "failed" ? "bad" : "warn"));
  } else if (snap.message) {
    alerts.push(seg(`${snap.message}  `, "dim"));
  }
  if (model.loadError) alerts.push(seg(`! cannot refresh: ${model.loadError}`, "bad"));
  if (alerts.length > 0) lines.push(alerts);
  return lines;
}

function tabLine(model: ViewModel): Line {
  const out: Segment[] = [];
  VIEWS.forEach((view, i) => {
    const label = `${i + 1} ${VIEW_LABELS[view]}`;
    if (view === model.view && !model.help) out.push(seg(`[${label}]`, "cursor"));
    else out.push(seg(` ${label} `, "dim"));
    out.push(seg(" "));
  });
  if (model.help) out.push(seg("[? help]", "cursor"));
  return out;
}

function footerLine(model: ViewModel): Line {
  if (model.help) return [seg("? or Esc close help  q quit", "dim")];
  const byView: Record<string, string> = {
    pair: "x/X y/Y axes  s swap  d dots",
    planets: "j/k planet",
  };
  const extra = byView[model.view] ?? "j/k parameter  p pair";
  return [seg(`1-5/tab view  ${extra}  ? help  q quit`, "dim")];
}

// ---------------------------------------------------------------- tables

/** First row to show so that `selected` stays visible in a window of `height` rows. */
export function windowStart(count: number, selected: number, height: number): number {
  if (count <= height || height <= 0) return 0;
  const start = selected - Math.floor(height / 2);
  return Math.max(0, Math.min(count - height, start));
}

function cursor(selected: boolean): Segment {
  return selected ? seg("> ", "cursor") : seg("  ");
}

/** Right-aligned number cell with a trailing one-character mark flag. */
function markedCell(text: string, width: number, mark: Mark): Segment[] {
  return [
    seg(fit(text, width - 1, { align: "right" }), mark === "good" ? "plain" : MARK_TONE[mark]),
    seg(MARK_FLAG[mark], MARK_TONE[mark]),
  ];
}

const CONV_WIDTHS = { rhat: 8, essBulk: 10, essTail: 10, tau: 9, stepsPerTau: 11, status: 6 };

function convergenceBody(model: ViewModel, snap: RunSnapshot, height: number): Body {
  const w = CONV_WIDTHS;
  const fixed = 2 + w.rhat + w.essBulk + w.essTail + w.tau + w.stepsPerTau + w.status;
  const nameWidth = Math.max(8, Math.min(40, model.columns - fixed));
  const heading: Line = [
    seg(
      "  " + fit("parameter", nameWidth) +
        fit("R-hat ", w.rhat, { align: "right" }) +
        fit("ESS bulk ", w.essBulk, { align: "right" }) +
        fit("ESS tail ", w.essTail, { align: "right" }) +
        fit("tau ", w.tau, { align: "right" }) +
        fit("steps/tau ", w.stepsPerTau, { align: "right" }) +
        fit(" mark", w.status),
      "strong",
    ),
  ];
  const t = snap.thresholds;
  const rowsHeight = Math.max(0, height - 3);
  const n = snap.parameters.length;
  const start = windowStart(n, model.selected, rowsHeight);
  const rows: Line[] = [];
  let flagged = 0;
  snap.parameters.forEach((p, i) => {
    const d = snap.diagnostics[i];
    const marks = d
      ? {
        rhat: rhatMark(d.rhat, t.rhat),
        essBulk: atLeastMark(d.essBulk, t.essBulk),
        essTail: atLeastMark(d.essTail, t.essBulk),
        stepsPerTau: atLeastMark(d.stepsPerTau, t.stepsPerTau),
      }
      : undefined;
    const row = marks ? worstMark(Object.values(marks)) : "unknown";
    if (row === "warn" || row === "bad") flagged++;
    if (i < start || i >= start + rowsHeight) return;
    const sel = i === model.selected;
    const line: Segment[] = [cursor(sel), seg(fit(p.key, nameWidth), sel ? "cursor" : "plain")];
    if (d && marks) {
      line.push(
        ...markedCell(formatFixed(d.rhat, 3), w.rhat, marks.rhat),
        ...markedCell(formatCount(d.essBulk), w.essBulk, marks.essBulk),
        ...markedCell(formatCount(d.essTail), w.essTail, marks.essTail),
        seg(fit(formatNumber(d.tau, { digits: 3 }) + " ", w.tau, { align: "right" })),
        ...markedCell(formatNumber(d.stepsPerTau, { digits: 3 }), w.stepsPerTau, marks.stepsPerTau),
      );
    } else {
      line.push(seg(fit("no diagnostics", w.rhat + w.essBulk + w.essTail), "dim"));
    }
    line.push(seg(" " + fit(MARK_WORD[row], w.status - 1), MARK_TONE[row]));
    rows.push(line);
  });
  const shown = n > rowsHeight
    ? `  rows ${start + 1}-${Math.min(n, start + rowsHeight)} of ${n}`
    : "";
  const legend: Line[] = [
    [
      seg("flags: ", "dim"),
      seg("~", "warn"),
      seg(" near threshold  ", "dim"),
      seg("!", "bad"),
      seg(" fails it  ", "dim"),
      seg("?", "dim"),
      seg(" not known yet;  row mark: the worst flag", "dim"),
    ],
    [
      seg(
        `ok when R-hat <= ${t.rhat}, ESS >= ${t.essBulk}, steps/tau >= ${t.stepsPerTau}` +
          `  flagged ${flagged}/${n}${shown}`,
        flagged > 0 ? "warn" : "dim",
      ),
    ],
  ];
  return { kind: "convergence", heading, rows, legend };
}

function formatCount(x: number): string {
  if (Number.isNaN(x)) return "--";
  return Math.abs(x) < 1e7 ? String(Math.round(x)) : formatNumber(x, { digits: 3 });
}

function posteriorBody(model: ViewModel, height: number): Body {
  const params = model.parameters;
  const rowsHeight = Math.max(0, height - 3);
  const start = windowStart(params.length, model.selected, rowsHeight);
  const visible = params.slice(start, start + rowsHeight).map((p) => ({
    p,
    f: formatSummary(p.summary.median, p.summary.lower, p.summary.upper),
  }));
  // Number columns as wide as their widest visible entry, within limits.
  const medianWidth = Math.min(16, Math.max(8, ...visible.map((v) => textWidth(v.f.median))));
  const errorsWidth = Math.min(22, Math.max(12, ...visible.map((v) => textWidth(v.f.errors))));
  const unitWidth = Math.min(8, Math.max(4, ...visible.map((v) => textWidth(v.p.unit))));
  const fixed = 2 + medianWidth + 2 + errorsWidth + 1 + unitWidth + 1;
  const rest = Math.max(0, model.columns - fixed);
  const nameWidth = Math.max(10, Math.min(30, Math.round(rest * 0.5)));
  const histWidth = Math.max(0, rest - nameWidth);
  const heading: Line = [
    seg(
      "  " + fit("parameter", nameWidth) + fit("median", medianWidth, { align: "right" }) + "  " +
        fit("68% interval", errorsWidth) + " " + fit("unit", unitWidth) + " " +
        fit("histogram (0.5-99.5%)", histWidth),
      "strong",
    ),
  ];
  const rows: Line[] = visible.map(({ p, f }, k): Line => {
    const sel = start + k === model.selected;
    return [
      cursor(sel),
      seg(fit(p.key, nameWidth), sel ? "cursor" : "plain"),
      seg(fit(f.median, medianWidth, { align: "right" }) + "  "),
      seg(fit(f.errors, errorsWidth) + " "),
      seg(fit(p.unit, unitWidth) + " ", "dim"),
      seg(histogramText(p, histWidth), "accent"),
    ];
  });
  const p = params[model.selected];
  const detail: Line[] = [];
  if (p) {
    const f = formatSummary(p.summary.median, p.summary.lower, p.summary.upper);
    const unit = p.unit ? ` ${p.unit}` : "";
    detail.push([
      seg(`${p.key}`, "strong"),
      seg(`: median ${f.median}${unit}, 68% interval ${f.interval}, ${p.summary.count} draws`),
    ]);
    const d = decimalsForSpan(p.range[1] - p.range[0]);
    detail.push([
      seg(
        `histogram spans ${formatFixed(p.range[0], d)} .. ${formatFixed(p.range[1], d)}${unit}` +
          "  (0.5% to 99.5% quantile)",
        "dim",
      ),
    ]);
  }
  return { kind: "posterior", heading, rows, detail };
}

function histogramText(q: QuantityStats, width: number): string {
  if (width <= 0 || q.sorted.length === 0) return "";
  return blockBars(histogram(q.sorted, width, { min: q.range[0], max: q.range[1] }));
}

// ---------------------------------------------------------------- plots

/** Three y-axis labels (top, middle, bottom) for [lo, hi] at a precision that resolves the span. */
function yLabels(lo: number, hi: number, decimals?: number): readonly [string, string, string] {
  const d = decimals ?? decimalsForSpan(hi - lo);
  return [formatFixed(hi, d), formatFixed((lo + hi) / 2, d), formatFixed(lo, d)];
}

/** Width of the y-label gutter (label, a space), so every label fits; at least 6, at most 16. */
function gutterWidth(labels: readonly string[]): number {
  return Math.min(16, Math.max(6, ...labels.map((l) => textWidth(l) + 1)));
}

function axisLabelLines(
  plot: readonly string[],
  labels: readonly [string, string, string],
  gutter: number,
): Line[] {
  const mid = Math.floor((plot.length - 1) / 2);
  return plot.map((text, r) => {
    const label = r === 0
      ? labels[0]
      : r === plot.length - 1
      ? labels[2]
      : r === mid
      ? labels[1]
      : "";
    return [
      seg(fit(label, gutter - 1, { align: "right" }) + " ", "dim"),
      seg("│", "dim"),
      seg(text, "accent"),
    ];
  });
}

/** The x axis rule and a label line with `lo` at the left, `mid` centred and `hi` at the right. */
function xAxisLines(
  gutter: number,
  width: number,
  labels: readonly [string, string, string],
): Line[] {
  const [lo, mid, hi] = labels;
  const cells = Array.from(" ".repeat(width));
  const put = (text: string, at: number) => {
    const chars = Array.from(text);
    const start = Math.max(0, Math.min(width - chars.length, at));
    chars.forEach((c, i) => {
      if (start + i < width) cells[start + i] = c;
    });
  };
  put(lo, 0);
  if (width >= textWidth(lo) + textWidth(mid) + textWidth(hi) + 4) {
    put(mid, Math.floor(width / 2 - textWidth(mid) / 2));
  }
  if (width >= textWidth(lo) + textWidth(hi) + 2) put(hi, width - textWidth(hi));
  return [
    [seg(" ".repeat(gutter), "dim"), seg("└" + "─".repeat(width), "dim")],
    [seg(" ".repeat(gutter + 1) + cells.join(""), "dim")],
  ];
}

function xLabels(lo: number, hi: number): readonly [string, string, string] {
  const d = decimalsForSpan(hi - lo);
  return [formatFixed(lo, d), formatFixed((lo + hi) / 2, d), formatFixed(hi, d)];
}

function paramLabel(p: ParameterStats): string {
  return p.unit ? `${p.key} [${p.unit}]` : p.key;
}

/**
 * Bins per axis for a shaded density of `n` draws: the Rice rule ⌈2 n^(1/3)⌉
 * (common practice, no source), at least 4 and at most the cells available.
 */
export function densityBins(n: number, cells: number): number {
  return Math.max(1, Math.min(cells, Math.max(4, Math.ceil(2 * Math.cbrt(Math.max(0, n))))));
}

/** Spread a `bins`-column grid of levels over `columns` character cells (nearest bin). */
function stretchColumns(
  levels: Uint8Array,
  bins: number,
  rows: number,
  columns: number,
): Uint8Array {
  const out = new Uint8Array(columns * rows);
  for (let r = 0; r < rows; r++) {
    for (let c = 0; c < columns; c++) {
      out[r * columns + c] =
        levels[r * bins + Math.min(bins - 1, Math.floor((c * bins) / columns))]!;
    }
  }
  return out;
}

function stretchRows(levels: Uint8Array, columns: number, bins: number, rows: number): Uint8Array {
  const out = new Uint8Array(columns * rows);
  for (let r = 0; r < rows; r++) {
    const b = Math.min(bins - 1, Math.floor((r * bins) / rows));
    out.set(levels.subarray(b * columns, (b + 1) * columns), r * columns);
  }
  return out;
}

function pairBody(model: ViewModel, snap: RunSnapshot, height: number): Body {
  const px = model.parameters[model.pairX];
  const py = model.parameters[model.pairY];
  if (!px || !py) {
    return {
      kind: "pair",
      heading: [seg("Pair density needs at least one parameter", "dim")],
      plot: [],
      legend: [],
    };
  }
  const xDraws = snap.draws[model.pairX] ?? new Float64Array(0);
  const yDraws = snap.draws[model.pairY] ?? new Float64Array(0);
  const n = Math.min(xDraws.length, yDraws.length);
  const r = correlation(xDraws, yDraws);
  const heading: Line = [
    seg("y ", "dim"),
    seg(paramLabel(py), "strong"),
    seg("  vs  x ", "dim"),
    seg(paramLabel(px), "strong"),
    seg(`  corr ${Number.isNaN(r) ? "--" : (r >= 0 ? "+" : "") + r.toFixed(2)}  n=${n}`),
  ];
  const xRange = px.range;
  const yRange = py.range;
  const labels = yLabels(yRange[0], yRange[1]);
  const gutter = gutterWidth(labels);
  const plotRows = Math.max(0, height - 4);
  const plotColumns = Math.max(0, model.columns - gutter - 1);
  if (plotRows < 2 || plotColumns < 4 || n === 0) {
    return { kind: "pair", heading, plot: [], legend: [] };
  }
  let text: string[];
  let legend: Line;
  if (model.pairStyle === "dots") {
    const raster = brailleRaster(plotColumns, plotRows);
    const counts = histogram2d(xDraws, yDraws, {
      columns: raster.width,
      rows: raster.height,
      xRange,
      yRange,
    });
    text = brailleLines(plotCounts(raster, counts));
    legend = [seg("dots: every pixel (2x4 per cell) holding a draw  d: shaded regions", "dim")];
  } else {
    const bx = densityBins(n, plotColumns);
    const by = densityBins(n, plotRows);
    const counts = histogram2d(xDraws, yDraws, { columns: bx, rows: by, xRange, yRange });
    const levels = densityLevels(smoothGrid(counts, bx, by), DENSITY_FRACTIONS);
    const cells = stretchRows(
      stretchColumns(levels, bx, by, plotColumns),
      plotColumns,
      by,
      plotRows,
    );
    text = shadeLines(cells, plotColumns, DENSITY_FRACTIONS.length);
    legend = [
      seg("█ 39%  ▓ 68%  ▒ 86%  ░ 99%", "accent"),
      seg(` of draws in the densest bins (${bx}x${by}, smoothed)  d: dots  axes 0.5-99.5%`, "dim"),
    ];
  }
  return {
    kind: "pair",
    heading,
    plot: [
      ...axisLabelLines(text, labels, gutter),
      ...xAxisLines(gutter, plotColumns, xLabels(xRange[0], xRange[1])),
    ],
    legend: [legend],
  };
}

function traceBody(model: ViewModel, snap: RunSnapshot, height: number): Body {
  const { steps, values } = snap.logPosteriorTrace;
  const n = Math.min(steps.length, values.length);
  let lo = Infinity;
  let hi = -Infinity;
  let last = NaN;
  for (let i = 0; i < n; i++) {
    const v = values[i]!;
    if (!Number.isFinite(v)) continue;
    lo = Math.min(lo, v);
    hi = Math.max(hi, v);
    last = v;
  }
  const d = decimalsForSpan(hi - lo);
  const heading: Line = [
    seg("walker-mean log posterior", "strong"),
    seg(`  last ${formatFixed(last, d)}  max ${formatFixed(hi, d)}  points ${n}`),
  ];
  const labels = yLabels(lo, hi, d);
  const gutter = gutterWidth(labels);
  const plotRows = Math.max(0, height - 4);
  const plotColumns = Math.max(0, model.columns - gutter - 1);
  if (n === 0 || !Number.isFinite(lo) || plotRows < 2 || plotColumns < 4) {
    return {
      kind: "trace",
      heading,
      plot: n === 0 ? [[seg("No log-posterior values yet", "dim")]] : [],
      legend: [],
    };
  }
  const raster = plotLine(brailleRaster(plotColumns, plotRows), values.subarray(0, n), {
    min: lo,
    max: hi,
  });
  const s0 = steps[0]!;
  const s1 = steps[n - 1]!;
  const burnVisible = snap.burn > s0 && snap.burn < s1;
  if (burnVisible) markColumn(raster, ((snap.burn - s0) / (s1 - s0)) * (raster.width - 1));
  const legend: Line = [
    seg(`x: step ${s0} to ${s1}`, "dim"),
    seg(burnVisible ? `  dotted column: burn-in ends at step ${snap.burn}` : "", "dim"),
  ];
  return {
    kind: "trace",
    heading,
    plot: [
      ...axisLabelLines(brailleLines(raster), labels, gutter),
      ...xAxisLines(gutter, plotColumns, [
        String(s0),
        String(Math.round((s0 + s1) / 2)),
        String(s1),
      ]),
    ],
    legend: [legend],
  };
}

// ---------------------------------------------------------------- planets

const PLANET_WIDTHS = { label: 24, median: 12, interval: 22, unit: 8 };

function planetsBody(model: ViewModel, height: number): Body {
  const w = PLANET_WIDTHS;
  const heading: Line = [
    seg(
      "  " + fit("quantity", w.label) + fit("median", w.median, { align: "right" }) + "  " +
        fit("68% interval", w.interval) + fit("unit", w.unit),
      "strong",
    ),
  ];
  const row = (label: string, q: QuantityStats, unit: string): Line => {
    const f = formatSummary(q.summary.median, q.summary.lower, q.summary.upper);
    return [
      seg("  " + fit(label, w.label)),
      seg(fit(f.median, w.median, { align: "right" }) + "  ", "strong"),
      seg(fit(f.errors, w.interval)),
      seg(fit(unit, w.unit), "dim"),
    ];
  };
  const rows: Line[] = [];
  const room = Math.max(0, height - 3);
  let shown = 0;
  for (let i = model.planet; i < model.planets.length; i++) {
    const p = model.planets[i]!;
    const block: Line[] = [
      [seg(`planet ${p.name}`, "accent")],
      row("m sin i (lower limit)", p.msiniMjup, "M_Jup"),
      row("m sin i (lower limit)", p.msiniMearth, "M_Earth"),
      row("a (semi-major axis)", p.aAu, "au"),
      row("e (eccentricity)", p.eccentricity, ""),
    ];
    if (p.lambdaDeg) block.push(row("lambda (projected obl.)", p.lambdaDeg, "deg"));
    if (p.psiDeg) block.push(row("psi (3D obliquity)", p.psiDeg, "deg"));
    if (rows.length + block.length > room && shown > 0) break;
    rows.push(...block);
    shown++;
  }
  const note: Line[] = [];
  if (model.planets.length === 0) note.push([seg("No planets in this model", "dim")]);
  else {
    const range = `planets ${model.planet + 1}-${model.planet + shown} of ${model.planets.length}`;
    note.push([
      seg(
        "m sin i is a minimum mass: the orbit's inclination i is not known from RVs alone",
        "dim",
      ),
    ]);
    note.push([seg(`${range}  (j/k to scroll)`, "dim")]);
  }
  return { kind: "planets", heading, rows, note };
}

// ---------------------------------------------------------------- help

function helpLines(model: ViewModel): Line[] {
  const t = model.snapshot?.thresholds;
  const key = (k: string, what: string): Line => [seg("  " + fit(k, 26), "accent"), seg(what)];
  return [
    [seg("Keys", "strong")],
    key("1-5  tab  shift-tab", "switch view (left/right arrows too)"),
    key("j/k  up/down  PgUp/PgDn", "move the selected parameter (planet in view 5)"),
    key("g / G  Home / End", "first / last parameter"),
    key("x / X   y / Y", "next / previous parameter on the pair's x / y axis"),
    key("s", "swap the pair's axes"),
    key("p", "selected parameter on x, then open the pair view"),
    key("d", "pair view: shaded regions or braille dots"),
    key("?  Esc", "toggle / close this help"),
    key("q", "leave the dashboard; the run keeps going"),
    [seg("Marks (convergence view)", "strong")],
    [seg("  1.234~ near its threshold   1.234! fails it   ? not yet known")],
    [seg("  row mark: ok / warn / BAD / wait = the worst figure in the row")],
    [
      seg(
        t
          ? `  this run: R-hat <= ${t.rhat}, ESS bulk and tail >= ${t.essBulk}, steps/tau >= ${t.stepsPerTau}`
          : "  thresholds are read from the run",
      ),
    ],
    [seg("  converged=yes is a flag over these checks, never a proof of convergence", "dim")],
  ];
}
