/**
 * Finding periodic signals in radial velocities before any MCMC: the
 * generalised Lomb–Scargle periodogram with per-instrument offsets, its
 * analytic false-alarm probability, the spectral window, an iterative
 * peak-fit-subtract search, a Nelder–Mead optimiser, a terminal plot, the
 * maximum a posteriori fit of a compiled model with start values for specs
 * that lack them, and the drafting and writing of specs as TOML.
 * All functions are pure (no I/O, clock, console or global RNG).
 *
 * @example
 * ```ts
 * import { asciiPeriodogram, searchSignals } from "./mod.ts";
 * const result = searchSignals(series, { minPeriod: 1.5, trendDegree: 1 });
 * const periods = result.frequencies.map((f) => 1 / f);
 * console.log(asciiPeriodogram(periods, result.periodograms[0]!, {
 *   marks: result.signals.map((s) => s.period),
 * }).join("\n"));
 * ```
 * @module
 */
export type { RvSeries } from "./_series.ts";
export { type FrequencyGrid, frequencyGrid, type FrequencyGridOptions } from "./frequency_grid.ts";
export { type GlsOptions, glsPeriodogram, type GlsResult } from "./gls.ts";
export {
  falseAlarmProbability,
  type FapInputs,
  type FapOptions,
  powerAtFalseAlarm,
} from "./false_alarm.ts";
export { spectralWindow, type SpectralWindowOptions } from "./spectral_window.ts";
export {
  fitSinusoids,
  type FitSinusoidsOptions,
  type FittedSinusoid,
  type SinusoidFitResult,
} from "./fit_sinusoids.ts";
export {
  type FoundSignal,
  type RejectedPeak,
  type SearchOptions,
  type SearchResult,
  searchSignals,
} from "./search_signals.ts";
export { nelderMead, type NelderMeadOptions, type NelderMeadResult } from "./nelder_mead.ts";
export { asciiPeriodogram, type AsciiPeriodogramOptions } from "./ascii_periodogram.ts";
export {
  type FilledStart,
  type FillStartOptions,
  fillStartValues,
  mapFit,
  type MapFitOptions,
  type MapFitResult,
  startsGiven,
} from "./map_fit.ts";
export {
  type DraftData,
  type DraftInstrument,
  type DraftPlanet,
  type DraftSignal,
  draftSpec,
  type DraftSpecOptions,
  type SpecDraft,
  specToml,
  withDraftStarts,
} from "./spec_writer.ts";
