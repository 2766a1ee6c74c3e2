/**
 * Shards: one model sampled as N independent runs (a Slurm job array), each
 * with its own seed, pooled afterwards into one posterior.
 *
 * ```
 * DIR/
 *   shards.json        plan: spec copy, data hashes, count, steps, per-shard seeds, Slurm settings, submissions
 *   spec.toml          the spec, copied; its data files are copied beside it (self-contained)
 *   job.sbatch         the array script; task k runs (or resumes) DIR/shard-k
 *   logs/shard-k.out   Slurm output of task k (appended across resubmissions)
 *   shard-k/           run directory of shard k (see layout.ts)
 * ```
 *
 * Shard k samples with seed (s·1000003 + k) mod 2³² where s is the spec's
 * seed; the seeds are recorded in shards.json. A resubmitted task whose run
 * directory holds a checkpoint resumes from it.
 * @module
 */
import { parse as parseToml, stringify as stringifyToml } from "smol-toml";
import { InputError } from "../errors.ts";
import { CompiledModel } from "../model/posterior.ts";
import { loadProblem } from "../spec/load.ts";
import type { Problem } from "../spec/resolve.ts";
import { writeFileAtomic } from "./atomic.ts";
import { runPath } from "./layout.ts";
import { dataHash, modelHash, RVWALK_VERSION } from "./manifest.ts";
import { type MergeResult, mergeRuns } from "./merge.ts";
import { readStatus } from "./status.ts";

/** File name of the plan inside a shard directory. */
export const SHARDS_FILE = "shards.json";
/** Shard-directory format version; readers refuse newer ones. */
export const SHARDS_FORMAT_VERSION = 1;

/** One shard as planned. */
export interface PlannedShard {
  /** Slurm array index. */
  readonly task: number;
  /** Run directory, relative to the shard directory. */
  readonly dir: string;
  readonly seed: number;
}

/** Slurm settings written into the array script. */
export interface SlurmSettings {
  readonly cpusPerTask: number;
  readonly time?: string;
  readonly partition?: string;
}

/** One `sbatch` submission of the array (or part of it). */
export interface Submission {
  readonly jobId: string;
  /** The `--array` value submitted, e.g. `0-3` or `1,3`. */
  readonly array: string;
  readonly submittedAt: string;
}

/** Contents of DIR/shards.json. */
export interface ShardPlan {
  readonly format: "rvwalk-shards";
  readonly formatVersion: number;
  readonly rvwalkVersion: string;
  readonly createdAt: string;
  readonly title: string;
  /** The spec the shards were made from, as given. */
  readonly source: string;
  /** The copied spec, relative to the shard directory. */
  readonly spec: string;
  /** Copied data files, relative to the shard directory. */
  readonly dataFiles: readonly string[];
  readonly modelHash: string;
  readonly dataHash: string;
  readonly count: number;
  /** Steps each shard takes. */
  readonly steps: number;
  readonly walkers: number;
  /** The spec's seed, from which shard seeds derive. */
  readonly seed: number;
  readonly seedRule: string;
  readonly shards: readonly PlannedShard[];
  readonly slurm: SlurmSettings;
  /** Absolute paths recorded when the script was last written (for compute nodes). */
  readonly deno: string;
  readonly main: string;
  readonly config: string;
  readonly submissions: readonly Submission[];
}

/** Options of {@link writeShards}. */
export interface WriteShardsOptions {
  /** Shard directory to create (or to update, when it holds shards of the same model). */
  readonly out: string;
  /** Number of shards. Required for a new directory; may grow an existing one. */
  readonly count?: number;
  /** Steps per shard. @default the spec's `[sampler] steps`, or the recorded value */
  readonly steps?: number;
  /** @default the recorded value, else none */
  readonly partition?: string;
  /** Slurm time limit per task (`HH:MM:SS`, `D-HH:MM:SS`, `MM:SS` or minutes). @default the recorded value, else none */
  readonly time?: string;
  /** @default the recorded value, else 1 */
  readonly cpusPerTask?: number;
  /** Array indices to put in the script. @default all shards */
  readonly only?: readonly number[];
}

