/**
 * The SBC rank histogram of one quantity as an SVG document, in the style of
 * Talts et al. 2018 (arXiv:1804.06788, Fig. 1): bars of rank counts per bin
 * over the grey 99% band a uniform histogram's counts fall in, and a dashed
 * line at the expected count N/B.
 * @module
 */
import { drawAxes, linearAxis, OKABE_ITO, STYLE } from "../report/svg/mod.ts";

/** What {@link rankHistogramSvg} draws. */
export interface RankHistogramInput {
  /** Quantity key, e.g. `b.period`. */
  readonly key: string;
  /** Ranks per bin. */
  readonly counts: readonly number[];
  /** L: ranks run 0 … L. */
  readonly draws: number;
  /** Number of simulations N. */
  readonly simulations: number;
  /** 99% band of a bin count under uniformity. */
  readonly band: readonly [number, number];
  readonly pValue: number;
  readonly chiSquare: number;
  readonly df: number;
}

const WIDTH = 520;
const HEIGHT = 330;
const BOX = { x: 70, y: 44, width: 420, height: 210 };

/** An SVG document string; pure. */
export function rankHistogramSvg(input: RankHistogramInput): string {
  const { counts, draws, simulations, band } = input;
  const bins = counts.length;
  const expected = simulations / bins;
  const top = Math.max(band[1], ...counts) * 1.08;
  const x = linearAxis([0, draws + 1], [BOX.x, BOX.x + BOX.width], {
    label: `rank of the true value among ${draws} posterior draws`,
    pad: 0,
  });
  const y = linearAxis([0, top], [BOX.y + BOX.height, BOX.y], {
    label: "simulations",
    pad: 0,
  });
  const sx = x.scale.map;
  const sy = y.scale.map;
  const parts: string[] = [];
  parts.push(
    el("rect", {
      x: BOX.x,
      y: sy(band[1]),
      width: BOX.width,
      height: sy(band[0]) - sy(band[1]),
      fill: STYLE.band,
      "fill-opacity": STYLE.bandOpacity,
      class: "uniform-band",
    }),
  );
  const binWidth = (draws + 1) / bins;
  counts.forEach((c, b) => {
    const x0 = sx(b * binWidth);
    const x1 = sx((b + 1) * binWidth);
    parts.push(
      el("rect", {
        x: x0,
        y: sy(c),
        width: x1 - x0,
        height: sy(0) - sy(c),
        fill: OKABE_ITO.blue,
        "fill-opacity": 0.85,
        stroke: "#ffffff",
        "stroke-width": 0.8,
        class: "bin",
      }),
    );
  });
  parts.push(
    el("path", {
      d: `M${r(BOX.x)} ${r(sy(expected))}H${r(BOX.x + BOX.width)}`,
      stroke: STYLE.ink,
      "stroke-width": 1,
      "stroke-dasharray": "5 3",
      fill: "none",
      class: "expected",
    }),
  );
  const p = input.pValue;
  const pText = !Number.isFinite(p) ? "?" : p < 1e-4 ? p.toExponential(1) : p.toFixed(4);
  parts.push(
    drawAxes(BOX, { x, y }, {
      title: `${input.key}: χ² uniformity p = ${pText}`,
    }),
  );
  parts.push(
    textEl(
      BOX.x + BOX.width,
      HEIGHT - 8,
      `N = ${simulations} simulations, ${bins} bins; grey: 99% band for uniform ranks; ` +
        `χ² = ${input.chiSquare.toFixed(1)} on ${input.df} dof`,
      { "text-anchor": "end", "font-size": 10, fill: STYLE.muted },
    ),
  );
  return document(parts.join("\n"), `SBC rank histogram of ${input.key}`);
}

function r(v: number): string {
  const x = Math.round(v * 100) / 100;
  return Object.is(x, -0) ? "0" : String(x);
}

function escape(s: string): string {
  return s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(
    /"/g,
    "&quot;",
  );
}

function el(name: string, attrs: Record<string, string | number>, content?: string): string {
  const a = Object.entries(attrs)
    .map(([k, v]) => ` ${k}="${typeof v === "number" ? r(v) : escape(v)}"`)
    .join("");
  return content === undefined ? `<${name}${a}/>` : `<${name}${a}>${content}</${name}>`;
}

function textEl(x: number, y: number, s: string, attrs: Record<string, string | number>): string {
  return el("text", { x, y, ...attrs }, escape(s));
}

function document(body: string, title: string): string {
  return `<?xml version="1.0" encoding="UTF-8"?>\n<svg xmlns="http://www.w3.org/2000/svg" width="${WIDTH}" height="${HEIGHT}" viewBox="0 0 ${WIDTH} ${HEIGHT}" font-family="${STYLE.fontFamily}" font-size="${STYLE.tickSize}" fill="${STYLE.ink}">\n<title>${
    escape(title)
  }</title><rect x="0" y="0" width="${WIDTH}" height="${HEIGHT}" fill="#ffffff"/>\n${body}\n</svg>\n`;
}
