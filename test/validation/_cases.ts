/**
 * The bad-input corpus: each case is a spec/data folder and a command line,
 * with the exit code and the exact stderr the real CLI must give. `$DIR` in
 * `stderr` stands for the case's folder (the CLI names data files by their
 * absolute path).
 * @module
 */
import { BASE_SPEC, baseRows } from "./_cli.ts";

export interface InputCase {
  readonly id: string;
  readonly what: string;
  readonly spec?: string;
  readonly data?: string | Uint8Array;
  /** Default `["check", "spec.toml"]`. */
  readonly args?: readonly string[];
  readonly code: number;
  /** Exact stderr (one line, or "" for none). */
  readonly stderr: string;
  /** Something stdout must say (notes of things done on the user's behalf). */
  readonly stdout?: RegExp;
  /**
   * Set when the message comes from a file this corpus may not edit and lacks
   * the found/expected wording; says what would fix it. Only the wording check
   * is skipped: code, one line, exact text and no stack are still checked.
   */
  readonly wordingGap?: string;
}

const HEAD = "time,rv,rv_err,instrument";
/** Base rows with row `i` (0-based data row, on line i + 2) replaced. */
const withRow = (i: number, row: string): string => {
  const r = baseRows();
  r[i + 1] = row;
  return r.join("\n") + "\n";
};
const rows = (): string[] => baseRows();
const spec = (from: string, to: string): string => {
  if (!BASE_SPEC.includes(from)) throw new Error(`fixture: no \`${from}\` in the base spec`);
  return BASE_SPEC.replace(from, to);
};

