/**
 * Plain-data inputs shared by the figures.
 * @module
 */

/** Points of one instrument (or one group) with their residuals. */
export interface DataSeries {
  /** Legend label, e.g. the instrument name. */
  readonly name: string;
  readonly x: ArrayLike<number>;
  readonly y: ArrayLike<number>;
  /** Reported one-sigma errors (half-lengths of the dark error bars). */
  readonly error: ArrayLike<number>;
  /** Errors with the jitter added in quadrature (light error bars). */
  readonly errorWithJitter?: ArrayLike<number>;
  /** Data minus model at the same points. */
  readonly residual: ArrayLike<number>;
  /**
   * Index into the series colours and marker shapes, so an instrument keeps
   * its look across figures. @default the series' position
   */
  readonly styleIndex?: number;
}

/** A posterior model on a grid: pointwise median and a credible band. */
export interface ModelBand {
  readonly x: ArrayLike<number>;
  readonly median: ArrayLike<number>;
  readonly lo: ArrayLike<number>;
  readonly hi: ArrayLike<number>;
}

/** An extra model curve. */
export interface ModelLine {
  readonly x: ArrayLike<number>;
  readonly y: ArrayLike<number>;
  readonly label?: string;
  readonly colour?: string;
  readonly dashed?: boolean;
}
