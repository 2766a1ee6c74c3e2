/**
 * The run status file: what a watcher needs to know about the writer.
 * @module
 */
import { writeFileAtomic } from "./atomic.ts";
import { runPath } from "./layout.ts";
import { isAlive, processStartTicks } from "./lock.ts";

export type WriterState = "starting" | "running" | "finished" | "stopped" | "failed";

export interface RunStatus {
  readonly state: WriterState;
  readonly pid: number;
  readonly host: string;
  readonly startTicks: number | null;
  readonly step: number;
  readonly targetSteps: number;
  readonly threads: number;
  readonly stepsPerSecond: number;
  readonly startedAt: string;
  readonly updatedAt: string;
  readonly message?: string;
}

/** Write the status file atomically. */
export async function writeStatus(
  dir: string,
  s: Omit<RunStatus, "pid" | "host" | "startTicks" | "updatedAt">,
): Promise<void> {
  const full: RunStatus = {
    ...s,
    pid: Deno.pid,
    host: Deno.hostname(),
    startTicks: processStartTicks(Deno.pid),
    updatedAt: new Date().toISOString(),
  };
  await writeFileAtomic(runPath(dir, "status"), JSON.stringify(full) + "\n");
}

/** Read the status, turning a `running` status whose writer is dead into `stale`. */
export async function readStatus(
  dir: string,
): Promise<(Omit<RunStatus, "state"> & { state: WriterState | "stale" }) | null> {
  try {
    const s = JSON.parse(await Deno.readTextFile(runPath(dir, "status"))) as RunStatus;
    if ((s.state === "running" || s.state === "starting") && !isAlive(s)) {
      return { ...s, state: "stale" };
    }
    return s;
  } catch {
    return null;
  }
}