/** What {@link writeShards} did. */
export interface WrittenShards {
  /** Absolute path of the shard directory. */
  readonly dir: string;
  readonly plan: ShardPlan;
  /** Absolute path of the array script. */
  readonly script: string;
  /** The `--array` value in the script. */
  readonly array: string;
  /** False when an existing shard directory was updated. */
  readonly created: boolean;
  readonly notes: readonly string[];
}

/**
 * Seed of shard `task` from the spec's `seed`: (seed·1000003 + task) mod 2³²,
 * exact for every safe integer seed (BigInt arithmetic). 1000003 is a prime,
 * so distinct (seed, task) pairs with task < 1000003 rarely collide; the
 * rule is this project's choice (no source).
 * @throws {RangeError} when seed or task is not a non-negative safe integer
 */
export function shardSeed(seed: number, task: number): number {
  if (!Number.isSafeInteger(seed) || seed < 0 || !Number.isSafeInteger(task) || task < 0) {
    throw new RangeError(
      `Cannot derive a shard seed as seed and task must be non-negative integers: seed=${seed}, task=${task}`,
    );
  }
  return Number((BigInt(seed) * 1000003n + BigInt(task)) % 4294967296n);
}

/**
 * Parse a task list such as `3,5` or `0-2,7` into sorted distinct indices,
 * each below `count`.
 * @throws {InputError} on a malformed list or an index out of range
 */
export function parseTaskList(text: string, count: number): number[] {
  const out = new Set<number>();
  for (const part of text.split(",")) {
    const m = /^\s*(\d+)\s*(?:-\s*(\d+)\s*)?$/.exec(part);
    if (m === null) {
      throw new InputError(`found \`${text}\`: expected task indices such as 3,5 or 0-2,7`, {
        field: "--only",
      });
    }
    const a = Number(m[1]);
    const b = m[2] === undefined ? a : Number(m[2]);
    if (b < a) {
      throw new InputError(`found range ${a}-${b}: expected low-high`, { field: "--only" });
    }
    for (let k = a; k <= b; k++) {
      if (k >= count) {
        throw new InputError(`found task ${k}: expected 0 to ${count - 1} (${count} shards)`, {
          field: "--only",
        });
      }
      out.add(k);
    }
  }
  return [...out].sort((x, y) => x - y);
}

/** Slurm `--array` value for sorted task indices: runs of consecutive indices become `a-b`. */
export function arraySpec(tasks: readonly number[]): string {
  const parts: string[] = [];
  for (let i = 0; i < tasks.length;) {
    let j = i;
    while (j + 1 < tasks.length && tasks[j + 1] === tasks[j]! + 1) j++;
    parts.push(i === j ? `${tasks[i]}` : `${tasks[i]}-${tasks[j]}`);
    i = j + 1;
  }
  return parts.join(",");
}

