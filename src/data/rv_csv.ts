/**
 * Reading radial-velocity tables: CSV with header `time,rv,rv_err,instrument`
 * (days, m/s, m/s, instrument name), columns in any order. Validation names
 * the file, line and field, what was found and what was expected.
 *
 * One line is one row: fields are separated by commas, may be padded with
 * spaces and may be quoted (`"spectro A"`, with `""` for a quote inside);
 * blank lines and lines starting with `#` are skipped; a byte-order mark is
 * ignored. Text is parsed line by line into typed arrays, so a file can be
 * streamed from disk ({@link readRvCsvFile}) with memory bounded by the
 * arrays it fills (about 34 bytes per row), not by the file's size.
 * @module
 */
import { InputError } from "../errors.ts";

/** The required columns, in any order. */
export const RV_COLUMNS = ["time", "rv", "rv_err", "instrument"] as const;

/** Longest line accepted, in characters; longer ones are not RV rows. */
export const MAX_LINE_CHARS = 65536;

/** One RV table as read, before instruments are resolved against a spec. */
export interface RvTable {
  readonly time: Float64Array;
  readonly rv: Float64Array;
  readonly rvErr: Float64Array;
  /** Distinct instrument names in order of first appearance (after sorting by time). */
  readonly instruments: readonly string[];
  /** Per row: index into `instruments`. */
  readonly instrumentIndex: Int32Array;
  /** Source files; `fileIndex` points here. */
  readonly files: readonly string[];
  /** Per row: index into `files`. */
  readonly fileIndex: Int32Array;
  /** Per row: 1-based line in its file. */
  readonly line: Int32Array;
  /** Instrument name per row (built on access; prefer `instrumentIndex` for large tables). */
  readonly instrumentName: readonly string[];
  /** Source file and 1-based line per row (built on access), for messages. */
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
  const reader = new RvRowReader(options.file);
  const lines = text.split(/\r\n|\n|\r/);
  for (let i = 0; i < lines.length; i++) reader.line(lines[i]!, i + 1);
  return reader.finish();
}

/**
 * Read an RV CSV file by streaming it line by line (for files of any size).
 * Same rules and messages as {@link parseRvCsv}; a missing file, a folder or
 * text that is not UTF-8 is an {@link InputError} too.
 */
export async function readRvCsvFile(
  path: string,
  options: { file?: string } = {},
): Promise<RvTable> {
  const file = options.file ?? path;
  let handle: Deno.FsFile;
  try {
    if ((await Deno.stat(path)).isDirectory) {
      throw new InputError("found a folder: expected a CSV data file", { file });
    }
    handle = await Deno.open(path, { read: true });
  } catch (err) {
    if (err instanceof InputError) throw err;
    if (err instanceof Deno.errors.NotFound) {
      throw new InputError("no such data file: expected a CSV file of RVs", { file });
    }
    throw new InputError(`cannot read data file: ${firstLine(err)}`, { file });
  }
  const reader = new RvRowReader(file);
  let lineNo = 0;
  let carry = "";
  const feed = (text: string, final: boolean) => {
    const buf = carry + text;
    // Keep the unfinished last line (and a trailing CR, whose LF may open the next chunk).
    let end = buf.length;
    if (!final) {
      const searchEnd = buf.endsWith("\r") ? buf.length - 2 : buf.length - 1;
      end = Math.max(buf.lastIndexOf("\n", searchEnd), buf.lastIndexOf("\r", searchEnd)) + 1;
    }
    carry = buf.slice(end);
    if (carry.length > MAX_LINE_CHARS) {
      throw new InputError(
        `found a line longer than ${MAX_LINE_CHARS} characters: expected one short row per line`,
        { file, line: lineNo + 1 },
      );
    }
    if (end === 0) return;
    const parts = buf.slice(0, end).split(/\r\n|\n|\r/);
    // Text ending in a line break leaves an empty last part that is not a line.
    const count = final ? parts.length : parts.length - 1;
    for (let i = 0; i < count; i++) reader.line(parts[i]!, ++lineNo);
  };
  const decoder = new TextDecoder("utf-8", { fatal: true });
  try {
    const buf = new Uint8Array(1 << 20);
    while (true) {
      const n = await handle.read(buf);
      if (n === null) break;
      let text: string;
      try {
        text = decoder.decode(buf.subarray(0, n), { stream: true });
      } catch {
        throw new InputError(
          "found bytes that are not UTF-8 text: expected a CSV text file",
          { file, line: lineNo + 1 + badUtf8Line(buf.subarray(0, n)) },
        );
      }
      feed(text, false);
    }
    let rest: string;
    try {
      rest = decoder.decode();
    } catch {
      throw new InputError(
        "found a file ending in the middle of a UTF-8 character: expected text",
        {
          file,
          line: lineNo + 1,
        },
      );
    }
    feed(rest, true);
  } finally {
    handle.close();
  }
  return reader.finish();
}

