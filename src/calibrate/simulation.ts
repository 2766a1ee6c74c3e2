/**
 * One simulation of simulation-based calibration, start to finish: draw the
 * truth from the priors, simulate RVs, sample their posterior with a short
 * ensemble run, thin it to near-independent draws and rank the truth among
 * them (Talts, Betancourt, Simpson, Vehtari & Gelman 2018, arXiv:1804.06788,
 * Algorithm 1).
 *
 * Everything random comes from streams seeded by (seed, simulation index), so
 * a simulation's result does not depend on which worker runs it or when.
 * @module
 */
import { CompiledModel, type ModelPayload } from "../model/posterior.ts";
import { integratedAutocorrTime, splitRhat } from "../diagnostics/mod.ts";
import {
  createEvaluator,
  createRng,
  createWorkspace,
  type EnsembleState,
  type Evaluator,
  type MoveMix,
  type Rng,
  step,
} from "../../samplers/mod.ts";
import { sbcRank } from "./ranks.ts";
import {
  derivedFunction,
  derivedKeys,
  drawFromPrior,
  drawPrior,
  simulateData,
} from "./simulate.ts";

/** Where the log-density factory lives; called with `{ spec, data }` of each simulated data set. */
export interface DensityModule {
  /** Absolute URL of the module. */
  readonly moduleUrl: string;
  /** Export name of the factory `(payload) => (theta) => number`. */
  readonly exportName: string;
}

/** The model's own log-posterior (`createLogPosterior` of src/model/posterior.ts). */
export const MODEL_DENSITY: DensityModule = {
  moduleUrl: new URL("../model/posterior.ts", import.meta.url).href,
  exportName: "createLogPosterior",
};

/** How the walkers start. */
export type StartKind = "prior" | "spec";

/** Settings shared by every simulation of a calibration. */
export interface SimulationSettings {
  /** Base seed; simulation i uses streams seeded `rvwalk-calibrate:<seed>:<i>:…`. */
  readonly seed: number;
  readonly walkers: number;
  /** Ensemble steps per simulation, burn-in included. */
  readonly steps: number;
  /** Steps discarded as burn-in (< steps). */
  readonly burn: number;
  /** L: posterior draws the truth is ranked among (ranks 0 … L). */
  readonly draws: number;
  readonly moves: MoveMix;
  /**
   * `prior`: each walker an independent draw from the priors (overdispersed,
   * independent of the truth); `spec`: the spec's start values with the
   * model's small ball. @default "prior"
   */
  readonly start?: StartKind;
  /** The log-density to sample. @default MODEL_DENSITY */
  readonly density?: DensityModule;
}

/** Outcome of one simulation. */
export interface SimulationResult {
  readonly index: number;
  /** Rank of the truth per quantity (order of {@link calibrationKeys}), 0 … L. */
  readonly ranks: number[];
  /** True values per quantity. */
  readonly truth: number[];
  /** Variance of the L selected draws per quantity. */
  readonly posteriorVariance: number[];
  /** Largest integrated autocorrelation time over the internal coordinates, steps. */
  readonly tau: number;
  /** Thinning stride in steps, ⌈tau⌉. */
  readonly stride: number;
  /** Draws available after thinning (thinned steps × walkers). */
  readonly pool: number;
  /** Largest split R-hat over the internal coordinates, kept steps. */
  readonly rhat: number;
  /** Walkers moved out of low-probability regions halfway through burn-in. */
  readonly relocated: number;
  /** Fraction of accepted proposals over the whole run. */
  readonly acceptance: number;
}

/** Keys of the calibrated quantities: the free parameters, then the derived ones. */
export function calibrationKeys(model: CompiledModel): string[] {
  return [...model.keys, ...derivedKeys(model)];
}

/**
 * Run simulation `index`.
 *
 * Method:
 * 1. θ̃ and M★ from the priors, RVs simulated at θ̃ ({@link drawFromPrior},
 *    {@link simulateData}).
 * 2. Walkers start as independent prior draws (an overdispersed start,
 *    Gelman & Rubin 1992, Stat. Sci. 7, 457, sec. 2) or at the spec's start;
 *    the ensemble then takes `steps` steps with the spec's move mix and the
 *    first `burn` are discarded. Halfway through burn-in, walkers stranded far
 *    below the ensemble's median log-posterior are moved onto other walkers
 *    (see `relocateStranded`).
 * 3. τ = the largest integrated autocorrelation time over the internal
 *    coordinates of the kept steps (Sokal window, src/diagnostics); the kept
 *    chain is thinned to every ⌈τ⌉-th step counted back from the last step.
 *    At one step the walkers are independent at stationarity (the ensemble's
 *    invariant law is the product of the target over walkers; Goodman & Weare
 *    2010, Commun. Appl. Math. Comput. Sci. 5, 65, sec. 2), so the pool holds
 *    near-independent draws; L of them are chosen at random without
 *    replacement. When the pool has fewer than L draws, L draws evenly spread
 *    over all kept steps and walkers are taken instead (`pool` < L says so).
 * 4. The rank of each true quantity among its L draws ({@link sbcRank}); m sin i
 *    pairs each draw with an independent star-mass draw from its prior, as the
 *    summary does.
 */
