/**
 * Cost of watching: sampler wall time for the demo model with and without a
 * watcher process attached (the dashboard's reads and diagnostics every
 * second, without drawing), alternating A/B runs to spread machine drift.
 * Target: less than 3% difference.
 *
 * Run alone: `deno run -A bench/watch_bench.ts`.
 * @module
 */
import { RunWatcher } from "../src/run/snapshot.ts";

const STEPS = 30000;
const PAIRS = 2;

async function timedRun(dir: string, watch: boolean): Promise<number> {
  const main = new URL("../src/cli/main.ts", import.meta.url).pathname;
  const spec = new URL("../examples/demo/spec.toml", import.meta.url).pathname;
  const out = `${dir}/run-${crypto.randomUUID()}`;
  const child = new Deno.Command(Deno.execPath(), {
    args: [
      "run",
      "-A",
      main,
      "run",
      spec,
      "--out",
      out,
      "--steps",
      String(STEPS),
      "--thin",
      "1",
      "--threads",
      "2",
      "--no-ui",
    ],
    stdout: "null",
    stderr: "null",
  }).spawn();
  let watching = watch;
  const watcher = (async () => {
    if (!watch) return 0;
    let loads = 0;
    while (watching) {
      try {
        await new RunWatcher(out).load();
        loads++;
      } catch {
        // not started yet
      }
      await new Promise((r) => setTimeout(r, 1000));
    }
    return loads;
  })();
  await child.status;
  watching = false;
  await watcher;
  const status = JSON.parse(await Deno.readTextFile(`${out}/status.json`));
  const seconds = (Date.parse(status.updatedAt) - Date.parse(status.startedAt)) / 1000;
  return STEPS / seconds;
}

export async function bench(): Promise<void> {
  const dir = await Deno.makeTempDir({ prefix: "rvwalk-watch-bench-" });
  try {
    const alone: number[] = [];
    const watched: number[] = [];
    for (let i = 0; i < PAIRS; i++) {
      alone.push(await timedRun(dir, false));
      watched.push(await timedRun(dir, true));
    }
    const mean = (x: number[]) => x.reduce((a, b) => a + b, 0) / x.length;
    const a = mean(alone);
    const w = mean(watched);
    console.log(
      `demo model, ${STEPS} steps, 2 threads, ${PAIRS} A/B pairs (watcher in this process, reading every 1 s)`,
    );
    console.log(
      `without watcher: ${a.toFixed(0)} steps/s  [${alone.map((x) => x.toFixed(0)).join(", ")}]`,
    );
    console.log(
      `with watcher   : ${w.toFixed(0)} steps/s  [${watched.map((x) => x.toFixed(0)).join(", ")}]`,
    );
    console.log(
      `difference: ${
        (100 * (a - w) / a).toFixed(1)
      }% (target < 3%; on 2 cores the watcher competes for a core)`,
    );
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
}

if (import.meta.main) await bench();
