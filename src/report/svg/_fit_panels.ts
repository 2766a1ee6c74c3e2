/**
 * The layout shared by the RV, phase-folded and RM figures (private to
 * `src/report/svg/`): a data panel with the posterior model band, and a
 * residual panel below it on the same x axis.
 * @module
 */
import {
  type Axis,
  type Box,
  clipPathDef,
  drawAxes,
  errorBars,
  type LegendEntry,
  legendRow,
  linearAxis,
  marker,
  textWidth,
} from "./axes.ts";
import { bandPath, linePath, px, svgDocument, tag, text } from "./_svg.ts";
import { seriesColour, seriesShape, STYLE } from "./style.ts";
import type { DataSeries, ModelBand, ModelLine } from "./types.ts";

/** What a fit figure shows. */
export interface FitPanelsSpec {
  readonly id: string;
  readonly title: string;
  readonly subtitle?: string;
  readonly xAxis: (pixels: readonly [number, number]) => Axis;
  readonly yLabel: string;
  readonly residualLabel: string;
  readonly series: readonly DataSeries[];
  readonly band?: ModelBand;
  readonly bandLabel: string;
  readonly medianLabel: string;
  readonly lines?: readonly ModelLine[];
  /** Vertical guide lines (x value, short label). */
  readonly guides?: readonly { readonly x: number; readonly label?: string }[];
  readonly width: number;
  readonly height: number;
  readonly residualHeight: number;
  /** Note under the figure (what the error bars are). */
  readonly note?: string;
}

/** Range of finite values of several arrays, each optionally ± a half-width. */
export function extent(
  parts: readonly { v: ArrayLike<number>; pm?: ArrayLike<number> }[],
): [number, number] {
  let lo = Infinity;
  let hi = -Infinity;
  for (const { v, pm } of parts) {
    for (let i = 0; i < v.length; i++) {
      const e = pm?.[i] ?? 0;
      const a = v[i]! - (Number.isFinite(e) ? e : 0);
      const b = v[i]! + (Number.isFinite(e) ? e : 0);
      if (Number.isFinite(a) && a < lo) lo = a;
      if (Number.isFinite(b) && b > hi) hi = b;
    }
  }
  if (!(lo <= hi)) return [-1, 1];
  return [lo, hi];
}

