/**
 * The house style of rvwalk figures: one font, legible sizes, a colour-blind
 * safe palette and marker shapes that tell instruments apart even in grey.
 *
 * Palette: the eight colours of Okabe & Ito (2008), "Color Universal Design
 * (CUD): how to make figures and presentations that are friendly to colorblind
 * people", J*FLY, https://jfly.uni-koeln.de/color/ (hex values as published
 * there, recalled from memory). Yellow comes last: it reads poorly on white.
 * @module
 */

/** Okabe–Ito colours by name. */
export const OKABE_ITO = {
  black: "#000000",
  orange: "#E69F00",
  skyBlue: "#56B4E9",
  bluishGreen: "#009E73",
  yellow: "#F0E442",
  blue: "#0072B2",
  vermillion: "#D55E00",
  reddishPurple: "#CC79A7",
} as const;

/** Series colours in order of use (instruments, planets, parameters). */
export const SERIES_COLOURS: readonly string[] = [
  OKABE_ITO.blue,
  OKABE_ITO.vermillion,
  OKABE_ITO.bluishGreen,
  OKABE_ITO.reddishPurple,
  OKABE_ITO.orange,
  OKABE_ITO.skyBlue,
  OKABE_ITO.black,
  OKABE_ITO.yellow,
];

/** Marker shapes in order of use. */
export type MarkerShape = "circle" | "square" | "triangle" | "diamond" | "triangle-down";
export const SERIES_SHAPES: readonly MarkerShape[] = [
  "circle",
  "square",
  "triangle",
  "diamond",
  "triangle-down",
];

/** Fonts, sizes (px) and neutral colours shared by every figure. */
export const STYLE = {
  fontFamily: "DejaVu Sans, Helvetica, Arial, sans-serif",
  titleSize: 15,
  labelSize: 13,
  tickSize: 11,
  legendSize: 11,
  ink: "#222222",
  frame: "#333333",
  grid: "#e6e6e6",
  muted: "#777777",
  /** Posterior model line and band. */
  model: "#000000",
  band: "#7f7f7f",
  bandOpacity: 0.35,
  markerSize: 6,
  tickLength: 5,
} as const;

/** Colour of series `i` (wraps around). */
export function seriesColour(i: number): string {
  return SERIES_COLOURS[
    ((i % SERIES_COLOURS.length) + SERIES_COLOURS.length) %
    SERIES_COLOURS.length
  ]!;
}

/** Marker shape of series `i` (wraps around). */
export function seriesShape(i: number): MarkerShape {
  return SERIES_SHAPES[((i % SERIES_SHAPES.length) + SERIES_SHAPES.length) % SERIES_SHAPES.length]!;
}
