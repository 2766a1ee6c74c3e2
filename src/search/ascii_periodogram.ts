/**
 * Plain-text periodogram plot for terminals.
 * @module
 */

/** Options of {@linkcode asciiPeriodogram}. */
export interface AsciiPeriodogramOptions {
  /** Total width of every line in characters, axis labels included (>= 20). @default 72 */
  width?: number;
  /** Rows of the plot area (>= 2). @default 12 */
  height?: number;
  /** Logarithmic period axis. @default true */
  logPeriod?: boolean;
  /**
   * Periods to mark (e.g. found signals): their columns are drawn with `#`
   * and labelled 1, 2, ... (then a, b, ...) on the line under the axis.
   * @default []
   */
  marks?: ArrayLike<number>;
  /** Power level drawn as a dotted line (e.g. the 0.1 % FAP level); NaN or absent for none. */
  level?: number;
  /** Axis caption printed after the tick labels. @default "period [d]" */
  xLabel?: string;
}

const MARK_LABELS = "123456789abcdefghijklmnopqrstuvwxyz";

/**
 * Draws power against period as vertical bars and returns the lines (plain
 * ASCII, no colour codes, none longer than `width`).
 *
 * Layout: `height` plot rows with the y labels (maximum, half, 0) in a left
 * gutter, an axis row, a tick-label row, and a marker row when `marks` is
 * given. Each column shows the highest power among the periods that fall in
 * it, so narrow peaks are never lost by binning; a column is filled from the
 * bottom up to round(height * power / max power) rows. Points with a
 * non-finite power or period (or period <= 0 on a log axis) are skipped.
 */
export function asciiPeriodogram(
  periods: ArrayLike<number>,
  power: ArrayLike<number>,
  options: AsciiPeriodogramOptions = {},
): string[] {
  const width = options.width ?? 72;
  const height = options.height ?? 12;
  const logPeriod = options.logPeriod ?? true;
  const marks = options.marks ?? [];
  const xLabel = options.xLabel ?? "period [d]";
  if (!Number.isInteger(width) || width < 20 || !Number.isInteger(height) || height < 2) {
    throw new RangeError(
      `Cannot draw periodogram as the size is too small: width=${width}, height=${height}`,
    );
  }
  if (periods.length !== power.length) {
    throw new TypeError(
      `Cannot draw periodogram as lengths differ: periods=${periods.length}, power=${power.length}`,
    );
  }
  const axis = (p: number): number => (logPeriod ? Math.log10(p) : p);
  const usable = (p: number, y: number): boolean =>
    Number.isFinite(p) && Number.isFinite(y) && (!logPeriod || p > 0);

  let xLo = Infinity, xHi = -Infinity, yMax = 0;
  for (let i = 0; i < periods.length; i++) {
    const p = periods[i]!, y = power[i]!;
    if (!usable(p, y)) continue;
    const x = axis(p);
    if (x < xLo) xLo = x;
    if (x > xHi) xHi = x;
    if (y > yMax) yMax = y;
  }
  const level = options.level;
  const labels = [fmt(yMax), fmt(yMax / 2), fmt(0)];
  const gutter = Math.max(...labels.map((s) => s.length)) + 1;
  const cols = width - gutter - 1;
  if (!(xHi >= xLo)) {
    return [" ".repeat(gutter) + "(no finite data to plot)"];
  }
  const column = (x: number): number => {
    if (xHi === xLo) return 0;
    const c = Math.round((x - xLo) / (xHi - xLo) * (cols - 1));
    return c < 0 ? 0 : c > cols - 1 ? cols - 1 : c;
  };
  const top = new Float64Array(cols).fill(-1);
  for (let i = 0; i < periods.length; i++) {
    const p = periods[i]!, y = power[i]!;
    if (!usable(p, y)) continue;
    const c = column(axis(p));
    if (y > top[c]!) top[c] = y;
  }
  const marked = new Array<string>(cols).fill(" ");
  for (let j = 0; j < marks.length; j++) {
    const p = marks[j]!;
    if (!Number.isFinite(p) || (logPeriod && p <= 0)) continue;
    const x = axis(p);
    if (x < xLo || x > xHi) continue;
    marked[column(x)] = MARK_LABELS[j % MARK_LABELS.length]!;
  }
  const levelRow = level !== undefined && Number.isFinite(level) && yMax > 0 && level <= yMax
    ? Math.round(height * level / yMax)
    : -1;

  const lines: string[] = [];
  for (let r = height; r >= 1; r--) {
    const label = r === height ? labels[0]! : r === Math.round(height / 2) ? labels[1]! : "";
    let line = label.padStart(gutter - 1) + " |";
    for (let c = 0; c < cols; c++) {
      const filled = top[c]! >= 0 && yMax > 0 && Math.round(height * top[c]! / yMax) >= r;
      line += filled ? (marked[c] !== " " ? "#" : "|") : r === levelRow ? "." : " ";
    }
    lines.push(line.trimEnd());
  }
  lines.push(labels[2]!.padStart(gutter - 1) + " +" + "-".repeat(cols));

  // Tick labels: decades (and 2, 5 within a decade when the range is short) on a
  // log axis, about five round numbers on a linear one.
  const tickRow = new Array<string>(cols).fill(" ");
  let lastEnd = -2;
  for (const t of ticks(xLo, xHi, logPeriod)) {
    const text = fmt(t);
    // A label that would run past the right edge is right-aligned to it.
    const c = Math.min(column(axis(t)), cols - text.length);
    if (c <= lastEnd + 1) continue;
    for (let q = 0; q < text.length; q++) tickRow[c + q] = text[q]!;
    lastEnd = c + text.length - 1;
  }
  let tickLine = " ".repeat(gutter + 1) + tickRow.join("").trimEnd();
  if (tickLine.length + 2 + xLabel.length <= width) tickLine += "  " + xLabel;
  lines.push(tickLine);
  if (marks.length > 0) lines.push((" ".repeat(gutter + 1) + marked.join("")).trimEnd());
  return lines;
}

/** Short number for labels: 3 significant digits, no exponent below 1e6. */
function fmt(v: number): string {
  if (v === 0) return "0";
  const a = Math.abs(v);
  if (a >= 1e6 || a < 1e-3) return v.toExponential(1);
  if (a >= 100) return v.toFixed(0);
  return String(Number(v.toPrecision(3)));
}

/** Round tick values inside [lo, hi] (axis units: log10 when `log`). */
function ticks(lo: number, hi: number, log: boolean): number[] {
  const out: number[] = [];
  if (log) {
    const dense = hi - lo < 2;
    for (let e = Math.floor(lo); e <= Math.ceil(hi); e++) {
      for (const m of dense ? [1, 2, 5] : [1]) {
        const v = m * Math.pow(10, e);
        const x = Math.log10(v);
        if (x >= lo - 1e-9 && x <= hi + 1e-9) out.push(v);
      }
    }
    return out;
  }
  const span = hi - lo;
  if (!(span > 0)) return [lo];
  const raw = span / 5;
  const mag = Math.pow(10, Math.floor(Math.log10(raw)));
  const unit = [1, 2, 5, 10].map((m) => m * mag).find((s) => s >= raw) ?? 10 * mag;
  for (let v = Math.ceil(lo / unit) * unit; v <= hi + 1e-9 * unit; v += unit) out.push(v);
  return out;
}
