/**
 * The affine-invariant ensemble sampler as an explicit state plus pure
 * `initEnsemble` / `step` functions (Goodman & Weare 2010, Commun. Appl. Math.
 * Comput. Sci. 5, 65, doi:10.2140/camcos.2010.5.65).
 *
 * `step` is a deterministic function of the state: the random stream is
 * restored from `state.rng` at the start and saved at the end, so N steps,
 * a checkpoint, and N more steps give the same bytes as 2N steps straight.
 * @module
 */

import { decodeFloat64, encodeFloat64 } from "./_base64.ts";
import {
  complementSpread,
  differentialEvolutionMove,
  type DifferentialEvolutionOptions,
  type HalfStep,
  stretchMove,
  type StretchOptions,
} from "./moves.ts";
import type { Evaluator } from "./pool.ts";
import { createRng, restoreRng, type RngState, validateRngState } from "./rng.ts";

/** Everything the next step needs, as plain data. */
export interface EnsembleState {
  /** Number of walkers (even, > 2 × dimensions). */
  walkers: number;
  /** Number of parameters D. */
  dimensions: number;
  /** Walker-major positions: `positions[w * D + d]`. */
  positions: Float64Array;
  /** Log-probability of each walker's position. */
  logProb: Float64Array;
  /** State of the random stream. */
  rng: RngState;
  /** Number of steps taken since `initEnsemble`. */
  step: number;
  /** Cumulative number of accepted proposals per walker. */
  accepted: Float64Array;
}

/** One move type and its weight in the mix. */
export type MoveSpec =
  | ({ kind: "stretch"; weight: number } & StretchOptions)
  | ({ kind: "de"; weight: number } & DifferentialEvolutionOptions);

/** Moves chosen per half-step with probability proportional to weight. */
export type MoveMix = readonly MoveSpec[];

/** The default move mix: the stretch move alone with a = 2. */
export const defaultMoves: MoveMix = [{ kind: "stretch", weight: 1, scale: 2 }];

/** Options of {@linkcode initEnsemble}. */
export interface InitOptions {
  /** Number of walkers: even and greater than 2 × dimensions. */
  walkers: number;
  /** Seed of the random stream. */
  seed: number | string;
  /** Per-dimension standard deviation of the Gaussian ball around the start point. */
  scale: Float64Array;
  /** Evaluates the log-probability. */
  evaluator: Evaluator;
  /** Draws per walker before giving up on a finite log-probability. @default 100 */
  maxTries?: number;
}

/**
 * Place the walkers in a small Gaussian ball around `start` and evaluate them.
 *
 * Walker w, dimension d starts at start[d] + scale[d] · N(0, 1). Walkers whose
 * log-probability is not finite (−Infinity, NaN, or +Infinity) are drawn again,
 * all such walkers of a round in one evaluator call, up to `maxTries` draws.
 *
 * The walker count must be even because the kernel splits the ensemble into
 * two equal halves (red/blue) that are updated in turn: each half-step then
 * sends the same number of points to the evaluator and each half has as many
 * complementary walkers as the other. It must exceed 2 × dimensions so that
 * each half holds at least D + 1 walkers, the fewest whose affine span is the
 * whole D-dimensional space; otherwise the moves, built from the other half's
 * positions, could not leave a lower-dimensional subspace.
 *
 * @throws {RangeError} on invalid walkers, scale or start, or when some walker
 *   found no finite log-probability in `maxTries` draws.
 */
