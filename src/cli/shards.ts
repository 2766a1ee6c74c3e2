/** `rvwalk shards`: a Slurm job array of independent runs of one spec. @module */
import { InputError } from "../errors.ts";
import { formatShardOverview, loadShardOverview } from "../run/shard_watch.ts";
import {
  mergeShards,
  parseTaskList,
  readShardPlan,
  shellQuote,
  submitShards,
  writeShards,
} from "../run/shards.ts";
import { type Command, intOption, parseOptions, say } from "./_common.ts";

export const shardsCommand: Command = {
  name: "shards",
  summary: "split a run into a Slurm job array of shards, pooled by merge",
  help: `Usage: rvwalk shards SPEC.toml --count N --out DIR [options]

Writes the shard directory DIR: a copy of the spec and its data files
(self-contained), shards.json (count, steps, each shard's seed), and
job.sbatch, a Slurm array script whose task k samples DIR/shard-k with seed
(spec seed × 1000003 + k) mod 2^32. A task whose shard already holds a
checkpoint resumes it instead, so resubmitting a cancelled, timed-out or
failed shard continues where it stopped. Output of task k is appended to
DIR/logs/shard-k.out. The script calls this rvwalk by absolute path; it must
be reachable from the compute nodes (shared file system).

Running it again on an existing DIR (same model and data) rewrites the script,
e.g. for some tasks only (--only), more shards (a larger --count) or more
steps (--steps: resumed shards continue to the new total).

Options:
  --count N            number of shards (array tasks 0 to N-1)
  --out DIR            shard directory to create or update (required)
  --steps S            steps per shard (default: [sampler] steps)
  --partition P        Slurm partition (default: the cluster's default)
  --time T             Slurm time limit per task, e.g. 02:00:00 or 1-00:00:00
  --cpus-per-task C    cores per task, used as --threads (default 1)
  --only LIST          put only these tasks in the script, e.g. 3,5 or 0-2
  --submit             submit the script with sbatch and print the job id

Afterwards:
  rvwalk watch DIR                 progress of every shard, pooled diagnostics
  rvwalk merge DIR --out POOLED    pool the finished shards; lists the others
                                   with the command that resubmits them`,
  async run(args) {
    const { values, positionals } = parseOptions(args, {
      count: { type: "string" },
      out: { type: "string" },
      steps: { type: "string" },
      partition: { type: "string" },
      time: { type: "string" },
      "cpus-per-task": { type: "string" },
      only: { type: "string" },
      submit: { type: "boolean" },
    }, { min: 1, max: 1, names: "SPEC" });
    if (values.help) return say(this.help), 0;
    if (values.out === undefined) {
      throw new InputError("missing: expected --out DIR", { field: "--out" });
    }
    const count = intOption(values.count, "count", undefined);
    let only: number[] | undefined;
    if (values.only !== undefined) {
      let n = count;
      if (n === undefined) {
        try {
          n = (await readShardPlan(values.out)).count;
        } catch {
          throw new InputError("missing: expected --count N with --only on a new directory", {
            field: "--count",
          });
        }
      }
      only = parseTaskList(values.only, n);
    }
    const w = await writeShards(positionals[0]!, {
      out: values.out,
      count,
      steps: intOption(values.steps, "steps", undefined),
      partition: values.partition,
      time: values.time,
      cpusPerTask: intOption(values["cpus-per-task"], "cpus-per-task", undefined),
      only,
    });
    for (const n of w.notes) say(`note: ${n}`);
    const p = w.plan;
    const seeds = p.shards.map((s) => s.seed);
    say(
      `${
        w.created ? "wrote" : "updated"
      } ${p.count} shards × ${p.steps} steps (${p.walkers} walkers) in ${w.dir}`,
    );
    say(
      `seeds: ${
        seeds.length <= 6 ? seeds.join(", ") : `${seeds.slice(0, 3).join(", ")}, …, ${seeds.at(-1)}`
      } (recorded in shards.json)`,
    );
    say(`script: ${w.script}  (array ${w.array})`);
    const dir = shellQuote(w.dir);
    if (values.submit) {
      const sub = await submitShards(w.dir);
      say(`submitted job ${sub.jobId} (tasks ${sub.array})`);
      say(`queue:  squeue -j ${sub.jobId}`);
    } else {
      say(`submit: sbatch ${shellQuote(w.script)}`);
    }
    say(`watch:  rvwalk watch ${dir}`);
    say(`merge:  rvwalk merge ${dir} --out ${shellQuote(`${w.dir}-pooled`)}`);
    return 0;
  },
};

/**
 * `rvwalk merge DIR --out POOLED` for a shard directory: pools the finished
 * shards, lists the others by task with the resubmit command. Exit 0 when
 * something was merged (even with shards missing).
 */
export async function mergeShardDirectory(dir: string, out: string): Promise<number> {
  const r = await mergeShards(dir, out);
  for (const n of r.merged.notes) say(`note: ${n}`);
  say(
    `merged ${r.pooled.length} of ${r.pooled.length + r.missing.length} shards (${
      r.pooled.join(",")
    }): ${r.merged.walkers} walkers × ${r.merged.steps} steps → ${out}`,
  );
  for (const m of r.missing) say(`shard ${m.task} left out: ${m.reason}`);
  if (r.resubmit !== undefined) say(`resubmit: ${r.resubmit}`);
  say(`summary: rvwalk summary ${shellQuote(out)}`);
  return 0;
}

/**
 * `rvwalk watch DIR` for a shard directory: the per-shard table and pooled
 * diagnostics, printed once on a non-terminal; on a terminal redrawn every
 * `intervalMs` until every shard has ended or Ctrl-C.
 */
export async function watchShardDirectory(
  dir: string,
  options: { intervalMs?: number } = {},
): Promise<number> {
  const interval = options.intervalMs ?? 2000;
  if (!Deno.stdout.isTerminal()) {
    say(formatShardOverview(await loadShardOverview(dir)));
    return 0;
  }
  let stop = false;
  const onSignal = () => {
    stop = true;
  };
  Deno.addSignalListener("SIGINT", onSignal);
  try {
    while (true) {
      const ov = await loadShardOverview(dir);
      // Home and clear screen (ECMA-48 CUP and ED), then the plain table.
      Deno.stdout.writeSync(new TextEncoder().encode("\x1b[H\x1b[2J"));
      say(formatShardOverview(ov));
      const active = ov.shards.some((s) => s.state === "running" || s.state === "starting");
      const unstarted = ov.shards.some((s) => s.state === "absent");
      if (stop || (!active && !unstarted)) break;
      say(`\n(refresh every ${interval / 1000} s; Ctrl-C leaves, the shards go on)`);
      for (let t = 0; t < interval && !stop; t += 100) {
        await new Promise((r) => setTimeout(r, 100));
      }
      if (stop) break;
    }
  } finally {
    Deno.removeSignalListener("SIGINT", onSignal);
  }
  return 0;
}
