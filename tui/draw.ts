/**
 * Character graphics for the dashboard: one-line block histograms, braille
 * dot plots and shaded density grids. Pure functions from numbers to strings.
 * @module
 */

/** Eighth-height blocks U+2581..U+2588, lowest first. */
export const BLOCKS = "▁▂▃▄▅▆▇█";

/** Shades for density levels 1..4 (level 0 is blank), lightest first. */
export const SHADES = "░▒▓█";

/**
 * One character per count: blank for 0, otherwise the block of height
 * ⌈8 c / max⌉ eighths, so any non-zero count shows at least "▁".
 */
export function blockBars(counts: ArrayLike<number>): string {
  let max = 0;
  for (let i = 0; i < counts.length; i++) if (counts[i]! > max) max = counts[i]!;
  let out = "";
  for (let i = 0; i < counts.length; i++) {
    const c = counts[i]!;
    if (!(c > 0) || max <= 0) {
      out += " ";
      continue;
    }
    const k = Math.min(8, Math.max(1, Math.ceil((8 * c) / max)));
    out += BLOCKS[k - 1];
  }
  return out;
}

/**
 * Bit of each dot in a braille cell, indexed `[row][column]` with row 0 at
 * the top. The Unicode Braille Patterns block (U+2800..U+28FF) encodes dots
 * 1..8 as bits 0..7; dots 1-2-3-7 run down the left column and 4-5-6-8 down
 * the right (The Unicode Standard, chapter 21, "Braille Patterns").
 */
export const BRAILLE_BITS: readonly (readonly [number, number])[] = [
  [0x01, 0x08],
  [0x02, 0x10],
  [0x04, 0x20],
  [0x40, 0x80],
];

/** A dot raster: `width` × `height` pixels, row-major, row 0 at the top; non-zero = dot. */
export interface Raster {
  readonly width: number;
  readonly height: number;
  readonly pixels: Uint8Array;
}

/** A blank raster covering `columns` × `rows` braille cells (2 × 4 dots each). */
export function brailleRaster(columns: number, rows: number): Raster {
  const width = Math.max(0, Math.floor(columns)) * 2;
  const height = Math.max(0, Math.floor(rows)) * 4;
  return { width, height, pixels: new Uint8Array(width * height) };
}

/** Render a raster as braille text, one string per row of cells (4 pixel rows). */
export function brailleLines(raster: Raster): string[] {
  const columns = Math.ceil(raster.width / 2);
  const rows = Math.ceil(raster.height / 4);
  const lines: string[] = [];
  for (let r = 0; r < rows; r++) {
    let line = "";
    for (let c = 0; c < columns; c++) {
      let bits = 0;
      for (let dy = 0; dy < 4; dy++) {
        const y = r * 4 + dy;
        if (y >= raster.height) break;
        for (let dx = 0; dx < 2; dx++) {
          const x = c * 2 + dx;
          if (x < raster.width && raster.pixels[y * raster.width + x]) {
            bits |= BRAILLE_BITS[dy]![dx]!;
          }
        }
      }
      line += String.fromCharCode(0x2800 + bits);
    }
    lines.push(line);
  }
  return lines;
}

/** Pixel row (0 at top) of value `v` on a raster of `height` rows spanning [lo, hi]. */
function pixelRow(v: number, lo: number, hi: number, height: number): number {
  if (!(hi > lo)) return Math.floor((height - 1) / 2);
  const t = (v - lo) / (hi - lo);
  return Math.min(height - 1, Math.max(0, Math.round((1 - t) * (height - 1))));
}

/** Options of {@link plotLine}. */
export interface PlotLineOptions {
  /** Value at the bottom pixel row. @default the smallest finite value */
  readonly min?: number;
  /** Value at the top pixel row. @default the largest finite value */
  readonly max?: number;
}

/**
 * Draw `values` (equally spaced in x) as a connected line across the whole
 * raster width. Each pixel column covers a slice of the series; the column is
 * filled between the smallest and largest value in that slice, including the
 * linearly interpolated values at the slice edges, so the line has no gaps.
 * Non-finite values are skipped.
 */
