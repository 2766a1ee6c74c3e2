/**
 * Figure: a periodogram (power against period on a log axis) with marked
 * periods and false-alarm levels.
 * @module
 */
import { type Box, clipPathDef, drawAxes, figureHeading, linearAxis, logAxis } from "./axes.ts";
import { linePath, px, svgDocument, tag, text } from "./_svg.ts";
import { OKABE_ITO, seriesColour, STYLE } from "./style.ts";

/** Inputs of {@link periodogramFigure}. */
export interface PeriodogramFigureInput {
  readonly title?: string;
  readonly subtitle?: string;
  /** Periods, days (> 0), any order matching `power`. */
  readonly period: ArrayLike<number>;
  readonly power: ArrayLike<number>;
  /** Axis title of the power. @default "GLS power" */
  readonly powerLabel?: string;
  /** Periods to mark with a labelled vertical line (e.g. the fitted planets). */
  readonly marks?: readonly { readonly period: number; readonly label: string }[];
  /** Horizontal levels, e.g. false-alarm probabilities. */
  readonly levels?: readonly { readonly power: number; readonly label: string }[];
}

/** The periodogram as an SVG document. Throws RangeError when no period is positive and finite. */
export function periodogramFigure(
  input: PeriodogramFigureInput,
  options: { width?: number; height?: number } = {},
): string {
  const width = options.width ?? 760;
  const h = options.height ?? 300;
  const margin = { left: 78, right: 22, top: input.subtitle ? 62 : 44, bottom: 56 };
  const box: Box = {
    x: margin.left,
    y: margin.top,
    width: width - margin.left - margin.right,
    height: h,
  };
  const height = margin.top + h + margin.bottom;
  let pLo = Infinity;
  let pHi = -Infinity;
  let yHi = 0;
  for (let i = 0; i < input.period.length; i++) {
    const p = input.period[i]!;
    if (p > 0 && Number.isFinite(p)) {
      pLo = Math.min(pLo, p);
      pHi = Math.max(pHi, p);
    }
    const y = input.power[i]!;
    if (Number.isFinite(y)) yHi = Math.max(yHi, y);
  }
  if (!(pLo <= pHi)) {
    throw new RangeError(
      `Cannot draw periodogram as no period is positive: count=${input.period.length}`,
    );
  }
  for (const l of input.levels ?? []) if (Number.isFinite(l.power)) yHi = Math.max(yHi, l.power);
  if (!(yHi > 0)) yHi = 1;
  const x = logAxis([pLo, pHi], [box.x, box.x + box.width], { label: "Period [d]" });
  const y = linearAxis([0, yHi * 1.08], [box.y + box.height, box.y], {
    label: input.powerLabel ?? "GLS power",
    mode: "loose",
  });
  // Sort by period so the line runs left to right.
  const order = Array.from({ length: input.period.length }, (_, i) => i).sort((a, b) =>
    input.period[a]! - input.period[b]!
  );
  const xs = order.map((i) => input.period[i]!);
  const ys = order.map((i) => input.power[i]!);
  const clip = "periodogram-clip";
  const body: string[] = [];
  (input.levels ?? []).forEach((l) => {
    if (!Number.isFinite(l.power)) return;
    const yy = y.scale.map(l.power);
    body.push(
      tag("path", {
        d: `M${px(box.x)} ${px(yy)}H${px(box.x + box.width)}`,
        stroke: STYLE.muted,
        "stroke-width": 1,
        "stroke-dasharray": "2 3",
        fill: "none",
      }),
    );
  });
  (input.marks ?? []).forEach((m, k) => {
    const xx = x.scale.map(m.period);
    if (!Number.isFinite(xx)) return;
    body.push(
      tag("path", {
        d: `M${px(xx)} ${px(box.y)}V${px(box.y + box.height)}`,
        stroke: seriesColour(k + 1),
        "stroke-width": 1.2,
        "stroke-dasharray": "6 4",
        fill: "none",
      }),
    );
  });
  body.push(
    tag("path", {
      d: linePath(xs, ys, x.scale.map, y.scale.map),
      stroke: OKABE_ITO.blue,
      "stroke-width": 1,
      fill: "none",
      class: "power",
    }),
  );
  const out: string[] = [tag("defs", {}, clipPathDef(clip, box))];
  out.push(tag("g", { "clip-path": `url(#${clip})` }, body.join("")));
  out.push(drawAxes(box, { x, y }));
  out.push(figureHeading(box.x + box.width / 2, input.title ?? "Periodogram", input.subtitle).svg);
  (input.levels ?? []).forEach((l) => {
    if (!Number.isFinite(l.power)) return;
    out.push(
      text(box.x + box.width - 4, y.scale.map(l.power) - 4, l.label, {
        "text-anchor": "end",
        "font-size": STYLE.legendSize,
        fill: STYLE.muted,
      }),
    );
  });
  (input.marks ?? []).forEach((m, k) => {
    const xx = x.scale.map(m.period);
    if (!Number.isFinite(xx) || xx < box.x || xx > box.x + box.width) return;
    out.push(
      text(xx + 4, box.y + 14, m.label, {
        "font-size": STYLE.legendSize,
        fill: seriesColour(k + 1),
        "font-weight": "bold",
      }),
    );
  });
  return svgDocument(width, height, out.join("\n"), { title: input.title ?? "Periodogram" });
}
