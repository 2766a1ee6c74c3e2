/**
 * Figure: radial velocities against time, per instrument, with the posterior
 * model and residuals.
 * @module
 */
import { linearAxis, offsetLabel } from "./axes.ts";
import { extent, fitPanels } from "./_fit_panels.ts";
import { labelReference } from "./ticks.ts";
import type { DataSeries, ModelBand } from "./types.ts";

/** Inputs of {@link rvFigure}: times in days (BJD or any day count), velocities in m/s. */
export interface RvFigureInput {
  readonly title?: string;
  /** One series per instrument, offsets already subtracted; x = time. */
  readonly instruments: readonly DataSeries[];
  /** Posterior model (offsets removed, trend kept) on a fine time grid. */
  readonly model?: ModelBand;
  /** Legend text of the band. @default "68% of posterior draws" */
  readonly bandLabel?: string;
}

/** Options of {@link rvFigure}. */
export interface RvFigureOptions {
  /** Figure width, px. @default 760 */
  width?: number;
  /** Subtracted from times on the axis; chosen from the data when not given. */
  timeReference?: number;
}

/** RVs per instrument with the posterior median model, its band, and residuals (O − C). */
export function rvFigure(input: RvFigureInput, options: RvFigureOptions = {}): string {
  const tr = extent(input.instruments.map((s) => ({ v: s.x })));
  if (input.model) {
    const m = extent([{ v: input.model.x }]);
    tr[0] = Math.min(tr[0], m[0]);
    tr[1] = Math.max(tr[1], m[1]);
  }
  const ref = options.timeReference ?? labelReference(tr[0], tr[1], { ratio: 10 });
  return fitPanels({
    id: "rv",
    title: input.title ?? "Radial velocities",
    subtitle: "instrument offsets subtracted",
    xAxis: (pixels) =>
      linearAxis(tr, pixels, {
        label: offsetLabel("Time", ref, "d"),
        reference: ref,
        mode: "tight",
        pad: 0.02,
        count: 7,
      }),
    yLabel: "RV [m/s]",
    residualLabel: "O − C [m/s]",
    series: input.instruments,
    band: input.model,
    bandLabel: input.bandLabel ?? "68% of posterior draws",
    medianLabel: "posterior median model",
    width: options.width ?? 760,
    height: 300,
    residualHeight: 120,
    note: "Error bars: dark, reported errors; light, with the median jitter added in quadrature.",
  });
}
