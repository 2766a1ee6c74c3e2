/**
 * Reading a spec file and its data files from disk.
 * @module
 */
import { concatRvTables, parseRvCsv } from "../data/mod.ts";
import { InputError } from "../errors.ts";
import { parseSpecText } from "./parse.ts";
import { type Problem, resolveProblem } from "./resolve.ts";

/** Read `specPath` and the data it names; validate everything. */
export async function loadProblem(specPath: string): Promise<Problem> {
  const text = await readText(specPath, "spec");
  const abs = await Deno.realPath(specPath);
  const dir = abs.slice(0, abs.lastIndexOf("/")) || "/";
  const written = parseSpecText(text, { file: specPath, dir });
  const tables = [];
  for (const f of written.dataFiles) {
    tables.push(parseRvCsv(await readText(f, "data"), { file: f }));
  }
  return resolveProblem(written, concatRvTables(tables));
}

async function readText(path: string, what: string): Promise<string> {
  try {
    const info = await Deno.stat(path);
    if (info.isDirectory) {
      throw new InputError(`is a folder: expected a ${what} file`, { file: path });
    }
    return await Deno.readTextFile(path);
  } catch (err) {
    if (err instanceof InputError) throw err;
    if (err instanceof Deno.errors.NotFound) {
      throw new InputError(`no such ${what} file`, { file: path });
    }
    if (err instanceof TypeError) {
      throw new InputError(`cannot read ${what} file as UTF-8 text`, { file: path });
    }
    throw new InputError(`cannot read ${what} file: ${(err as Error).message}`, { file: path });
  }
}
