import { describe, expect, test } from "vitest";
import {
  blockBars,
  brailleLines,
  brailleRaster,
  markColumn,
  plotCounts,
  plotLine,
  shadeLines,
} from "../../tui/draw.ts";

describe("blockBars", () => {
  test("blockBars() scales counts to eighth blocks with blanks for zero", () => {
    // ceil(8 c / 8): 1 -> 1/8 block, 2 -> 2/8, 4 -> 4/8, 8 -> full.
    expect(blockBars([0, 1, 2, 4, 8])).toBe(" ▁▂▄█");
    expect(blockBars([0, 0])).toBe("  ");
  });
});

describe("braille", () => {
  test("brailleLines() encodes single dots as in the Unicode Braille Patterns block", () => {
    // The Unicode Standard, Braille Patterns U+2800..U+28FF: dot 1 = bit 0 (top left),
    // dot 4 = bit 3 (top right), dot 7 = bit 6 (bottom left), dot 8 = bit 7 (bottom right).
    const dot = (x: number, y: number) => {
      const r = brailleRaster(1, 1);
      r.pixels[y * r.width + x] = 1;
      return brailleLines(r)[0];
    };
    expect(dot(0, 0)).toBe("\u2801");
    expect(dot(1, 0)).toBe("\u2808");
    expect(dot(0, 3)).toBe("\u2840");
    expect(dot(1, 3)).toBe("\u2880");
    const full = brailleRaster(1, 1);
    full.pixels.fill(1);
    expect(brailleLines(full)[0]).toBe("\u28ff");
    expect(brailleLines(brailleRaster(3, 2))).toEqual(["\u2800".repeat(3), "\u2800".repeat(3)]);
  });

  test("plotLine() draws a rising series from bottom left to top right without gaps", () => {
    const r = plotLine(brailleRaster(10, 3), Float64Array.from({ length: 50 }, (_, i) => i));
    const lit = (x: number, y: number) => r.pixels[y * r.width + x] === 1;
    expect(lit(0, r.height - 1)).toBe(true);
    expect(lit(r.width - 1, 0)).toBe(true);
    for (let x = 0; x < r.width; x++) {
      let any = false;
      for (let y = 0; y < r.height; y++) any ||= lit(x, y);
      expect(any).toBe(true);
    }
  });

  test("plotLine() puts a constant series on the middle row", () => {
    const r = plotLine(brailleRaster(4, 2), Float64Array.of(5, 5, 5));
    const rows = new Set<number>();
    r.pixels.forEach((p, i) => {
      if (p) rows.add(Math.floor(i / r.width));
    });
    expect([...rows]).toEqual([Math.floor((r.height - 1) / 2)]);
  });

  test("plotCounts() flips histogram rows so the lowest y is at the bottom", () => {
    const r = brailleRaster(1, 1); // 2 x 4 pixels
    const counts = new Float64Array(8);
    counts[0] = 1; // row 0 (lowest y), column 0
    plotCounts(r, counts);
    expect(brailleLines(r)[0]).toBe("\u2840");
  });

  test("markColumn() dots every second pixel of a column", () => {
    const r = markColumn(brailleRaster(1, 1), 0);
    // Rows 0 and 2 of the left column: dots 1 and 3 = bits 0 and 2.
    expect(brailleLines(r)[0]).toBe("\u2805");
  });
});

describe("shadeLines", () => {
  test("shadeLines() draws the innermost level darkest with the top row first", () => {
    // Two rows, two columns; row 0 (bottom) = levels 4, 1; row 1 (top) = 0, 2.
    expect(shadeLines([4, 1, 0, 2], 2, 4)).toEqual([" ▒", "█░"]);
  });
});