/** Concatenate tables from several files, re-sorting by time (stable). */
export function concatRvTables(tables: readonly RvTable[]): RvTable {
  if (tables.length === 1) return tables[0]!;
  const n = tables.reduce((a, t) => a + t.time.length, 0);
  const time = new Float64Array(n);
  const rv = new Float64Array(n);
  const rvErr = new Float64Array(n);
  const names: string[] = [];
  const nameIndex = new Map<string, number>();
  const inst = new Int32Array(n);
  const files: string[] = [];
  const fileIndex = new Int32Array(n);
  const line = new Int32Array(n);
  let o = 0;
  for (const tab of tables) {
    const fileMap = tab.files.map((f) => {
      const k = files.indexOf(f);
      return k >= 0 ? k : files.push(f) - 1;
    });
    const instMap = tab.instruments.map((name) => {
      let k = nameIndex.get(name);
      if (k === undefined) nameIndex.set(name, k = names.push(name) - 1);
      return k;
    });
    for (let i = 0; i < tab.time.length; i++, o++) {
      time[o] = tab.time[i]!;
      rv[o] = tab.rv[i]!;
      rvErr[o] = tab.rvErr[i]!;
      inst[o] = instMap[tab.instrumentIndex[i]!]!;
      fileIndex[o] = fileMap[tab.fileIndex[i]!]!;
      line[o] = tab.line[i]!;
    }
  }
  const order = timeOrder(time);
  return makeTable({
    time: permute(time, order),
    rv: permute(rv, order),
    rvErr: permute(rvErr, order),
    instrumentIndex: permute(inst, order),
    names,
    files,
    fileIndex: permute(fileIndex, order),
    line: permute(line, order),
    notes: tables.flatMap((t) => t.notes),
  });
}

/** Accumulates rows line by line into growing typed arrays. */
class RvRowReader {
  readonly #file: string;
  #header: string[] | undefined;
  #headerText = "";
  #headerLine = 0;
  #col = { time: 0, rv: 0, rv_err: 0, instrument: 0 };
  #n = 0;
  #time = new Float64Array(1024);
  #rv = new Float64Array(1024);
  #err = new Float64Array(1024);
  #inst = new Int32Array(1024);
  #line = new Int32Array(1024);
  #names: string[] = [];
  #nameIndex = new Map<string, number>();
  #lastLine = 0;

  constructor(file: string) {
    this.#file = file;
  }

