/**
 * Property tests of the RV CSV reader: arbitrary text never throws anything
 * but InputError and never yields a value the text does not say; valid tables
 * round-trip exactly. Fixed seeds, bounded runs.
 */
import fc from "fast-check";
import { describe, expect, test } from "vitest";
import { parseRvCsv, type RvTable } from "../../src/data/mod.ts";
import { InputError } from "../../src/errors.ts";

const SEED = 20240612;
const file = "fuzz.csv";

/** Parse, returning the table or the InputError; anything else fails the property. */
function attempt(text: string): RvTable | InputError {
  try {
    return parseRvCsv(text, { file });
  } catch (err) {
    if (err instanceof InputError) return err;
    throw err;
  }
}

/**
 * Independent check of a parsed table against its text: every row's numbers
 * are what its cited line says, errors are positive, times sorted, and the
 * number of rows is the number of data lines (no row silently lost or merged).
 */
function checkAgainstText(t: RvTable, text: string): void {
  const src = text.split(/\r\n|\n|\r/);
  const content = src.map((l, i) => ({ l: (i === 0 ? l.replace(/^\uFEFF/, "") : l).trim(), i }))
    .filter(({ l }) => l !== "" && !l.startsWith("#"));
  const header = content[0]!.l.split(",").map((h) => h.trim().toLowerCase());
  expect(t.time.length).toBe(content.length - 1);
  for (let r = 0; r < t.time.length; r++) {
    const raw = src[t.line[r]! - 1]!;
    if (raw.includes('"')) continue; // quoted fields: covered by the round-trip property
    const f = raw.trim().split(",").map((x) => x.trim());
    const at = (name: string) => f[header.indexOf(name)]!;
    expect(t.time[r]).toBe(Number(at("time")));
    expect(t.rv[r]).toBe(Number(at("rv")));
    expect(t.rvErr[r]).toBe(Number(at("rv_err")));
    expect(t.instruments[t.instrumentIndex[r]!]).toBe(at("instrument"));
    expect(Number.isFinite(t.time[r]!) && Number.isFinite(t.rv[r]!)).toBe(true);
    expect(t.rvErr[r]! > 0 && Number.isFinite(t.rvErr[r]!)).toBe(true);
    if (r > 0) expect(t.time[r]! >= t.time[r - 1]!).toBe(true);
  }
}

/** Tokens that CSV exports and hand edits produce. */
const token = fc.oneof(
  fc.constantFrom(
    "time",
    "rv",
    "rv_err",
    "instrument",
    ",",
    ",",
    "\n",
    "\n",
    "\r\n",
    "\r",
    " ",
    '"',
    "#",
    "NaN",
    "Infinity",
    "-",
    "+",
    "e",
    "E",
    ".",
    "0x1",
    "1_0",
    "\uFEFF",
    "specA",
  ),
  fc.integer({ min: -99999, max: 99999 }).map(String),
  fc.double().map(String),
  fc.string({ maxLength: 4 }),
);
const csvSoup = fc.array(token, { maxLength: 80 }).map((a) => a.join(""));
const validHeader = "time,rv,rv_err,instrument\n";

describe("parseRvCsv() on arbitrary text", () => {
  test("parseRvCsv() throws only InputError and never says what the text does not", () => {
    fc.assert(
      fc.property(
        fc.oneof(
          fc.string({ unit: "binary", maxLength: 200 }),
          csvSoup,
          csvSoup.map((s) => validHeader + s),
        ),
        (text) => {
          const r = attempt(text);
          if (r instanceof InputError) {
            // One line naming the file.
            expect(r.message.startsWith(`${file}:`)).toBe(true);
            expect(r.message).not.toContain("\n");
          } else {
            checkAgainstText(r, text);
          }
        },
      ),
      { seed: SEED, numRuns: 4000 },
    );
  });
});

