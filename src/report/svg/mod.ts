/**
 * rvwalk's own small SVG plotting kit and the figures of a run. Every figure
 * is a pure function from plain arrays to an SVG document string; one house
 * style (sans-serif type, Okabe–Ito colours, marker shapes per instrument).
 *
 * @example
 * ```ts
 * import { periodogramFigure } from "./mod.ts";
 * const svg = periodogramFigure({ period: [1, 10, 100], power: [0.1, 0.8, 0.2] });
 * ```
 * @module
 */
export {
  autoReference,
  type Axis,
  type Box,
  clipPathDef,
  drawAxes,
  type DrawAxesOptions,
  errorBars,
  legend,
  type LegendEntry,
  legendRow,
  linearAxis,
  type LinearAxisOptions,
  linearScale,
  logAxis,
  logScale,
  marker,
  offsetLabel,
  type Scale,
  textWidth,
  withUnit,
} from "./axes.ts";
export {
  contourLines,
  type Grid,
  histogram1d,
  histogram2d,
  type Histogram2dOptions,
  hpdLevels,
  polygonArea,
  polylineLength,
  smoothGrid,
} from "./contour.ts";
export {
  formatLogTick,
  formatTick,
  labelReference,
  type LogTicks,
  logTicks,
  MINUS,
  niceNumber,
  type NiceTickOptions,
  niceTicks,
  type Ticks,
} from "./ticks.ts";
export {
  type MarkerShape,
  OKABE_ITO,
  SERIES_COLOURS,
  SERIES_SHAPES,
  seriesColour,
  seriesShape,
  STYLE,
} from "./style.ts";
export type { DataSeries, ModelBand, ModelLine } from "./types.ts";
export { rvFigure, type RvFigureInput, type RvFigureOptions } from "./rv_figure.ts";
export { phaseFigure, type PhaseFigureInput } from "./phase_figure.ts";
export { rmFigure, type RmFigureInput } from "./rm_figure.ts";
export { cornerFigure, type CornerFigureOptions, type CornerParameter } from "./corner_figure.ts";
export { traceFigure, type TraceFigureInput, type TracePanel } from "./trace_figure.ts";
export { periodogramFigure, type PeriodogramFigureInput } from "./periodogram_figure.ts";
export {
  fileSafe,
  pointwiseBand,
  type RenderedFigure,
  runFigures,
  type RunFiguresOptions,
} from "./run_figures.ts";
