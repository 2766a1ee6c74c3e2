/**
 * Figure: one planet's signal folded on its period.
 * @module
 */
import type { Axis } from "./axes.ts";
import { linearScale } from "./axes.ts";
import { fitPanels } from "./_fit_panels.ts";
import { formatTick } from "./ticks.ts";
import type { DataSeries, ModelBand } from "./types.ts";

/** Inputs of {@link phaseFigure}. */
export interface PhaseFigureInput {
  /** Planet name, for the title. */
  readonly planet: string;
  readonly title?: string;
  /** Extra line under the title (period, K, …). */
  readonly subtitle?: string;
  /**
   * One series per instrument; x = orbital phase in [−0.5, 0.5) with 0 at
   * inferior conjunction; y = RV with the other planets, offsets and trend
   * subtracted.
   */
  readonly instruments: readonly DataSeries[];
  /** This planet's Keplerian against phase. */
  readonly model?: ModelBand;
  /** @default "68% of posterior draws" */
  readonly bandLabel?: string;
}

/** The phase-folded RV curve of one planet with its model band and residuals. */
export function phaseFigure(input: PhaseFigureInput, options: { width?: number } = {}): string {
  const xAxis = (pixels: readonly [number, number]): Axis => {
    const ticks = [-0.5, -0.25, 0, 0.25, 0.5];
    return {
      scale: linearScale(-0.5, 0.5, pixels[0], pixels[1]),
      ticks,
      tickLabels: ticks.map((t) => formatTick(t, 2)),
      minorTicks: [-0.375, -0.125, 0.125, 0.375],
      label: "Phase (0 = conjunction)",
    };
  };
  return fitPanels({
    id: `phase-${input.planet}`,
    title: input.title ?? `Planet ${input.planet}, phase-folded`,
    subtitle: input.subtitle ?? "other planets, offsets and trend subtracted",
    xAxis,
    yLabel: "RV [m/s]",
    residualLabel: "O − C [m/s]",
    series: input.instruments,
    band: input.model,
    bandLabel: input.bandLabel ?? "68% of posterior draws",
    medianLabel: "posterior median model",
    guides: [{ x: 0 }],
    width: options.width ?? 760,
    height: 300,
    residualHeight: 120,
    note: "Error bars: dark, reported errors; light, with the median jitter added in quadrature.",
  });
}
