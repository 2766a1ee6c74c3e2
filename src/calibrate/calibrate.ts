/**
 * Simulation-based calibration of a spec's posterior (Talts, Betancourt,
 * Simpson, Vehtari & Gelman 2018, arXiv:1804.06788): N simulations spread
 * over Deno Workers, each a whole simulation with its own seeded streams, then
 * per-quantity rank histograms and χ² uniformity p-values.
 * @module
 */
import { CompiledModel, type ModelPayload } from "../model/posterior.ts";
import type { MoveMix } from "../../samplers/mod.ts";
import { binomialBand, defaultBins, rankUniformity, validateBinning } from "./ranks.ts";
import {
  calibrationKeys,
  type DensityModule,
  runSimulation,
  type SimulationResult,
  type SimulationSettings,
  type StartKind,
} from "./simulation.ts";
import type { WorkerRequest, WorkerResponse } from "./_worker.ts";

/** Progress of a calibration, after each finished simulation. */
export interface CalibrationProgress {
  readonly done: number;
  readonly total: number;
  readonly elapsedSeconds: number;
}

/** Options of {@link calibrate}. */
export interface CalibrateOptions {
  /** N, the number of simulations. @default 200 */
  simulations?: number;
  /** Ensemble steps per simulation, burn-in included. @default 2000 */
  steps?: number;
  /** Fraction of the steps discarded as burn-in. @default 0.5 */
  burnFraction?: number;
  /** Walkers. @default the spec's `[sampler] walkers` */
  walkers?: number;
  /** Base seed. @default the spec's `[sampler] seed` */
  seed?: number;
  /** Simulations run at once, each in its own worker; 1 runs them in this thread. @default 1 */
  threads?: number;
  /** L, posterior draws per simulation (ranks 0 … L). @default 99 */
  draws?: number;
  /** B, histogram bins for the χ² test; must divide L + 1. @default defaultBins(N, L) */
  bins?: number;
  /** Move mix. @default the spec's `[sampler] moves` */
  moves?: MoveMix;
  /** Walker start. @default "prior" */
  start?: StartKind;
  /** The log-density to sample (tests use a deliberately wrong one). @default MODEL_DENSITY */
  density?: DensityModule;
  /** Called after each finished simulation. */
  onProgress?: (progress: CalibrationProgress) => void;
}

/** Calibration of one quantity. */
export interface QuantityCalibration {
  /** Rank of the truth in each simulation, in simulation order; 0 … L. */
  readonly ranks: number[];
  /** Ranks per bin. */
  readonly counts: number[];
  readonly chiSquare: number;
  readonly df: number;
  /** χ² uniformity p-value. */
  readonly pValue: number;
  /**
   * Posterior contraction 1 − mean(posterior variance)/var(truths) (Schad,
   * Betancourt & Vasishth 2021, Psychol. Methods 26, 103, sec. "posterior
   * z-score and contraction"): near 0 when the data teach nothing (or the
   * chains never left the prior draws they started from), near 1 when they
   * pin the quantity down.
   */
  readonly contraction: number;
}

/** Result of {@link calibrate}. */
export interface CalibrationResult {
  /** Quantities in order: free parameters, then derived ones. */
  readonly keys: readonly string[];
  readonly parameters: Readonly<Record<string, QuantityCalibration>>;
  readonly simulations: number;
  readonly draws: number;
  readonly bins: number;
  /** 99% band of a bin count under uniformity, Binomial(N, 1/B). */
  readonly band: readonly [number, number];
  readonly steps: number;
  readonly burn: number;
  readonly walkers: number;
  readonly seed: number;
  readonly start: StartKind;
  /** Per-simulation sampler diagnostics. */
  readonly diagnostics: {
    /** Median and largest τ over simulations (steps). */
    readonly tauMedian: number;
    readonly tauMax: number;
    /** Smallest kept steps / τ over simulations. */
    readonly keptPerTauMin: number;
    /** Simulations whose thinned pool held fewer than L draws. */
    readonly shortPools: number;
    /** Median and largest split R-hat (largest over coordinates per simulation). */
    readonly rhatMedian: number;
    readonly rhatMax: number;
    /** Simulations with split R-hat above 1.1. */
    readonly rhatAbove: number;
    readonly acceptanceMedian: number;
    /** Simulations in which stranded walkers were moved halfway through burn-in. */
    readonly relocatedSimulations: number;
  };
  /** Wall-clock seconds. */
  readonly seconds: number;
}

