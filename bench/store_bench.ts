/**
 * Run-directory store: resident memory of the writer path (append checksummed
 * blocks, fsync, atomic checkpoint) after 10^4 and 2·10^5 steps of 64 walkers ×
 * 15 parameters (17 stored columns), and the start-up time of `resume`.
 *
 * Run alone: `deno run -A bench/store_bench.ts`.
 * @module
 */
import { appendBlock } from "../src/run/chain_file.ts";
import { saveCheckpoint } from "../src/run/checkpoint.ts";
import { ChainFollower } from "../src/run/follow.ts";

const WALKERS = 64;
const COLUMNS = 17;
const BLOCK = 500;

function rssMiB(): number {
  return Deno.memoryUsage().rss / 2 ** 20;
}

function heapMiB(): number {
  const m = Deno.memoryUsage();
  return (m.heapUsed + m.external) / 2 ** 20;
}

async function writerMemory(): Promise<void> {
  const dir = await Deno.makeTempDir({ prefix: "rvwalk-store-bench-" });
  try {
    const block = new Float64Array(BLOCK * WALKERS * COLUMNS);
    for (let i = 0; i < block.length; i++) block[i] = Math.sin(i);
    const state = { positions: "x".repeat(WALKERS * 15 * 11), rng: { s: [1, 2, 3] } };
    const marks = new Map<number, number>([[10_000, NaN], [200_000, NaN]]);
    const heap = new Map<number, number>();
    let step = 0;
    let bytes = 0;
    const t0 = performance.now();
    while (step < 200_000) {
      bytes = await appendBlock(dir, {
        firstStep: step,
        steps: BLOCK,
        walkers: WALKERS,
        columns: COLUMNS,
      }, block);
      step += BLOCK;
      await saveCheckpoint(dir, {
        step,
        chainBytes: bytes,
        targetSteps: 200_000,
        savedAt: "",
        state,
      });
      if (marks.has(step)) {
        marks.set(step, rssMiB());
        heap.set(step, heapMiB());
      }
    }
    const seconds = (performance.now() - t0) / 1000;
    const a = marks.get(10_000)!;
    const b = marks.get(200_000)!;
    console.log(
      `writer RSS at 1e4 steps: ${a.toFixed(1)} MiB; at 2e5 steps: ${b.toFixed(1)} MiB; ratio ${
        (b / a).toFixed(2)
      } (flat = 1; RSS includes garbage not yet collected)`,
    );
    console.log(
      `writer V8 heap + external at 1e4 steps: ${heap.get(10_000)!.toFixed(1)} MiB; at 2e5: ${
        heap.get(200_000)!.toFixed(1)
      } MiB`,
    );
    console.log(
      `  wrote ${(bytes / 2 ** 30).toFixed(2)} GiB in ${
        seconds.toFixed(1)
      } s with an fsync and atomic checkpoint per ${BLOCK}-step block`,
    );
    // A watcher following the whole file keeps a bounded reservoir.
    const before = rssMiB();
    const f = new ChainFollower(dir, { walkers: WALKERS, columns: COLUMNS });
    const t1 = performance.now();
    await f.poll();
    console.log(
      `watcher attach to the 2e5-step chain: ${
        ((performance.now() - t1) / 1000).toFixed(1)
      } s, RSS ${before.toFixed(1)} → ${
        rssMiB().toFixed(1)
      } MiB, reservoir ${f.stream.keptSteps} steps/walker`,
    );
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
}

async function resumeStartup(): Promise<void> {
  const main = new URL("../src/cli/main.ts", import.meta.url).pathname;
  const spec = new URL("../examples/demo/spec.toml", import.meta.url).pathname;
  const dir = await Deno.makeTempDir({ prefix: "rvwalk-resume-bench-" });
  try {
    const run = async (args: string[]) => {
      const t0 = performance.now();
      const out = await new Deno.Command(Deno.execPath(), {
        args: ["run", "-A", main, ...args],
        stdout: "null",
        stderr: "null",
      }).output();
      if (!out.success) throw new Error(`rvwalk ${args[0]} failed`);
      return (performance.now() - t0) / 1000;
    };
    await run(["run", spec, "--out", `${dir}/r`, "--steps", "2000", "--threads", "1", "--no-ui"]);
    const times: number[] = [];
    for (let i = 0; i < 3; i++) {
      times.push(await run(["resume", `${dir}/r`, "--more", "1", "--threads", "1", "--no-ui"]));
    }
    const version = await run(["--help"]).catch(() => NaN);
    times.sort((x, y) => x - y);
    console.log(
      `resume start-up (process start → one more step → exit, demo model): median ${
        times[1]!.toFixed(2)
      } s; bare CLI start ${version.toFixed(2)} s`,
    );
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
}

export async function bench(): Promise<void> {
  await writerMemory();
  await resumeStartup();
}

if (import.meta.main) await bench();
