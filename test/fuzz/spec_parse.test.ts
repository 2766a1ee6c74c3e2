/**
 * Property tests of the TOML spec reader: arbitrary text never throws
 * anything but InputError; what it accepts is a valid spec; priors written
 * in any TOML number form read back as the same numbers. Fixed seed, bounded runs.
 */
import fc from "fast-check";
import { describe, expect, test } from "vitest";
import { InputError } from "../../src/errors.ts";
import { parseSpecText, type WrittenSpec } from "../../src/spec/mod.ts";
import type { ParamSpec } from "../../src/spec/types.ts";

const SEED = 8675309;
const file = "fuzz.toml";
const parse = (text: string) => parseSpecText(text, { file, dir: "/data" });

function attempt(text: string): WrittenSpec | InputError {
  try {
    return parse(text);
  } catch (err) {
    if (err instanceof InputError) return err;
    throw err;
  }
}

/** Every accepted parameter is usable: finite numbers, lo < hi, positive scales, start inside. */
function checkParam(p: ParamSpec): void {
  const pr = p.prior;
  const nums = Object.entries(pr).filter(([k]) => k !== "kind").map(([, v]) => v as number);
  for (const x of nums) expect(Number.isFinite(x)).toBe(true);
  if ("lo" in pr) expect(pr.lo < pr.hi).toBe(true);
  if ("sigma" in pr) expect(pr.sigma > 0).toBe(true);
  if (pr.kind === "loguniform") expect(pr.lo > 0).toBe(true);
  if (p.start !== undefined) {
    expect(Number.isFinite(p.start)).toBe(true);
    if ("lo" in pr) expect(p.start >= pr.lo && p.start <= pr.hi).toBe(true);
  }
}

function checkSpec(s: WrittenSpec): void {
  checkParam(s.star.massMsun);
  for (const w of s.writtenInstruments) {
    if (w.offset) checkParam(w.offset);
    if (w.jitter) checkParam(w.jitter);
  }
  for (const p of s.planets) {
    for (const q of [p.period, p.epoch, p.semiAmplitude, p.eccentricity, p.omegaDeg]) checkParam(q);
  }
  expect(Number.isInteger(s.sampler.walkers) && s.sampler.walkers >= 2).toBe(true);
  expect(Number.isInteger(s.sampler.steps) && s.sampler.steps >= 1).toBe(true);
  expect(Number.isSafeInteger(s.sampler.seed)).toBe(true);
}

const BASE = `title = "fuzz (invented)"
[star]
mass_msun = { normal = [0.92, 0.03] }
[data]
files = ["data.csv"]
[[instrument]]
name = "specA"
offset = { uniform = [-200, 200], start = 0 }
jitter = { loguniform = [0.01, 50], start = 2 }
[[planet]]
name = "b"
period = { loguniform = [700, 1100], start = 905 }
tc = { uniform = [2460300, 2460800], start = 2460560 }
semi_amplitude = { loguniform = [0.1, 500], start = 45 }
eccentricity = { uniform = [0, 0.95], start = 0.1 }
omega_deg = { uniform = [-180, 180], start = 0 }
[sampler]
walkers = 64
steps = 20000
seed = 7
`;

const tomlToken = fc.oneof(
  fc.constantFrom(
    "[",
    "]",
    "[[",
    "]]",
    "{",
    "}",
    "=",
    ",",
    '"',
    "'",
    "\n",
    " ",
    ".",
    "#",
    "star",
    "planet",
    "sampler",
    "mass_msun",
    "uniform",
    "start",
    "walkers",
    "inf",
    "nan",
    "-inf",
    "1e400",
    "9007199254740993",
    "true",
    "1979-05-27",
    '"""',
  ),
  fc.double().map(String),
  fc.string({ maxLength: 5 }),
);

