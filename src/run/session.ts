/**
 * A sampling session: the one writer of a run directory. Starts or resumes
 * the ensemble, appends flushed blocks, checkpoints after each block, keeps
 * the status file current, and stops cleanly on SIGINT/SIGTERM or a full disk.
 * @module
 */
import {
  createEvaluator,
  deserializeState,
  type EnsembleState,
  type Evaluator,
  initEnsemble,
  serializeState,
  step as ensembleStep,
} from "../../samplers/mod.ts";
import { InputError } from "../errors.ts";
import { CompiledModel, type ModelPayload } from "../model/posterior.ts";
import type { Problem, ProblemData } from "../spec/resolve.ts";
import type { MoveSpec } from "../spec/types.ts";
import { appendBlock, truncateChain } from "./chain_file.ts";
import { loadCheckpoint, saveCheckpoint } from "./checkpoint.ts";
import { runPath } from "./layout.ts";
import { acquireLock, type RunLock } from "./lock.ts";
import {
  dataHash,
  LEADING_COLUMNS,
  type Manifest,
  modelHash,
  readManifest,
  RUN_FORMAT_VERSION,
  RVWALK_VERSION,
  writeManifest,
} from "./manifest.ts";
import { writeStatus } from "./status.ts";

/** Progress reported to the caller after each step (the caller rate-limits output). */
export interface Progress {
  readonly step: number;
  readonly targetSteps: number;
  readonly stepsPerSecond: number;
  readonly acceptance: number;
  readonly flushedStep: number;
}

/** How a session ended. */
export interface SessionResult {
  readonly state: "finished" | "stopped" | "failed";
  readonly step: number;
  readonly message?: string;
}

export interface SessionOptions {
  readonly threads: number;
  /** Called after every step. */
  readonly onProgress?: (p: Progress) => void;
  /** Stop when this returns true (checked after every flush). */
  readonly shouldStop?: (step: number) => boolean | Promise<boolean>;
  /**
   * Steps between `shouldStop` checks (rounded up to a multiple of the
   * thinning). Checks happen at fixed steps, after a flush, so a run that stops
   * on convergence stops at the same step whatever the machine's speed.
   * @default the spec's `[sampler] check_every`
   */
  readonly checkEvery?: number;
  /** Override flush settings (tests). */
  readonly flushSeconds?: number;
  readonly flushSteps?: number;
  /** Called at once with notes worth telling (a checkpoint fallback, a restart). */
  readonly onNote?: (note: string) => void;
  /** Handle SIGINT/SIGTERM (default true). */
  readonly handleSignals?: boolean;
}

const MODEL_URL = new URL("../model/posterior.ts", import.meta.url).href;

/**
 * Check a walker count against the number of free parameters: the stretch
 * move needs more walkers than twice the dimensions (Goodman & Weare 2010 use
 * an ensemble spanning the space), and the red/blue split needs an even count.
 * Throws {@link InputError} naming `where`.
 */
export function checkWalkers(
  walkers: number,
  dimensions: number,
  where: { file?: string; field: string },
): void {
  if (dimensions === 0) {
    throw new InputError(
      "found every parameter fixed: expected at least one parameter with a prior to sample",
      { file: where.file, field: "parameters" },
    );
  }
  if (walkers <= 2 * dimensions) {
    throw new InputError(
      `found walkers=${walkers} for ${dimensions} free parameters: expected more than 2 × ${dimensions} = ${
        2 * dimensions
      } (and even), e.g. ${2 * dimensions + 2}`,
      where,
    );
  }
  if (walkers % 2 !== 0) {
    throw new InputError(
      `found walkers=${walkers}: expected an even number (two equal halves), e.g. ${walkers + 1}`,
      where,
    );
  }
}

