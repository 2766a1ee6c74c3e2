/**
 * Shard directories without a cluster: seeds, task lists, the array script
 * (run by hand with SLURM_ARRAY_TASK_ID set, as Slurm would), merge of a
 * partly finished directory.
 */
import { afterAll, describe, expect, test, vi } from "vitest";
import { mergeShardDirectory, watchShardDirectory } from "../../src/cli/shards.ts";
import { InputError } from "../../src/errors.ts";
import { dataHash, readManifest } from "../../src/run/manifest.ts";
import { formatShardOverview, loadShardOverview } from "../../src/run/shard_watch.ts";
import {
  arraySpec,
  isShardDir,
  mergeShards,
  parseTaskList,
  readShardPlan,
  sbatchScript,
  shardSeed,
  writeShards,
} from "../../src/run/shards.ts";
import { loadProblem } from "../../src/spec/load.ts";
import { sh, writeProblem } from "./_fixture.ts";

const tmp = Deno.makeTempDirSync({ prefix: "rvwalk-shards-" });
afterAll(() => Deno.removeSync(tmp, { recursive: true }));

describe("shards without Slurm", () => {
  test("shardSeed() is seed × 1000003 + task, reduced mod 2^32", () => {
    // Independent arithmetic: 11 × 1000003 = 11000033 (exact in doubles).
    expect(shardSeed(11, 0)).toBe(11000033);
    expect(shardSeed(11, 3)).toBe(11000036);
    // 2^40 × 1000003 is a multiple of 2^32, so only the task remains.
    expect(shardSeed(2 ** 40, 5)).toBe(5);
    // 5000 × 1000003 = 5000015000 = 2^32 + 705047704.
    expect(shardSeed(5000, 1)).toBe(5000015000 - 4294967296 + 1);
    expect(() => shardSeed(-1, 0)).toThrow(RangeError);
    expect(() => shardSeed(1.5, 0)).toThrow(RangeError);
  });

  test("parseTaskList() reads lists and ranges and refuses tasks beyond the count", () => {
    expect(parseTaskList("3,5", 6)).toEqual([3, 5]);
    expect(parseTaskList("7, 0-2,1", 8)).toEqual([0, 1, 2, 7]);
    expect(() => parseTaskList("6", 6)).toThrow(InputError);
    expect(() => parseTaskList("2-1", 6)).toThrow(InputError);
    expect(() => parseTaskList("a", 6)).toThrow(/expected task indices/);
  });

  test("arraySpec() joins consecutive tasks into ranges", () => {
    expect(arraySpec([0, 1, 2, 3])).toBe("0-3");
    expect(arraySpec([1, 3])).toBe("1,3");
    expect(arraySpec([0, 1, 2, 5, 7, 8])).toBe("0-2,5,7-8");
  });

  test("writeShards() writes a self-contained directory and an array script", async () => {
    const src = `${tmp}/src1`;
    Deno.mkdirSync(src);
    const spec = writeProblem(src, { dataDir: "rv" });
    const out = `${tmp}/four`;
    const w = await writeShards(spec, {
      out,
      count: 4,
      steps: 300,
      cpusPerTask: 2,
      time: "00:10:00",
      partition: "debug",
    });
    expect(await isShardDir(out)).toBe(true);
    const plan = await readShardPlan(out);
    expect(plan.count).toBe(4);
    expect(plan.steps).toBe(300);
    expect(plan.shards.map((s) => s.seed)).toEqual([0, 1, 2, 3].map((k) => 11 * 1000003 + k));
    // The data file sat in a subfolder, so the copy's [data] files was rewritten;
    // the copy must read back to the very same data.
    expect(plan.dataFiles).toEqual(["data.csv"]);
    const original = await loadProblem(spec);
    const copy = await loadProblem(`${out}/spec.toml`);
    const names = original.spec.instruments.map((i) => i.name);
    expect(await dataHash(copy.data, names)).toBe(await dataHash(original.data, names));
    expect(Deno.readTextFileSync(`${out}/data.csv`)).toBe(
      Deno.readTextFileSync(`${src}/rv/data.csv`),
    );
    const script = Deno.readTextFileSync(w.script);
    expect(script).toContain("#SBATCH --array=0-3\n");
    expect(script).toContain("#SBATCH --cpus-per-task=2\n");
    expect(script).toContain("#SBATCH --time=00:10:00\n");
    expect(script).toContain("#SBATCH --partition=debug\n");
    expect(script).toContain(`#SBATCH --output='${w.dir}/logs/shard-%a.out'`);
    expect(script).toContain("SEEDS=(11000033 11000034 11000035 11000036)");
    const denoLine = script.split("\n").find((l) => l.startsWith("DENO="));
    expect(denoLine).toContain(Deno.execPath());
    expect((await sh("bash", ["-n", w.script])).code).toBe(0);
    // Outside a job array the script refuses to run.
    const bare = await sh("bash", [w.script], { env: { SLURM_ARRAY_TASK_ID: "" } });
    expect(bare.code).not.toBe(0);
    expect(bare.stderr).toContain("run this script with sbatch");

    // Same model again with --only: the script lists just those tasks; recorded settings stay.
    const again = await writeShards(`${out}/spec.toml`, { out, only: [1, 3] });
    expect(again.created).toBe(false);
    expect(again.array).toBe("1,3");
    const script2 = Deno.readTextFileSync(again.script);
    expect(script2).toContain("#SBATCH --array=1,3\n");
    expect(script2).toContain("#SBATCH --partition=debug\n");
    expect(sbatchScript(again.plan, again.dir, [0, 1, 2, 3])).toContain("--array=0-3");
  });

  test("writeShards() refuses a directory of another model, a non-empty folder and shrinking", async () => {
    const src = `${tmp}/src2`;
    Deno.mkdirSync(src);
    const spec = writeProblem(src);
    const out = `${tmp}/two`;
    await writeShards(spec, { out, count: 2, steps: 100 });
    const other = Deno.readTextFileSync(spec).replace("uniform = [1, 100]", "uniform = [1, 90]");
    Deno.writeTextFileSync(`${src}/other.toml`, other);
    await expect(writeShards(`${src}/other.toml`, { out, count: 2 })).rejects.toThrow(
      /different model/,
    );
    await expect(writeShards(spec, { out, count: 1 })).rejects.toThrow(/counts may only grow/);
    Deno.mkdirSync(`${tmp}/busy`);
    Deno.writeTextFileSync(`${tmp}/busy/x`, "");
    await expect(writeShards(spec, { out: `${tmp}/busy`, count: 2 })).rejects.toThrow(
      /not empty/,
    );
    await expect(writeShards(spec, { out: `${tmp}/bad`, count: 2, time: "soon" })).rejects
      .toThrow(/Slurm time/);
  });

  test(
    "job.sbatch starts a shard, then resumes it, and mergeShards() lists the unfinished",
    async () => {
      const src = `${tmp}/src3`;
      Deno.mkdirSync(src);
      const spec = writeProblem(src);
      const out = `${tmp}/byhand`;
      const w = await writeShards(spec, { out, count: 2, steps: 200 });
      // Nothing ran yet: merge refuses and names the resubmit command.
      await expect(mergeShards(out, `${tmp}/none`)).rejects.toThrow(
        /no finished shard.*--only 0-1 --submit/,
      );
      // Task 1 as Slurm would run it (the script reads only these variables).
      const env = { SLURM_ARRAY_TASK_ID: "1", SLURM_CPUS_PER_TASK: "1", SLURM_ARRAY_JOB_ID: "0" };
      const first = await sh("bash", [w.script], { env });
      expect(first.code).toBe(0);
      // Slurm would append stdout to logs/shard-1.out; here it comes back directly.
      expect(first.stdout).toContain("shard 1 started with seed 11000034");
      expect(first.stdout).toContain("finished at step 200");
      const m = await readManifest(`${out}/shard-1`);
      expect(m.seed).toBe(11000034);
      // Run again with more steps: resumes from the checkpoint.
      const more = await writeShards(spec, { out, steps: 300, only: [1] });
      expect(more.notes.join()).toContain("from 200 to 300");
      const second = await sh("bash", [w.script], { env });
      expect(second.code).toBe(0);
      expect(second.stdout).toContain("shard 1 resumed from its checkpoint");
      expect(second.stdout).toContain("finished at step 300");

      const r = await mergeShards(out, `${tmp}/pooled`);
      expect(r.pooled).toEqual([1]);
      expect(r.merged.walkers).toBe(16);
      expect(r.missing.map((x) => [x.task, x.state])).toEqual([[0, "absent"]]);
      expect(r.resubmit).toBe(
        `rvwalk shards ${out}/spec.toml --count 2 --out ${out} --only 0 --submit`,
      );
      const ov = await loadShardOverview(out);
      const text = formatShardOverview(ov);
      expect(text).toMatch(/^\s+1\s+finished\s+300\s+300/m);
      expect(text).toMatch(/^\s+0\s+absent\s+0\s+300/m);
      expect(text).toContain("need at least two shards");

      // The CLI entry points the lead wires into `merge` and `watch`.
      const said: string[] = [];
      const spy = vi.spyOn(console, "log").mockImplementation((line) =>
        void said.push(String(line))
      );
      try {
        expect(await mergeShardDirectory(out, `${tmp}/pooled2`)).toBe(0);
        expect(await watchShardDirectory(out)).toBe(0);
      } finally {
        spy.mockRestore();
      }
      const printed = said.join("\n");
      expect(printed).toContain("merged 1 of 2 shards (1): 16 walkers × 300 steps");
      expect(printed).toContain("shard 0 left out: never started");
      expect(printed).toContain(`resubmit: ${r.resubmit}`);
      expect(printed).toMatch(/^\s+1\s+finished\s+300\s+300/m);
    },
    60_000,
  );
});
