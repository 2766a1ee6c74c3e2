import { describe, expect, test } from "vitest";
import {
  contourLines,
  type Grid,
  histogram1d,
  histogram2d,
  hpdLevels,
  polygonArea,
  polylineLength,
  smoothGrid,
} from "../../../src/report/svg/contour.ts";

/** A field f(x, y) sampled on [lo, hi]² with n points per side. */
function sample(f: (x: number, y: number) => number, lo: number, hi: number, n: number): Grid {
  const d = (hi - lo) / (n - 1);
  const values = new Float64Array(n * n);
  for (let j = 0; j < n; j++) {
    for (let i = 0; i < n; i++) values[j * n + i] = f(lo + i * d, lo + j * d);
  }
  return { values, nx: n, ny: n, x0: lo, dx: d, y0: lo, dy: d };
}

describe("contourLines()", () => {
  // Analytic check: the level-r contour of the cone 1 − √(x² + y²) (inside = value ≥ 1 − r) is
  // the circle of radius r, length 2πr, area πr².
  // Tolerance (derived): the polygon's chords are at most √2·h long, so each
  // falls short of its arc by a relative θ²/24 with θ ≤ √2·h/r (length) and
  // encloses a relative θ²/6 less (area); linear interpolation of the cone along
  // a grid edge puts vertices within about h²/(8r) of the circle. For r = 1
  // these sum to ≈ 0.21 h² (length) and ≈ 0.58 h² (area); we allow h².
  for (const n of [21, 101]) {
    test(`contourLines() traces a circle on a ${n}×${n} grid within h² of 2πr and πr²`, () => {
      const grid = sample((x, y) => 1 - Math.hypot(x, y), -2, 2, n);
      const h = grid.dx!;
      const lines = contourLines(grid, 0); // 1 − ρ ≥ 0 ⇔ ρ ≤ 1
      expect(lines.length).toBe(1);
      const line = lines[0]!;
      // Closed: the first point repeats at the end.
      expect(line[line.length - 2]).toBe(line[0]);
      expect(line[line.length - 1]).toBe(line[1]);
      const length = polylineLength(line);
      const area = Math.abs(polygonArea(line));
      expect(Math.abs(length - 2 * Math.PI) / (2 * Math.PI)).toBeLessThan(h * h);
      expect(Math.abs(area - Math.PI) / Math.PI).toBeLessThan(h * h);
    });
  }

  test("contourLines() error shrinks about as h² (grid 21 vs 101 points)", () => {
    const err = (n: number) => {
      const line = contourLines(sample((x, y) => 1 - Math.hypot(x, y), -2, 2, n), 0)[0]!;
      return Math.abs(Math.abs(polygonArea(line)) - Math.PI);
    };
    // h shrinks by 5, so a second-order error shrinks by ≈ 25; ask for at least 10.
    expect(err(21) / err(101)).toBeGreaterThan(10);
  });

  test("contourLines() is exact on a linear field and leaves open lines at the border", () => {
    // f = x on [0, 1]²: the 0.3 contour is the segment x = 0.3 from y = 0 to y = 1.
    const lines = contourLines(sample((x) => x, 0, 1, 11), 0.3);
    expect(lines.length).toBe(1);
    const line = lines[0]!;
    for (let k = 0; k < line.length; k += 2) expect(line[k]).toBeCloseTo(0.3, 14);
    expect(polylineLength(line)).toBeCloseTo(1, 14);
  });

  test("contourLines() finds two loops around two separate peaks", () => {
    const bump = (x: number, y: number, cx: number) => Math.exp(-((x - cx) ** 2 + y * y) / 0.1);
    const grid = sample((x, y) => bump(x, y, -1) + bump(x, y, 1), -2, 2, 81);
    expect(contourLines(grid, 0.5).length).toBe(2);
  });

  test("contourLines() resolves a saddle cell by its centre value", () => {
    // Corners 00 and 11 inside (value 1), 10 and 01 outside (0); centre mean 0.5.
    const grid: Grid = { values: Float64Array.of(1, 0, 0, 1), nx: 2, ny: 2 };
    // Level 0.4: centre inside → the inside corners join; two segments cut off the outside corners.
    const joined = contourLines(grid, 0.4);
    expect(joined.length).toBe(2);
    // Level 0.6: centre outside → two segments cut off the inside corners.
    const apart = contourLines(grid, 0.6);
    expect(apart.length).toBe(2);
    // Cutting off corner 10 = (1, 0) at 0.4: crossings at x = 0.6 on the bottom edge, y = 0.4 on the right.
    const pts = joined.map((l) => Array.from(l));
    expect(pts).toContainEqual([0.6, 0, 1, 0.4]);
  });

  test("contourLines() refuses a grid smaller than 2 × 2", () => {
    expect(() => contourLines({ values: new Float64Array(1), nx: 1, ny: 1 }, 0)).toThrow(
      RangeError,
    );
  });
});

