/**
 * Building SVG text (private to `src/report/svg/`): escaping, compact numbers,
 * elements, paths and the document wrapper.
 * @module
 */
import { STYLE } from "./style.ts";

/** Escape text for XML character data and attribute values. */
export function esc(text: string): string {
  return text.replace(
    /[&<>"']/g,
    (c) =>
      c === "&"
        ? "&amp;"
        : c === "<"
        ? "&lt;"
        : c === ">"
        ? "&gt;"
        : c === '"'
        ? "&quot;"
        : "&apos;",
  );
}

/** A pixel coordinate with at most two decimals ("-0" becomes "0"). */
export function px(x: number): string {
  const r = Math.round(x * 100) / 100;
  return Object.is(r, -0) ? "0" : String(r);
}

type AttrValue = string | number | undefined;

/** One element; attributes with `undefined` values are left out; numbers go through {@link px}. */
export function tag(name: string, attrs: Record<string, AttrValue>, content?: string): string {
  let s = `<${name}`;
  for (const [k, v] of Object.entries(attrs)) {
    if (v === undefined) continue;
    s += ` ${k}="${typeof v === "number" ? px(v) : esc(v)}"`;
  }
  return content === undefined ? `${s}/>` : `${s}>${content}</${name}>`;
}

/** A text element (content escaped). */
export function text(
  x: number,
  y: number,
  content: string,
  attrs: Record<string, AttrValue> = {},
): string {
  return tag("text", { x, y, ...attrs }, esc(content));
}

/**
 * Path data through mapped points; a non-finite point breaks the line so gaps
 * show as gaps.
 */
export function linePath(
  xs: ArrayLike<number>,
  ys: ArrayLike<number>,
  mapX: (v: number) => number,
  mapY: (v: number) => number,
): string {
  const parts: string[] = [];
  let pen = false;
  for (let i = 0; i < xs.length; i++) {
    const x = mapX(xs[i]!);
    const y = mapY(ys[i]!);
    if (!Number.isFinite(x) || !Number.isFinite(y)) {
      pen = false;
      continue;
    }
    parts.push(`${pen ? "L" : "M"}${px(x)} ${px(y)}`);
    pen = true;
  }
  return parts.join("");
}

/**
 * Path data of the closed band between `lo` and `hi` over `xs` (forward along
 * `hi`, back along `lo`); non-finite points split the band into pieces.
 */
export function bandPath(
  xs: ArrayLike<number>,
  lo: ArrayLike<number>,
  hi: ArrayLike<number>,
  mapX: (v: number) => number,
  mapY: (v: number) => number,
): string {
  const pieces: string[] = [];
  let start = -1;
  const flush = (end: number) => {
    if (start < 0 || end - start < 2) return;
    const up: string[] = [];
    const down: string[] = [];
    for (let i = start; i < end; i++) up.push(`${px(mapX(xs[i]!))} ${px(mapY(hi[i]!))}`);
    for (let i = end - 1; i >= start; i--) down.push(`${px(mapX(xs[i]!))} ${px(mapY(lo[i]!))}`);
    pieces.push(`M${up.join("L")}L${down.join("L")}Z`);
  };
  for (let i = 0; i < xs.length; i++) {
    const ok = Number.isFinite(mapX(xs[i]!)) && Number.isFinite(mapY(lo[i]!)) &&
      Number.isFinite(mapY(hi[i]!));
    if (ok && start < 0) start = i;
    if (!ok) {
      flush(i);
      start = -1;
    }
  }
  flush(xs.length);
  return pieces.join("");
}

/** The whole document: XML declaration, white background, house font. */
export function svgDocument(
  width: number,
  height: number,
  body: string,
  options: { title?: string } = {},
): string {
  const head = `<?xml version="1.0" encoding="UTF-8"?>\n`;
  const open = `<svg xmlns="http://www.w3.org/2000/svg" width="${px(width)}" height="${
    px(height)
  }" viewBox="0 0 ${px(width)} ${
    px(height)
  }" font-family="${STYLE.fontFamily}" font-size="${STYLE.tickSize}" fill="${STYLE.ink}">`;
  const title = options.title === undefined ? "" : `<title>${esc(options.title)}</title>`;
  const bg = tag("rect", { x: 0, y: 0, width, height, fill: "#ffffff" });
  return `${head}${open}\n${title}${bg}\n${body}\n</svg>\n`;
}
