/**
 * Figure: a corner plot — 1-D marginal histograms on the diagonal and 2-D
 * highest-density contours (68% and 95%) of every pair below it.
 * @module
 */
import { roundByUncertainty } from "../rounding.ts";
import { quantileSorted } from "../quantiles.ts";
import {
  autoReference,
  type Axis,
  type Box,
  clipPathDef,
  drawAxes,
  linearAxis,
  linearScale,
  offsetLabel,
  textWidth,
} from "./axes.ts";
import { contourLines, histogram1d, histogram2d, hpdLevels, smoothGrid } from "./contour.ts";
import { px, svgDocument, tag, text } from "./_svg.ts";
import { OKABE_ITO, STYLE } from "./style.ts";
import { MINUS } from "./ticks.ts";

/** One parameter of the corner plot. */
export interface CornerParameter {
  readonly key: string;
  readonly unit: string;
  readonly draws: ArrayLike<number>;
  /** A reference value to mark (e.g. a planted truth). */
  readonly truth?: number;
}

/** Options of {@link cornerFigure}. */
export interface CornerFigureOptions {
  /** Side of one panel, px. @default fitted to the number of parameters (110–170) */
  cell?: number;
  /** Bins of the 1-D histograms. @default 40 */
  bins1d?: number;
  /** Bins along each axis of the 2-D histograms. @default 30 */
  bins2d?: number;
  /** Gaussian smoothing of the 2-D histograms, in bins. @default 1 */
  smooth?: number;
  /** Highest-density mass fractions to contour. @default [0.68, 0.95] */
  levels?: readonly number[];
  /** @default "Posterior: marginal and joint distributions" */
  title?: string;
}

/**
 * The corner plot of `parameters` (draws aligned across parameters).
 *
 * Method: each axis spans the 0.5–99.5% quantiles of its draws, widened by 8%
 * (and to include a truth); 2-D densities are histograms with two empty bins
 * of margin (so every contour closes), lightly smoothed, contoured at their
 * highest-density levels by marching squares (see `contour.ts`).
 * Throws RangeError for no parameters or draws of unequal length.
 */
