/**
 * The single-writer lock of a run directory. Created exclusively; a lock left
 * by a dead process on this host (its pid gone, or reused by a process that
 * started later) is stale and taken over.
 * @module
 */
import { InputError } from "../errors.ts";
import { runPath } from "./layout.ts";

interface LockInfo {
  pid: number;
  host: string;
  /** Process start time in clock ticks since boot (Linux /proc/PID/stat field 22). */
  startTicks: number | null;
  startedAt: string;
}

/** A held lock; call `release()` when the writer stops. */
export interface RunLock {
  release(): Promise<void>;
}

/**
 * Acquire the lock or throw {@link InputError} naming the live holder.
 * `takeOver`: treat a lock held from another host as stale too. Only for
 * callers that know no other writer can run, such as a cluster scheduler that
 * runs one instance of each array task (a node lost mid-run leaves a lock no
 * process on this host can check).
 */
export async function acquireLock(
  dir: string,
  options: { takeOver?: boolean } = {},
): Promise<RunLock> {
  const path = runPath(dir, "lock");
  const me: LockInfo = {
    pid: Deno.pid,
    host: Deno.hostname(),
    startTicks: processStartTicks(Deno.pid),
    startedAt: new Date().toISOString(),
  };
  for (let attempt = 0; attempt < 3; attempt++) {
    try {
      const f = await Deno.open(path, { write: true, createNew: true });
      await f.write(new TextEncoder().encode(JSON.stringify(me) + "\n"));
      await f.sync();
      f.close();
      return {
        async release() {
          try {
            const cur = JSON.parse(await Deno.readTextFile(path)) as LockInfo;
            if (cur.pid === me.pid && cur.host === me.host) await Deno.remove(path);
          } catch {
            // already gone
          }
        },
      };
    } catch (err) {
      if (!(err instanceof Deno.errors.AlreadyExists)) throw err;
    }
    const holder = await readLock(path);
    const otherHost = holder !== null && holder.host !== Deno.hostname();
    if (holder !== null && isAlive(holder) && !(options.takeOver && otherHost)) {
      throw new InputError(
        `run is being written by process ${holder.pid} on ${holder.host} since ${holder.startedAt}: wait for it, stop it, or use another directory${
          otherHost ? " (if that host is gone, resume with --take-lock)" : ""
        }`,
        { file: path },
      );
    }
    // Stale: remove and retry the exclusive create (another taker may win the race).
    try {
      await Deno.remove(path);
    } catch {
      // someone else removed it
    }
  }
  throw new InputError("cannot take the lock after 3 attempts", { file: path });
}

/** Read who holds the lock, or null if there is none or it is unreadable. */
export async function readLock(path: string): Promise<LockInfo | null> {
  try {
    return JSON.parse(await Deno.readTextFile(path)) as LockInfo;
  } catch {
    return null;
  }
}

/** Whether the lock's process is alive. A lock from another host counts as alive. */
export function isAlive(info: LockInfo): boolean {
  if (info.host !== Deno.hostname()) return true;
  const ticks = processStartTicks(info.pid);
  if (ticks === null) return false;
  return info.startTicks === null || info.startTicks === ticks;
}

/** Start time of a process from /proc (Linux); null when the process does not exist. */
export function processStartTicks(pid: number): number | null {
  try {
    const stat = Deno.readTextFileSync(`/proc/${pid}/stat`);
    // Field 2 (comm) may contain spaces; fields after the last ')' are space separated.
    const rest = stat.slice(stat.lastIndexOf(")") + 2).split(" ");
    const v = Number(rest[19]); // field 22 overall = index 19 after pid and comm
    return Number.isFinite(v) ? v : null;
  } catch {
    return null;
  }
}
