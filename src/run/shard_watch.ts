/**
 * A plain-text view of a shard directory: each shard's progress and the
 * diagnostics of all shards pooled (each walker of each shard one chain, so
 * disagreement between shards raises R-hat). Reads only.
 * @module
 */
import { type ConvergenceReport, convergenceReport } from "../diagnostics/mod.ts";
import { readChain } from "./chain_file.ts";
import { type Manifest, readManifest } from "./manifest.ts";
import { type ShardState, shardStates } from "./shards.ts";

/** What {@link loadShardOverview} read. */
export interface ShardOverview {
  readonly dir: string;
  readonly title: string;
  readonly count: number;
  readonly steps: number;
  readonly shards: readonly ShardState[];
  /** Last submitted job id, if any. */
  readonly jobId?: string;
  /** Tasks whose chains were pooled, and the steps used from each. */
  readonly pooledTasks: readonly number[];
  readonly pooledSteps: number;
  /** Every how many steps the pooled chains were read (the report counts in read steps). */
  readonly thin: number;
  /** Parameter names, in column order of `report.columns`. */
  readonly parameters: readonly string[];
  /** Undefined when fewer than two shards have at least `minSteps` steps. */
  readonly report?: ConvergenceReport;
}

/** Options of {@link loadShardOverview}. */
export interface ShardOverviewOptions {
  /** Most steps per shard read for the pooled diagnostics (evenly thinned). @default 4000 */
  readonly maxSteps?: number;
  /** Fewest steps a shard needs to be pooled. @default 20 */
  readonly minSteps?: number;
}

/**
 * Read every shard's status and pool the chains of those with at least
 * `minSteps` steps, cut to the shortest of them and thinned to at most
 * `maxSteps`, into one {@link convergenceReport} (burn-in chosen by its rule).
 * @throws {InputError} when `dir` is not a shard directory
 */
export async function loadShardOverview(
  dir: string,
  options: ShardOverviewOptions = {},
): Promise<ShardOverview> {
  const maxSteps = options.maxSteps ?? 4000;
  const minSteps = options.minSteps ?? 20;
  const { plan, shards } = await shardStates(dir);
  const manifests: { task: number; dir: string; m: Manifest; steps: number }[] = [];
  for (const s of shards) {
    if (s.state === "absent") continue;
    let m: Manifest;
    try {
      m = await readManifest(s.dir);
    } catch {
      continue;
    }
    manifests.push({ task: s.task, dir: s.dir, m, steps: s.step });
  }
  const usable = manifests.filter((x) => x.steps >= minSteps);
  const base = {
    dir,
    title: plan.title,
    count: plan.count,
    steps: plan.steps,
    shards,
    jobId: plan.submissions.at(-1)?.jobId,
  };
  const parameters = manifests[0]?.m.parameters.map((p) => p.key) ?? [];
  if (usable.length < 2) return { ...base, pooledTasks: [], pooledSteps: 0, thin: 1, parameters };
  const steps = Math.min(...usable.map((x) => x.steps));
  const thin = Math.max(1, Math.ceil(steps / maxSteps));
  const first = usable[0]!.m;
  const C = first.columns.length;
  const chains = [];
  for (const x of usable) {
    const r = await readChain(x.dir, { walkers: x.m.walkers, columns: C }, { thin });
    chains.push(r.chain);
  }
  const kept = Math.min(...chains.map((c) => c.steps));
  if (kept < 4) return { ...base, pooledTasks: [], pooledSteps: 0, thin: 1, parameters };
  const W = chains.reduce((a, c) => a + c.walkers, 0);
  const data = new Float64Array(kept * W * C);
  for (let s = 0; s < kept; s++) {
    let o = s * W * C;
    for (const c of chains) {
      const row = c.data.subarray(s * c.walkers * C, (s + 1) * c.walkers * C);
      data.set(row, o);
      o += row.length;
    }
  }
  const report = convergenceReport(
    { data, steps: kept, walkers: W, columns: C },
    {
      columns: parameters.map((_, i) => 2 + i),
      names: parameters,
      logPosteriorColumn: 0,
      thresholds: first.spec.sampler.thresholds,
    },
  );
  return {
    ...base,
    pooledTasks: usable.map((x) => x.task),
    pooledSteps: kept * thin,
    thin,
    parameters,
    report,
  };
}

function num(x: number, digits: number): string {
  return Number.isFinite(x) ? x.toFixed(digits) : "-";
}

/** Format an overview as a plain-text table (no escape codes). */
export function formatShardOverview(ov: ShardOverview): string {
  const lines: string[] = [];
  const done = ov.shards.filter((s) => s.state === "finished").length;
  lines.push(
    `${ov.dir}: ${ov.count} shards × ${ov.steps} steps, ${done} finished` +
      (ov.jobId === undefined ? ", not submitted" : `, last job ${ov.jobId}`) +
      (ov.title ? ` — ${ov.title}` : ""),
  );
  lines.push("");
  const rows = [["task", "state", "step", "target", "steps/s", "host"]];
  for (const s of ov.shards) {
    rows.push([
      String(s.task),
      s.state,
      String(s.step),
      String(s.targetSteps),
      num(s.stepsPerSecond, 0),
      s.host ?? "",
    ]);
  }
  lines.push(...table(rows, [true, false, true, true, true, false]));
  lines.push("");
  const r = ov.report;
  if (r === undefined) {
    lines.push("pooled diagnostics: need at least two shards with steps");
    return lines.join("\n");
  }
  const t = ov.thin;
  lines.push(
    `pooled diagnostics: shards ${ov.pooledTasks.join(",")}, first ${ov.pooledSteps} steps each, ` +
      `${r.walkers} chains, burn-in ${r.burn * t} steps` +
      (t > 1 ? `, read 1 step in ${t}` : ""),
  );
  const prow = [["parameter", "R-hat", "ESS bulk", "ESS tail", "tau", "steps/tau", "mean", "sd"]];
  for (const c of r.columns) {
    prow.push([
      c.name,
      num(c.rhat, 3),
      num(c.essBulk, 0),
      num(c.essTail, 0),
      num(c.tau * t, 1),
      num(c.stepsPerTau, 1),
      meanText(c.mean, c.sd),
      Number.isFinite(c.sd) ? c.sd.toPrecision(3) : "-",
    ]);
  }
  lines.push(...table(prow, [false, true, true, true, true, true, true, true]));
  lines.push(
    r.converged
      ? "criteria met (never a proof of convergence)"
      : `not converged by the criteria: ${r.reasons[0] ?? ""}${
        r.reasons.length > 1 ? ` (+${r.reasons.length - 1} more)` : ""
      }`,
  );
  return lines.join("\n");
}

/** The mean with two significant digits of its sd. */
function meanText(mean: number, sd: number): string {
  if (!Number.isFinite(mean)) return "-";
  if (!(sd > 0) || !Number.isFinite(sd)) return mean.toPrecision(6);
  const decimals = Math.min(12, Math.max(0, 1 - Math.floor(Math.log10(sd))));
  return mean.toFixed(decimals);
}

function table(rows: string[][], right: readonly boolean[]): string[] {
  const widths = rows[0]!.map((_, j) => Math.max(...rows.map((r) => (r[j] ?? "").length)));
  return rows.map((r) =>
    r.map((cell, j) => right[j] ? cell.padStart(widths[j]!) : cell.padEnd(widths[j]!)).join("  ")
      .trimEnd()
  );
}
