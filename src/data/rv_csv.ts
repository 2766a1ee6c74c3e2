/**
 * Reading radial-velocity tables: CSV with header `time,rv,rv_err,instrument`
 * (days, m/s, m/s, instrument name). Validation names the file, line and field.
 * @module
 */
import { parse } from "csv-parse/sync";
import { InputError } from "../errors.ts";

/** The required columns, in any order. */
export const RV_COLUMNS = ["time", "rv", "rv_err", "instrument"] as const;

/** One RV table as read, before instruments are resolved against a spec. */
export interface RvTable {
  readonly time: Float64Array;
  readonly rv: Float64Array;
  readonly rvErr: Float64Array;
  /** Instrument name per row. */
  readonly instrumentName: readonly string[];
  /** Source file per row and its 1-based line, for messages. */
  readonly source: readonly { readonly file: string; readonly line: number }[];
  /** Notes worth telling the user (sorting done, duplicate times). */
  readonly notes: readonly string[];
}

/**
 * Parse RV CSV text. Throws {@link InputError} naming file, line and column on
 * any bad value: missing/extra/duplicated columns, a header repeated mid-file,
 * text or NaN/infinite values in numeric fields, non-positive errors, empty files.
 * Rows are sorted by time (said in `notes`); duplicate times are kept and noted.
 */
export function parseRvCsv(text: string, options: { file: string }): RvTable {
  const file = options.file;
  let records: string[][];
  try {
    records = parse(text, {
      relax_column_count: true,
      skip_empty_lines: true,
      trim: true,
      comment: "#",
      comment_no_infix: true,
      info: false,
    }) as string[][];
  } catch (err) {
    const e = err as { lines?: number; message?: string };
    throw new InputError(`cannot parse CSV: ${e.message ?? String(err)}`, { file, line: e.lines });
  }
  // csv-parse drops blank and comment lines; recover real line numbers.
  const lineOf = recordLines(text);
  if (records.length === 0) {
    throw new InputError(
      `file is empty: expected a header line \`${RV_COLUMNS.join(",")}\` and data rows`,
      { file, line: 1 },
    );
  }
  const header = records[0]!.map((h) => h.toLowerCase());
  const index = headerIndex(header, { file, line: lineOf[0] ?? 1 });
  if (records.length === 1) {
    throw new InputError("file has a header but no data rows", { file, line: lineOf[0] ?? 1 });
  }
  const n = records.length - 1;
  const rows: { t: number; v: number; s: number; inst: string; line: number }[] = [];
  for (let r = 1; r < records.length; r++) {
    const rec = records[r]!;
    const line = lineOf[r] ?? r + 1;
    if (rec.map((c) => c.toLowerCase()).join(",") === header.join(",")) {
      throw new InputError(
        "header repeated mid-file (concatenated exports?): remove the extra header line",
        { file, line },
      );
    }
    if (rec.length !== header.length) {
      throw new InputError(
        `row has ${rec.length} fields: expected ${header.length} as in the header`,
        { file, line },
      );
    }
    const t = numberField(rec[index.time]!, { file, line, field: "time" });
    const v = numberField(rec[index.rv]!, { file, line, field: "rv" });
    const s = numberField(rec[index.rv_err]!, { file, line, field: "rv_err" });
    if (!(s > 0)) {
      throw new InputError(`found ${rec[index.rv_err]}: expected an error > 0 m/s`, {
        file,
        line,
        field: "rv_err",
      });
    }
    const inst = rec[index.instrument]!;
    if (inst.length === 0) {
      throw new InputError("found an empty name: expected an instrument name", {
        file,
        line,
        field: "instrument",
      });
    }
    rows.push({ t, v, s, inst, line });
  }
  const notes: string[] = [];
  let sorted = true;
  for (let i = 1; i < rows.length; i++) if (rows[i]!.t < rows[i - 1]!.t) sorted = false;
  if (!sorted) {
    rows.sort((a, b) => a.t - b.t || a.line - b.line);
    notes.push(`${file}: rows were not in time order; sorted by time`);
  }
  let dup = 0;
  for (let i = 1; i < rows.length; i++) if (rows[i]!.t === rows[i - 1]!.t) dup++;
  if (dup > 0) notes.push(`${file}: ${dup} rows share a time with the previous row; kept`);
  const time = new Float64Array(n);
  const rv = new Float64Array(n);
  const rvErr = new Float64Array(n);
  rows.forEach((row, i) => {
    time[i] = row.t;
    rv[i] = row.v;
    rvErr[i] = row.s;
  });
  return {
    time,
    rv,
    rvErr,
    instrumentName: rows.map((r) => r.inst),
    source: rows.map((r) => ({ file, line: r.line })),
    notes,
  };
}

