/**
 * What the dashboard reads from a run directory, as plain data. The run
 * directory reader (`src/run/`) fills it; `tui/model.ts` reduces successive
 * snapshots into the view-model. Nothing here talks to the sampler.
 * @module
 */

/** Run state as recorded in the run directory. */
export type RunState = "starting" | "running" | "finished" | "stopped" | "failed" | "stale";

/** One sampled parameter as named in summaries (`b.period`, `spectroA.jitter`). */
export interface SnapshotParameter {
  readonly key: string;
  /** Display unit, e.g. `d`, `m/s`, `deg`, or empty for dimensionless. */
  readonly unit: string;
}

/** Convergence figures for one parameter; NaN where not yet computable. */
export interface SnapshotDiagnostics {
  readonly rhat: number;
  readonly essBulk: number;
  readonly essTail: number;
  /** Integrated autocorrelation time in steps. */
  readonly tau: number;
  readonly stepsPerTau: number;
}

/** Derived quantities of one planet, as posterior draws (same length as `draws`). */
export interface SnapshotPlanet {
  readonly name: string;
  /** m sin i in Jupiter masses (a lower limit on the true mass). */
  readonly msiniMjup: Float64Array;
  /** m sin i in Earth masses. */
  readonly msiniMearth: Float64Array;
  /** Semi-major axis in au. */
  readonly aAu: Float64Array;
  readonly eccentricity: Float64Array;
  /** Projected spin–orbit angle in degrees, where the RM effect is modelled. */
  readonly lambdaDeg?: Float64Array;
  /** 3D obliquity in degrees, where the star's inclination is constrained. */
  readonly psiDeg?: Float64Array;
}

/** Everything one dashboard refresh needs. */
export interface RunSnapshot {
  /** Run directory path as given by the user. */
  readonly dir: string;
  readonly title: string;
  readonly state: RunState;
  /** Steps written so far (completed steps on disk). */
  readonly step: number;
  /** Steps the run is asked to reach. */
  readonly totalSteps: number;
  readonly walkers: number;
  readonly threads: number;
  /** Recent sampling speed; NaN when unknown. */
  readonly stepsPerSecond: number;
  /** Burn-in steps discarded for `draws`. */
  readonly burn: number;
  /** Mean acceptance fraction over all walkers so far. */
  readonly acceptance: number;
  /** Walker indices flagged as stuck. */
  readonly stuckWalkers: readonly number[];
  readonly parameters: readonly SnapshotParameter[];
  /** Posterior draws after burn-in (thinned, pooled over walkers), one array per parameter. */
  readonly draws: readonly Float64Array[];
  /** One entry per parameter, same order as `parameters`. */
  readonly diagnostics: readonly SnapshotDiagnostics[];
  /** Walker-mean log-posterior per (thinned) step, with the step numbers. */
  readonly logPosteriorTrace: { readonly steps: Float64Array; readonly values: Float64Array };
  readonly planets: readonly SnapshotPlanet[];
  /** Thresholds used for the good/warning/bad marks. */
  readonly thresholds: {
    readonly rhat: number;
    readonly essBulk: number;
    readonly stepsPerTau: number;
  };
  /** Whether all convergence criteria hold (a flag, never a proof of convergence). */
  readonly converged: boolean;
  /** Last message from the run (error text when failed). */
  readonly message?: string;
}