/** Quote for a POSIX shell. */
export function shellQuote(s: string): string {
  return /^[A-Za-z0-9_./:=,+-]+$/.test(s) ? s : `'${s.replaceAll("'", `'\\''`)}'`;
}

const TIME_RE = /^(?:\d+-\d{1,2}(?::\d{2}){0,2}|\d+(?::\d{2}){0,2})$/;
const PARTITION_RE = /^[A-Za-z0-9_.,-]+$/;

function resolvePath(p: string): string {
  if (p.startsWith("/")) return p;
  return `${Deno.cwd().replace(/\/+$/, "")}/${p}`;
}

function baseName(p: string): string {
  return p.slice(p.lastIndexOf("/") + 1);
}

/** Read DIR/shards.json. Throws {@link InputError} naming the file. */
export async function readShardPlan(dir: string): Promise<ShardPlan> {
  const file = `${dir.replace(/\/+$/, "")}/${SHARDS_FILE}`;
  let text: string;
  try {
    text = await Deno.readTextFile(file);
  } catch (err) {
    if (err instanceof Deno.errors.NotFound) {
      throw new InputError("no shards.json: expected a shard directory written by rvwalk shards", {
        file,
      });
    }
    throw new InputError(`cannot read shard plan: ${(err as Error).message}`, { file });
  }
  let plan: ShardPlan;
  try {
    plan = JSON.parse(text);
  } catch (err) {
    throw new InputError(`shard plan is not valid JSON: ${(err as Error).message}`, { file });
  }
  if (plan?.format !== "rvwalk-shards") {
    throw new InputError(`found format ${JSON.stringify(plan?.format)}: expected "rvwalk-shards"`, {
      file,
      field: "format",
    });
  }
  if (typeof plan.formatVersion !== "number" || plan.formatVersion > SHARDS_FORMAT_VERSION) {
    throw new InputError(
      `shard format ${plan.formatVersion} was written by a newer rvwalk (${plan.rvwalkVersion}): this is ${RVWALK_VERSION}; upgrade rvwalk`,
      { file, field: "formatVersion" },
    );
  }
  if (!Array.isArray(plan.shards) || plan.shards.length !== plan.count) {
    throw new InputError("shard plan lacks its shards or their count disagrees", { file });
  }
  return plan;
}

/** Whether `dir` is a shard directory (holds shards.json). */
export async function isShardDir(dir: string): Promise<boolean> {
  try {
    return (await Deno.stat(`${dir.replace(/\/+$/, "")}/${SHARDS_FILE}`)).isFile;
  } catch {
    return false;
  }
}

async function writePlan(dir: string, plan: ShardPlan): Promise<void> {
  await writeFileAtomic(`${dir}/${SHARDS_FILE}`, JSON.stringify(plan, null, 1) + "\n");
}

/** Paths a compute node needs: deno, the CLI entry and the project's deno.json. */
function toolPaths(): { deno: string; main: string; config: string } {
  return {
    deno: Deno.execPath(),
    main: new URL("../cli/main.ts", import.meta.url).pathname,
    config: new URL("../../deno.json", import.meta.url).pathname,
  };
}

/**
 * The sbatch array script for `tasks` of `plan` in the shard directory `dir`
 * (absolute). Task k runs `rvwalk run` into DIR/shard-k with its seed, or
 * `rvwalk resume` when DIR/shard-k holds a checkpoint; output is appended to
 * DIR/logs/shard-k.out.
 */
export function sbatchScript(plan: ShardPlan, dir: string, tasks: readonly number[]): string {
  const q = shellQuote;
  const lines = [
    "#!/bin/bash",
    `#SBATCH --job-name=${q(`rvwalk-${baseName(dir).replace(/[^A-Za-z0-9_.-]/g, "_")}`)}`,
    `#SBATCH --array=${arraySpec(tasks)}`,
    "#SBATCH --ntasks=1",
    `#SBATCH --cpus-per-task=${plan.slurm.cpusPerTask}`,
  ];
  if (plan.slurm.time !== undefined) lines.push(`#SBATCH --time=${plan.slurm.time}`);
  if (plan.slurm.partition !== undefined) lines.push(`#SBATCH --partition=${plan.slurm.partition}`);
  lines.push(
    `#SBATCH --chdir=${q(dir)}`,
    `#SBATCH --output=${q(`${dir}/logs/shard-%a.out`)}`,
    "#SBATCH --open-mode=append",
    `# Written by rvwalk ${RVWALK_VERSION} shards: ${plan.count} shards of ${plan.steps} steps.`,
    "# Resubmitting a task resumes its shard from the checkpoint.",
    "set -u",
    `DENO=${q(plan.deno)}`,
    `MAIN=${q(plan.main)}`,
    `CONFIG=${q(plan.config)}`,
    `DIR=${q(dir)}`,
    `STEPS=${plan.steps}`,
    `SEEDS=(${plan.shards.map((s) => s.seed).join(" ")})`,
    'k=${SLURM_ARRAY_TASK_ID:?"run this script with sbatch (it is a job array)"}',
    'seed=${SEEDS[$k]:?"no seed for task $k"}',
    "threads=${SLURM_CPUS_PER_TASK:-1}",
    'run="$DIR/shard-$k"',
    "export DENO_NO_UPDATE_CHECK=1 NO_COLOR=1",
    'echo "rvwalk shards: task $k on $(hostname) at $(date -u +%Y-%m-%dT%H:%M:%SZ), job ${SLURM_ARRAY_JOB_ID:-?}"',
    'if [ -f "$run/checkpoint.json" ] || [ -f "$run/checkpoint.prev.json" ]; then',
    "  # Slurm runs one instance of each array task, so a lock left by a lost node is stale.",
    '  echo "rvwalk shards: shard $k resumed from its checkpoint"',
    '  exec "$DENO" run -A --config "$CONFIG" "$MAIN" resume "$run" --steps "$STEPS" --threads "$threads" --no-ui --take-lock',
    "fi",
    'if [ -e "$run" ]; then',
    "  # a start that died before its first checkpoint: keep it aside, start afresh",
    '  aside="$run.failed-$(date +%s)"',
    '  mv "$run" "$aside" && echo "rvwalk shards: moved an unstartable $run to $aside"',
    "fi",
    'echo "rvwalk shards: shard $k started with seed $seed"',
    'exec "$DENO" run -A --config "$CONFIG" "$MAIN" run "$DIR/spec.toml" --out "$run" --steps "$STEPS" --seed "$seed" --threads "$threads" --no-ui',
    "",
  );
  return lines.join("\n");
}