/** Concatenate tables from several files, re-sorting by time. */
export function concatRvTables(tables: readonly RvTable[]): RvTable {
  const rows: {
    t: number;
    v: number;
    s: number;
    inst: string;
    src: { file: string; line: number };
  }[] = [];
  for (const tab of tables) {
    for (let i = 0; i < tab.time.length; i++) {
      rows.push({
        t: tab.time[i]!,
        v: tab.rv[i]!,
        s: tab.rvErr[i]!,
        inst: tab.instrumentName[i]!,
        src: tab.source[i]!,
      });
    }
  }
  rows.sort((a, b) => a.t - b.t);
  return {
    time: Float64Array.from(rows, (r) => r.t),
    rv: Float64Array.from(rows, (r) => r.v),
    rvErr: Float64Array.from(rows, (r) => r.s),
    instrumentName: rows.map((r) => r.inst),
    source: rows.map((r) => r.src),
    notes: tables.flatMap((t) => t.notes),
  };
}

function headerIndex(
  header: string[],
  where: { file: string; line: number },
): Record<(typeof RV_COLUMNS)[number], number> {
  const seen = new Set<string>();
  for (const h of header) {
    if (seen.has(h)) {
      throw new InputError(`column \`${h}\` appears twice in the header`, { ...where, field: h });
    }
    seen.add(h);
  }
  for (const h of header) {
    if (!(RV_COLUMNS as readonly string[]).includes(h)) {
      throw new InputError(
        `unknown column \`${h}\`: expected exactly ${RV_COLUMNS.join(",")}`,
        { ...where, field: h },
      );
    }
  }
  const out: Partial<Record<(typeof RV_COLUMNS)[number], number>> = {};
  for (const c of RV_COLUMNS) {
    const i = header.indexOf(c);
    if (i < 0) {
      throw new InputError(
        `missing column \`${c}\`: expected header ${RV_COLUMNS.join(",")}, found ${
          header.join(",")
        }`,
        { ...where, field: c },
      );
    }
    out[c] = i;
  }
  return out as Record<(typeof RV_COLUMNS)[number], number>;
}

function numberField(text: string, where: { file: string; line: number; field: string }): number {
  // Number("") is 0 and Number(" 1 ") is 1: insist on a plain decimal literal.
  if (!/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(text)) {
    const what = text === "" ? "an empty field" : `\`${text}\``;
    throw new InputError(`found ${what}: expected a finite number`, where);
  }
  const x = Number(text);
  if (!Number.isFinite(x)) {
    throw new InputError(`found \`${text}\`: expected a finite number`, where);
  }
  return x;
}

/** 1-based line number of each non-blank, non-comment record (quoted newlines not supported in RV tables). */
function recordLines(text: string): number[] {
  const out: number[] = [];
  const lines = text.split(/\r\n|\n|\r/);
  for (let i = 0; i < lines.length; i++) {
    const s = lines[i]!.trim();
    if (s.length === 0 || s.startsWith("#")) continue;
    out.push(i + 1);
  }
  return out;
}
