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
      throw new InputError("no manifest: expected a run directory written by rvwalk run", { file });
    }
    throw new InputError(`cannot read manifest: ${(err as Error).message}`, { file });
  }
  let m: Manifest;
  try {
    m = JSON.parse(text);
  } catch (err) {
    throw new InputError(`manifest is not valid JSON: ${(err as Error).message}`, { file });
  }
  if (m?.format !== "rvwalk-run") {
    throw new InputError(`found format ${JSON.stringify(m?.format)}: expected "rvwalk-run"`, {
      file,
      field: "format",
    });
  }
  if (typeof m.formatVersion !== "number" || m.formatVersion > RUN_FORMAT_VERSION) {
    throw new InputError(
      `run directory format ${m.formatVersion} was written by a newer rvwalk (${m.rvwalkVersion}): this is ${RVWALK_VERSION}, reading format ≤ ${RUN_FORMAT_VERSION}; upgrade rvwalk`,
      { file, field: "formatVersion" },
    );
  }
  if (!Array.isArray(m.columns) || typeof m.walkers !== "number") {
    throw new InputError("manifest lacks columns or walkers", { file });
  }
  return m;
}
