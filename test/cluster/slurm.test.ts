/**
 * Shards on a real single-host Slurm cluster (slurmctld + slurmd + munge),
 * stood up by the project's own test/cluster/slurm_harness.sh. Skipped, with
 * the reason printed, only where Slurm cannot be installed (no root or no
 * apt-get); a cluster that is installed but will not start fails the test.
 */
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { shardsCommand } from "../../src/cli/shards.ts";
import { mcseQuantile } from "../../src/diagnostics/mod.ts";
import { type ChainData, readChain } from "../../src/run/chain_file.ts";
import { readManifest } from "../../src/run/manifest.ts";
import { formatShardOverview, loadShardOverview } from "../../src/run/shard_watch.ts";
import { mergeShards, readShardPlan, shardLogPath } from "../../src/run/shards.ts";
import { readStatus } from "../../src/run/status.ts";
import { CONFIG, MAIN, sh, writeProblem } from "./_fixture.ts";

const HARNESS = new URL("./slurm_harness.sh", import.meta.url).pathname;
const root = Deno.makeTempDirSync({ prefix: "rvwalk-slurm-" });
const cluster = `${root}/cluster`;
let skipReason: string | undefined;
let oldConf: string | undefined;

beforeAll(async () => {
  const r = await sh("bash", [HARNESS, "start", cluster]);
  if (r.code === 3) {
    skipReason = `Slurm cannot be installed here: ${r.stderr.trim()}`;
    console.warn(`test/cluster/slurm.test.ts skipped: ${skipReason}`);
    return;
  }
  if (r.code !== 0) {
    throw new Error(`slurm_harness.sh start failed (exit ${r.code}):\n${r.stdout}\n${r.stderr}`);
  }
  oldConf = Deno.env.get("SLURM_CONF");
  Deno.env.set("SLURM_CONF", `${cluster}/slurm.conf`);
}, 120_000);

afterAll(async () => {
  if (skipReason === undefined) {
    const r = await sh("bash", [HARNESS, "stop", cluster, "--purge"]);
    if (r.code !== 0) console.warn(`slurm_harness.sh stop: ${r.stdout}${r.stderr}`);
  }
  if (oldConf === undefined) Deno.env.delete("SLURM_CONF");
  else Deno.env.set("SLURM_CONF", oldConf);
  Deno.removeSync(root, { recursive: true });
}, 60_000);

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

/** Task index → state of every task of a job, finished ones included (-r: one line per task, else pending tasks share a line such as `2-3`). */
async function taskStates(jobId: string): Promise<Map<number, string>> {
  const r = await sh("squeue", ["-r", "-h", "-t", "all", "-j", jobId, "-o", "%K %T"]);
  const m = new Map<number, string>();
  for (const line of r.stdout.trim().split("\n")) {
    const [k, s] = line.trim().split(/\s+/);
    if (k !== undefined && s !== undefined && /^\d+$/.test(k)) m.set(Number(k), s);
  }
  return m;
}

const ACTIVE = new Set(["PENDING", "CONFIGURING", "RUNNING", "COMPLETING", "SUSPENDED"]);

/** Poll squeue until no task of `jobId` (or only `task`) is pending or running. */
async function waitJob(jobId: string, options: { task?: number; timeoutMs?: number } = {}) {
  const until = Date.now() + (options.timeoutMs ?? 120_000);
  while (Date.now() < until) {
    const st = await taskStates(jobId);
    const active = [...st].filter(([k, s]) =>
      (options.task === undefined || k === options.task) && ACTIVE.has(s)
    );
    if (st.size > 0 && active.length === 0) return st;
    await sleep(250);
  }
  throw new Error(`job ${jobId} still active: ${JSON.stringify([...await taskStates(jobId)])}`);
}

async function lastJob(dir: string): Promise<string> {
  const plan = await readShardPlan(dir);
  return plan.submissions.at(-1)!.jobId;
}

async function chainOf(dir: string): Promise<ChainData> {
  const m = await readManifest(dir);
  return (await readChain(dir, { walkers: m.walkers, columns: m.columns.length })).chain;
}