export async function runSimulation(
  problem: ModelPayload,
  options: SimulationSettings & { index: number },
): Promise<SimulationResult> {
  const { index, walkers, steps, burn, draws, moves } = options;
  const model = new CompiledModel(problem);
  const dims = model.dimensions;
  const tag = `rvwalk-calibrate:${options.seed}:${index}`;
  const rng = createRng(tag);
  const truth = drawFromPrior(model, rng);
  const data = simulateData(model, truth.physical, rng);
  const density = options.density ?? MODEL_DENSITY;
  const evaluator = await createEvaluator(
    { moduleUrl: density.moduleUrl, exportName: density.exportName, payload: { ...problem, data } },
    { threads: 1, dimensions: dims },
  );
  try {
    let state = await startEnsemble(model, evaluator, {
      walkers,
      start: options.start ?? "prior",
      rng,
      seed: `${tag}:sampler`,
    });
    const kept = steps - burn;
    const chain = new Float64Array(kept * walkers * dims);
    const workspace = createWorkspace(walkers, dims);
    const relocateAt = Math.floor(burn / 2);
    let relocated = 0;
    for (let s = 0; s < steps; s++) {
      if (s === relocateAt && s > 0) relocated = relocateStranded(state, rng);
      state = (await step(state, { evaluator, moves, out: state, workspace })).state;
      if (s >= burn) chain.set(state.positions, (s - burn) * walkers * dims);
    }
    let acceptedTotal = 0;
    for (const a of state.accepted) acceptedTotal += a;
    const view = { data: chain, steps: kept, walkers, columns: dims };
    let tau = 0;
    let rhat = 0;
    for (let d = 0; d < dims; d++) {
      const t = integratedAutocorrTime(view, d).tau;
      if (t > tau) tau = t;
      const r = splitRhat(view, d);
      if (r > rhat || Number.isNaN(r)) rhat = r;
    }
    const stride = Number.isFinite(tau) && tau >= 1 ? Math.ceil(tau) : 1;
    const thinnedSteps = Math.floor(kept / stride);
    const pool = thinnedSteps * walkers;
    const chosen = chooseDraws({ kept, walkers, stride, pool, draws }, rng);
    const keys = calibrationKeys(model);
    const q = keys.length;
    const values = Array.from({ length: q }, () => new Float64Array(draws));
    const theta = new Float64Array(dims);
    const physical = new Float64Array(dims);
    const derived = derivedFunction(model);
    const nDerived = q - dims;
    const derivedOut = new Float64Array(nDerived);
    const starPrior = model.spec.star.massMsun.prior;
    for (let l = 0; l < draws; l++) {
      const offset = chosen[l]! * dims;
      theta.set(chain.subarray(offset, offset + dims));
      model.toPhysical(theta, physical);
      for (let d = 0; d < dims; d++) values[d]![l] = physical[d]!;
      const starMass = drawPrior(starPrior, rng);
      derived({ physical, starMass }, derivedOut);
      for (let j = 0; j < nDerived; j++) values[dims + j]![l] = derivedOut[j]!;
    }
    const truthValues = [
      ...truth.physical,
      ...derived(truth, new Float64Array(nDerived)),
    ];
    const ranks = truthValues.map((t, k) => sbcRank(t, values[k]!, { tieBreak: rng.uniform() }));
    return {
      index,
      ranks,
      truth: truthValues,
      posteriorVariance: values.map(variance),
      tau,
      stride,
      pool,
      rhat,
      relocated,
      acceptance: acceptedTotal / (walkers * steps),
    };
  } finally {
    await evaluator.close();
  }
}

/**
 * Indices (step × walkers + walker, into the kept chain) of the L draws.
 * Thinned steps are kept − 1, kept − 1 − stride, …; with pool ≥ L a random
 * L-subset of them (partial Fisher–Yates shuffle; Knuth 1997, TAOCP vol. 2,
 * 3rd ed., §3.4.2, Algorithm P), else L indices evenly spread over all kept
 * steps and walkers.
 */