/** Data-file cases, all through `rvwalk check spec.toml`. */
export const CSV_CASES: readonly InputCase[] = [
  {
    id: "D01",
    what: "NaN in a numeric field",
    data: withRow(2, "2460006.2000,NaN,1.5,specA"),
    code: 2,
    stderr: "rvwalk check: $DIR/data.csv:4: rv: found `NaN`: expected a finite number",
  },
  {
    id: "D02",
    what: "infinite value (Infinity) in time",
    data: withRow(3, "Infinity,1.0,1.5,specA"),
    code: 2,
    stderr: "rvwalk check: $DIR/data.csv:5: time: found `Infinity`: expected a finite number",
  },
  {
    id: "D03",
    what: "a number that overflows to infinity (1e999)",
    data: withRow(4, "2460012.4000,1e999,1.5,specA"),
    code: 2,
    stderr:
      "rvwalk check: $DIR/data.csv:6: rv: found `1e999` (overflows to Infinity): expected a finite number",
  },
  {
    id: "D04",
    what: "zero error",
    data: withRow(5, "2460015.5000,3.2,0,specA"),
    code: 2,
    stderr: "rvwalk check: $DIR/data.csv:7: rv_err: found 0: expected an error > 0 m/s",
  },
  {
    id: "D05",
    what: "negative error",
    data: withRow(6, "2460018.6000,3.2,-1.5,specA"),
    code: 2,
    stderr: "rvwalk check: $DIR/data.csv:8: rv_err: found -1.5: expected an error > 0 m/s",
  },
  {
    id: "D06",
    what: "missing column (no rv_err)",
    data: ["time,rv,instrument", "2460000,1.0,specA"].join("\n") + "\n",
    code: 2,
    stderr:
      "rvwalk check: $DIR/data.csv:1: rv_err: missing column `rv_err`: found the header `time,rv,instrument`: expected the columns time,rv,rv_err,instrument (any order)",
  },
  {
    id: "D07",
    what: "extra column in the header",
    data: [HEAD + ",snr", "2460000,1.0,1.5,specA,40"].join("\n") + "\n",
    code: 2,
    stderr:
      "rvwalk check: $DIR/data.csv:1: snr: found unknown column `snr` in the header `time,rv,rv_err,instrument,snr`: expected the columns time,rv,rv_err,instrument (any order)",
  },
  {
    id: "D08",
    what: "duplicated column",
    data: ["time,rv,rv,rv_err,instrument", "2460000,1.0,1.0,1.5,specA"].join("\n") + "\n",
    code: 2,
    stderr:
      "rvwalk check: $DIR/data.csv:1: rv: found the header `time,rv,rv,rv_err,instrument`, where column `rv` appears twice in the header: expected the columns time,rv,rv_err,instrument (any order), each once",
  },
  {
    id: "D09",
    what: "header repeated mid-file (two exports concatenated)",
    data: [...rows().slice(0, 11), ...rows()].join("\n") + "\n",
    code: 2,
    stderr:
      "rvwalk check: $DIR/data.csv:12: header repeated mid-file (concatenated exports?): found `time,rv,rv_err,instrument` again (first at line 1): expected a data row; remove the extra header line",
  },
  {
    id: "D10",
    what: "text in a numeric field",
    data: withRow(7, "2460021.7000,n/a,1.5,specA"),
    code: 2,
    stderr: "rvwalk check: $DIR/data.csv:9: rv: found `n/a`: expected a finite number",
  },
  {
    id: "D11",
    what: "hexadecimal number (Number() would read 0x10 as 16)",
    data: withRow(8, "2460024.8000,0x10,1.5,specA"),
    code: 2,
    stderr: "rvwalk check: $DIR/data.csv:10: rv: found `0x10`: expected a finite number",
  },
  {
    id: "D12",
    what: "empty numeric field",
    data: withRow(9, "2460027.9000,4.0,,specA"),
    code: 2,
    stderr:
      "rvwalk check: $DIR/data.csv:11: rv_err: found an empty field: expected a finite number",
  },
  {
    id: "D13",
    what: "empty file",
    data: "",
    code: 2,
    stderr:
      "rvwalk check: $DIR/data.csv:1: file is empty: found no header: expected a header line `time,rv,rv_err,instrument` then data rows",
  },
  {
    id: "D14",
    what: "header-only file",
    data: HEAD + "\n",
    code: 2,
    stderr:
      "rvwalk check: $DIR/data.csv:1: file has a header but no data rows: found only `time,rv,rv_err,instrument`: expected at least one row below it",
  },
  {
    id: "D15",
    what: "row with a missing field",
    data: withRow(10, "2460031.0000,4.0,1.5"),
    code: 2,
    stderr:
      "rvwalk check: $DIR/data.csv:12: row has 3 fields: expected 4 as in the header (time,rv,rv_err,instrument); found `2460031.0000,4.0,1.5`",
  },
  {
    id: "D16",
    what: "row with an extra field",
    data: withRow(11, "2460034.1000,4.0,1.5,specA,extra"),
    code: 2,
    stderr:
      "rvwalk check: $DIR/data.csv:13: row has 5 fields: expected 4 as in the header (time,rv,rv_err,instrument); found `2460034.1000,4.0,1.5,specA,extra`",
  },
  {
    id: "D17",
    what: "unclosed quote",
    data: withRow(12, '2460037.2000,4.0,1.5,"specA'),
    code: 2,
    stderr:
      'rvwalk check: $DIR/data.csv:14: found an opening quote at column 22 with no closing quote: expected "…" within the line',
  },
  {
    id: "D18",
    what: "bytes that are not UTF-8 (a Latin-1 export)",
    data: new TextEncoder().encode(rows().slice(0, 5).join("\n") + "\n2460012.4,1,1.5,spec\xe9\n")
      .map((b, i, a) => (b === 0xc3 && a[i + 1] === 0xa9 ? 0xe9 : b))
      .filter((b, i, a) => !(b === 0xa9 && a[i - 1] === 0xe9)),
    code: 2,
    stderr:
      "rvwalk check: $DIR/data.csv:6: found bytes that are not UTF-8 text: expected a CSV text file",
  },
  {
    id: "D19",
    what: "empty instrument name",
    data: withRow(13, "2460040.3000,4.0,1.5,"),
    code: 2,
    stderr:
      "rvwalk check: $DIR/data.csv:15: instrument: found an empty name: expected an instrument name",
  },
  {
    id: "D20",
    what: "unsorted times: sorted, and said (exit 0)",
    data: (() => {
      const r = rows();
      [r[5], r[6]] = [r[6]!, r[5]!];
      return r.join("\n") + "\n";
    })(),
    code: 0,
    stderr: "",
    stdout: /^note: \$DIR\/data\.csv: rows were not in time order .*; sorted by time$/m,
  },
  {
    id: "D21",
    what: "duplicate times: kept, and said (exit 0)",
    data: (() => {
      const r = rows();
      r[8] = r[8]!.replace(/^[^,]+/, r[7]!.split(",")[0]!);
      return r.join("\n") + "\n";
    })(),
    code: 0,
    stderr: "",
    stdout: /^note: \$DIR\/data\.csv: 1 rows share a time with the previous row .*; kept/m,
  },
  {
    id: "D22",
    what: "data file missing",
    spec: spec('files = ["data.csv"]', 'files = ["nothere.csv"]'),
    code: 2,
    stderr: "rvwalk check: $DIR/nothere.csv: no such data file: expected a CSV file of RVs",
  },
  {
    id: "D23",
    what: "data path is a folder",
    spec: spec('files = ["data.csv"]', 'files = ["."]'),
    code: 2,
    stderr: "rvwalk check: $DIR/.: found a folder: expected a CSV data file",
  },
];

