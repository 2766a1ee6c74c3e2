/**
 * The run manifest: what was run, so that a run can be resumed, merged only
 * with compatible runs, and summarised long after.
 * @module
 */
import { InputError } from "../errors.ts";
import type { ModelSpec } from "../spec/types.ts";
import type { ProblemData } from "../spec/resolve.ts";
import { writeFileAtomic } from "./atomic.ts";
import { runPath } from "./layout.ts";

/** Version of rvwalk that writes run directories. */
export const RVWALK_VERSION = "0.1.0";
/** Run-directory format version; readers refuse newer ones. */
export const RUN_FORMAT_VERSION = 1;

/** Columns stored before the parameters for each (step, walker). */
export const LEADING_COLUMNS = ["log_posterior", "accepted"] as const;

export interface ManifestParameter {
  readonly key: string;
  readonly unit: string;
  readonly transform: string;
}

export interface Manifest {
  readonly format: "rvwalk-run";
  readonly formatVersion: number;
  readonly rvwalkVersion: string;
  readonly createdAt: string;
  readonly spec: ModelSpec;
  /** The data as fitted (instrument indices refer to spec.instruments). */
  readonly data: { time: number[]; rv: number[]; rvErr: number[]; instrument: number[] };
  readonly dataHash: string;
  readonly modelHash: string;
  readonly parameters: readonly ManifestParameter[];
  /** All stored columns: LEADING_COLUMNS then parameter keys. */
  readonly columns: readonly string[];
  readonly walkers: number;
  readonly seed: number;
  /** Stored row k of the chain is sampler step (k + 1)·thin (absent in old runs: 1). */
  readonly thin?: number;
  readonly moves: ModelSpec["sampler"]["moves"];
  /** For merged runs: the source runs, each contributing `walkers` chains. */
  readonly sources?: readonly {
    readonly dir: string;
    readonly walkers: number;
    readonly seed: number;
  }[];
}

/** SHA-256 hex of text. */
export async function sha256Hex(text: string): Promise<string> {
  const d = await crypto.subtle.digest("SHA-256", new TextEncoder().encode(text));
  return Array.from(new Uint8Array(d), (b) => b.toString(16).padStart(2, "0")).join("");
}

/** Hash of the data as fitted. */
export function dataHash(data: ProblemData, instruments: readonly string[]): Promise<string> {
  const rows: string[] = [];
  for (let i = 0; i < data.count; i++) {
    rows.push(`${data.time[i]},${data.rv[i]},${data.rvErr[i]},${instruments[data.instrument[i]!]}`);
  }
  return sha256Hex(rows.join("\n"));
}

/** Hash of the model definition (planets, instruments, trend, star; not sampler settings or paths). */
export function modelHash(spec: ModelSpec): Promise<string> {
  const { star, instruments, planets, trend } = spec;
  return sha256Hex(
    JSON.stringify({
      star,
      instruments: instruments.map(({ name, offset, jitter }) => ({ name, offset, jitter })),
      planets,
      trend: trend ?? null,
    }),
  );
}

/** Write the manifest atomically. */
export async function writeManifest(dir: string, m: Manifest): Promise<void> {
  await writeFileAtomic(runPath(dir, "manifest"), JSON.stringify(m, null, 1) + "\n");
}

/** Read and check a manifest. Throws {@link InputError} naming the file. */
export async function readManifest(dir: string): Promise<Manifest> {
  const file = runPath(dir, "manifest");
  let text: string;
  try {
    text = await Deno.readTextFile(file);
  } catch (err) {
    if (err instanceof Deno.errors.NotFound) {
      throw new InputError("found no manifest: expected a run directory written by rvwalk run", {
        file,
      });
    }
    throw new InputError(
      `cannot read manifest: ${String((err as Error).message).split("\n")[0]}`,
      { file },
    );
  }
  let m: Manifest;
  try {
    m = JSON.parse(text);
  } catch (err) {
    throw new InputError(
      `found text that is not valid JSON (${
        String((err as Error).message).split("\n")[0]
      }): expected the manifest written by rvwalk run`,
      { file },
    );
  }
  if (typeof m !== "object" || m === null || m.format !== "rvwalk-run") {
    throw new InputError(
      `found ${
        JSON.stringify((m as { format?: unknown } | null)?.format ?? null)
      }: expected "rvwalk-run"`,
      { file, field: "format" },
    );
  }
  if (!Number.isInteger(m.formatVersion) || m.formatVersion < 1) {
    throw new InputError(
      `found ${JSON.stringify(m.formatVersion ?? null)}: expected a whole number ≥ 1`,
      { file, field: "formatVersion" },
    );
  }
  if (m.formatVersion > RUN_FORMAT_VERSION) {
    throw new InputError(
      `found run-directory format ${m.formatVersion}, written by a newer rvwalk (${
        String(m.rvwalkVersion)
      }): expected format ≤ ${RUN_FORMAT_VERSION}, which this rvwalk ${RVWALK_VERSION} reads; upgrade rvwalk to read this run`,
      { file, field: "formatVersion" },
    );
  }
  if (!Number.isInteger(m.walkers) || m.walkers < 1) {
    throw new InputError(
      `found ${JSON.stringify(m.walkers ?? null)}: expected a whole number ≥ 1`,
      {
        file,
        field: "walkers",
      },
    );
  }
  if (
    !Array.isArray(m.columns) || m.columns.length < 2 ||
    !m.columns.every((c) => typeof c === "string")
  ) {
    throw new InputError("found no list of column names: expected columns as written by rvwalk", {
      file,
      field: "columns",
    });
  }
  if (!Array.isArray(m.parameters)) {
    throw new InputError("found no parameter list: expected parameters as written by rvwalk", {
      file,
      field: "parameters",
    });
  }
  return m;
}
