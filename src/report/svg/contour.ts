/**
 * Contour lines of a field sampled on a regular grid (marching squares), and
 * the 2-D histogram, smoothing and highest-density levels the corner plot
 * draws with them.
 * @module
 */

/**
 * A field on a regular grid: `values[j·nx + i]` is the value at
 * x = x0 + i·dx, y = y0 + j·dy.
 */
export interface Grid {
  readonly values: Float64Array;
  readonly nx: number;
  readonly ny: number;
  /** @default 0 */
  readonly x0?: number;
  /** @default 1 */
  readonly dx?: number;
  /** @default 0 */
  readonly y0?: number;
  /** @default 1 */
  readonly dy?: number;
}

/**
 * Contour lines of `grid` at `level`, as polylines of interleaved x, y
 * coordinates (`[x0, y0, x1, y1, …]`). A closed line repeats its first point
 * at the end. Corners with value ≥ level count as inside; NaN counts as outside.
 *
 * Method: marching squares (Lorensen & Cline 1987, "Marching cubes",
 * SIGGRAPH '87, Computer Graphics 21(4), 163, in its 2-D form; common
 * practice). Each cell is classified by which of its four corners are inside;
 * an edge whose ends differ is crossed where the linear interpolation of the
 * two corner values equals the level. The two ambiguous (saddle) cells are
 * resolved by the mean of the four corners: when it is inside, the inside
 * corners are taken as connected through the cell. Segments are joined into
 * polylines by the grid edge they share, so joins are exact.
 * Throws RangeError when the grid is smaller than 2 × 2 or its values too few.
 */