export function plotLine(
  raster: Raster,
  values: ArrayLike<number>,
  options: PlotLineOptions = {},
): Raster {
  const n = values.length;
  const { width, height, pixels } = raster;
  if (n === 0 || width === 0 || height === 0) return raster;
  let lo = options.min ?? Infinity;
  let hi = options.max ?? -Infinity;
  if (options.min === undefined || options.max === undefined) {
    for (let i = 0; i < n; i++) {
      const v = values[i]!;
      if (!Number.isFinite(v)) continue;
      if (options.min === undefined && v < lo) lo = v;
      if (options.max === undefined && v > hi) hi = v;
    }
  }
  if (!Number.isFinite(lo) || !Number.isFinite(hi)) return raster;
  const at = (t: number): number => {
    const i = Math.floor(t);
    const j = Math.min(n - 1, i + 1);
    const a = values[i]!;
    const b = values[j]!;
    if (!Number.isFinite(a)) return b;
    if (!Number.isFinite(b)) return a;
    return a + (t - i) * (b - a);
  };
  for (let c = 0; c < width; c++) {
    const t0 = n === 1 ? 0 : (c / width) * (n - 1);
    const t1 = n === 1 ? 0 : ((c + 1) / width) * (n - 1);
    let vmin = Math.min(at(t0), at(t1));
    let vmax = Math.max(at(t0), at(t1));
    for (let i = Math.ceil(t0); i <= Math.floor(t1); i++) {
      const v = values[i]!;
      if (!Number.isFinite(v)) continue;
      if (v < vmin || Number.isNaN(vmin)) vmin = v;
      if (v > vmax || Number.isNaN(vmax)) vmax = v;
    }
    if (!Number.isFinite(vmin) || !Number.isFinite(vmax)) continue;
    const top = pixelRow(vmax, lo, hi, height);
    const bottom = pixelRow(vmin, lo, hi, height);
    for (let y = top; y <= bottom; y++) pixels[y * width + c] = 1;
  }
  return raster;
}

/** Set every second pixel of column `x` (a dotted vertical marker). */
export function markColumn(raster: Raster, x: number): Raster {
  const c = Math.floor(x);
  if (c < 0 || c >= raster.width) return raster;
  for (let y = 0; y < raster.height; y += 2) raster.pixels[y * raster.width + c] = 1;
  return raster;
}

/**
 * Light the braille dot of every pixel that holds at least one pair
 * (x[i], y[i]) of a 2-D histogram with one bin per pixel (row 0 of the
 * histogram at the lowest y, as `histogram2d` returns it).
 */
export function plotCounts(raster: Raster, counts: ArrayLike<number>): Raster {
  const { width, height, pixels } = raster;
  for (let row = 0; row < height; row++) {
    for (let c = 0; c < width; c++) {
      if (counts[row * width + c]! > 0) pixels[(height - 1 - row) * width + c] = 1;
    }
  }
  return raster;
}

/**
 * Shaded text of density levels (see `densityLevels`): level 0 blank, level k
 * the k-th of {@link SHADES} counted so the innermost level is darkest.
 * `levels` is row-major with row 0 at the lowest y; the first returned line is the top.
 */
export function shadeLines(
  levels: ArrayLike<number>,
  columns: number,
  levelCount: number,
): string[] {
  const rows = columns > 0 ? Math.floor(levels.length / columns) : 0;
  const lines: string[] = [];
  for (let r = rows - 1; r >= 0; r--) {
    let line = "";
    for (let c = 0; c < columns; c++) {
      const level = levels[r * columns + c]!;
      if (level <= 0) {
        line += " ";
        continue;
      }
      const index = SHADES.length - 1 - (levelCount - Math.min(level, levelCount));
      line += SHADES[Math.max(0, index)];
    }
    lines.push(line);
  }
  return lines;
}
