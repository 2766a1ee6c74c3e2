/**
 * The affine-invariant ensemble sampler: explicit state, pure `initEnsemble` /
 * `step`, the stretch and differential-evolution moves, a seeded random stream
 * whose state is plain data, and evaluators that spread log-density evaluations
 * over Deno Workers.
 *
 * ```ts
 * const evaluator = await createEvaluator(source, { threads: 2, dimensions: 3 });
 * let state = await initEnsemble(start, { walkers: 32, seed: 1, scale, evaluator });
 * for (let i = 0; i < 1000; i++) ({ state } = await step(state, { evaluator }));
 * await evaluator.close();
 * ```
 * @module
 */

export {
  createWorkspace,
  defaultMoves,
  deserializeState,
  type EnsembleState,
  initEnsemble,
  type InitOptions,
  type MoveMix,
  type MoveSpec,
  type SerializedEnsembleState,
  serializeState,
  step,
  type StepInfo,
  type StepOptions,
  type StepWorkspace,
} from "./ensemble.ts";
export {
  complementSpread,
  differentialEvolutionMove,
  type DifferentialEvolutionOptions,
  type HalfStep,
  stretchMove,
  type StretchOptions,
} from "./moves.ts";
export {
  createEvaluator,
  type Evaluator,
  type EvaluatorOptions,
  type LogDensity,
  type LogDensitySource,
} from "./pool.ts";
export { createRng, restoreRng, Rng, type RngState, rngState, validateRngState } from "./rng.ts";