/** The figure as an SVG document. */
export function fitPanels(spec: FitPanelsSpec): string {
  const width = spec.width;
  const left = 78;
  const right = 22;
  const plotW = width - left - right;
  const entries: LegendEntry[] = spec.series.map((s, k) => ({
    label: s.name,
    kind: "marker",
    colour: seriesColour(s.styleIndex ?? k),
    shape: seriesShape(s.styleIndex ?? k),
  }));
  if (spec.band) {
    entries.push({ label: spec.medianLabel, kind: "line", colour: STYLE.model });
    entries.push({ label: spec.bandLabel, kind: "band", colour: STYLE.band });
  }
  for (const l of spec.lines ?? []) {
    if (l.label) {
      entries.push({
        label: l.label,
        kind: l.dashed ? "dashed" : "line",
        colour: l.colour ?? STYLE.model,
      });
    }
  }
  // Title, subtitle and a legend row above the data panel.
  const titleY = 24;
  const subtitleY = spec.subtitle ? 43 : titleY;
  const legendTop = subtitleY + 10;
  const legendBlock = legendRow(entries, left, legendTop, plotW);
  const margin = {
    left,
    right,
    top: legendTop + legendBlock.height + 8,
    bottom: spec.note ? 72 : 56,
  };
  const top: Box = { x: margin.left, y: margin.top, width: plotW, height: spec.height };
  const bottom: Box = {
    x: margin.left,
    y: margin.top + spec.height,
    width: plotW,
    height: spec.residualHeight,
  };
  const height = margin.top + spec.height + spec.residualHeight + margin.bottom;
  const x = spec.xAxis([top.x, top.x + top.width]);
  const errs = (s: DataSeries) => s.errorWithJitter ?? s.error;
  const yRange = extent([
    ...spec.series.map((s) => ({ v: s.y, pm: errs(s) })),
    ...(spec.band ? [{ v: spec.band.lo }, { v: spec.band.hi }, { v: spec.band.median }] : []),
    ...(spec.lines ?? []).map((l) => ({ v: l.y })),
  ]);
  const y = linearAxis(yRange, [top.y + top.height, top.y], {
    label: spec.yLabel,
    mode: "tight",
    pad: 0.06,
  });
  let rMax = 0;
  for (const s of spec.series) {
    const e = errs(s);
    for (let i = 0; i < s.residual.length; i++) {
      const r = Math.abs(s.residual[i]!) + (Number.isFinite(e[i]!) ? e[i]! : 0);
      if (Number.isFinite(r) && r > rMax) rMax = r;
    }
  }
  if (!(rMax > 0)) rMax = 1;
  const yr = linearAxis([-rMax, rMax], [bottom.y + bottom.height, bottom.y], {
    label: spec.residualLabel,
    mode: "tight",
    pad: 0.08,
    count: 3,
  });
  const xs = x.scale;
  const clipTop = `${spec.id}-clip-top`;
  const clipBottom = `${spec.id}-clip-bottom`;
  const out: string[] = [];
  out.push(tag("defs", {}, clipPathDef(clipTop, top) + clipPathDef(clipBottom, bottom)));

  // Data panel: band, guides, model lines, error bars, markers.
  const data: string[] = [];
  const sy = y.scale;
  if (spec.band) {
    const b = spec.band;
    data.push(
      tag("path", {
        d: bandPath(b.x, b.lo, b.hi, xs.map, sy.map),
        fill: STYLE.band,
        "fill-opacity": STYLE.bandOpacity,
        stroke: "none",
        class: "model-band",
      }),
    );
  }
  for (const g of spec.guides ?? []) {
    const gx = xs.map(g.x);
    data.push(
      tag("path", {
        d: `M${px(gx)} ${px(top.y)}V${px(top.y + top.height)}`,
        stroke: STYLE.muted,
        "stroke-width": 0.8,
        "stroke-dasharray": "2 3",
        fill: "none",
      }),
    );
  }
  for (const l of spec.lines ?? []) {
    data.push(
      tag("path", {
        d: linePath(l.x, l.y, xs.map, sy.map),
        stroke: l.colour ?? STYLE.model,
        "stroke-width": 1.3,
        "stroke-dasharray": l.dashed ? "6 4" : undefined,
        fill: "none",
      }),
    );
  }
  if (spec.band) {
    data.push(
      tag("path", {
        d: linePath(spec.band.x, spec.band.median, xs.map, sy.map),
        stroke: STYLE.model,
        "stroke-width": 1.5,
        fill: "none",
        class: "model-median",
      }),
    );
  }
  spec.series.forEach((s, k) => {
    const colour = seriesColour(s.styleIndex ?? k);
    data.push(errorBars(s.x, s.y, { inner: s.error, outer: s.errorWithJitter }, { x: xs, y: sy }, {
      colour,
    }));
    const marks: string[] = [];
    for (let i = 0; i < s.x.length; i++) {
      const mx = xs.map(s.x[i]!);
      const my = sy.map(s.y[i]!);
      if (Number.isFinite(mx) && Number.isFinite(my)) {
        marks.push(
          marker(seriesShape(s.styleIndex ?? k), mx, my, STYLE.markerSize, { fill: colour }),
        );
      }
    }
    data.push(tag("g", { class: "data" }, marks.join("")));
  });
  out.push(tag("g", { "clip-path": `url(#${clipTop})` }, data.join("")));
  // One offset for both y titles so they line up.
  const widest = (a: Axis) => Math.max(0, ...a.tickLabels.map((l) => textWidth(l, STYLE.tickSize)));
  const yLabelOffset = Math.max(widest(y), widest(yr)) + 14;
  out.push(drawAxes(top, { x, y }, { xLabels: false, yLabelOffset }));
  out.push(
    text(top.x + top.width / 2, titleY, spec.title, {
      "text-anchor": "middle",
      "font-size": STYLE.titleSize,
      "font-weight": "bold",
      class: "title",
    }),
  );
  out.push(legendBlock.svg);
  for (const g of spec.guides ?? []) {
    if (!g.label) continue;
    out.push(
      text(xs.map(g.x) + 3, top.y + 12, g.label, {
        "font-size": STYLE.legendSize - 1,
        fill: STYLE.muted,
      }),
    );
  }
  if (spec.subtitle) {
    out.push(
      text(top.x + top.width / 2, subtitleY, spec.subtitle, {
        "text-anchor": "middle",
        "font-size": STYLE.labelSize - 1,
        fill: STYLE.muted,
      }),
    );
  }

  // Residual panel.
  const res: string[] = [];
  const ry = yr.scale;
  spec.series.forEach((s, k) => {
    const colour = seriesColour(s.styleIndex ?? k);
    res.push(errorBars(s.x, s.residual, { inner: s.error, outer: s.errorWithJitter }, {
      x: xs,
      y: ry,
    }, { colour }));
    const marks: string[] = [];
    for (let i = 0; i < s.x.length; i++) {
      const mx = xs.map(s.x[i]!);
      const my = ry.map(s.residual[i]!);
      if (Number.isFinite(mx) && Number.isFinite(my)) {
        marks.push(
          marker(seriesShape(s.styleIndex ?? k), mx, my, STYLE.markerSize - 1, { fill: colour }),
        );
      }
    }
    res.push(marks.join(""));
  });
  out.push(tag("g", { "clip-path": `url(#${clipBottom})` }, res.join("")));
  out.push(drawAxes(bottom, { x, y: yr }, { zeroLine: true, yLabelOffset }));

  if (spec.note) {
    out.push(
      text(margin.left, height - 12, spec.note, {
        "font-size": STYLE.legendSize - 1,
        fill: STYLE.muted,
        class: "note",
      }),
    );
  }
  return svgDocument(width, height, out.join("\n"), { title: spec.title });
}
