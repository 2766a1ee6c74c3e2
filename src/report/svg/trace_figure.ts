/**
 * Figure: traces of the log-posterior and chosen parameters against step, one
 * line per walker, with the burn-in shaded.
 * @module
 */
import { quantileSorted } from "../quantiles.ts";
import {
  autoReference,
  type Axis,
  type Box,
  clipPathDef,
  drawAxes,
  figureHeading,
  linearAxis,
  offsetLabel,
  textWidth,
} from "./axes.ts";
import { linePath, px, svgDocument, tag, text } from "./_svg.ts";
import { OKABE_ITO, STYLE } from "./style.ts";

/** One panel: a quantity's value per walker at each kept step. */
export interface TracePanel {
  readonly key: string;
  readonly unit: string;
  /** walkers[w][s] is walker w's value at `steps[s]`. */
  readonly walkers: readonly ArrayLike<number>[];
}

/** Inputs of {@link traceFigure}. */
export interface TraceFigureInput {
  readonly title?: string;
  /** Step numbers of the kept (thinned) samples, ascending. */
  readonly steps: ArrayLike<number>;
  readonly panels: readonly TracePanel[];
  /** Steps before this are burn-in (shaded). */
  readonly burn?: number;
  /** Extra line under the title (e.g. which walkers are shown). */
  readonly subtitle?: string;
}

/**
 * Stacked trace panels sharing the step axis. The y range of each panel is
 * the 0.1–99.9% range of its values after burn-in, widened by 15%, so a
 * walker's climb from a distant start does not squash the panel; lines
 * leaving that range are clipped. Throws RangeError for no panels.
 */
export function traceFigure(input: TraceFigureInput, options: { width?: number } = {}): string {
  if (input.panels.length === 0) {
    throw new RangeError("Cannot draw traces as no panels were given: count=0");
  }
  const width = options.width ?? 760;
  const panelH = 105;
  const gap = 10;
  const margin = { left: 86, right: 22, top: input.subtitle ? 62 : 44, bottom: 56 };
  const nP = input.panels.length;
  const height = margin.top + nP * panelH + (nP - 1) * gap + margin.bottom;
  const plotW = width - margin.left - margin.right;
  const steps = input.steps;
  const s0 = steps.length > 0 ? steps[0]! : 0;
  const s1 = steps.length > 0 ? steps[steps.length - 1]! : 1;
  const burn = input.burn ?? 0;
  const x = linearAxis([s0, s1], [margin.left, margin.left + plotW], {
    label: "Step",
    mode: "tight",
    pad: 0.01,
    count: 7,
  });
  const axes: { box: Box; y: Axis }[] = input.panels.map((p, k) => {
    const box: Box = {
      x: margin.left,
      y: margin.top + k * (panelH + gap),
      width: plotW,
      height: panelH,
    };
    const vals: number[] = [];
    for (const w of p.walkers) {
      for (let s = 0; s < w.length; s++) {
        if ((steps[s] ?? 0) >= burn && Number.isFinite(w[s]!)) vals.push(w[s]!);
      }
    }
    if (vals.length === 0) {
      for (const w of p.walkers) {
        for (let s = 0; s < w.length; s++) if (Number.isFinite(w[s]!)) vals.push(w[s]!);
      }
    }
    const sorted = Float64Array.from(vals).sort();
    let lo = quantileSorted(sorted, 0.001);
    let hi = quantileSorted(sorted, 0.999);
    if (!Number.isFinite(lo) || !Number.isFinite(hi)) [lo, hi] = [0, 1];
    const pad = 0.15 * (hi - lo);
    const ref = autoReference([lo - pad, hi + pad], { mode: "tight", pad: 0, count: 4 });
    return {
      box,
      y: linearAxis([lo - pad, hi + pad], [box.y + box.height, box.y], {
        label: offsetLabel(p.key, ref, p.unit),
        reference: ref,
        mode: "tight",
        pad: 0,
        count: 4,
      }),
    };
  });
  const defs: string[] = [];
  const out: string[] = [];
  input.panels.forEach((p, k) => {
    const { box, y } = axes[k]!;
    const clip = `trace-clip-${k}`;
    defs.push(clipPathDef(clip, box));
    const body: string[] = [];
    if (burn > s0) {
      const xb = Math.min(x.scale.map(burn), box.x + box.width);
      body.push(
        tag("rect", {
          x: box.x,
          y: box.y,
          width: xb - box.x,
          height: box.height,
          fill: "#000000",
          "fill-opacity": 0.06,
        }),
      );
      body.push(
        tag("path", {
          d: `M${px(xb)} ${px(box.y)}V${px(box.y + box.height)}`,
          stroke: STYLE.muted,
          "stroke-width": 1,
          "stroke-dasharray": "4 3",
          fill: "none",
        }),
      );
    }
    const paths = p.walkers.map((w) => linePath(steps, w, x.scale.map, y.scale.map)).join("");
    body.push(
      tag("path", {
        d: paths,
        stroke: k === 0 ? OKABE_ITO.black : OKABE_ITO.blue,
        "stroke-opacity": 0.35,
        "stroke-width": 0.8,
        fill: "none",
        class: "walkers",
      }),
    );
    out.push(tag("g", { "clip-path": `url(#${clip})` }, body.join("")));
    // The panel's name sits inside it (a rotated title would not fit a short panel).
    const name = y.label ?? p.key;
    const nameW = textWidth(name, STYLE.labelSize) + 10;
    out.push(
      tag("rect", {
        x: box.x + box.width - nameW - 4,
        y: box.y + 4,
        width: nameW,
        height: STYLE.labelSize + 6,
        rx: 2,
        fill: "#ffffff",
        "fill-opacity": 0.85,
      }),
    );
    out.push(
      text(box.x + box.width - 9, box.y + STYLE.labelSize + 5, name, {
        "text-anchor": "end",
        "font-size": STYLE.labelSize,
        class: "panel-label",
      }),
    );
    out.push(
      drawAxes(box, { x, y: { ...y, label: undefined } }, {
        xLabels: k === nP - 1,
      }),
    );
    if (k === 0 && burn > s0) {
      out.push(
        text(Math.min(x.scale.map(burn), box.x + box.width) - 4, box.y + 13, "burn-in", {
          "text-anchor": "end",
          "font-size": STYLE.legendSize,
          fill: STYLE.muted,
        }),
      );
    }
  });
  out.push(figureHeading(margin.left + plotW / 2, input.title ?? "Traces", input.subtitle).svg);
  return svgDocument(width, height, tag("defs", {}, defs.join("")) + "\n" + out.join("\n"), {
    title: input.title ?? "Traces",
  });
}