/** Create a run directory and sample `steps` steps. */
export async function startRun(
  dir: string,
  problem: Problem,
  options: SessionOptions & { steps: number; walkers: number; seed: number; thin?: number },
): Promise<SessionResult> {
  const spec = {
    ...problem.spec,
    sampler: {
      ...problem.spec.sampler,
      steps: options.steps,
      walkers: options.walkers,
      seed: options.seed,
      thin: options.thin ?? problem.spec.sampler.thin,
    },
  };
  const payload: ModelPayload = { spec, data: problem.data };
  const model = new CompiledModel(payload);
  // Before anything is written: a refused walker count leaves no folder behind.
  checkWalkers(options.walkers, model.dimensions, {
    file: spec.specPath,
    field: "sampler.walkers",
  });
  await prepareDir(dir);
  const lock = await acquireLock(dir);
  try {
    const names = spec.instruments.map((i) => i.name);
    const manifest: Manifest = {
      format: "rvwalk-run",
      formatVersion: RUN_FORMAT_VERSION,
      rvwalkVersion: RVWALK_VERSION,
      createdAt: new Date().toISOString(),
      spec,
      data: plainData(problem.data),
      dataHash: await dataHash(problem.data, names),
      modelHash: await modelHash(spec),
      parameters: model.parameters.map((p) => ({
        key: p.key,
        unit: p.unit,
        transform: p.transform,
      })),
      columns: [...LEADING_COLUMNS, ...model.keys],
      walkers: options.walkers,
      seed: options.seed,
      thin: spec.sampler.thin,
      moves: spec.sampler.moves,
    };
    await writeManifest(dir, manifest);
    await writeStatus(dir, {
      state: "starting",
      step: 0,
      targetSteps: options.steps,
      threads: options.threads,
      stepsPerSecond: NaN,
      startedAt: new Date().toISOString(),
    });
    return await sampleFromStart(dir, { model, manifest, payload, target: options.steps }, options);
  } finally {
    await lock.release();
  }
}

/** Initialise the ensemble from the spec's start point, checkpoint step 0, and sample. */
async function sampleFromStart(
  dir: string,
  input: { model: CompiledModel; manifest: Manifest; payload: ModelPayload; target: number },
  options: SessionOptions,
): Promise<SessionResult> {
  const { model, manifest, payload, target } = input;
  const evaluator = await createEvaluator(
    { moduleUrl: MODEL_URL, exportName: "createLogPosterior", payload },
    { threads: options.threads, dimensions: model.dimensions },
  );
  try {
    const state = await initEnsemble(model.startInternal(), {
      walkers: manifest.walkers,
      seed: manifest.seed,
      scale: model.ballScales(),
      evaluator,
    });
    await saveCheckpoint(dir, {
      step: 0,
      chainBytes: 0,
      targetSteps: target,
      savedAt: new Date().toISOString(),
      state: serializeState(state),
    });
    return await loop(dir, {
      model,
      manifest,
      state,
      evaluator,
      target,
      moves: manifest.moves,
      flushedBytes: 0,
    }, options);
  } finally {
    await evaluator.close();
  }
}

/** Continue a run from its checkpoint, to `steps` total (default: the recorded target). */
export async function resumeRun(
  dir: string,
  options: SessionOptions & { steps?: number; addSteps?: number; takeLock?: boolean },
): Promise<SessionResult & { notes: string[] }> {
  const manifest = await readManifest(dir);
  const lock: RunLock = await acquireLock(dir, { takeOver: options.takeLock });
  const notes: string[] = [];
  const note = (n: string) => {
    notes.push(n);
    options.onNote?.(n);
  };
  try {
    const payload: ModelPayload = { spec: manifest.spec, data: typedData(manifest.data) };
    if (await neverCheckpointed(dir)) {
      // Killed after writing the manifest but before the first checkpoint:
      // start again from the spec's start point (deterministic for the seed).
      note("no checkpoint yet (stopped during start-up); starting from the beginning");
      await truncateChain(dir, 0);
      const model = new CompiledModel(payload);
      const target = options.addSteps ?? options.steps ?? manifest.spec.sampler.steps;
      const r = await sampleFromStart(dir, { model, manifest, payload, target }, options);
      return { ...r, notes };
    }
    const loaded = await loadCheckpoint(dir);
    if (loaded.usedFallback) {
      note(`newest checkpoint unusable (${loaded.reason}); resumed from the previous one`);
    }
    const cp = loaded.checkpoint;
    await truncateChain(dir, cp.chainBytes);
    const model = new CompiledModel(payload);
    const state = deserializeState(cp.state as Parameters<typeof deserializeState>[0]);
    if (state.step !== cp.step) {
      throw new InputError(`checkpoint step ${cp.step} disagrees with its state (${state.step})`, {
        file: runPath(dir, "checkpoint"),
      });
    }
    const target = options.addSteps !== undefined
      ? cp.step + options.addSteps
      : options.steps ?? cp.targetSteps;
    await writeStatus(dir, {
      state: "starting",
      step: cp.step,
      targetSteps: target,
      threads: options.threads,
      stepsPerSecond: NaN,
      startedAt: new Date().toISOString(),
    });
    const evaluator = await createEvaluator(
      { moduleUrl: MODEL_URL, exportName: "createLogPosterior", payload },
      { threads: options.threads, dimensions: model.dimensions },
    );
    try {
      const r = await loop(dir, {
        model,
        manifest,
        state,
        evaluator,
        target,
        moves: manifest.moves,
        flushedBytes: cp.chainBytes,
      }, options);
      return { ...r, notes };
    } finally {
      await evaluator.close();
    }
  } finally {
    await lock.release();
  }
}