/** A valid row: finite time and rv, positive finite error, an instrument name. */
const rowArb = fc.record({
  t: fc.double({ noNaN: true, noDefaultInfinity: true, min: -1e12, max: 1e12 }),
  v: fc.double({ noNaN: true, noDefaultInfinity: true }),
  s: fc.double({ noNaN: true, min: Number.MIN_VALUE, max: 1e300 }),
  inst: fc.oneof(
    fc.constantFrom("specA", "spec B", "s,c", 'q"uote', "Ω-grat", "tel#2"),
    fc.stringMatching(/^[A-Za-z][A-Za-z0-9_ -]{0,8}[A-Za-z0-9]$/),
  ),
});

/** Ways to write one number that all mean the same double. */
const fmt = fc.constantFrom(
  (x: number) => String(x),
  (x: number) => x.toExponential(),
  (x: number) => x.toPrecision(17),
  (x: number) => ` ${String(x)} `,
);

function quoteIfNeeded(s: string): string {
  return /[",]|^\s|\s$/.test(s) ? `"${s.replaceAll('"', '""')}"` : s;
}

describe("parseRvCsv() round trip", () => {
  test("parseRvCsv() reads back exactly the table that was written, stably sorted by time", () => {
    fc.assert(
      fc.property(
        fc.array(rowArb, { minLength: 1, maxLength: 25 }),
        fc.shuffledSubarray([0, 1, 2, 3], { minLength: 4, maxLength: 4 }),
        fc.array(fmt, { minLength: 3, maxLength: 3 }),
        fc.constantFrom("\n", "\r\n", "\r"),
        fc.array(fc.constantFrom("", "# comment, with commas", "   "), { maxLength: 3 }),
        (rows, order, [ft, fv, fs], eol, extra) => {
          const cols = ["time", "rv", "rv_err", "instrument"];
          const out = [...extra, order.map((k) => cols[k]).join(",")];
          rows.forEach((r, i) => {
            const cells = [ft!(r.t), fv!(r.v), fs!(r.s), quoteIfNeeded(r.inst)];
            out.push(order.map((k) => cells[k]).join(","));
            if (i % 7 === 3) out.push(...extra);
          });
          const t = parseRvCsv(out.join(eol) + eol, { file });
          // Expected: stable sort by time (ties keep file order), written independently here.
          const want = rows.map((r, i) => ({ ...r, i })).sort((a, b) => a.t - b.t || a.i - b.i);
          expect(t.time.length).toBe(rows.length);
          want.forEach((w, k) => {
            // === treats 0 and -0 alike: String(-0) is "0", which is the same number.
            expect(t.time[k] === w.t && t.rv[k] === w.v && t.rvErr[k] === w.s).toBe(true);
            expect(t.instruments[t.instrumentIndex[k]!]).toBe(w.inst.trim());
          });
        },
      ),
      { seed: SEED, numRuns: 1500 },
    );
  });

  test("parseRvCsv() never silently changes a table hit by a one-character edit", () => {
    const base = [
      "time,rv,rv_err,instrument",
      "2460000.125,-12.5,1.25,specA",
      "2460001.5,3.75,0.5,specB",
      "2460002.25,1e1,2,specA",
      "2460003,-0.5,1.5,specB",
    ].join("\n") + "\n";
    fc.assert(
      fc.property(
        fc.nat({ max: base.length - 1 }),
        fc.constantFrom("replace", "insert", "delete"),
        fc.constantFrom(",", "\n", '"', " ", "#", ".", "e", "-", "0", "9", "x", "N", "\r"),
        (pos, op, ch) => {
          const text = op === "delete"
            ? base.slice(0, pos) + base.slice(pos + 1)
            : base.slice(0, pos) + ch + base.slice(op === "insert" ? pos : pos + 1);
          const r = attempt(text);
          // Either a located error, or a table that is exactly what the edited text says.
          if (!(r instanceof InputError)) checkAgainstText(r, text);
        },
      ),
      { seed: SEED, numRuns: 4000 },
    );
  });
});