/** Copy the spec and its data files into `dir`; returns their names relative to `dir`. */
async function copySpec(
  specPath: string,
  problem: Problem,
  dir: string,
): Promise<{ spec: string; dataFiles: string[] }> {
  const text = await Deno.readTextFile(specPath);
  const doc = parseToml(text) as { data?: { files?: unknown[] } };
  const written = (doc.data?.files ?? []).map(String);
  const names: string[] = [];
  for (const [i, f] of problem.spec.dataFiles.entries()) {
    let name = baseName(f);
    if (names.includes(name) || name === "spec.toml" || name === SHARDS_FILE) {
      name = `data-${i}-${name}`;
    }
    names.push(name);
    await Deno.copyFile(f, `${dir}/${name}`);
  }
  const verbatim = written.length === names.length && written.every((w, i) => w === names[i]);
  let out: string;
  if (verbatim) {
    out = text;
  } else {
    (doc.data as { files: string[] }).files = names;
    out = `# Copied from ${specPath} by rvwalk shards; data files copied beside it.\n` +
      stringifyToml(doc);
  }
  await Deno.writeTextFile(`${dir}/spec.toml`, out);
  return { spec: "spec.toml", dataFiles: names };
}

/** Whether `dir` exists and holds anything. */
async function nonEmpty(dir: string): Promise<boolean> {
  try {
    for await (const _ of Deno.readDir(dir)) return true;
    return false;
  } catch (err) {
    if (err instanceof Deno.errors.NotFound) return false;
    throw new InputError(`cannot use output path: ${(err as Error).message}`, {
      file: dir,
      field: "--out",
    });
  }
}

/**
 * Write (or update) the shard directory `options.out` for the spec at
 * `specPath`: copies the spec and its data, records the plan with per-shard
 * seeds, writes job.sbatch for all tasks or `options.only`. An existing shard
 * directory is updated only for the same model and data (checked by hash);
 * its count may grow, settings given here replace the recorded ones.
 *
 * @throws {InputError} on a bad spec, bad options or a mismatching directory
 */