interface LoopInput {
  model: CompiledModel;
  manifest: Manifest;
  state: EnsembleState;
  evaluator: Evaluator;
  target: number;
  moves: readonly MoveSpec[];
  flushedBytes: number;
}

async function loop(
  dir: string,
  input: LoopInput,
  options: SessionOptions,
): Promise<SessionResult> {
  const { model, evaluator, target, moves } = input;
  let state = input.state;
  const W = state.walkers;
  const D = state.dimensions;
  const columns = LEADING_COLUMNS.length + D;
  const flushSteps = options.flushSteps ?? input.manifest.spec.sampler.flushSteps;
  const flushMs = 1000 * (options.flushSeconds ?? input.manifest.spec.sampler.flushSeconds);
  let block = new Float64Array(Math.min(flushSteps, 64) * W * columns);
  let blockSteps = 0;
  const thin = input.manifest.thin ?? 1;
  const every = options.checkEvery ?? input.manifest.spec.sampler.checkEvery ?? 2500;
  const checkEvery = Math.max(thin, Math.ceil(every / thin) * thin);
  let blockFirst = Math.floor(state.step / thin);
  let flushedStep = state.step;
  let chainBytes = input.flushedBytes;
  let lastFlush = performance.now();
  const startedAt = new Date().toISOString();
  const phys = new Float64Array(D);
  const theta = new Float64Array(D);
  let stopRequested = false;
  const onSignal = () => {
    stopRequested = true;
  };
  const handle = options.handleSignals ?? true;
  if (handle) {
    Deno.addSignalListener("SIGINT", onSignal);
    Deno.addSignalListener("SIGTERM", onSignal);
  }
  // Speed over a sliding window of recent steps.
  const times: number[] = [];
  let accSum = 0;
  let accCount = 0;
  const flush = async () => {
    if (blockSteps === 0) return;
    chainBytes = await appendBlock(dir, {
      firstStep: blockFirst,
      steps: blockSteps,
      walkers: W,
      columns,
    }, block);
    await saveCheckpoint(dir, {
      step: state.step,
      chainBytes,
      targetSteps: target,
      savedAt: new Date().toISOString(),
      state: serializeState(state),
    });
    blockFirst = Math.floor(state.step / thin);
    flushedStep = state.step;
    blockSteps = 0;
    lastFlush = performance.now();
  };
  const status = (s: "running" | "finished" | "stopped" | "failed", message?: string) =>
    writeStatus(dir, {
      state: s,
      step: state.step,
      targetSteps: target,
      threads: options.threads,
      stepsPerSecond: rate(),
      startedAt,
      message,
    });
  const rate = () =>
    times.length < 2 ? NaN : (1000 * (times.length - 1)) / (times[times.length - 1]! - times[0]!);
  try {
    await status("running");
    while (state.step < target && !stopRequested) {
      const r = await ensembleStep(state, { evaluator, moves });
      state = r.state;
      for (let w = 0; w < W; w++) {
        const a = r.info.acceptedThisStep[w]!;
        accSum += a;
        accCount++;
      }
      // Rows are stored for sampler steps thin, 2·thin, … (absolute, so resumes agree).
      const store = state.step % thin === 0;
      const need = (blockSteps + 1) * W * columns;
      if (store && need > block.length) {
        const bigger = new Float64Array(Math.min(flushSteps, 2 * (blockSteps + 1)) * W * columns);
        bigger.set(block.subarray(0, blockSteps * W * columns));
        block = bigger;
      }
      let o = blockSteps * W * columns;
      for (let w = 0; w < W && store; w++) {
        for (let d = 0; d < D; d++) theta[d] = state.positions[w * D + d]!;
        model.toPhysical(theta, phys);
        block[o++] = state.logProb[w]!;
        block[o++] = r.info.acceptedThisStep[w]!;
        for (let d = 0; d < D; d++) block[o++] = phys[d]!;
      }
      if (store) blockSteps++;
      const now = performance.now();
      times.push(now);
      if (times.length > 200) times.shift();
      const checkNow = store && options.shouldStop !== undefined && state.step % checkEvery === 0;
      if (
        store &&
        (checkNow || blockSteps >= flushSteps || now - lastFlush >= flushMs || state.step >= target)
      ) {
        await flush();
        await status("running");
        if (checkNow && await options.shouldStop!(state.step)) break;
      }
      options.onProgress?.({
        step: state.step,
        targetSteps: target,
        stepsPerSecond: rate(),
        acceptance: accCount === 0 ? NaN : accSum / accCount,
        flushedStep,
      });
    }
    await flush();
    const done = state.step >= target || !stopRequested;
    await status(done ? "finished" : "stopped");
    return { state: done ? "finished" : "stopped", step: state.step };
  } catch (err) {
    const message = (err as Error).message;
    // The last checkpoint names the chain length it matches; resume truncates any partial block.
    try {
      await status("failed", message);
    } catch {
      // disk may be full; the checkpoint on disk is still the last good one
    }
    return { state: "failed", step: flushedStep, message };
  } finally {
    if (handle) {
      Deno.removeSignalListener("SIGINT", onSignal);
      Deno.removeSignalListener("SIGTERM", onSignal);
    }
  }
}