describe("hpdLevels()", () => {
  test("hpdLevels() picks the smallest set of cells reaching each mass by hand", () => {
    // Sorted 4, 3, 2, 1 (total 10): running sums 4, 7, 9, 10.
    // 50% → 5 first reached at 3; 70% → 7 reached at 3 (≥); 95% → 9.5 reached at 1.
    expect(hpdLevels([2, 4, 1, 3], [0.5, 0.7, 0.95])).toEqual([3, 3, 1]);
    expect(hpdLevels([0, 0], [0.5])[0]).toBeNaN();
  });

  // Analytic check: for a standard bivariate normal the highest-density region of
  // mass q is the disc r² ≤ −2 ln(1 − q) (R² ~ χ² with 2 degrees of freedom,
  // P(R² ≤ s) = 1 − e^(−s/2); standard result), so its contour encloses the area
  // −2π ln(1 − q).
  // Tolerance (derived): cell masses are at most h²/(2π), so the level's mass is off
  // by less than that; near the boundary dq/dA = (1 − q)/(2π), giving a relative
  // area error below h²/((1 − q) A) ≈ 1e-3 for h = 0.025 and q = 0.95; the polygon
  // adds ~h² (see above). We allow 5e-3.
  for (const q of [0.68, 0.95]) {
    test(`hpdLevels() + contourLines() give the analytic ${q * 100}% region of a 2-D normal`, () => {
      const grid = sample((x, y) => Math.exp(-(x * x + y * y) / 2) / (2 * Math.PI), -5, 5, 401);
      const [level] = hpdLevels(grid.values, [q]);
      const lines = contourLines(grid, level!);
      expect(lines.length).toBe(1);
      const area = Math.abs(polygonArea(lines[0]!));
      const want = -2 * Math.PI * Math.log(1 - q);
      expect(Math.abs(area - want) / want).toBeLessThan(5e-3);
    });
  }
});

describe("histograms", () => {
  test("histogram2d() counts points into bin-centred cells with an empty margin", () => {
    const g = histogram2d({ x: [0.1, 0.1, 0.9, 2], y: [0.1, 0.2, 0.9, 0.5] }, {
      x: [0, 1],
      y: [0, 1],
    }, { bins: [2, 2], margin: 1 });
    expect([g.nx, g.ny]).toEqual([4, 4]);
    // Bin (0, 0) of the data sits at (1, 1) with the margin; its centre is x = 0.25.
    expect(g.values[1 * 4 + 1]).toBe(2);
    expect(g.values[2 * 4 + 2]).toBe(1);
    expect(g.x0! + g.dx!).toBeCloseTo(0.25, 14);
    let total = 0;
    for (const v of g.values) total += v;
    expect(total).toBe(3); // the point at x = 2 is outside
  });

  test("histogram1d() puts the upper bound in the last bin", () => {
    expect(Array.from(histogram1d([0, 0.5, 1, NaN, 3], [0, 1], { bins: 2 }))).toEqual([1, 2]);
  });

  test("smoothGrid() keeps the total of a point away from the edges", () => {
    const values = new Float64Array(21 * 21);
    values[10 * 21 + 10] = 1;
    const s = smoothGrid({ values, nx: 21, ny: 21 }, 1.5);
    let total = 0;
    for (const v of s.values) total += v;
    // The kernel is normalised and fits inside the grid (3σ = 4.5 < 10 cells).
    expect(total).toBeCloseTo(1, 12);
    expect(s.values[10 * 21 + 10]).toBeLessThan(1);
  });
});