export async function writeShards(
  specPath: string,
  options: WriteShardsOptions,
): Promise<WrittenShards> {
  const problem = await loadProblem(specPath);
  const spec = problem.spec;
  const model = new CompiledModel({ spec, data: problem.data });
  const walkers = spec.sampler.walkers;
  if (model.dimensions === 0) {
    throw new InputError("nothing to sample: every parameter is fixed", { file: specPath });
  }
  if (walkers <= 2 * model.dimensions || walkers % 2 !== 0) {
    throw new InputError(
      `walkers must be even and exceed twice the dimensions: walkers=${walkers}, dimensions=${model.dimensions}`,
      { file: specPath, field: "sampler.walkers" },
    );
  }
  if (options.time !== undefined && !TIME_RE.test(options.time)) {
    throw new InputError(
      `found \`${options.time}\`: expected a Slurm time such as 02:00:00 or 1-12:00:00`,
      { field: "--time" },
    );
  }
  if (options.partition !== undefined && !PARTITION_RE.test(options.partition)) {
    throw new InputError(`found \`${options.partition}\`: expected a partition name`, {
      field: "--partition",
    });
  }
  for (
    const [k, v] of [["count", options.count], ["steps", options.steps], [
      "cpus-per-task",
      options.cpusPerTask,
    ]] as const
  ) {
    if (v !== undefined && (!Number.isSafeInteger(v) || v < 1)) {
      throw new InputError(`found ${v}: expected a whole number ≥ 1`, { field: `--${k}` });
    }
  }
  const names = spec.instruments.map((i) => i.name);
  const hashes = {
    modelHash: await modelHash(spec),
    dataHash: await dataHash(problem.data, names),
  };
  const dir = resolvePath(options.out).replace(/\/+$/, "");
  const notes: string[] = [];
  let old: ShardPlan | undefined;
  if (await isShardDir(dir)) {
    old = await readShardPlan(dir);
    if (old.dataHash !== hashes.dataHash) {
      throw new InputError(
        "holds shards of different data: choose another --out, or pass the shards' own spec.toml",
        { file: dir, field: "--out" },
      );
    }
    if (old.modelHash !== hashes.modelHash) {
      throw new InputError(
        "holds shards of a different model: choose another --out, or pass the shards' own spec.toml",
        { file: dir, field: "--out" },
      );
    }
    if (options.count !== undefined && options.count < old.count) {
      throw new InputError(
        `found --count ${options.count}: the directory already holds ${old.count} shards (counts may only grow)`,
        { file: dir, field: "--count" },
      );
    }
  } else if (await nonEmpty(dir)) {
    throw new InputError("is not empty and holds no shards.json: choose another --out", {
      file: dir,
      field: "--out",
    });
  }
  const count = options.count ?? old?.count;
  if (count === undefined) {
    throw new InputError("missing: expected --count N for a new shard directory", {
      field: "--count",
    });
  }
  await Deno.mkdir(`${dir}/logs`, { recursive: true });
  let copied = old === undefined ? undefined : { spec: old.spec, dataFiles: [...old.dataFiles] };
  if (copied === undefined) copied = await copySpec(specPath, problem, dir);
  const seed = old?.seed ?? spec.sampler.seed;
  const shards: PlannedShard[] = [];
  for (let k = 0; k < count; k++) {
    shards.push(old?.shards[k] ?? { task: k, dir: `shard-${k}`, seed: shardSeed(seed, k) });
  }
  if (old !== undefined && count > old.count) notes.push(`added shards ${old.count}-${count - 1}`);
  const steps = options.steps ?? old?.steps ?? spec.sampler.steps;
  if (old !== undefined && steps !== old.steps) {
    notes.push(
      `steps per shard changed from ${old.steps} to ${steps}; resumed shards run to ${steps}`,
    );
  }
  const time = options.time ?? old?.slurm.time;
  const partition = options.partition ?? old?.slurm.partition;
  const plan: ShardPlan = {
    format: "rvwalk-shards",
    formatVersion: SHARDS_FORMAT_VERSION,
    rvwalkVersion: RVWALK_VERSION,
    createdAt: old?.createdAt ?? new Date().toISOString(),
    title: spec.title,
    source: old?.source ?? resolvePath(specPath),
    spec: copied.spec,
    dataFiles: copied.dataFiles,
    ...hashes,
    count,
    steps,
    walkers: old?.walkers ?? walkers,
    seed,
    seedRule: "seed of shard k = (seed × 1000003 + k) mod 2^32",
    shards,
    slurm: {
      cpusPerTask: options.cpusPerTask ?? old?.slurm.cpusPerTask ?? 1,
      ...(time === undefined ? {} : { time }),
      ...(partition === undefined ? {} : { partition }),
    },
    ...toolPaths(),
    submissions: old?.submissions ?? [],
  };
  const tasks = options.only === undefined ? shards.map((s) => s.task) : [...options.only];
  for (const t of tasks) {
    if (!Number.isInteger(t) || t < 0 || t >= count) {
      throw new InputError(`found task ${t}: expected 0 to ${count - 1}`, { field: "--only" });
    }
  }
  if (tasks.length === 0) throw new InputError("no tasks to run", { field: "--only" });
  tasks.sort((a, b) => a - b);
  const script = `${dir}/job.sbatch`;
  await writePlan(dir, plan);
  await writeFileAtomic(script, sbatchScript(plan, dir, tasks));
  await Deno.chmod(script, 0o755);
  return { dir, plan, script, array: arraySpec(tasks), created: old === undefined, notes };
}