describe("parseSpecText() on arbitrary text", () => {
  test("parseSpecText() throws only InputError, one line naming the file", () => {
    fc.assert(
      fc.property(
        fc.oneof(
          fc.string({ unit: "binary", maxLength: 200 }),
          fc.array(tomlToken, { maxLength: 60 }).map((a) => a.join("")),
        ),
        (text) => {
          const r = attempt(text);
          if (r instanceof InputError) {
            expect(r.message.startsWith(file)).toBe(true);
            expect(r.message).not.toContain("\n");
          } else {
            checkSpec(r);
          }
        },
      ),
      { seed: SEED, numRuns: 3000 },
    );
  });

  test("parseSpecText() accepts a one-character edit of a valid spec only as a valid spec", () => {
    fc.assert(
      fc.property(
        fc.nat({ max: BASE.length - 1 }),
        fc.constantFrom("replace", "insert", "delete"),
        fc.constantFrom("[", "]", "{", "}", "=", ",", '"', "\n", " ", "-", "0", "9", ".", "e", "#"),
        (pos, op, ch) => {
          const text = op === "delete"
            ? BASE.slice(0, pos) + BASE.slice(pos + 1)
            : BASE.slice(0, pos) + ch + BASE.slice(op === "insert" ? pos : pos + 1);
          const r = attempt(text);
          if (!(r instanceof InputError)) checkSpec(r);
        },
      ),
      { seed: SEED, numRuns: 3000 },
    );
  });
});

/** Ways TOML can write the same float; integers also with underscores. */
function tomlNumber(x: number, style: number): string {
  if (Number.isInteger(x) && Math.abs(x) < 1e15) {
    if (style === 1) return String(x).replace(/(\d)(?=(\d{3})+$)/g, "$1_");
    if (style === 2) return `${x}.0`;
    return String(x);
  }
  const s = style === 1 ? x.toExponential() : style === 2 ? x.toPrecision(17) : String(x);
  // TOML floats need a digit before and after a decimal point and allow e/E exponents.
  return s.includes(".") || s.includes("e") ? s : `${s}.0`;
}

describe("parseSpecText() round trip", () => {
  test("parseSpecText() reads priors back as exactly the numbers written", () => {
    // `+ 0` turns -0 into 0: String(-0) is "0", so -0 cannot be written this way.
    const finite = fc.double({ noNaN: true, noDefaultInfinity: true, min: -1e300, max: 1e300 })
      .map((x) => x + 0);
    fc.assert(
      fc.property(
        finite,
        finite,
        fc.double({ noNaN: true, min: 1e-300, max: 1e300 }),
        fc.double({ min: 0, max: 1, noNaN: true }),
        fc.nat({ max: 2 }),
        fc.integer({ min: 11, max: 100000 }),
        fc.integer({ min: 0, max: Number.MAX_SAFE_INTEGER }),
        (a, b, sigma, frac, style, walkers, seed) => {
          fc.pre(a !== b);
          const lo = Math.min(a, b);
          const hi = Math.max(a, b);
          const start = lo + frac * (hi - lo) + 0;
          fc.pre(Number.isFinite(start) && start >= lo && start <= hi);
          const text = BASE.replace(
            "offset = { uniform = [-200, 200], start = 0 }",
            `offset = { uniform = [${tomlNumber(lo, style)}, ${tomlNumber(hi, style)}], start = ${
              tomlNumber(start, style)
            } }`,
          ).replace(
            "normal = [0.92, 0.03]",
            `normal = [${tomlNumber(a, style)}, ${tomlNumber(sigma, style)}]`,
          )
            .replace("walkers = 64", `walkers = ${tomlNumber(walkers, style === 2 ? 0 : style)}`)
            .replace("seed = 7", `seed = ${seed}`);
          const s = parse(text);
          expect(s.writtenInstruments[0]!.offset).toEqual({
            prior: { kind: "uniform", lo, hi },
            start,
          });
          expect(s.star.massMsun.prior).toEqual({ kind: "normal", mu: a, sigma });
          expect(s.sampler.walkers).toBe(walkers);
          expect(s.sampler.seed).toBe(seed);
        },
      ),
      { seed: SEED, numRuns: 1500 },
    );
  });
});
