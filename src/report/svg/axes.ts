/**
 * Scales, axes with ticks and labels, clipping, markers, error bars and
 * legends: the pieces every figure is built from.
 * @module
 */
import { esc, px, tag, text } from "./_svg.ts";
import { type MarkerShape, STYLE } from "./style.ts";
import {
  formatLogTick,
  formatTick,
  labelReference,
  logTicks,
  minorStep,
  MINUS,
  niceTicks,
} from "./ticks.ts";

/** Maps data values to pixels. */
export interface Scale {
  readonly kind: "linear" | "log";
  /** Data range. */
  readonly lo: number;
  readonly hi: number;
  /** Pixel positions of lo and hi (hi may be smaller, as for y axes). */
  readonly pxLo: number;
  readonly pxHi: number;
  map(value: number): number;
}

/** A linear scale; a zero-width data range maps to the middle. */
export function linearScale(lo: number, hi: number, pxLo: number, pxHi: number): Scale {
  const k = hi === lo ? 0 : (pxHi - pxLo) / (hi - lo);
  const mid = (pxLo + pxHi) / 2;
  return {
    kind: "linear",
    lo,
    hi,
    pxLo,
    pxHi,
    map: hi === lo ? () => mid : (v) => pxLo + (v - lo) * k,
  };
}

/** A base-10 logarithmic scale; values ≤ 0 map to NaN. Throws RangeError unless 0 < lo < hi. */
export function logScale(lo: number, hi: number, pxLo: number, pxHi: number): Scale {
  if (!(lo > 0) || !(hi > lo)) {
    throw new RangeError(
      `Cannot build log scale as the range must be positive: lo=${lo}, hi=${hi}`,
    );
  }
  const a = Math.log10(lo);
  const k = (pxHi - pxLo) / (Math.log10(hi) - a);
  return {
    kind: "log",
    lo,
    hi,
    pxLo,
    pxHi,
    map: (v) => (v > 0 ? pxLo + (Math.log10(v) - a) * k : NaN),
  };
}

/** One axis: its scale, ticks with their labels, and the axis title. */
export interface Axis {
  readonly scale: Scale;
  readonly ticks: readonly number[];
  readonly tickLabels: readonly string[];
  readonly minorTicks?: readonly number[];
  /** Axis title with unit, e.g. `RV [m/s]`. */
  readonly label?: string;
}

/** Options of {@link linearAxis}. */
export interface LinearAxisOptions {
  label?: string;
  /** Wanted number of ticks. @default 5 */
  count?: number;
  /** See {@link niceTicks}. @default "tight" */
  mode?: "loose" | "tight";
  /** Padding fraction for `tight`. @default 0.04 */
  pad?: number;
  /**
   * Value subtracted before labelling ticks (the label should say so), or
   * `auto`: a round value (see {@link labelReference}) when labels would
   * otherwise exceed 7 characters (see {@link autoReference}). @default 0
   */
  reference?: number | "auto";
}

/** The reference {@link linearAxis} uses for `reference: "auto"`. */
export function autoReference(
  range: readonly [number, number],
  options: Omit<LinearAxisOptions, "reference" | "label"> & { maxChars?: number } = {},
): number {
  const t = niceTicks(range[0], range[1], {
    count: options.count,
    mode: options.mode ?? "tight",
    pad: options.pad,
  });
  const longest = Math.max(...t.values.map((v) => formatTick(v, t.decimals).length));
  return longest > (options.maxChars ?? 7) ? labelReference(range[0], range[1], { ratio: 1 }) : 0;
}

/** A linear axis over the data range [lo, hi] drawn between pixels pxLo and pxHi. */
export function linearAxis(
  range: readonly [number, number],
  pixels: readonly [number, number],
  options: LinearAxisOptions = {},
): Axis {
  const ref = options.reference === "auto" ? autoReference(range, options) : options.reference ?? 0;
  const t = niceTicks(range[0] - ref, range[1] - ref, {
    count: options.count,
    mode: options.mode ?? "tight",
    pad: options.pad,
  });
  const minor: number[] = [];
  const ms = minorStep(t.step);
  for (let k = Math.ceil(t.lo / ms - 1e-9); k * ms <= t.hi + 1e-9 * ms; k++) {
    if (Math.abs(k * ms / t.step - Math.round(k * ms / t.step)) > 1e-6) minor.push(k * ms + ref);
  }
  return {
    scale: linearScale(t.lo + ref, t.hi + ref, pixels[0], pixels[1]),
    ticks: t.values.map((v) => v + ref),
    tickLabels: t.values.map((v) => formatTick(v, t.decimals)),
    minorTicks: minor,
    label: options.label,
  };
}

