/**
 * Names of the files in a run directory.
 *
 * ```
 * RUN/
 *   manifest.json        what was run: spec, data hash, model hash, columns, settings, version
 *   chain.bin            append-only checksummed blocks of [step][walker][column] Float64
 *   checkpoint.json      ensemble + RNG state after the last flushed block (atomic)
 *   checkpoint.prev.json the checkpoint before it (fallback if the newest is damaged)
 *   status.json          state, step, speed, pid (atomic; read by watchers)
 *   lock                 held by the one writer: pid, host, start time
 *   log.txt              output of a detached run
 * ```
 * @module
 */

export const FILES = {
  manifest: "manifest.json",
  chain: "chain.bin",
  checkpoint: "checkpoint.json",
  checkpointPrev: "checkpoint.prev.json",
  status: "status.json",
  lock: "lock",
  log: "log.txt",
} as const;

/** Path of a run-directory file. */
export function runPath(dir: string, file: keyof typeof FILES): string {
  return `${dir.replace(/\/+$/, "")}/${FILES[file]}`;
}