export async function initEnsemble(
  start: Float64Array,
  options: InitOptions,
): Promise<EnsembleState> {
  const { walkers, evaluator, scale } = options;
  const dims = evaluator.dimensions;
  const maxTries = options.maxTries ?? 100;
  if (!(start instanceof Float64Array) || start.length !== dims) {
    throw new RangeError(
      `Cannot start sampler as the start point has the wrong length: length=${start?.length}, dimensions=${dims}`,
    );
  }
  if (!(scale instanceof Float64Array) || scale.length !== dims) {
    throw new RangeError(
      `Cannot start sampler as scale has the wrong length: length=${scale?.length}, dimensions=${dims}`,
    );
  }
  for (let d = 0; d < dims; d++) {
    if (!Number.isFinite(start[d]!)) {
      throw new RangeError(
        `Cannot start sampler as the start point is not finite: index=${d}, value=${start[d]}`,
      );
    }
    if (!(scale[d]! >= 0) || !Number.isFinite(scale[d]!)) {
      throw new RangeError(
        `Cannot start sampler as scale must be finite and non-negative: index=${d}, value=${
          scale[d]
        }`,
      );
    }
  }
  checkWalkers(walkers, dims);
  if (!Number.isInteger(maxTries) || maxTries < 1) {
    throw new RangeError(
      `Cannot start sampler as maxTries must be a positive integer: maxTries=${maxTries}`,
    );
  }
  const rng = createRng(options.seed);
  const positions = new Float64Array(walkers * dims);
  const logProb = new Float64Array(walkers);
  const batch = new Float64Array(walkers * dims);
  const batchLogProb = new Float64Array(walkers);
  const pending = new Int32Array(walkers);
  let pendingCount = walkers;
  for (let w = 0; w < walkers; w++) pending[w] = w;
  for (let tries = 1; pendingCount > 0; tries++) {
    if (tries > maxTries) {
      throw new RangeError(
        `Cannot start sampler as some walkers found no finite log-probability: walkersWithout=${pendingCount}, maxTries=${maxTries}`,
      );
    }
    for (let i = 0; i < pendingCount; i++) {
      for (let d = 0; d < dims; d++) batch[i * dims + d] = start[d]! + scale[d]! * rng.normal();
    }
    await evaluator.evaluate(batch, pendingCount, batchLogProb);
    let still = 0;
    for (let i = 0; i < pendingCount; i++) {
      const w = pending[i]!;
      const lp = batchLogProb[i]!;
      if (Number.isFinite(lp)) {
        positions.set(batch.subarray(i * dims, (i + 1) * dims), w * dims);
        logProb[w] = lp;
      } else {
        pending[still++] = w;
      }
    }
    pendingCount = still;
  }
  return {
    walkers,
    dimensions: dims,
    positions,
    logProb,
    rng: rng.state(),
    step: 0,
    accepted: new Float64Array(walkers),
  };
}

function checkWalkers(walkers: number, dims: number): void {
  if (!Number.isInteger(walkers) || walkers <= 2 * dims) {
    throw new RangeError(
      `Cannot start sampler as walkers must exceed twice the dimensions: walkers=${walkers}, dimensions=${dims}`,
    );
  }
  if (walkers % 2 !== 0) {
    throw new RangeError(
      `Cannot start sampler as walkers must be even for the red/blue split: walkers=${walkers}`,
    );
  }
}

/** Scratch buffers of {@linkcode step}; reuse one per ensemble shape to avoid allocation. */
export interface StepWorkspace {
  readonly walkers: number;
  readonly dimensions: number;
  readonly proposals: Float64Array;
  readonly logHastings: Float64Array;
  readonly proposalLogProb: Float64Array;
  readonly spread: Float64Array;
  /** 1 where the walker's proposal was accepted in the last step; overwritten by the next step. */
  readonly acceptedThisStep: Uint8Array;
}

/** Allocate the scratch buffers of {@linkcode step} for an ensemble shape. */
export function createWorkspace(walkers: number, dimensions: number): StepWorkspace {
  const half = walkers / 2;
  return {
    walkers,
    dimensions,
    proposals: new Float64Array(half * dimensions),
    logHastings: new Float64Array(half),
    proposalLogProb: new Float64Array(half),
    spread: new Float64Array(dimensions),
    acceptedThisStep: new Uint8Array(walkers),
  };
}

/** Options of {@linkcode step}. */
export interface StepOptions {
  /** Evaluates the log-probability. */
  evaluator: Evaluator;
  /** Move mix, one move type drawn per half-step by weight. @default defaultMoves */
  moves?: MoveMix;
  /** State to write the result into (may be `state` itself); a new one when absent. */
  out?: EnsembleState;
  /** Scratch buffers; allocated per call when absent. `info.acceptedThisStep` lives in it. */
  workspace?: StepWorkspace;
}

/** Per-step facts returned by {@linkcode step}. */
export interface StepInfo {
  /** 1 where the walker's proposal was accepted in this step, else 0. */
  acceptedThisStep: Uint8Array;
}

/**
 * Advance every walker once.
 *
 * Method: the parallel (red/blue) form of Goodman & Weare (2010): walkers 0 … n/2 − 1
 * are moved with proposals built from walkers n/2 … n − 1, which stay fixed,
 * then the second half is moved against the updated first half. For each
 * half-step one move type is drawn from `moves` by weight, one proposal per
 * active walker is made (walker order), the proposals are evaluated in one
 * evaluator call, and walker k accepts its proposal Y when
 * ln(1 − u) ≤ ln H + ln p(Y) − ln p(X_k), u uniform on [0, 1) and H the move's
 * Hastings term (Metropolis–Hastings; Hastings 1970, Biometrika 57, 97).
 * A proposal whose log-probability is NaN is rejected.
 *
 * @throws {RangeError} when the state, moves, out or workspace do not fit.
 */