/** Median of column c after `burn` steps (all walkers pooled). */
function median(chain: ChainData, c: number, burn: number): number {
  const { data, steps, walkers, columns } = chain;
  const xs: number[] = [];
  for (let s = burn; s < steps; s++) {
    for (let w = 0; w < walkers; w++) xs.push(data[(s * walkers + w) * columns + c]!);
  }
  xs.sort((a, b) => a - b);
  const n = xs.length;
  return n % 2 === 1 ? xs[(n - 1) / 2]! : (xs[n / 2 - 1]! + xs[n / 2]!) / 2;
}

/** Sample standard deviation of column c after `burn` steps. */
function sdAfter(chain: ChainData, c: number, burn: number): number {
  const { data, steps, walkers, columns } = chain;
  let n = 0;
  let mean = 0;
  let m2 = 0;
  for (let s = burn; s < steps; s++) {
    for (let w = 0; w < walkers; w++) {
      // Welford's running variance (Welford 1962, Technometrics 4(3), 419).
      const x = data[(s * walkers + w) * columns + c]!;
      n++;
      const d = x - mean;
      mean += d / n;
      m2 += d * (x - mean);
    }
  }
  return Math.sqrt(m2 / (n - 1));
}

describe("shards on a single-host Slurm cluster", () => {
  test(
    "shardsCommand() submits a 4-task array whose pooled medians match one long run",
    async (ctx) => {
      if (skipReason !== undefined) return ctx.skip(skipReason);
      const src = `${root}/problem`;
      Deno.mkdirSync(src);
      const spec = writeProblem(src, { seed: 11 });
      const dir = `${root}/four`;
      const shardSteps = 6000;
      const longSteps = 24000;
      expect(
        await shardsCommand.run([
          spec,
          "--count",
          "4",
          "--out",
          dir,
          "--steps",
          `${shardSteps}`,
          "--submit",
        ]),
      ).toBe(0);
      const jobId = await lastJob(dir);
      // The single long run, same model and data, seed 11 (no shard uses it), beside the array.
      const long = sh(Deno.execPath(), [
        "run",
        "-A",
        "--config",
        CONFIG,
        MAIN,
        "run",
        spec,
        "--out",
        `${root}/long`,
        "--steps",
        `${longSteps}`,
        "--threads",
        "1",
        "--no-ui",
      ]);
      const states = await waitJob(jobId);
      expect([...states].sort()).toEqual([[0, "COMPLETED"], [1, "COMPLETED"], [2, "COMPLETED"], [
        3,
        "COMPLETED",
      ]]);
      const longRun = await long;
      expect(longRun.code, longRun.stderr).toBe(0);

      for (let k = 0; k < 4; k++) {
        // Seed rule stated in the plan: spec seed × 1000003 + k.
        expect((await readManifest(`${dir}/shard-${k}`)).seed).toBe(11 * 1000003 + k);
        expect((await readStatus(`${dir}/shard-${k}`))?.state).toBe("finished");
        expect(Deno.readTextFileSync(shardLogPath(dir, k))).toContain(
          `finished at step ${shardSteps}`,
        );
      }
      const ov = await loadShardOverview(dir);
      expect(ov.shards.map((s) => s.state)).toEqual([
        "finished",
        "finished",
        "finished",
        "finished",
      ]);
      expect(ov.pooledTasks).toEqual([0, 1, 2, 3]);
      expect(formatShardOverview(ov)).toContain(`last job ${jobId}`);

      const r = await mergeShards(dir, `${root}/pooled`);
      expect(r.missing).toEqual([]);
      expect(r.merged.walkers).toBe(64);
      expect(r.merged.steps).toBe(shardSteps);

      // Medians of every sampled parameter, first half of each run discarded as
      // burn-in (walkers start in a small ball near the mode; common practice, no
      // source). Tolerance: 3 × MCSE of the difference, the two runs' MCSEs of the
      // median (Vehtari et al. 2021, Bayesian Analysis 16(2), 667, sec. 4.4, via
      // mcseQuantile) combined in quadrature as the runs are independent.
      const pooled = await chainOf(`${root}/pooled`);
      const single = await chainOf(`${root}/long`);
      const m = await readManifest(`${root}/pooled`);
      expect(single.steps).toBe(longSteps);
      const keys = m.parameters.map((p) => p.key);
      expect(keys.length).toBe(5);
      for (let i = 0; i < keys.length; i++) {
        const c = 2 + i;
        const bp = Math.floor(pooled.steps / 2);
        const bl = Math.floor(single.steps / 2);
        const mp = median(pooled, c, bp);
        const ml = median(single, c, bl);
        const sp = mcseQuantile(pooled, c, { prob: 0.5, burn: bp });
        const sl = mcseQuantile(single, c, { prob: 0.5, burn: bl });
        const tol = 3 * Math.hypot(sp, sl);
        // The check is sharp: the tolerance is a small fraction of the posterior width.
        expect(tol, keys[i]).toBeLessThan(0.2 * sdAfter(single, c, bl));
        expect(Number.isFinite(tol) && tol > 0, `${keys[i]}: MCSE ${sp}, ${sl}`).toBe(true);
        expect(Math.abs(mp - ml), `${keys[i]}: pooled ${mp} ± ${sp}, single ${ml} ± ${sl}`)
          .toBeLessThan(tol);
      }
    },
    300_000,
  );

  test(
    "a shard cancelled with scancel resumes from its checkpoint when resubmitted with --only",
    async (ctx) => {
      if (skipReason !== undefined) return ctx.skip(skipReason);
      const src = `${root}/problem2`;
      Deno.mkdirSync(src);
      const spec = writeProblem(src, { seed: 5, flushSteps: 100 });
      const dir = `${root}/two`;
      const steps = 24000;
      expect(
        await shardsCommand.run([
          spec,
          "--count",
          "2",
          "--out",
          dir,
          "--steps",
          `${steps}`,
          "--submit",
        ]),
      )
        .toBe(0);
      const jobId = await lastJob(dir);
      // Cancel task 1 once it has checkpointed a few thousand steps.
      const until = Date.now() + 60_000;
      while (((await readStatus(`${dir}/shard-1`))?.step ?? 0) < 2000) {
        if (Date.now() > until) throw new Error("shard 1 never reached step 2000");
        await sleep(100);
      }
      const cancel = await sh("scancel", [`${jobId}_1`]);
      expect(cancel.code, cancel.stderr).toBe(0);
      const after = await waitJob(jobId, { task: 1 });
      expect(after.get(1)).toBe("CANCELLED");
      const stopped = await readStatus(`${dir}/shard-1`);
      expect(stopped?.state).toBe("stopped");
      const cut = stopped!.step;
      expect(cut).toBeGreaterThanOrEqual(2000);
      expect(cut).toBeLessThan(steps);
      const before = await chainOf(`${dir}/shard-1`);
      expect(before.steps).toBe(cut);
      await waitJob(jobId);

      // Merge lists the cancelled shard with the command that resubmits it.
      const partial = await mergeShards(dir, `${root}/partial`);
      expect(partial.pooled).toEqual([0]);
      expect(partial.missing.map((x) => [x.task, x.state, x.step])).toEqual([[1, "stopped", cut]]);
      const cmd = partial.resubmit!;
      expect(cmd).toContain("--only 1 --submit");
      const args = cmd.split(" ");
      expect(args.slice(0, 2)).toEqual(["rvwalk", "shards"]);
      expect(await shardsCommand.run(args.slice(2))).toBe(0);
      const again = await lastJob(dir);
      expect(again).not.toBe(jobId);
      const end = await waitJob(again);
      expect([...end]).toEqual([[1, "COMPLETED"]]);

      const log = Deno.readTextFileSync(shardLogPath(dir, 1));
      expect(log).toContain("shard 1 started with seed");
      expect(log).toContain("shard 1 resumed from its checkpoint");
      expect(log).toContain(`finished at step ${steps}`);
      const done = await chainOf(`${dir}/shard-1`);
      expect(done.steps).toBe(steps);
      // The steps taken before the cancel are kept bit for bit.
      const n = cut * before.walkers * before.columns;
      expect(done.data.subarray(0, n)).toEqual(before.data);
      const full = await mergeShards(dir, `${root}/full`);
      expect(full.missing).toEqual([]);
      expect(full.merged.steps).toBe(steps);
    },
    300_000,
  );
});