  line(raw: string, lineNo: number): void {
    this.#lastLine = lineNo;
    const file = this.#file;
    if (raw.length > MAX_LINE_CHARS) {
      throw new InputError(
        `found a line longer than ${MAX_LINE_CHARS} characters: expected one short row per line`,
        { file, line: lineNo },
      );
    }
    let text = lineNo === 1 && raw.charCodeAt(0) === 0xfeff ? raw.slice(1) : raw;
    text = text.trim();
    if (text.length === 0 || text.startsWith("#")) return;
    const fields = splitFields(text, { file, line: lineNo });
    if (this.#header === undefined) {
      this.#header = fields.map((h) => h.toLowerCase());
      this.#headerText = this.#header.join(",");
      this.#headerLine = lineNo;
      this.#col = headerIndex(this.#header, { file, line: lineNo });
      return;
    }
    const header = this.#header;
    if (fields.length === header.length && fields.join(",").toLowerCase() === this.#headerText) {
      throw new InputError(
        `header repeated mid-file (concatenated exports?): found \`${
          fields.join(",")
        }\` again (first at line ${this.#headerLine}): expected a data row; remove the extra header line`,
        { file, line: lineNo },
      );
    }
    if (fields.length !== header.length) {
      throw new InputError(
        `row has ${fields.length} fields: expected ${header.length} as in the header (${this.#headerText}); found \`${
          clip(text)
        }\``,
        { file, line: lineNo },
      );
    }
    const c = this.#col;
    const t = numberField(fields[c.time]!, { file, line: lineNo, field: "time" });
    const v = numberField(fields[c.rv]!, { file, line: lineNo, field: "rv" });
    const s = numberField(fields[c.rv_err]!, { file, line: lineNo, field: "rv_err" });
    if (!(s > 0)) {
      throw new InputError(`found ${fields[c.rv_err]}: expected an error > 0 m/s`, {
        file,
        line: lineNo,
        field: "rv_err",
      });
    }
    const name = fields[c.instrument]!;
    if (name.length === 0) {
      throw new InputError("found an empty name: expected an instrument name", {
        file,
        line: lineNo,
        field: "instrument",
      });
    }
    let k = this.#nameIndex.get(name);
    if (k === undefined) {
      k = this.#names.push(name) - 1;
      this.#nameIndex.set(name, k);
    }
    if (this.#n === this.#time.length) this.#grow();
    const i = this.#n++;
    this.#time[i] = t;
    this.#rv[i] = v;
    this.#err[i] = s;
    this.#inst[i] = k;
    this.#line[i] = lineNo;
  }

  finish(): RvTable {
    const file = this.#file;
    if (this.#header === undefined) {
      throw new InputError(
        `file is empty: found no header: expected a header line \`${
          RV_COLUMNS.join(",")
        }\` then data rows`,
        { file, line: Math.max(1, this.#lastLine) },
      );
    }
    const n = this.#n;
    if (n === 0) {
      throw new InputError(
        `file has a header but no data rows: found only \`${this.#headerText}\`: expected at least one row below it`,
        { file, line: this.#headerLine },
      );
    }
    let time = this.#time.slice(0, n);
    let rv = this.#rv.slice(0, n);
    let rvErr = this.#err.slice(0, n);
    let inst = this.#inst.slice(0, n);
    let line = this.#line.slice(0, n);
    const notes: string[] = [];
    let firstDisorder = -1;
    for (let i = 1; i < n && firstDisorder < 0; i++) if (time[i]! < time[i - 1]!) firstDisorder = i;
    if (firstDisorder >= 0) {
      notes.push(
        `${file}: rows were not in time order (line ${line[firstDisorder]}: time ${
          time[firstDisorder]
        } after ${time[firstDisorder - 1]}); sorted by time`,
      );
      const order = timeOrder(time);
      time = permute(time, order);
      rv = permute(rv, order);
      rvErr = permute(rvErr, order);
      inst = permute(inst, order);
      line = permute(line, order);
    }
    let dup = 0;
    let firstDup = -1;
    for (let i = 1; i < n; i++) {
      if (time[i] === time[i - 1]) {
        if (dup++ === 0) firstDup = i;
      }
    }
    if (dup > 0) {
      notes.push(
        `${file}: ${dup} rows share a time with the previous row (first: line ${
          line[firstDup]
        }, time ${time[firstDup]}); kept as separate measurements`,
      );
    }
    return makeTable({
      time,
      rv,
      rvErr,
      instrumentIndex: inst,
      names: this.#names,
      files: [file],
      fileIndex: new Int32Array(n),
      line,
      notes,
    });
  }

  #grow(): void {
    const size = 2 * this.#time.length;
    const f = (a: Float64Array) => {
      const b = new Float64Array(size);
      b.set(a);
      return b;
    };
    const g = (a: Int32Array) => {
      const b = new Int32Array(size);
      b.set(a);
      return b;
    };
    this.#time = f(this.#time);
    this.#rv = f(this.#rv);
    this.#err = f(this.#err);
    this.#inst = g(this.#inst);
    this.#line = g(this.#line);
  }
}

/** Build a table, renumbering instruments by first appearance in row order. */
function makeTable(parts: {
  time: Float64Array;
  rv: Float64Array;
  rvErr: Float64Array;
  instrumentIndex: Int32Array;
  names: readonly string[];
  files: readonly string[];
  fileIndex: Int32Array;
  line: Int32Array;
  notes: readonly string[];
}): RvTable {
  const remap = new Int32Array(parts.names.length).fill(-1);
  const instruments: string[] = [];
  const idx = parts.instrumentIndex;
  for (let i = 0; i < idx.length; i++) {
    const k = idx[i]!;
    if (remap[k] === -1) remap[k] = instruments.push(parts.names[k]!) - 1;
    idx[i] = remap[k]!;
  }
  const { time, rv, rvErr, files, fileIndex, line, notes } = parts;
  return {
    time,
    rv,
    rvErr,
    instruments,
    instrumentIndex: idx,
    files,
    fileIndex,
    line,
    notes,
    get instrumentName() {
      return Array.from(idx, (k) => instruments[k]!);
    },
    get source() {
      return Array.from(line, (l, i) => ({ file: files[fileIndex[i]!]!, line: l }));
    },
  };
}

/** Row order sorted by time, ties kept in their original order. */
function timeOrder(time: Float64Array): Uint32Array {
  const order = new Uint32Array(time.length);
  for (let i = 0; i < order.length; i++) order[i] = i;
  return order.sort((a, b) => time[a]! - time[b]! || a - b);
}

function permute<T extends Float64Array | Int32Array>(a: T, order: Uint32Array): T {
  const out = a.slice() as T;
  for (let i = 0; i < order.length; i++) out[i] = a[order[i]!]!;
  return out;
}

/**
 * Split one line into trimmed fields. A field may be quoted (`"a,b"`, `""`
 * for a quote); text after a closing quote other than spaces is an error.
 */
function splitFields(text: string, where: { file: string; line: number }): string[] {
  if (text.indexOf('"') < 0) return text.split(",").map((f) => f.trim());
  const out: string[] = [];
  let i = 0;
  while (true) {
    while (text[i] === " " || text[i] === "\t") i++;
    if (text[i] === '"') {
      let value = "";
      let j = i + 1;
      while (true) {
        const q = text.indexOf('"', j);
        if (q < 0) {
          throw new InputError(
            `found an opening quote at column ${
              i + 1
            } with no closing quote: expected "…" within the line`,
            where,
          );
        }
        value += text.slice(j, q);
        if (text[q + 1] === '"') {
          value += '"';
          j = q + 2;
          continue;
        }
        j = q + 1;
        break;
      }
      while (text[j] === " " || text[j] === "\t") j++;
      if (j < text.length && text[j] !== ",") {
        throw new InputError(
          `found text after a closing quote at column ${j + 1}: expected a comma`,
          where,
        );
      }
      out.push(value.trim());
      if (j >= text.length) return out;
      i = j + 1;
    } else {
      const comma = text.indexOf(",", i);
      const end = comma < 0 ? text.length : comma;
      const field = text.slice(i, end).trim();
      if (field.includes('"')) {
        throw new InputError(
          `found a quote inside the unquoted field \`${field}\`: expected the whole field in quotes`,
          where,
        );
      }
      out.push(field);
      if (comma < 0) return out;
      i = comma + 1;
    }
  }
}

function headerIndex(
  header: string[],
  where: { file: string; line: number },
): Record<(typeof RV_COLUMNS)[number], number> {
  const expected = `expected the columns ${RV_COLUMNS.join(",")} (any order)`;
  const seen = new Set<string>();
  for (const h of header) {
    if (seen.has(h)) {
      throw new InputError(
        `found the header \`${
          header.join(",")
        }\`, where column \`${h}\` appears twice in the header: ${expected}, each once`,
        {
          ...where,
          field: h,
        },
      );
    }
    seen.add(h);
  }
  for (const h of header) {
    if (!(RV_COLUMNS as readonly string[]).includes(h)) {
      throw new InputError(
        `found unknown column \`${h}\` in the header \`${header.join(",")}\`: ${expected}`,
        { ...where, field: h === "" ? "(empty column name)" : h },
      );
    }
  }
  const out: Partial<Record<(typeof RV_COLUMNS)[number], number>> = {};
  for (const c of RV_COLUMNS) {
    const i = header.indexOf(c);
    if (i < 0) {
      throw new InputError(
        `missing column \`${c}\`: found the header \`${header.join(",")}\`: ${expected}`,
        { ...where, field: c },
      );
    }
    out[c] = i;
  }
  return out as Record<(typeof RV_COLUMNS)[number], number>;
}

const DECIMAL = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

function numberField(text: string, where: { file: string; line: number; field: string }): number {
  // Number("") is 0, Number("0x10") is 16: insist on a plain decimal literal.
  if (!DECIMAL.test(text)) {
    const what = text === "" ? "an empty field" : `\`${clip(text)}\``;
    throw new InputError(`found ${what}: expected a finite number`, where);
  }
  const x = Number(text);
  if (!Number.isFinite(x)) {
    throw new InputError(
      `found \`${clip(text)}\` (overflows to ${x}): expected a finite number`,
      where,
    );
  }
  return x;
}

function clip(s: string): string {
  return s.length > 40 ? `${s.slice(0, 37)}...` : s;
}

/** Lines before the first line of `bytes` that is not valid UTF-8 (0 if none is found). */
function badUtf8Line(bytes: Uint8Array): number {
  const strict = new TextDecoder("utf-8", { fatal: true });
  let start = 0;
  // Skip continuation bytes of a character begun in the previous chunk.
  while (start < 3 && start < bytes.length && (bytes[start]! & 0xc0) === 0x80) start++;
  let line = 0;
  for (let i = start; i <= bytes.length; i++) {
    if (i < bytes.length && bytes[i] !== 0x0a) continue;
    if (i === bytes.length) break; // the last piece may be cut mid-character
    try {
      strict.decode(bytes.subarray(start, i));
    } catch {
      return line;
    }
    line++;
    start = i + 1;
  }
  return 0;
}

function firstLine(err: unknown): string {
  return String((err as Error)?.message ?? err).split("\n")[0]!;
}
