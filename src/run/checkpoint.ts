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

/**
 * Load the newest valid checkpoint; fall back to the previous one if the newest
 * is missing, damaged, or needs more chain than the chain file holds. Throws
 * {@link InputError} naming both files when neither can be used.
 */
export async function loadCheckpoint(dir: string): Promise<LoadedCheckpoint> {
  const chainSize = await fileSize(runPath(dir, "chain"));
  const first = await tryRead(runPath(dir, "checkpoint"), chainSize);
  if (first.ok) return { checkpoint: first.value, usedFallback: false };
  const second = await tryRead(runPath(dir, "checkpointPrev"), chainSize);
  if (second.ok) return { checkpoint: second.value, usedFallback: true, reason: first.reason };
  throw new InputError(
    `found no usable checkpoint (${first.reason}; ${second.reason}): expected a valid checkpoint.json or checkpoint.prev.json; the chain can still be summarised`,
    { file: runPath(dir, "checkpoint") },
  );
}

type Read = { ok: true; value: Checkpoint } | { ok: false; reason: string };

async function fileSize(path: string): Promise<number> {
  try {
    return (await Deno.stat(path)).size;
  } catch {
    return 0;
  }
}

async function tryRead(path: string, chainSize: number): Promise<Read> {
  const name = path.slice(path.lastIndexOf("/") + 1);
  let text: string;
  try {
    text = new TextDecoder("utf-8", { fatal: true }).decode(await Deno.readFile(path));
  } catch (err) {
    if (err instanceof Deno.errors.NotFound) return { ok: false, reason: `${name} is missing` };
    if (err instanceof TypeError) return { ok: false, reason: `${name} is not UTF-8 text` };
    return { ok: false, reason: `${name}: ${String((err as Error).message).split("\n")[0]}` };
  }
  let outer: unknown;
  try {
    outer = JSON.parse(text);
  } catch {
    return { ok: false, reason: `${name} is not valid JSON (truncated or overwritten?)` };
  }
  const o = outer as { crc32?: unknown; body?: unknown } | null;
  if (typeof o !== "object" || o === null || typeof o.body !== "string") {
    return { ok: false, reason: `${name} lacks its body` };
  }
  if (crc32(new TextEncoder().encode(o.body)) !== o.crc32) {
    return { ok: false, reason: `${name} fails its checksum` };
  }
  let cp: Checkpoint;
  try {
    cp = JSON.parse(o.body) as Checkpoint;
  } catch {
    return { ok: false, reason: `${name} body is not valid JSON` };
  }
  if (
    typeof cp !== "object" || cp === null || !Number.isInteger(cp.step) || cp.step < 0 ||
    !Number.isInteger(cp.chainBytes) || cp.chainBytes < 0 ||
    typeof cp.state !== "object" || cp.state === null
  ) {
    return { ok: false, reason: `${name} lacks step, chainBytes or state` };
  }
  if (cp.chainBytes > chainSize) {
    return {
      ok: false,
      reason: `${name} needs ${cp.chainBytes} bytes of chain but chain.bin holds ${chainSize}`,
    };
  }
  return { ok: true, value: cp };
}