/** Options of {@link submitShards}. */
export interface SubmitOptions {
  /** The sbatch executable. @default "sbatch" (from PATH) */
  readonly sbatch?: string;
}

/**
 * Submit DIR/job.sbatch with `sbatch --parsable`, record the job in
 * shards.json and return its id.
 * @throws {Error} when sbatch is missing or refuses the job (its message included)
 */
export async function submitShards(
  dir: string,
  options: SubmitOptions = {},
): Promise<Submission> {
  const abs = resolvePath(dir).replace(/\/+$/, "");
  const plan = await readShardPlan(abs);
  const script = `${abs}/job.sbatch`;
  const text = await Deno.readTextFile(script);
  const array = /^#SBATCH --array=(\S+)$/m.exec(text)?.[1] ?? "?";
  const sbatch = options.sbatch ?? "sbatch";
  let out: Deno.CommandOutput;
  try {
    out = await new Deno.Command(sbatch, {
      args: ["--parsable", script],
      cwd: abs,
      stdin: "null",
    }).output();
  } catch (err) {
    throw new Error(
      `cannot submit as ${sbatch} did not start (${
        (err as Error).message
      }); the script is written: submit it on the cluster with sbatch ${shellQuote(script)}`,
    );
  }
  const stdout = new TextDecoder().decode(out.stdout).trim();
  const stderr = new TextDecoder().decode(out.stderr).trim();
  if (!out.success) {
    throw new Error(`cannot submit as sbatch failed (exit ${out.code}): ${stderr || stdout}`);
  }
  const jobId = stdout.split("\n").pop()!.split(";")[0]!.trim();
  if (!/^\d+$/.test(jobId)) {
    throw new Error(
      `cannot read the job id from sbatch --parsable: output=${JSON.stringify(stdout)}`,
    );
  }
  const sub: Submission = { jobId, array, submittedAt: new Date().toISOString() };
  await writePlan(abs, { ...plan, submissions: [...plan.submissions, sub] });
  return sub;
}

/** State of one shard as read from its run directory. */
export interface ShardState {
  readonly task: number;
  /** Absolute path of its run directory. */
  readonly dir: string;
  readonly seed: number;
  /** Writer state; `absent` when the shard has not written a status yet; `stale` when its writer died. */
  readonly state: "absent" | "starting" | "running" | "finished" | "stopped" | "failed" | "stale";
  readonly step: number;
  readonly targetSteps: number;
  readonly stepsPerSecond: number;
  readonly host?: string;
  readonly message?: string;
}

/** Read every shard's status (only reads). */
export async function shardStates(dir: string): Promise<{ plan: ShardPlan; shards: ShardState[] }> {
  const abs = resolvePath(dir).replace(/\/+$/, "");
  const plan = await readShardPlan(abs);
  const shards: ShardState[] = [];
  for (const s of plan.shards) {
    const rd = `${abs}/${s.dir}`;
    const st = await readStatus(rd);
    shards.push(
      st === null
        ? {
          task: s.task,
          dir: rd,
          seed: s.seed,
          state: "absent",
          step: 0,
          targetSteps: plan.steps,
          stepsPerSecond: NaN,
        }
        : {
          task: s.task,
          dir: rd,
          seed: s.seed,
          state: st.state,
          step: st.step,
          targetSteps: st.targetSteps,
          stepsPerSecond: st.state === "running" ? st.stepsPerSecond : NaN,
          host: st.host,
          message: st.message,
        },
    );
  }
  return { plan, shards };
}