export function cornerFigure(
  parameters: readonly CornerParameter[],
  options: CornerFigureOptions = {},
): string {
  const k = parameters.length;
  if (k === 0) throw new RangeError("Cannot draw corner plot as no parameters were given: count=0");
  const n = parameters[0]!.draws.length;
  for (const p of parameters) {
    if (p.draws.length !== n) {
      throw new RangeError(
        `Cannot draw corner plot as draws differ in length: ${
          parameters[0]!.key
        }=${n}, ${p.key}=${p.draws.length}`,
      );
    }
  }
  const cell = options.cell ?? Math.max(110, Math.min(170, Math.floor(640 / k)));
  const gap = 8;
  const tickSize = cell < 130 ? 9 : 10;
  const labelSize = 11;
  const margin = { left: 96, right: 24, top: 104, bottom: 88 };
  const width = Math.max(480, margin.left + k * cell + (k - 1) * gap + margin.right);
  const height = margin.top + k * cell + (k - 1) * gap + margin.bottom;
  const fractions = options.levels ?? [0.68, 0.95];
  const bins1 = options.bins1d ?? 40;
  const bins2 = options.bins2d ?? 30;
  const smooth = options.smooth ?? 1;
  const ticksWanted = cell < 140 ? 3 : 4;

  // Per-parameter range, label reference and summary.
  const info = parameters.map((p) => {
    const sorted = Float64Array.from(p.draws).filter((v) => Number.isFinite(v)).sort();
    let lo = quantileSorted(sorted, 0.005);
    let hi = quantileSorted(sorted, 0.995);
    if (p.truth !== undefined && Number.isFinite(p.truth)) {
      lo = Math.min(lo, p.truth);
      hi = Math.max(hi, p.truth);
    }
    if (!(hi > lo)) {
      const w = Number.isFinite(lo) && lo !== 0 ? Math.abs(lo) * 1e-6 : 1;
      lo = (Number.isFinite(lo) ? lo : 0) - w;
      hi = (Number.isFinite(hi) ? hi : 0) + w;
    }
    const pad = 0.08 * (hi - lo);
    lo -= pad;
    hi += pad;
    const ref = autoReference([lo, hi], {
      mode: "tight",
      pad: 0,
      count: ticksWanted,
      maxChars: Math.max(5, Math.floor(cell / (ticksWanted * tickSize * 0.58))),
    });
    const median = quantileSorted(sorted, 0.5);
    const q16 = quantileSorted(sorted, 0.16);
    const q84 = quantileSorted(sorted, 0.84);
    // Split "key − ref [unit]" over two lines when wider than a panel.
    let label = offsetLabel(p.key, ref, p.unit);
    if (textWidth(label, labelSize) > cell + gap - 4 && p.unit) {
      label = label.replace(/ \[/, "\n[");
    }
    return { lo, hi, ref, median, q16, q84, label };
  });
  const boxOf = (row: number, col: number): Box => ({
    x: margin.left + col * (cell + gap),
    y: margin.top + row * (cell + gap),
    width: cell,
    height: cell,
  });
  const axisFor = (i: number, pixels: readonly [number, number]): Axis => {
    const a = linearAxis([info[i]!.lo, info[i]!.hi], pixels, {
      reference: info[i]!.ref,
      mode: "tight",
      pad: 0,
      count: ticksWanted,
      label: info[i]!.label,
    });
    // Keep the range exactly as chosen (tight mode with pad 0 already does).
    return a;
  };
  const out: string[] = [];
  const defs: string[] = [];
  // Common offset of the y titles in the left column.
  let yGap = 0;
  for (let i = 1; i < k; i++) {
    const b = boxOf(i, 0);
    const a = axisFor(i, [b.y + b.height, b.y]);
    for (const l of a.tickLabels) yGap = Math.max(yGap, l.length * tickSize * 0.58);
  }
  yGap += 12;

  for (let i = 0; i < k; i++) {
    for (let j = 0; j <= i; j++) {
      const b = boxOf(i, j);
      const clip = `corner-clip-${i}-${j}`;
      defs.push(clipPathDef(clip, b));
      const x = axisFor(j, [b.x, b.x + b.width]);
      const body: string[] = [];
      if (i === j) {
        const h = histogram1d(parameters[i]!.draws, [info[i]!.lo, info[i]!.hi], { bins: bins1 });
        let max = 0;
        for (const c of h) max = Math.max(max, c);
        const ys = linearScale(0, 1.12, b.y + b.height, b.y);
        const w = (info[i]!.hi - info[i]!.lo) / bins1;
        let d = `M${px(x.scale.map(info[i]!.lo))} ${px(ys.map(0))}`;
        for (let m = 0; m < bins1; m++) {
          const yv = ys.map(max > 0 ? h[m]! / max : 0);
          d += `V${px(yv)}H${px(x.scale.map(info[i]!.lo + (m + 1) * w))}`;
        }
        d += `V${px(ys.map(0))}Z`;
        body.push(
          tag("path", {
            d,
            fill: OKABE_ITO.blue,
            "fill-opacity": 0.18,
            stroke: OKABE_ITO.blue,
            "stroke-width": 1.2,
            class: "histogram",
          }),
        );
        const vline = (v: number, dash?: string, colour: string = STYLE.ink) =>
          Number.isFinite(v)
            ? tag("path", {
              d: `M${px(x.scale.map(v))} ${px(b.y)}V${px(b.y + b.height)}`,
              stroke: colour,
              "stroke-width": 1,
              "stroke-dasharray": dash,
              fill: "none",
            })
            : "";
        body.push(vline(info[i]!.median));
        body.push(vline(info[i]!.q16, "4 3"));
        body.push(vline(info[i]!.q84, "4 3"));
        const t = parameters[i]!.truth;
        if (t !== undefined) body.push(vline(t, undefined, OKABE_ITO.vermillion));
        out.push(tag("g", { "clip-path": `url(#${clip})` }, body.join("")));
        const yDummy = {
          ...axisFor(i, [b.y + b.height, b.y]),
          ticks: [],
          tickLabels: [],
          label: undefined,
        };
        out.push(
          drawAxes(b, { x, y: yDummy }, {
            xLabels: i === k - 1,
            yLabels: false,
            tickSize,
            labelSize,
          }),
        );
        // Name and value above the panel.
        const r = roundByUncertainty(
          info[i]!.median,
          info[i]!.median - info[i]!.q16,
          info[i]!.q84 - info[i]!.median,
        );
        const value = r.minus === r.plus
          ? `${r.value.replace(/^-/, MINUS)} ± ${r.minus}`
          : `${r.value.replace(/^-/, MINUS)} +${r.plus} ${MINUS}${r.minus}`;
        // One line when it fits over the panel, else the median and the errors on two.
        const unit = parameters[i]!.unit ? " " + parameters[i]!.unit : "";
        const whole = `${value}${unit}`;
        const lines = textWidth(whole, tickSize) <= cell + gap
          ? [whole]
          : [r.value.replace(/^-/, MINUS), `${value.slice(value.indexOf(" ") + 1)}${unit}`];
        out.push(
          text(b.x + b.width / 2, b.y - 5 - 13 * lines.length, parameters[i]!.key, {
            "text-anchor": "middle",
            "font-size": labelSize,
            "font-weight": "bold",
          }),
        );
        lines.forEach((line, m) => {
          out.push(
            text(b.x + b.width / 2, b.y - 5 - 13 * (lines.length - 1 - m), line, {
              "text-anchor": "middle",
              "font-size": tickSize,
              class: "value",
            }),
          );
        });
      } else {
        const y = axisFor(i, [b.y + b.height, b.y]);
        const grid = smoothGrid(
          histogram2d({ x: parameters[j]!.draws, y: parameters[i]!.draws }, {
            x: [info[j]!.lo, info[j]!.hi],
            y: [info[i]!.lo, info[i]!.hi],
          }, { bins: [bins2, bins2], margin: 2 }),
          smooth,
        );
        const levels = hpdLevels(grid.values, fractions);
        // Widest region first so the denser one is painted over it.
        const order = fractions.map((f, m) => ({ f, level: levels[m]! })).sort((a, c) => c.f - a.f);
        order.forEach(({ level }, m) => {
          if (!(level > 0)) return;
          const lines = contourLines(grid, level);
          let d = "";
          for (const line of lines) {
            for (let q = 0; q + 1 < line.length; q += 2) {
              d += `${q === 0 ? "M" : "L"}${px(x.scale.map(line[q]!))} ${
                px(y.scale.map(line[q + 1]!))
              }`;
            }
            d += "Z";
          }
          body.push(
            tag("path", {
              d,
              fill: OKABE_ITO.blue,
              "fill-opacity": m === order.length - 1 ? 0.45 : 0.18,
              "fill-rule": "evenodd",
              stroke: OKABE_ITO.blue,
              "stroke-width": 1.1,
              class: "contour",
            }),
          );
        });
        const med = tag("circle", {
          cx: x.scale.map(info[j]!.median),
          cy: y.scale.map(info[i]!.median),
          r: 2.2,
          fill: STYLE.ink,
        });
        body.push(med);
        const tx = parameters[j]!.truth;
        const ty = parameters[i]!.truth;
        if (tx !== undefined && ty !== undefined) {
          body.push(
            tag("path", {
              d: `M${px(x.scale.map(tx))} ${px(b.y)}V${px(b.y + b.height)}M${px(b.x)} ${
                px(y.scale.map(ty))
              }H${px(b.x + b.width)}`,
              stroke: OKABE_ITO.vermillion,
              "stroke-width": 1,
              fill: "none",
            }),
          );
        }
        out.push(tag("g", { "clip-path": `url(#${clip})` }, body.join("")));
        out.push(
          drawAxes(b, { x, y }, {
            xLabels: i === k - 1,
            yLabels: j === 0,
            tickSize,
            labelSize,
            yLabelOffset: yGap,
          }),
        );
      }
    }
  }
  const title = options.title ?? "Posterior: marginal and joint distributions";
  out.push(
    text(width / 2, 24, title, {
      "text-anchor": "middle",
      "font-size": STYLE.titleSize,
      "font-weight": "bold",
      class: "title",
    }),
  );
  const pct = fractions.map((f) => `${Math.round(f * 100)}%`).join(" and ");
  const hasTruth = parameters.some((p) => p.truth !== undefined);
  const notes = [
    `Contours: ${pct} highest-density regions${hasTruth ? "; red: reference values" : ""}`,
    "Dot and solid line: median; dashed: 16th and 84th percentiles",
  ];
  notes.forEach((note, m) => {
    out.push(
      text(width / 2, 44 + 15 * m, note, {
        "text-anchor": "middle",
        "font-size": STYLE.legendSize,
        fill: STYLE.muted,
        class: "note",
      }),
    );
  });
  return svgDocument(width, height, tag("defs", {}, defs.join("")) + "\n" + out.join("\n"), {
    title,
  });
}
