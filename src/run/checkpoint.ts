/**
 * Checkpoints: the sampler state after the last flushed block, replaced
 * atomically, with the previous one kept as a fallback.
 * @module
 */
import { InputError } from "../errors.ts";
import { writeFileAtomic } from "./atomic.ts";
import { crc32 } from "./crc32.ts";
import { runPath } from "./layout.ts";

/** What a checkpoint records. `state` is the sampler's serialised state. */
export interface Checkpoint {
  /** Steps completed and flushed to the chain file. */
  readonly step: number;
  /** Length of the chain file that holds exactly those steps. */
  readonly chainBytes: number;
  /** Steps the run was asked to reach. */
  readonly targetSteps: number;
  readonly savedAt: string;
  readonly state: unknown;
}

/**
 * Save a checkpoint: the new one is written to a temporary file and fsynced,
 * the current one becomes `checkpoint.prev.json`, then the new one is renamed
 * into place. A crash at any point leaves at least one valid checkpoint.
 */
export async function saveCheckpoint(dir: string, cp: Checkpoint): Promise<void> {
  const body = JSON.stringify(cp);
  const text = JSON.stringify({ crc32: crc32(new TextEncoder().encode(body)), body }) + "\n";
  const path = runPath(dir, "checkpoint");
  const staged = `${path}.staged`;
  await writeFileAtomic(staged, text);
  try {
    await Deno.rename(path, runPath(dir, "checkpointPrev"));
  } catch (err) {
    if (!(err instanceof Deno.errors.NotFound)) throw err;
  }
  await Deno.rename(staged, path);
}

/** A checkpoint as loaded, and whether the fallback had to be used. */
export interface LoadedCheckpoint {
  readonly checkpoint: Checkpoint;
  readonly usedFallback: boolean;
  /** Why the newest checkpoint was not used, when `usedFallback`. */
  readonly reason?: string;
}

/** Load the newest valid checkpoint; fall back to the previous one if needed. */
export async function loadCheckpoint(dir: string): Promise<LoadedCheckpoint> {
  const first = await tryRead(runPath(dir, "checkpoint"));
  if (first.ok) return { checkpoint: first.value, usedFallback: false };
  const second = await tryRead(runPath(dir, "checkpointPrev"));
  if (second.ok) return { checkpoint: second.value, usedFallback: true, reason: first.reason };
  throw new InputError(
    `no usable checkpoint: ${first.reason}; previous: ${second.reason}`,
    { file: runPath(dir, "checkpoint") },
  );
}

type Read = { ok: true; value: Checkpoint } | { ok: false; reason: string };

async function tryRead(path: string): Promise<Read> {
  let text: string;
  try {
    text = await Deno.readTextFile(path);
  } catch (err) {
    if (err instanceof Deno.errors.NotFound) return { ok: false, reason: `${path} is missing` };
    return { ok: false, reason: `${path}: ${(err as Error).message}` };
  }
  try {
    const outer = JSON.parse(text) as { crc32: number; body: string };
    if (
      typeof outer.body !== "string" || crc32(new TextEncoder().encode(outer.body)) !== outer.crc32
    ) {
      return { ok: false, reason: `${path} fails its checksum` };
    }
    const cp = JSON.parse(outer.body) as Checkpoint;
    if (!Number.isInteger(cp.step) || !Number.isInteger(cp.chainBytes) || cp.state === undefined) {
      return { ok: false, reason: `${path} lacks step, chainBytes or state` };
    }
    return { ok: true, value: cp };
  } catch {
    return { ok: false, reason: `${path} is not valid JSON` };
  }
}