export function contourLines(grid: Grid, level: number): Float64Array[] {
  const { values, nx, ny } = grid;
  if (!(nx >= 2 && ny >= 2) || values.length < nx * ny) {
    throw new RangeError(
      `Cannot trace contours as the grid must be at least 2 × 2: nx=${nx}, ny=${ny}, values=${values.length}`,
    );
  }
  const x0 = grid.x0 ?? 0;
  const dx = grid.dx ?? 1;
  const y0 = grid.y0 ?? 0;
  const dy = grid.dy ?? 1;
  const hCount = (nx - 1) * ny;
  const edgeCount = hCount + nx * (ny - 1);
  // Edge ids: horizontal edge (i, j)→(i+1, j) is j(nx−1) + i; vertical (i, j)→(i, j+1) is hCount + j·nx + i.
  const hEdge = (i: number, j: number) => j * (nx - 1) + i;
  const vEdge = (i: number, j: number) => hCount + j * nx + i;
  const inside = (v: number) => v >= level;
  const segA: number[] = [];
  const segB: number[] = [];
  for (let j = 0; j < ny - 1; j++) {
    for (let i = 0; i < nx - 1; i++) {
      const v00 = values[j * nx + i]!;
      const v10 = values[j * nx + i + 1]!;
      const v11 = values[(j + 1) * nx + i + 1]!;
      const v01 = values[(j + 1) * nx + i]!;
      const c = (inside(v00) ? 1 : 0) | (inside(v10) ? 2 : 0) | (inside(v11) ? 4 : 0) |
        (inside(v01) ? 8 : 0);
      if (c === 0 || c === 15) continue;
      const bottom = hEdge(i, j);
      const top = hEdge(i, j + 1);
      const left = vEdge(i, j);
      const right = vEdge(i + 1, j);
      const add = (a: number, b: number) => {
        segA.push(a);
        segB.push(b);
      };
      switch (c) {
        case 1:
        case 14:
          add(left, bottom);
          break;
        case 2:
        case 13:
          add(bottom, right);
          break;
        case 3:
        case 12:
          add(left, right);
          break;
        case 4:
        case 11:
          add(right, top);
          break;
        case 6:
        case 9:
          add(bottom, top);
          break;
        case 7:
        case 8:
          add(left, top);
          break;
        case 5: {
          // 00 and 11 inside.
          const centre = inside((v00 + v10 + v11 + v01) / 4);
          if (centre) {
            add(bottom, right); // around outside corner 10
            add(left, top); // around outside corner 01
          } else {
            add(left, bottom); // around inside corner 00
            add(right, top); // around inside corner 11
          }
          break;
        }
        case 10: {
          // 10 and 01 inside.
          const centre = inside((v00 + v10 + v11 + v01) / 4);
          if (centre) {
            add(left, bottom); // around outside corner 00
            add(right, top); // around outside corner 11
          } else {
            add(bottom, right); // around inside corner 10
            add(left, top); // around inside corner 01
          }
          break;
        }
      }
    }
  }
  // Crossing point of each edge used.
  const point = (e: number, out: number[]) => {
    let ia: number, ja: number, ib: number, jb: number;
    if (e < hCount) {
      ja = Math.floor(e / (nx - 1));
      ia = e - ja * (nx - 1);
      ib = ia + 1;
      jb = ja;
    } else {
      const k = e - hCount;
      ja = Math.floor(k / nx);
      ia = k - ja * nx;
      ib = ia;
      jb = ja + 1;
    }
    const va = values[ja * nx + ia]!;
    const vb = values[jb * nx + ib]!;
    let t = (level - va) / (vb - va);
    if (!Number.isFinite(t)) t = 0.5; // NaN corner: put the crossing mid-edge
    t = Math.min(1, Math.max(0, t));
    out.push(x0 + (ia + t * (ib - ia)) * dx, y0 + (ja + t * (jb - ja)) * dy);
  };
  // Each edge is shared by at most two segments.
  const bySlot = new Int32Array(2 * edgeCount).fill(-1);
  const link = (e: number, s: number) => {
    if (bySlot[2 * e]! < 0) bySlot[2 * e] = s;
    else bySlot[2 * e + 1] = s;
  };
  for (let s = 0; s < segA.length; s++) {
    link(segA[s]!, s);
    link(segB[s]!, s);
  }
  const used = new Uint8Array(segA.length);
  const other = (
    e: number,
    s: number,
  ) => (bySlot[2 * e] === s ? bySlot[2 * e + 1]! : bySlot[2 * e]!);
  const walk = (start: number, fromEdge: number): number[] => {
    // Edges met going away from `fromEdge` through segment `start`.
    const edges: number[] = [];
    let s = start;
    let e = segA[s] === fromEdge ? segB[s]! : segA[s]!;
    while (true) {
      edges.push(e);
      const next = other(e, s);
      if (next < 0 || used[next]) break;
      used[next] = 1;
      s = next;
      e = segA[s] === e ? segB[s]! : segA[s]!;
    }
    return edges;
  };
  const lines: Float64Array[] = [];
  for (let s = 0; s < segA.length; s++) {
    if (used[s]) continue;
    used[s] = 1;
    const forward = walk(s, segA[s]!);
    const closed = forward[forward.length - 1] === segA[s];
    const edges = closed ? [segA[s]!, ...forward] : [...walk(s, segB[s]!).reverse(), ...forward];
    const pts: number[] = [];
    for (const e of edges) point(e, pts);
    lines.push(Float64Array.from(pts));
  }
  return lines;
}

/** Signed area of a closed polyline (shoelace formula; positive counter-clockwise in x-right, y-up axes). */
export function polygonArea(line: Float64Array): number {
  let a = 0;
  const n = line.length / 2;
  for (let k = 0; k < n; k++) {
    const k1 = (k + 1) % n;
    a += line[2 * k]! * line[2 * k1 + 1]! - line[2 * k1]! * line[2 * k + 1]!;
  }
  return a / 2;
}

/** Length of a polyline. */
export function polylineLength(line: Float64Array): number {
  let s = 0;
  for (let k = 2; k + 1 < line.length; k += 2) {
    s += Math.hypot(line[k]! - line[k - 2]!, line[k + 1]! - line[k - 1]!);
  }
  return s;
}

/** Options of {@link histogram2d}. */
export interface Histogram2dOptions {
  /** Bins along x and y. @default [30, 30] */
  bins?: readonly [number, number];
  /** Empty bins added on every side (so contours close). @default 0 */
  margin?: number;
}

/**
 * Counts of points (x, y) in `bins` over the given ranges, as a {@link Grid}
 * of bin centres. Points outside the ranges or non-finite are skipped. With
 * `margin` m, m empty bins are added on every side.
 */