/**
 * Run N simulations and test each quantity's ranks for uniformity.
 *
 * Simulation i depends only on (problem, settings, seed, i), and results are
 * gathered in index order, so the result does not depend on `threads`.
 *
 * @throws {RangeError} on invalid options or when a simulation fails.
 */
export async function calibrate(
  problem: ModelPayload,
  options: CalibrateOptions = {},
): Promise<CalibrationResult> {
  const model = new CompiledModel(problem);
  const simulations = options.simulations ?? 200;
  const steps = options.steps ?? 2000;
  const burnFraction = options.burnFraction ?? 0.5;
  const walkers = options.walkers ?? problem.spec.sampler.walkers;
  const seed = options.seed ?? problem.spec.sampler.seed;
  const threads = Math.min(options.threads ?? 1, simulations);
  const draws = options.draws ?? 99;
  const bins = options.bins ?? defaultBins(simulations, draws);
  const start = options.start ?? "prior";
  for (
    const [name, value] of [["simulations", simulations], ["steps", steps], [
      "threads",
      threads,
    ], ["draws", draws]] as const
  ) {
    if (!Number.isInteger(value) || value < 1) {
      throw new RangeError(
        `Cannot calibrate as ${name} must be a positive integer: ${name}=${value}`,
      );
    }
  }
  if (!(burnFraction >= 0 && burnFraction < 1)) {
    throw new RangeError(
      `Cannot calibrate as the burn-in fraction must lie in [0, 1): burnFraction=${burnFraction}`,
    );
  }
  if (!Number.isInteger(walkers) || walkers <= 2 * model.dimensions || walkers % 2 !== 0) {
    throw new RangeError(
      `Cannot calibrate as walkers must be even and exceed twice the dimensions: walkers=${walkers}, dimensions=${model.dimensions}`,
    );
  }
  if (!Number.isFinite(seed)) {
    throw new RangeError(`Cannot calibrate as the seed is not finite: seed=${seed}`);
  }
  validateBinning({ draws, bins });
  const burn = Math.floor(steps * burnFraction);
  if (steps - burn < 2) {
    throw new RangeError(
      `Cannot calibrate as fewer than 2 steps remain after burn-in: steps=${steps}, burn=${burn}`,
    );
  }
  const settings: SimulationSettings = {
    seed,
    walkers,
    steps,
    burn,
    draws,
    moves: options.moves ?? problem.spec.sampler.moves,
    start,
    density: options.density,
  };
  const t0 = performance.now();
  const results = threads === 1
    ? await runInThread(problem, settings, simulations, options.onProgress, t0)
    : await runInWorkers(problem, settings, { simulations, threads }, options.onProgress, t0);
  const keys = calibrationKeys(model);
  const parameters: Record<string, QuantityCalibration> = {};
  keys.forEach((key, k) => {
    const ranks = results.map((r) => r.ranks[k]!);
    const test = rankUniformity(ranks, { draws, bins });
    const truths = Float64Array.from(results, (r) => r.truth[k]!);
    const meanPosteriorVariance = mean(results.map((r) => r.posteriorVariance[k]!));
    parameters[key] = {
      ranks,
      counts: Array.from(test.counts),
      chiSquare: test.chiSquare,
      df: test.df,
      pValue: test.pValue,
      contraction: 1 - meanPosteriorVariance / sampleVariance(truths),
    };
  });
  const taus = results.map((r) => r.tau);
  const rhats = results.map((r) => r.rhat);
  return {
    keys,
    parameters,
    simulations,
    draws,
    bins,
    band: binomialBand(simulations, 1 / bins, 0.99),
    steps,
    burn,
    walkers,
    seed,
    start,
    diagnostics: {
      tauMedian: median(taus),
      tauMax: Math.max(...taus),
      keptPerTauMin: Math.min(...taus.map((t) => (steps - burn) / t)),
      shortPools: results.filter((r) => r.pool < draws).length,
      rhatMedian: median(rhats),
      rhatMax: Math.max(...rhats),
      rhatAbove: rhats.filter((r) => !(r <= 1.1)).length,
      acceptanceMedian: median(results.map((r) => r.acceptance)),
      relocatedSimulations: results.filter((r) => r.relocated > 0).length,
    },
    seconds: (performance.now() - t0) / 1000,
  };
}