/**
 * A log axis over exactly [lo, hi] (both > 0) drawn between pixels, with the
 * ticks of {@link logTicks} that fall inside.
 */
export function logAxis(
  range: readonly [number, number],
  pixels: readonly [number, number],
  options: { label?: string } = {},
): Axis {
  const [lo, hi] = range[1] > range[0] ? range : [range[0] / 2, range[0] * 2];
  const t = logTicks(lo, hi);
  const inside = (v: number) => v >= lo * (1 - 1e-9) && v <= hi * (1 + 1e-9);
  const values = t.values.filter(inside);
  return {
    scale: logScale(lo, hi, pixels[0], pixels[1]),
    ticks: values,
    tickLabels: values.map(formatLogTick),
    minorTicks: t.minor.filter(inside),
    label: options.label,
  };
}

/** A rectangle in pixels. */
export interface Box {
  readonly x: number;
  readonly y: number;
  readonly width: number;
  readonly height: number;
}

/** Rough width in pixels of `s` set in the house sans-serif at `size` px. */
export function textWidth(s: string, size: number): number {
  return s.length * size * 0.58;
}

/** Options of {@link drawAxes}. */
export interface DrawAxesOptions {
  /** Title above the panel. */
  title?: string;
  /** Draw x tick labels and the x label. @default true */
  xLabels?: boolean;
  /** Draw y tick labels and the y label. @default true */
  yLabels?: boolean;
  /** Light grid lines at the major ticks. @default false */
  grid?: boolean;
  /** A thin dashed line at y = 0. @default false */
  zeroLine?: boolean;
  /** Gap between the y tick labels and the y title, px. @default fitted to the labels */
  yLabelOffset?: number;
  /** Title font size. @default STYLE.titleSize */
  titleSize?: number;
  /** Tick label font size. @default STYLE.tickSize */
  tickSize?: number;
  /** Axis-title font size. @default STYLE.labelSize */
  labelSize?: number;
}

/**
 * The frame of a panel: box, inward major and minor ticks on all four sides
 * (labels bottom and left only), tick labels, axis titles and the panel title.
 * Draw data first and this on top.
 */