export function histogram2d(
  points: { readonly x: ArrayLike<number>; readonly y: ArrayLike<number> },
  ranges: { readonly x: readonly [number, number]; readonly y: readonly [number, number] },
  options: Histogram2dOptions = {},
): Grid {
  const [bx, by] = options.bins ?? [30, 30];
  const m = options.margin ?? 0;
  const nx = bx + 2 * m;
  const ny = by + 2 * m;
  const [xl, xh] = ranges.x;
  const [yl, yh] = ranges.y;
  const dx = (xh - xl) / bx;
  const dy = (yh - yl) / by;
  const values = new Float64Array(nx * ny);
  const n = Math.min(points.x.length, points.y.length);
  for (let k = 0; k < n; k++) {
    const x = points.x[k]!;
    const y = points.y[k]!;
    if (!(x >= xl && x <= xh && y >= yl && y <= yh)) continue;
    const i = Math.min(bx - 1, Math.floor((x - xl) / dx)) + m;
    const j = Math.min(by - 1, Math.floor((y - yl) / dy)) + m;
    values[j * nx + i]! += 1;
  }
  return { values, nx, ny, x0: xl + (0.5 - m) * dx, dx, y0: yl + (0.5 - m) * dy, dy };
}

/**
 * Counts of `x` in `bins` equal bins over [lo, hi]; values outside or
 * non-finite are skipped (hi itself goes in the last bin).
 */
export function histogram1d(
  x: ArrayLike<number>,
  range: readonly [number, number],
  options: { bins?: number } = {},
): Float64Array {
  const bins = options.bins ?? 40;
  const [lo, hi] = range;
  const w = (hi - lo) / bins;
  const out = new Float64Array(bins);
  for (let k = 0; k < x.length; k++) {
    const v = x[k]!;
    if (!(v >= lo && v <= hi)) continue;
    out[Math.min(bins - 1, Math.floor((v - lo) / w))]! += 1;
  }
  return out;
}

/**
 * The grid convolved with a Gaussian of `sigma` cells in x and y (separable,
 * truncated at 3σ, zero outside the grid). A light smoothing of a histogram
 * before contouring; common practice, no source. `sigma` ≤ 0 returns a copy.
 */
export function smoothGrid(grid: Grid, sigma: number): Grid {
  const { nx, ny } = grid;
  if (!(sigma > 0)) return { ...grid, values: grid.values.slice() };
  const r = Math.ceil(3 * sigma);
  const kernel = new Float64Array(2 * r + 1);
  let sum = 0;
  for (let k = -r; k <= r; k++) {
    kernel[k + r] = Math.exp(-0.5 * (k / sigma) ** 2);
    sum += kernel[k + r]!;
  }
  for (let k = 0; k < kernel.length; k++) kernel[k]! /= sum;
  const tmp = new Float64Array(nx * ny);
  const out = new Float64Array(nx * ny);
  const v = grid.values;
  for (let j = 0; j < ny; j++) {
    for (let i = 0; i < nx; i++) {
      let s = 0;
      for (let k = -r; k <= r; k++) {
        const ii = i + k;
        if (ii >= 0 && ii < nx) s += kernel[k + r]! * v[j * nx + ii]!;
      }
      tmp[j * nx + i] = s;
    }
  }
  for (let j = 0; j < ny; j++) {
    for (let i = 0; i < nx; i++) {
      let s = 0;
      for (let k = -r; k <= r; k++) {
        const jj = j + k;
        if (jj >= 0 && jj < ny) s += kernel[k + r]! * tmp[jj * nx + i]!;
      }
      out[j * nx + i] = s;
    }
  }
  return { ...grid, values: out };
}

/**
 * Highest-density levels: for each mass fraction q, the cell value L such that
 * the cells with value ≥ L hold at least the fraction q of the total (the
 * smallest such set). Contours of a density grid at these levels bound its
 * highest-posterior-density regions (Hyndman 1996, "Computing and graphing
 * highest density regions", The American Statistician 50, 120).
 *
 * Method: sort cell values in descending order and accumulate; L is the value
 * at which the running sum first reaches q·total. Returns NaN for an empty
 * or all-zero grid, and for q outside (0, 1].
 */
export function hpdLevels(values: ArrayLike<number>, fractions: readonly number[]): number[] {
  const sorted = Float64Array.from(values).filter((v) => v > 0).sort().reverse();
  let total = 0;
  for (const v of sorted) total += v;
  return fractions.map((q) => {
    if (!(total > 0) || !(q > 0 && q <= 1)) return NaN;
    let acc = 0;
    for (const v of sorted) {
      acc += v;
      if (acc >= q * total) return v;
    }
    return sorted[sorted.length - 1]!;
  });
}