export async function step(
  state: EnsembleState,
  options: StepOptions,
): Promise<{ state: EnsembleState; info: StepInfo }> {
  const { evaluator } = options;
  const moves = options.moves ?? defaultMoves;
  const walkers = state.walkers;
  const dims = state.dimensions;
  checkState(state, evaluator);
  const totalWeight = checkMoves(moves);
  const ws = options.workspace ?? createWorkspace(walkers, dims);
  if (ws.walkers !== walkers || ws.dimensions !== dims) {
    throw new RangeError(
      `Cannot step sampler as the workspace has another shape: workspace=${ws.walkers}x${ws.dimensions}, state=${walkers}x${dims}`,
    );
  }
  const out = options.out ?? {
    walkers,
    dimensions: dims,
    positions: new Float64Array(walkers * dims),
    logProb: new Float64Array(walkers),
    rng: state.rng,
    step: 0,
    accepted: new Float64Array(walkers),
  };
  if (out !== state) {
    if (
      out.walkers !== walkers || out.dimensions !== dims ||
      out.positions.length !== walkers * dims ||
      out.logProb.length !== walkers || out.accepted.length !== walkers
    ) {
      throw new RangeError(
        `Cannot step sampler as out has another shape: out=${out.walkers}x${out.dimensions}, state=${walkers}x${dims}`,
      );
    }
    out.positions.set(state.positions);
    out.logProb.set(state.logProb);
    out.accepted.set(state.accepted);
  }
  const stepNumber = state.step;
  const rng = restoreRng(state.rng);
  const half = walkers / 2;
  const positions = out.positions;
  const logProb = out.logProb;
  const accepted = out.accepted;
  const { proposals, logHastings, proposalLogProb, acceptedThisStep } = ws;
  for (let h = 0; h < 2; h++) {
    const activeStart = h * half;
    const context: HalfStep = {
      dimensions: dims,
      positions,
      activeStart,
      complementStart: (1 - h) * half,
      complementCount: half,
      proposals,
      spread: ws.spread,
      rng,
    };
    const move = pickMove(moves, totalWeight, rng.uniform());
    if (move.kind === "stretch") {
      for (let i = 0; i < half; i++) logHastings[i] = stretchMove(context, activeStart + i, move);
    } else {
      complementSpread(context);
      for (let i = 0; i < half; i++) {
        logHastings[i] = differentialEvolutionMove(context, activeStart + i, move);
      }
    }
    await evaluator.evaluate(proposals, half, proposalLogProb);
    for (let i = 0; i < half; i++) {
      const k = activeStart + i;
      const u = rng.uniform();
      const lp = proposalLogProb[i]!;
      if (Math.log(1 - u) <= logHastings[i]! + lp - logProb[k]!) {
        positions.set(proposals.subarray(i * dims, (i + 1) * dims), k * dims);
        logProb[k] = lp;
        accepted[k] = accepted[k]! + 1;
        acceptedThisStep[k] = 1;
      } else {
        acceptedThisStep[k] = 0;
      }
    }
  }
  out.rng = rng.state();
  out.step = stepNumber + 1;
  return { state: out, info: { acceptedThisStep } };
}

function pickMove(moves: MoveMix, totalWeight: number, u: number): MoveSpec {
  let target = u * totalWeight;
  for (const move of moves) {
    if (target < move.weight) return move;
    target -= move.weight;
  }
  // Rounding can leave target just above the last weight: take the last move with weight.
  for (let i = moves.length - 1; i >= 0; i--) if (moves[i]!.weight > 0) return moves[i]!;
  return moves[0]!;
}