export function drawAxes(
  box: Box,
  axes: { readonly x: Axis; readonly y: Axis },
  options: DrawAxesOptions = {},
): string {
  const out: string[] = [];
  const { x: ax, y: ay } = axes;
  const left = box.x;
  const right = box.x + box.width;
  const top = box.y;
  const bottom = box.y + box.height;
  const tl = STYLE.tickLength;
  const tickSize = options.tickSize ?? STYLE.tickSize;
  const labelSize = options.labelSize ?? STYLE.labelSize;
  const inside = (p: number, a: number, b: number) =>
    p >= Math.min(a, b) - 0.5 && p <= Math.max(a, b) + 0.5;
  if (options.grid) {
    const g: string[] = [];
    for (const v of ax.ticks) {
      const p = ax.scale.map(v);
      if (inside(p, left, right)) g.push(`M${px(p)} ${px(top)}V${px(bottom)}`);
    }
    for (const v of ay.ticks) {
      const p = ay.scale.map(v);
      if (inside(p, top, bottom)) g.push(`M${px(left)} ${px(p)}H${px(right)}`);
    }
    out.push(tag("path", { d: g.join(""), stroke: STYLE.grid, "stroke-width": 1, fill: "none" }));
  }
  if (options.zeroLine && ay.scale.kind === "linear") {
    const p = ay.scale.map(0);
    if (inside(p, top, bottom)) {
      out.push(
        tag("path", {
          d: `M${px(left)} ${px(p)}H${px(right)}`,
          stroke: STYLE.muted,
          "stroke-width": 0.8,
          "stroke-dasharray": "4 3",
          fill: "none",
        }),
      );
    }
  }
  const ticks: string[] = [];
  const addX = (vals: readonly number[], len: number) => {
    for (const v of vals) {
      const p = ax.scale.map(v);
      if (!inside(p, left, right)) continue;
      ticks.push(`M${px(p)} ${px(bottom)}v${-len}M${px(p)} ${px(top)}v${len}`);
    }
  };
  const addY = (vals: readonly number[], len: number) => {
    for (const v of vals) {
      const p = ay.scale.map(v);
      if (!inside(p, top, bottom)) continue;
      ticks.push(`M${px(left)} ${px(p)}h${len}M${px(right)} ${px(p)}h${-len}`);
    }
  };
  addX(ax.ticks, tl);
  addX(ax.minorTicks ?? [], tl * 0.55);
  addY(ay.ticks, tl);
  addY(ay.minorTicks ?? [], tl * 0.55);
  out.push(
    tag("path", { d: ticks.join(""), stroke: STYLE.frame, "stroke-width": 1, fill: "none" }),
  );
  out.push(
    tag("rect", {
      x: left,
      y: top,
      width: box.width,
      height: box.height,
      fill: "none",
      stroke: STYLE.frame,
      "stroke-width": 1,
    }),
  );
  if (options.xLabels ?? true) {
    const labels: string[] = [];
    ax.ticks.forEach((v, i) => {
      const p = ax.scale.map(v);
      if (!inside(p, left, right)) return;
      labels.push(tickText(p, bottom + tickSize + 5, ax.tickLabels[i]!, "middle", tickSize));
    });
    out.push(tag("g", { class: "x-tick-labels" }, labels.join("")));
    if (ax.label) {
      out.push(
        multiline((left + right) / 2, bottom + tickSize + labelSize + 14, ax.label, {
          "text-anchor": "middle",
          "font-size": labelSize,
          class: "x-label",
        }, labelSize * 1.2),
      );
    }
  }
  if (options.yLabels ?? true) {
    const labels: string[] = [];
    let widest = 0;
    ay.ticks.forEach((v, i) => {
      const p = ay.scale.map(v);
      if (!inside(p, top, bottom)) return;
      const s = ay.tickLabels[i]!;
      widest = Math.max(widest, textWidth(s, tickSize));
      labels.push(tickText(left - 5, p + tickSize * 0.35, s, "end", tickSize));
    });
    out.push(tag("g", { class: "y-tick-labels" }, labels.join("")));
    if (ay.label) {
      const gap = options.yLabelOffset ?? widest + 14;
      const lines = ay.label.split("\n").length;
      // Extra lines go towards the axis after the rotation, so start further out.
      const xx = left - gap - (lines - 1) * labelSize * 1.2;
      const yy = (top + bottom) / 2;
      out.push(
        multiline(xx, yy, ay.label, {
          "text-anchor": "middle",
          "font-size": labelSize,
          transform: `rotate(-90 ${px(xx)} ${px(yy)})`,
          class: "y-label",
        }, labelSize * 1.2),
      );
    }
  }
  if (options.title) {
    out.push(
      text((left + right) / 2, top - 10, options.title, {
        "text-anchor": "middle",
        "font-size": options.titleSize ?? STYLE.titleSize,
        "font-weight": "bold",
        class: "title",
      }),
    );
  }
  return tag("g", { class: "axes" }, out.join(""));
}

/** Text whose `\n`-separated lines are stacked `lineHeight` apart. */
function multiline(
  x: number,
  y: number,
  content: string,
  attrs: Record<string, string | number | undefined>,
  lineHeight: number,
): string {
  const lines = content.split("\n");
  if (lines.length === 1) return text(x, y, content, attrs);
  const spans = lines.map((l, i) =>
    tag("tspan", { x, dy: i === 0 ? undefined : lineHeight }, esc(l))
  ).join("");
  return tag("text", { x, y, ...attrs }, spans);
}

/** A tick label; "10^k" is typeset with a raised exponent. */
function tickText(x: number, y: number, s: string, anchor: string, size: number): string {
  const m = /^10\^(.+)$/.exec(s);
  if (m === null) return text(x, y, s, { "text-anchor": anchor, "font-size": size });
  const small = Math.round(size * 0.75);
  return tag(
    "text",
    { x, y, "text-anchor": anchor, "font-size": size },
    `10<tspan dy="${-Math.round(size * 0.4)}" font-size="${small}">${esc(m[1]!)}</tspan>`,
  );
}

