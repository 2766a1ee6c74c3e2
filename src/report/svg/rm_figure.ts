/**
 * Figure: the transit night of a planet with a Rossiter–McLaughlin model.
 * @module
 */
import { linearAxis } from "./axes.ts";
import { extent, fitPanels } from "./_fit_panels.ts";
import type { DataSeries, ModelBand, ModelLine } from "./types.ts";

/** Inputs of {@link rmFigure}; x in hours from mid-transit, velocities in m/s. */
export interface RmFigureInput {
  readonly planet: string;
  readonly title?: string;
  readonly subtitle?: string;
  /** One series per instrument: RVs of the night, offsets and trend subtracted. */
  readonly instruments: readonly DataSeries[];
  /** Keplerians + RM anomaly on a fine grid. */
  readonly model?: ModelBand;
  /** The Keplerian alone (median), drawn dashed. */
  readonly keplerian?: { readonly x: ArrayLike<number>; readonly y: ArrayLike<number> };
  /** Estimated first and last contact, hours from mid-transit. */
  readonly contacts?: readonly [number, number];
  /** @default "68% of posterior draws" */
  readonly bandLabel?: string;
}

/** RVs around one transit with the posterior Keplerian + RM model, and residuals. */
export function rmFigure(input: RmFigureInput, options: { width?: number } = {}): string {
  const xr = extent([
    ...input.instruments.map((s) => ({ v: s.x })),
    ...(input.model ? [{ v: input.model.x }] : []),
  ]);
  const lines: ModelLine[] = input.keplerian
    ? [{ x: input.keplerian.x, y: input.keplerian.y, dashed: true, label: "Keplerian alone" }]
    : [];
  const guides = input.contacts
    ? [{ x: input.contacts[0], label: "ingress" }, { x: input.contacts[1], label: "egress" }]
    : [{ x: 0 }];
  return fitPanels({
    id: `rm-${input.planet}`,
    title: input.title ?? `Planet ${input.planet}: transit night (Rossiter–McLaughlin)`,
    subtitle: input.subtitle ?? "offsets and trend subtracted",
    xAxis: (pixels) =>
      linearAxis(xr, pixels, {
        label: "Time from mid-transit [h]",
        mode: "tight",
        pad: 0.03,
        count: 7,
      }),
    yLabel: "RV [m/s]",
    residualLabel: "O − C [m/s]",
    series: input.instruments,
    band: input.model,
    bandLabel: input.bandLabel ?? "68% of posterior draws",
    medianLabel: "Keplerian + RM, posterior median",
    lines,
    guides,
    width: options.width ?? 760,
    height: 300,
    residualHeight: 120,
    note: "Error bars: dark, reported errors; light, with the median jitter added in quadrature.",
  });
}