function chooseDraws(
  shape: { kept: number; walkers: number; stride: number; pool: number; draws: number },
  rng: Rng,
): Int32Array {
  const { kept, walkers, stride, pool, draws } = shape;
  const out = new Int32Array(draws);
  if (pool >= draws) {
    const all = new Int32Array(pool);
    for (let j = 0; j < pool; j++) {
      const s = kept - 1 - Math.floor(j / walkers) * stride;
      all[j] = s * walkers + (j % walkers);
    }
    for (let l = 0; l < draws; l++) {
      const k = l + Math.floor(rng.uniform() * (pool - l));
      const tmp = all[l]!;
      all[l] = all[k]!;
      all[k] = tmp;
      out[l] = all[l]!;
    }
    return out;
  }
  const total = kept * walkers;
  for (let l = 0; l < draws; l++) out[l] = Math.floor(((l + 0.5) * total) / draws);
  return out;
}

/**
 * Move stranded walkers: every walker whose log-posterior lies more than
 * Δ = max(10, D) below the ensemble median is put at the position (and
 * log-posterior) of a walker drawn at random from those at or above the
 * median. Returns the number moved.
 *
 * Why: walkers started from prior draws can be left behind in a local mode
 * (for example "no planet, large jitter") that the stretch and DE moves,
 * built from the other walkers, cannot leave; such a walker would feed draws
 * from a region of negligible posterior mass. In a D-dimensional Gaussian
 * posterior ln p = max − χ²_D/2, which falls more than Δ below its median
 * with probability at most 1.1e-3 over all D (largest at D = 10; computed
 * with `chiSquareSurvival` of chi_square.ts), so walkers of the main mode are rarely
 * moved, and moving one does no harm. The relocation happens halfway through
 * burn-in and only changes where the rest of the burn-in starts: the kept
 * steps are an unmodified ensemble run. Resetting stranded walkers during
 * burn-in is common practice for ensemble samplers, no source.
 */
function relocateStranded(state: EnsembleState, rng: Rng): number {
  const { walkers, dimensions: dims, positions, logProb } = state;
  const sorted = Float64Array.from(logProb).sort();
  const medianLogProb = (sorted[(walkers >> 1) - 1]! + sorted[walkers >> 1]!) / 2;
  const threshold = medianLogProb - Math.max(10, dims);
  const good: number[] = [];
  for (let w = 0; w < walkers; w++) if (logProb[w]! >= medianLogProb) good.push(w);
  let moved = 0;
  for (let w = 0; w < walkers; w++) {
    if (!(logProb[w]! < threshold)) continue;
    const source = good[Math.floor(rng.uniform() * good.length)]!;
    positions.copyWithin(w * dims, source * dims, (source + 1) * dims);
    logProb[w] = logProb[source]!;
    moved++;
  }
  return moved;
}

/** The initial ensemble: prior draws, or the spec's start with the model's ball. */
async function startEnsemble(
  model: CompiledModel,
  evaluator: Evaluator,
  options: { walkers: number; start: StartKind; rng: Rng; seed: string },
): Promise<EnsembleState> {
  const { walkers, start, rng } = options;
  const dims = model.dimensions;
  const positions = new Float64Array(walkers * dims);
  const logProb = new Float64Array(walkers);
  const centre = model.startInternal();
  const ball = model.ballScales();
  const point = new Float64Array(dims);
  for (let w = 0; w < walkers; w++) {
    let found = false;
    for (let tries = 0; tries < 1000 && !found; tries++) {
      if (start === "prior") {
        point.set(model.toInternal(drawFromPrior(model, rng).physical));
      } else {
        for (let d = 0; d < dims; d++) point[d] = centre[d]! + ball[d]! * rng.normal();
      }
      await evaluator.evaluate(point, 1, logProb.subarray(w, w + 1));
      found = Number.isFinite(logProb[w]!);
    }
    if (!found) {
      throw new RangeError(
        `Cannot start calibration ensemble as a walker found no finite log-posterior: walker=${w}, start=${start}`,
      );
    }
    positions.set(point, w * dims);
  }
  return {
    walkers,
    dimensions: dims,
    positions,
    logProb,
    rng: createRng(options.seed).state(),
    step: 0,
    accepted: new Float64Array(walkers),
  };
}

/** Sample variance (n − 1 denominator) by Welford's update (Welford 1962, Technometrics 4, 419). */
function variance(x: Float64Array): number {
  let mean = 0;
  let m2 = 0;
  for (let i = 0; i < x.length; i++) {
    const d = x[i]! - mean;
    mean += d / (i + 1);
    m2 += d * (x[i]! - mean);
  }
  return x.length > 1 ? m2 / (x.length - 1) : NaN;
}