/** A clip path for a panel's data (`url(#id)`). */
export function clipPathDef(id: string, box: Box): string {
  return tag(
    "clipPath",
    { id },
    tag("rect", { x: box.x, y: box.y, width: box.width, height: box.height }),
  );
}

/** One marker centred at (x, y), `size` px across. */
export function marker(
  shape: MarkerShape,
  x: number,
  y: number,
  size: number,
  style: { fill: string; stroke?: string; opacity?: number },
): string {
  const r = size / 2;
  const attrs = {
    fill: style.fill,
    stroke: style.stroke ?? "#ffffff",
    "stroke-width": 0.6,
    "fill-opacity": style.opacity,
  };
  switch (shape) {
    case "circle":
      return tag("circle", { cx: x, cy: y, r, ...attrs });
    case "square":
      return tag("rect", {
        x: x - r * 0.9,
        y: y - r * 0.9,
        width: 1.8 * r,
        height: 1.8 * r,
        ...attrs,
      });
    case "triangle":
      return tag("path", {
        d: `M${px(x)} ${px(y - 1.15 * r)}L${px(x + r)} ${px(y + 0.6 * r)}L${px(x - r)} ${
          px(y + 0.6 * r)
        }Z`,
        ...attrs,
      });
    case "triangle-down":
      return tag("path", {
        d: `M${px(x)} ${px(y + 1.15 * r)}L${px(x + r)} ${px(y - 0.6 * r)}L${px(x - r)} ${
          px(y - 0.6 * r)
        }Z`,
        ...attrs,
      });
    case "diamond":
      return tag("path", {
        d: `M${px(x)} ${px(y - 1.2 * r)}L${px(x + r)} ${px(y)}L${px(x)} ${px(y + 1.2 * r)}L${
          px(x - r)
        } ${px(y)}Z`,
        ...attrs,
      });
  }
}

/**
 * Vertical error bars as one path: `inner` half-lengths drawn solid (the
 * reported errors), `outer` ones (errors with jitter) drawn lighter.
 */
export function errorBars(
  xs: ArrayLike<number>,
  ys: ArrayLike<number>,
  bars: { inner: ArrayLike<number>; outer?: ArrayLike<number> },
  scales: { x: Scale; y: Scale },
  style: { colour: string },
): string {
  const inner: string[] = [];
  const outer: string[] = [];
  for (let i = 0; i < xs.length; i++) {
    const x = scales.x.map(xs[i]!);
    const y = ys[i]!;
    if (!Number.isFinite(x) || !Number.isFinite(y)) continue;
    const e = bars.inner[i]!;
    if (Number.isFinite(e) && e > 0) {
      inner.push(`M${px(x)} ${px(scales.y.map(y - e))}V${px(scales.y.map(y + e))}`);
    }
    const o = bars.outer?.[i];
    if (o !== undefined && Number.isFinite(o) && o > e) {
      outer.push(`M${px(x)} ${px(scales.y.map(y - o))}V${px(scales.y.map(y + o))}`);
    }
  }
  const parts: string[] = [];
  if (outer.length > 0) {
    parts.push(
      tag("path", {
        d: outer.join(""),
        stroke: style.colour,
        "stroke-width": 1,
        "stroke-opacity": 0.4,
        fill: "none",
      }),
    );
  }
  if (inner.length > 0) {
    parts.push(
      tag("path", { d: inner.join(""), stroke: style.colour, "stroke-width": 1.2, fill: "none" }),
    );
  }
  return parts.join("");
}

/** One legend row. */
export interface LegendEntry {
  readonly label: string;
  readonly kind: "marker" | "line" | "dashed" | "band";
  readonly colour: string;
  readonly shape?: MarkerShape;
}