/** Spec cases: `check`, or `run` where the problem only shows when sampling starts. */
export const SPEC_CASES: readonly InputCase[] = [
  {
    id: "S01",
    what: "TOML syntax error",
    spec: spec("walkers = 16", "walkers = = 16"),
    code: 2,
    stderr:
      "rvwalk check: spec.toml:17: cannot parse TOML: found invalid value at column 11: expected TOML syntax",
  },
  {
    id: "S02",
    what: "instrument in the data with no [[instrument]]: defaults, said (exit 0)",
    data: withRow(4, "2460012.4000,5.0,2.5,specB"),
    code: 0,
    stderr: "",
    stdout:
      /^note: instrument specB: no \[\[instrument\]\] table in the spec; using offset uniform/m,
  },
  {
    id: "S03",
    what: "[[instrument]] with no data",
    spec: BASE_SPEC.replace(
      "[[planet]]",
      '[[instrument]]\nname = "specZ"\noffset = 0\njitter = 1\n[[planet]]',
    ),
    code: 2,
    stderr:
      "rvwalk check: spec.toml: instrument[1].name: instrument `specZ` has no rows in the data ($DIR/data.csv): expected one of the instruments found there: specA",
  },
  {
    id: "S04",
    what: "prior with lo = hi",
    spec: spec("uniform = [10, 15]", "uniform = [15, 15]"),
    code: 2,
    stderr: "rvwalk check: spec.toml: b.period: found uniform = [15, 15]: expected lo < hi",
  },
  {
    id: "S05",
    what: "prior with lo > hi (loguniform)",
    spec: spec("loguniform = [0.1, 100]", "loguniform = [100, 0.1]"),
    code: 2,
    stderr:
      "rvwalk check: spec.toml: b.semi_amplitude: found loguniform = [100, 0.1]: expected lo < hi",
  },
  {
    id: "S06",
    what: "unknown prior kind",
    spec: spec("mass_msun = { normal = [1.0, 0.05] }", "mass_msun = { gaussian = [1.0, 0.05] }"),
    code: 2,
    stderr:
      "rvwalk check: spec.toml: star.mass_msun: found keys gaussian: expected one prior kind of uniform, loguniform, normal, truncnormal, beta, fixed (and optional start)",
  },
  {
    id: "S07",
    what: "start outside its prior",
    spec: spec("start = 12.3", "start = 16"),
    code: 2,
    stderr: "rvwalk check: spec.toml: b.period.start: found 16: expected inside the prior [10, 15]",
  },
  {
    id: "S08",
    what: "period prior longer than ten times the data span (warning, exit 0)",
    spec: spec("uniform = [10, 15], start = 12.3", "uniform = [10, 2000], start = 12.3"),
    code: 0,
    stderr:
      "warning: spec.toml: b.period: prior reaches 2000 d, more than ten times the data span of 89.9 d; the period is then weakly constrained by the data and the prior shapes the result",
  },
  {
    id: "S09",
    what: "walkers <= 2 x dimensions (spec)",
    spec: spec("walkers = 16", "walkers = 10"),
    code: 2,
    stderr:
      "rvwalk check: spec.toml: sampler.walkers: found walkers=10 for 5 free parameters: expected more than 2 × 5 = 10 (and even), e.g. 12",
  },
  {
    id: "S10",
    what: "odd number of walkers",
    spec: spec("walkers = 16", "walkers = 13"),
    code: 2,
    stderr:
      "rvwalk check: spec.toml: sampler.walkers: found walkers=13: expected an even number (two equal halves), e.g. 14",
  },
  {
    id: "S11",
    what: "steps = 0 (spec)",
    spec: spec("steps = 60", "steps = 0"),
    code: 2,
    stderr: "rvwalk check: spec.toml: sampler.steps: found 0: expected an integer ≥ 1",
  },
  {
    id: "S12",
    what: "steps negative (spec)",
    spec: spec("steps = 60", "steps = -100"),
    code: 2,
    stderr: "rvwalk check: spec.toml: sampler.steps: found -100: expected an integer ≥ 1",
  },
  {
    id: "S13",
    what: "--steps 0 on the command line",
    args: ["run", "spec.toml", "--out", "out", "--steps", "0"],
    code: 2,
    stderr: "rvwalk run: --steps: found `0`: expected a whole number ≥ 1",
  },
  {
    id: "S14",
    what: "--steps -5 on the command line",
    args: ["run", "spec.toml", "--out", "out", "--steps", "-5"],
    code: 2,
    stderr:
      'rvwalk run: --steps: found a value starting with "-": expected --steps=VALUE for such values, or a value',
  },
  {
    id: "S15",
    what: "--walkers too few for the dimensions",
    args: ["run", "spec.toml", "--out", "out", "--walkers", "8", "--threads", "1"],
    code: 2,
    stderr:
      "rvwalk run: --walkers: found walkers=8 for 5 free parameters: expected more than 2 × 5 = 10 (and even), e.g. 12",
  },
  {
    id: "S16",
    what: "unknown key in the spec (typo)",
    spec: spec("semi_amplitude =", "semi_amplitud ="),
    code: 2,
    stderr:
      "rvwalk check: spec.toml: planet[0].semi_amplitud: unknown key: expected one of name, period, tc, tp, semi_amplitude, eccentricity, omega_deg, rm",
  },
  {
    id: "S17",
    what: "eccentricity prior reaching 1",
    spec: spec(
      "semi_amplitude = { loguniform = [0.1, 100], start = 20 }",
      "semi_amplitude = { loguniform = [0.1, 100], start = 20 }\neccentricity = { uniform = [0, 1.2] }",
    ),
    code: 2,
    stderr:
      "rvwalk check: spec.toml: b.eccentricity: prior support [0, 1.2]: expected within [0, 1)",
  },
  {
    id: "S18",
    what: "star mass missing",
    spec: spec("mass_msun = { normal = [1.0, 0.05] }", ""),
    code: 2,
    stderr:
      "rvwalk check: spec.toml: star.mass_msun: missing: expected a prior on the star's mass in solar masses",
  },
  {
    id: "S19",
    what: "NaN in the spec",
    spec: spec("start = 20", "start = nan"),
    code: 2,
    stderr: "rvwalk check: spec.toml: b.semi_amplitude.start: found NaN: expected a finite number",
  },
  {
    id: "S20",
    what: "spec file missing",
    args: ["check", "nosuch.toml"],
    code: 2,
    stderr: "rvwalk check: nosuch.toml: no such spec file: expected a TOML spec",
  },
  {
    id: "S21",
    what: "unknown command-line option",
    args: ["check", "spec.toml", "--wlakers", "20"],
    code: 2,
    stderr:
      "rvwalk check: --wlakers: found unknown option `--wlakers`: expected one of --help, --debug",
  },
];
