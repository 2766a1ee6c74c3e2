/**
 * Reading a spec file and its data files from disk.
 * @module
 */
import { concatRvTables, readRvCsvFile } from "../data/mod.ts";
import { InputError } from "../errors.ts";
import { parseSpecText } from "./parse.ts";
import { type Problem, resolveProblem } from "./resolve.ts";

/** Largest spec file read, in bytes: a spec is a page of TOML. */
export const MAX_SPEC_BYTES = 1 << 20;

/** Read `specPath` and the data it names (streamed); validate everything. */
export async function loadProblem(specPath: string): Promise<Problem> {
  const text = await readSpecText(specPath);
  const abs = await Deno.realPath(specPath);
  const dir = abs.slice(0, abs.lastIndexOf("/")) || "/";
  const written = parseSpecText(text, { file: specPath, dir });
  const tables = [];
  for (const f of written.dataFiles) tables.push(await readRvCsvFile(f));
  return resolveProblem(written, concatRvTables(tables));
}

async function readSpecText(path: string): Promise<string> {
  const file = path;
  let bytes: Uint8Array;
  try {
    const info = await Deno.stat(path);
    if (info.isDirectory) {
      throw new InputError("found a folder: expected a TOML spec file", { file });
    }
    if (info.size > MAX_SPEC_BYTES) {
      throw new InputError(
        `found ${info.size} bytes: expected a TOML spec of at most ${MAX_SPEC_BYTES} bytes (is this a data file?)`,
        { file },
      );
    }
    bytes = await Deno.readFile(path);
  } catch (err) {
    if (err instanceof InputError) throw err;
    if (err instanceof Deno.errors.NotFound) {
      throw new InputError("no such spec file: expected a TOML spec", { file });
    }
    throw new InputError(
      `cannot read spec file: ${String((err as Error).message).split("\n")[0]}`,
      { file },
    );
  }
  try {
    return new TextDecoder("utf-8", { fatal: true }).decode(bytes);
  } catch {
    const strict = new TextDecoder("utf-8", { fatal: true });
    let line = 1;
    for (let start = 0; start <= bytes.length; line++) {
      let end = bytes.indexOf(0x0a, start);
      if (end < 0) end = bytes.length;
      try {
        strict.decode(bytes.subarray(start, end));
      } catch {
        break;
      }
      start = end + 1;
    }
    throw new InputError("found bytes that are not UTF-8: expected a TOML text file", {
      file,
      line,
    });
  }
}