/** A legend in a corner of `box`, on a white card. */
export function legend(
  entries: readonly LegendEntry[],
  box: Box,
  options: { corner?: "top-right" | "top-left" | "bottom-right" | "bottom-left" } = {},
): string {
  if (entries.length === 0) return "";
  const size = STYLE.legendSize;
  const row = size + 6;
  const keyW = 22;
  const width = keyW + 10 + Math.max(...entries.map((e) => textWidth(e.label, size))) + 10;
  const height = entries.length * row + 8;
  const corner = options.corner ?? "top-right";
  const x0 = corner.endsWith("right") ? box.x + box.width - width - 6 : box.x + 6;
  const y0 = corner.startsWith("top") ? box.y + 6 : box.y + box.height - height - 6;
  const out: string[] = [
    tag("rect", {
      x: x0,
      y: y0,
      width,
      height,
      rx: 3,
      fill: "#ffffff",
      "fill-opacity": 0.88,
      stroke: "#bbbbbb",
      "stroke-width": 0.8,
    }),
  ];
  entries.forEach((e, i) => {
    const cy = y0 + 4 + row * i + row / 2;
    const kx = x0 + 8;
    out.push(legendKey(e, kx, cy, keyW));
    out.push(text(kx + keyW + 8, cy + size * 0.35, e.label, { "font-size": size }));
  });
  return tag("g", { class: "legend" }, out.join(""));
}

/**
 * A legend laid out in rows starting at (x, y) (top-left), wrapping at
 * `maxWidth`; returns the SVG and the height used.
 */
export function legendRow(
  entries: readonly LegendEntry[],
  x: number,
  y: number,
  maxWidth: number,
): { svg: string; height: number } {
  if (entries.length === 0) return { svg: "", height: 0 };
  const size = STYLE.legendSize;
  const keyW = 20;
  const row = size + 8;
  const out: string[] = [];
  let cx = x;
  let cy = y + row / 2;
  for (const e of entries) {
    const w = keyW + 6 + textWidth(e.label, size) + 18;
    if (cx > x && cx + w > x + maxWidth) {
      cx = x;
      cy += row;
    }
    out.push(legendKey(e, cx, cy, keyW));
    out.push(text(cx + keyW + 6, cy + size * 0.35, e.label, { "font-size": size }));
    cx += w;
  }
  return { svg: tag("g", { class: "legend" }, out.join("")), height: cy - y + row / 2 };
}

function legendKey(e: LegendEntry, kx: number, cy: number, keyW: number): string {
  switch (e.kind) {
    case "marker":
      return marker(e.shape ?? "circle", kx + keyW / 2, cy, STYLE.markerSize + 1, {
        fill: e.colour,
      });
    case "line":
    case "dashed":
      return tag("path", {
        d: `M${px(kx)} ${px(cy)}h${keyW}`,
        stroke: e.colour,
        "stroke-width": 1.6,
        "stroke-dasharray": e.kind === "dashed" ? "5 3" : undefined,
        fill: "none",
      });
    case "band":
      return tag("rect", {
        x: kx,
        y: cy - 5,
        width: keyW,
        height: 10,
        fill: e.colour,
        "fill-opacity": STYLE.bandOpacity,
      });
  }
}

/**
 * The heading of a figure centred at `cx`: a bold title at the top and an
 * optional muted subtitle under it. `bottom` is the first free y below.
 */
export function figureHeading(
  cx: number,
  title: string,
  subtitle?: string,
): { svg: string; bottom: number } {
  const parts = [
    text(cx, 24, title, {
      "text-anchor": "middle",
      "font-size": STYLE.titleSize,
      "font-weight": "bold",
      class: "title",
    }),
  ];
  if (subtitle) {
    parts.push(
      text(cx, 43, subtitle, {
        "text-anchor": "middle",
        "font-size": STYLE.labelSize - 1,
        fill: STYLE.muted,
        class: "subtitle",
      }),
    );
  }
  return { svg: parts.join(""), bottom: subtitle ? 50 : 32 };
}

/** `label [unit]`, or the label alone when the unit is empty. */
export function withUnit(label: string, unit: string): string {
  return unit ? `${label} [${unit}]` : label;
}

/** Label of an axis whose ticks are offset by `reference`: `Time − 2460000 [d]`. */
export function offsetLabel(label: string, reference: number, unit: string): string {
  if (reference === 0) return withUnit(label, unit);
  const sign = reference < 0 ? "+" : MINUS;
  return withUnit(`${label} ${sign} ${String(Math.abs(reference))}`, unit);
}
