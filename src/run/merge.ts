/**
 * Merging runs of the same model and data: walkers from every source run
 * become separate chains of one merged run (diagnostics treat each walker's
 * trace as a chain, so between-run disagreement shows up in R-hat).
 * @module
 */
import { InputError } from "../errors.ts";
import { appendBlock, type ChainData, readChain } from "./chain_file.ts";
import { type Manifest, readManifest, writeManifest } from "./manifest.ts";
import { writeStatus } from "./status.ts";

/** What a merge did. */
export interface MergeResult {
  readonly steps: number;
  readonly walkers: number;
  readonly sources: readonly { dir: string; walkers: number; steps: number }[];
  readonly notes: readonly string[];
}

/** Name the first difference between two manifests that forbids merging, or undefined. */
export function mergeConflict(a: Manifest, b: Manifest): string | undefined {
  if (a.dataHash !== b.dataHash) {
    const na = a.data.time.length;
    const nb = b.data.time.length;
    return na !== nb
      ? `data differ: ${na} vs ${nb} RVs`
      : "data differ (same number of RVs, different values)";
  }
  if (a.modelHash !== b.modelHash) {
    const sa = a.spec;
    const sb = b.spec;
    const pa = sa.planets.map((p) => p.name).join(",");
    const pb = sb.planets.map((p) => p.name).join(",");
    if (pa !== pb) return `planets differ: [${pa}] vs [${pb}]`;
    for (let i = 0; i < sa.planets.length; i++) {
      const x = sa.planets[i]! as unknown as Record<string, unknown>;
      const y = sb.planets[i]! as unknown as Record<string, unknown>;
      for (const k of Object.keys({ ...x, ...y })) {
        if (JSON.stringify(x[k]) !== JSON.stringify(y[k])) {
          return `planet ${sa.planets[i]!.name}: ${k} differs`;
        }
      }
    }
    const ia = JSON.stringify(
      sa.instruments.map(({ name, offset, jitter }) => ({ name, offset, jitter })),
    );
    const ib = JSON.stringify(
      sb.instruments.map(({ name, offset, jitter }) => ({ name, offset, jitter })),
    );
    if (ia !== ib) return "instruments or their priors differ";
    if (JSON.stringify(sa.trend ?? null) !== JSON.stringify(sb.trend ?? null)) {
      return "trend differs";
    }
    if (JSON.stringify(sa.star) !== JSON.stringify(sb.star)) return "star priors differ";
    return "model differs";
  }
  if (a.columns.join() !== b.columns.join()) return "parameter columns differ";
  return undefined;
}

/**
 * Merge `dirs` into a new run directory `out`. Steps are cut to the shortest
 * source so the merged chain is rectangular (said in `notes`).
 */
export async function mergeRuns(dirs: readonly string[], out: string): Promise<MergeResult> {
  if (dirs.length < 1) {
    throw new InputError("nothing to merge: expected run directories", { field: "arguments" });
  }
  const manifests: Manifest[] = [];
  for (const d of dirs) manifests.push(await readManifest(d));
  const first = manifests[0]!;
  manifests.forEach((m, i) => {
    const c = mergeConflict(first, m);
    if (c !== undefined) {
      throw new InputError(`cannot merge ${dirs[i]} with ${dirs[0]}: ${c}`, {
        file: dirs[i],
        field: "manifest",
      });
    }
  });
  const chains: ChainData[] = [];
  for (let i = 0; i < dirs.length; i++) {
    const r = await readChain(dirs[i]!, {
      walkers: manifests[i]!.walkers,
      columns: first.columns.length,
    });
    chains.push(r.chain);
  }
  const steps = Math.min(...chains.map((c) => c.steps));
  const notes: string[] = [];
  chains.forEach((c, i) => {
    if (c.steps > steps) {
      notes.push(`${dirs[i]}: using the first ${steps} of ${c.steps} steps (shortest source)`);
    }
  });
  if (steps === 0) throw new InputError("a source run has no steps yet", { field: "arguments" });
  try {
    const info = await Deno.stat(out);
    if (!info.isDirectory) {
      throw new InputError("output path is a file", { file: out, field: "--out" });
    }
    for await (const e of Deno.readDir(out)) {
      if (e.name === "manifest.json") {
        throw new InputError("already holds a run: choose another --out", {
          file: out,
          field: "--out",
        });
      }
    }
  } catch (err) {
    if (err instanceof InputError) throw err;
    await Deno.mkdir(out, { recursive: true });
  }
  const walkers = chains.reduce((a, c) => a + c.walkers, 0);
  const C = first.columns.length;
  const merged: Manifest = {
    ...first,
    createdAt: new Date().toISOString(),
    walkers,
    sources: dirs.map((d, i) => ({
      dir: d,
      walkers: manifests[i]!.walkers,
      seed: manifests[i]!.seed,
    })),
  };
  await writeManifest(out, merged);
  const chunk = Math.max(1, Math.floor((8 << 20) / (8 * walkers * C)));
  for (let s0 = 0; s0 < steps; s0 += chunk) {
    const n = Math.min(chunk, steps - s0);
    const block = new Float64Array(n * walkers * C);
    for (let s = 0; s < n; s++) {
      let o = s * walkers * C;
      for (const c of chains) {
        const row = c.data.subarray((s0 + s) * c.walkers * C, (s0 + s + 1) * c.walkers * C);
        block.set(row, o);
        o += row.length;
      }
    }
    await appendBlock(out, { firstStep: s0, steps: n, walkers, columns: C }, block);
  }
  await writeStatus(out, {
    state: "finished",
    step: steps,
    targetSteps: steps,
    threads: 0,
    stepsPerSecond: NaN,
    startedAt: new Date().toISOString(),
    message: `merged from ${dirs.length} runs`,
  });
  return {
    steps,
    walkers,
    sources: dirs.map((d, i) => ({ dir: d, walkers: chains[i]!.walkers, steps: chains[i]!.steps })),
    notes,
  };
}