async function prepareDir(dir: string): Promise<void> {
  try {
    const info = await Deno.stat(dir);
    if (!info.isDirectory) {
      throw new InputError(
        "output path is a file: expected a folder for the run directory (new or empty)",
        {
          file: dir,
          field: "--out",
        },
      );
    }
    for await (const e of Deno.readDir(dir)) {
      if (e.name === "manifest.json" || e.name === "chain.bin") {
        throw new InputError(
          "already holds a run: use `resume` to continue it, or choose another --out",
          { file: dir, field: "--out" },
        );
      }
    }
  } catch (err) {
    if (err instanceof InputError) throw err;
    if (!(err instanceof Deno.errors.NotFound)) {
      throw new InputError(`cannot use output path (${firstLine(err)}): expected a folder path`, {
        file: dir,
        field: "--out",
      });
    }
    try {
      await Deno.mkdir(dir, { recursive: true });
    } catch (e) {
      throw new InputError(
        `cannot create the run directory (${
          firstLine(e)
        }): expected a path where folders can be created`,
        {
          file: dir,
          field: "--out",
        },
      );
    }
  }
  // Fail early if not writable.
  try {
    const probe = `${dir}/.write-probe-${Deno.pid}`;
    await Deno.writeTextFile(probe, "");
    await Deno.remove(probe);
  } catch (e) {
    throw new InputError(
      `run directory is not writable (${firstLine(e)}): expected a writable folder`,
      {
        file: dir,
        field: "--out",
      },
    );
  }
}

/** Plain arrays for JSON. */
export function plainData(d: ProblemData): Manifest["data"] {
  return {
    time: Array.from(d.time),
    rv: Array.from(d.rv),
    rvErr: Array.from(d.rvErr),
    instrument: Array.from(d.instrument),
  };
}

/** Typed arrays from the manifest's JSON. */
export function typedData(d: Manifest["data"]): ProblemData {
  return {
    time: Float64Array.from(d.time),
    rv: Float64Array.from(d.rv),
    rvErr: Float64Array.from(d.rvErr),
    instrument: Int32Array.from(d.instrument),
    count: d.time.length,
  };
}

async function neverCheckpointed(dir: string): Promise<boolean> {
  for (const f of ["checkpoint", "checkpointPrev"] as const) {
    try {
      await Deno.stat(runPath(dir, f));
      return false;
    } catch {
      // missing
    }
  }
  try {
    await Deno.stat(`${runPath(dir, "checkpoint")}.staged`);
    return false;
  } catch {
    return true;
  }
}

function firstLine(err: unknown): string {
  return String((err as Error)?.message ?? err).split("\n")[0]!;
}