async function runInThread(
  problem: ModelPayload,
  settings: SimulationSettings,
  simulations: number,
  onProgress: CalibrateOptions["onProgress"],
  t0: number,
): Promise<SimulationResult[]> {
  const out: SimulationResult[] = [];
  for (let index = 0; index < simulations; index++) {
    out.push(await runSimulation(problem, { ...settings, index }));
    onProgress?.({
      done: index + 1,
      total: simulations,
      elapsedSeconds: (performance.now() - t0) / 1000,
    });
  }
  return out;
}

/** A queue of simulation indices served to `threads` workers, one simulation at a time each. */
async function runInWorkers(
  problem: ModelPayload,
  settings: SimulationSettings,
  shape: { simulations: number; threads: number },
  onProgress: CalibrateOptions["onProgress"],
  t0: number,
): Promise<SimulationResult[]> {
  const { simulations, threads } = shape;
  const results: (SimulationResult | undefined)[] = new Array(simulations);
  const workers: Worker[] = [];
  let next = 0;
  let done = 0;
  try {
    await new Promise<void>((resolve, reject) => {
      let failed = false;
      const fail = (error: Error) => {
        if (failed) return;
        failed = true;
        reject(error);
      };
      const feed = (worker: Worker) => {
        if (failed || next >= simulations) return;
        worker.postMessage({ kind: "run", index: next++ } satisfies WorkerRequest);
      };
      for (let w = 0; w < threads; w++) {
        const worker = new Worker(new URL("./_worker.ts", import.meta.url), { type: "module" });
        workers.push(worker);
        worker.onmessage = (event: MessageEvent<WorkerResponse>) => {
          const reply = event.data;
          if (reply.kind === "failed") {
            fail(
              new RangeError(
                `Cannot calibrate as a simulation failed: index=${reply.index}, ${reply.message}`,
              ),
            );
            return;
          }
          results[reply.result.index] = reply.result;
          done++;
          onProgress?.({
            done,
            total: simulations,
            elapsedSeconds: (performance.now() - t0) / 1000,
          });
          if (done === simulations) resolve();
          else feed(worker);
        };
        worker.onerror = (event: ErrorEvent) => {
          event.preventDefault();
          fail(new RangeError(`Cannot calibrate as a worker raised an error: ${event.message}`));
        };
        worker.postMessage({ kind: "init", problem, settings } satisfies WorkerRequest);
        feed(worker);
      }
    });
  } finally {
    for (const worker of workers) worker.terminate();
  }
  return results as SimulationResult[];
}

function mean(x: readonly number[]): number {
  let s = 0;
  for (const v of x) s += v;
  return s / x.length;
}

function sampleVariance(x: Float64Array): number {
  if (x.length < 2) return NaN;
  let m = 0;
  for (const v of x) m += v;
  m /= x.length;
  let s = 0;
  for (const v of x) s += (v - m) * (v - m);
  return s / (x.length - 1);
}

function median(x: readonly number[]): number {
  const s = [...x].sort((a, b) => a - b);
  const n = s.length;
  if (n === 0) return NaN;
  return n % 2 === 1 ? s[(n - 1) / 2]! : (s[n / 2 - 1]! + s[n / 2]!) / 2;
}