/** The command that resubmits `tasks` of the shard directory `dir`. */
export function resubmitCommand(dir: string, plan: ShardPlan, tasks: readonly number[]): string {
  const d = dir.replace(/\/+$/, "");
  return `rvwalk shards ${shellQuote(`${d}/${plan.spec}`)} --count ${plan.count} --out ${
    shellQuote(d)
  } --only ${arraySpec(tasks)} --submit`;
}

/** A shard left out of a merge. */
export interface MissingShard {
  readonly task: number;
  readonly state: ShardState["state"];
  readonly step: number;
  readonly targetSteps: number;
  /** Why, in words. */
  readonly reason: string;
}

/** What {@link mergeShards} did. */
export interface ShardMergeResult {
  /** The merge of the finished shards. */
  readonly merged: MergeResult;
  /** Tasks pooled. */
  readonly pooled: readonly number[];
  /** Shards not finished, by task. */
  readonly missing: readonly MissingShard[];
  /** Command resubmitting the missing shards that are not running; undefined if none. */
  readonly resubmit?: string;
}

function reasonOf(s: ShardState): string {
  const at = `step ${s.step}/${s.targetSteps}`;
  switch (s.state) {
    case "absent":
      return "never started (still queued, or the job failed before rvwalk ran: see its log)";
    case "starting":
    case "running":
      return `still running at ${at}${s.host ? ` on ${s.host}` : ""}`;
    case "stopped":
      return `stopped at ${at} (cancelled or out of time)`;
    case "stale":
      return `writer died at ${at} (killed)`;
    case "failed":
      return `failed at ${at}${s.message ? `: ${s.message}` : ""}`;
    case "finished":
      return "finished";
  }
}

/**
 * Pool the finished shards of the shard directory `dir` into the new run
 * directory `out` (see {@link mergeRuns}); list the others by task with the
 * command that resubmits those not running.
 * @throws {InputError} when no shard has finished, or `dir` is not a shard directory
 */
export async function mergeShards(dir: string, out: string): Promise<ShardMergeResult> {
  const { plan, shards } = await shardStates(dir);
  const done = shards.filter((s) => s.state === "finished");
  const missing: MissingShard[] = shards.filter((s) => s.state !== "finished").map((s) => ({
    task: s.task,
    state: s.state,
    step: s.step,
    targetSteps: s.targetSteps,
    reason: reasonOf(s),
  }));
  const redo = missing.filter((m) => m.state !== "running" && m.state !== "starting").map((m) =>
    m.task
  );
  const abs = resolvePath(dir).replace(/\/+$/, "");
  const resubmit = redo.length === 0 ? undefined : resubmitCommand(abs, plan, redo);
  if (done.length === 0) {
    throw new InputError(
      `no finished shard to merge (${shards.length} shards: ${
        missing.map((m) => `${m.task} ${m.state}`).join(", ")
      })${resubmit === undefined ? "" : `; resubmit: ${resubmit}`}`,
      { file: dir },
    );
  }
  const merged = await mergeRuns(done.map((s) => s.dir), out);
  return { merged, pooled: done.map((s) => s.task), missing, ...(resubmit ? { resubmit } : {}) };
}

/** Path of the Slurm log of shard `task`. */
export function shardLogPath(dir: string, task: number): string {
  return `${dir.replace(/\/+$/, "")}/logs/shard-${task}.out`;
}

/** Path of a file in shard `task`'s run directory. */
export function shardRunPath(
  dir: string,
  task: number,
  file: Parameters<typeof runPath>[1],
): string {
  return runPath(`${dir.replace(/\/+$/, "")}/shard-${task}`, file);
}