function checkMoves(moves: MoveMix): number {
  if (!Array.isArray(moves) || moves.length === 0) {
    throw new RangeError(
      `Cannot step sampler as the move mix is empty: moves=${JSON.stringify(moves)}`,
    );
  }
  let total = 0;
  for (const move of moves) {
    if (!(move.weight >= 0) || !Number.isFinite(move.weight)) {
      throw new RangeError(
        `Cannot step sampler as a move weight is not finite and non-negative: kind=${move.kind}, weight=${move.weight}`,
      );
    }
    if (move.kind === "stretch") {
      if (move.scale !== undefined && !(move.scale > 1 && Number.isFinite(move.scale))) {
        throw new RangeError(
          `Cannot step sampler as the stretch scale must exceed 1: scale=${move.scale}`,
        );
      }
    } else if (move.kind === "de") {
      if (move.gamma !== undefined && !(move.gamma > 0 && Number.isFinite(move.gamma))) {
        throw new RangeError(
          `Cannot step sampler as the DE gamma must be positive: gamma=${move.gamma}`,
        );
      }
      const hop = move.hopProbability;
      if (hop !== undefined && !(hop >= 0 && hop <= 1)) {
        throw new RangeError(
          `Cannot step sampler as the DE hop probability must lie in [0, 1]: hopProbability=${hop}`,
        );
      }
      if (move.noise !== undefined && !(move.noise >= 0 && Number.isFinite(move.noise))) {
        throw new RangeError(
          `Cannot step sampler as the DE noise must be finite and non-negative: noise=${move.noise}`,
        );
      }
    } else {
      throw new RangeError(
        `Cannot step sampler as the move kind is unknown: kind=${(move as { kind: unknown }).kind}`,
      );
    }
    total += move.weight;
  }
  if (!(total > 0)) {
    throw new RangeError(
      `Cannot step sampler as the move weights sum to zero: moves=${moves.length}`,
    );
  }
  return total;
}

function checkState(state: EnsembleState, evaluator: Evaluator): void {
  const { walkers, dimensions } = state;
  if (dimensions !== evaluator.dimensions) {
    throw new RangeError(
      `Cannot step sampler as the evaluator has other dimensions: state=${dimensions}, evaluator=${evaluator.dimensions}`,
    );
  }
  checkWalkers(walkers, dimensions);
  if (
    state.positions.length !== walkers * dimensions || state.logProb.length !== walkers ||
    state.accepted.length !== walkers
  ) {
    throw new RangeError(
      `Cannot step sampler as the state arrays have the wrong length: positions=${state.positions.length}, logProb=${state.logProb.length}, accepted=${state.accepted.length}, walkers=${walkers}, dimensions=${dimensions}`,
    );
  }
}

/** JSON-safe form of an {@linkcode EnsembleState}. */
export interface SerializedEnsembleState {
  format: "rvwalk-ensemble-state";
  version: 1;
  walkers: number;
  dimensions: number;
  step: number;
  rng: RngState;
  /** Base64 of the little-endian IEEE 754 bytes. */
  positions: string;
  logProb: string;
  accepted: string;
}

/** A JSON-safe copy of `state`; the arrays are encoded losslessly (base64 of little-endian bytes). */
export function serializeState(state: EnsembleState): SerializedEnsembleState {
  return {
    format: "rvwalk-ensemble-state",
    version: 1,
    walkers: state.walkers,
    dimensions: state.dimensions,
    step: state.step,
    rng: { ...state.rng },
    positions: encodeFloat64(state.positions),
    logProb: encodeFloat64(state.logProb),
    accepted: encodeFloat64(state.accepted),
  };
}

/**
 * Rebuild a state written by {@linkcode serializeState} (for example after
 * `JSON.parse`).
 *
 * @throws {TypeError} when a field is missing or has the wrong type or size.
 * @throws {RangeError} when walkers and dimensions do not fit the sampler's rules.
 */
export function deserializeState(value: unknown): EnsembleState {
  if (typeof value !== "object" || value === null) {
    throw new TypeError(
      `Cannot restore sampler state as it is not an object: state=${String(value)}`,
    );
  }
  const v = value as Record<string, unknown>;
  if (v.format !== "rvwalk-ensemble-state" || v.version !== 1) {
    throw new TypeError(
      `Cannot restore sampler state as the format is unknown: format=${String(v.format)}, version=${
        String(v.version)
      }`,
    );
  }
  for (const key of ["walkers", "dimensions", "step"]) {
    const x = v[key];
    if (typeof x !== "number" || !Number.isInteger(x) || x < 0) {
      throw new TypeError(
        `Cannot restore sampler state as a field is not a non-negative integer: ${key}=${
          String(x)
        }`,
      );
    }
  }
  const walkers = v.walkers as number;
  const dimensions = v.dimensions as number;
  if (dimensions < 1) {
    throw new RangeError(
      `Cannot restore sampler state as dimensions must be positive: dimensions=${dimensions}`,
    );
  }
  checkWalkers(walkers, dimensions);
  validateRngState(v.rng);
  return {
    walkers,
    dimensions,
    positions: decodeFloat64(v.positions, { length: walkers * dimensions, field: "positions" }),
    logProb: decodeFloat64(v.logProb, { length: walkers, field: "logProb" }),
    rng: { ...v.rng },
    step: v.step as number,
    accepted: decodeFloat64(v.accepted, { length: walkers, field: "accepted" }),
  };
}
