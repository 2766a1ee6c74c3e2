/**
 * The parsed, validated spec: what a run is asked to fit. Numbers are in the
 * units the spec uses (days, m/s, degrees, solar masses); kernels convert.
 * @module
 */

import type { Prior } from "../model/priors.ts";

/** A prior as written in the spec. `fixed` means the parameter is not sampled. */
export type PriorSpec = Prior;

/** One model quantity: its prior and optional start value (centre of the walker ball). */
export interface ParamSpec {
  readonly prior: PriorSpec;
  readonly start?: number;
}

export interface StarSpec {
  /** Prior on the star's mass, solar masses; used for derived masses and a. */
  readonly massMsun: ParamSpec;
  /** Prior on the star's radius, solar radii (optional). */
  readonly radiusRsun?: ParamSpec;
  /** Prior on the star's rotation period, days (optional; with radius gives i★). */
  readonly rotationPeriodDays?: ParamSpec;
}

export interface InstrumentSpec {
  readonly name: string;
  /** m/s */
  readonly offset: ParamSpec;
  /** m/s, added in quadrature to each point's error */
  readonly jitter: ParamSpec;
  /** True when the spec had no `[[instrument]]` for this name and defaults were used. */
  readonly defaulted: boolean;
}

/** Rossiter–McLaughlin terms of one planet (degrees, km/s, stellar radii, seconds). */
export interface RmSpec {
  readonly lambdaDeg: ParamSpec;
  readonly vsiniKms: ParamSpec;
  readonly radiusRatio: ParamSpec;
  readonly aOverRstar: ParamSpec;
  readonly impact: ParamSpec;
  readonly u1: ParamSpec;
  readonly u2: ParamSpec;
  /** Exposure time in seconds (0: no smearing). */
  readonly exposureS: number;
}

export interface PlanetSpec {
  readonly name: string;
  /** days */
  readonly period: ParamSpec;
  /** Reference epoch: time of inferior conjunction (`tc`) or of periastron (`tp`), days. */
  readonly epochKind: "tc" | "tp";
  readonly epoch: ParamSpec;
  /** m/s */
  readonly semiAmplitude: ParamSpec;
  readonly eccentricity: ParamSpec;
  /** Argument of periastron of the star's orbit, degrees. */
  readonly omegaDeg: ParamSpec;
  readonly rm?: RmSpec;
}

export interface TrendSpec {
  /** m/s/day */
  readonly slope: ParamSpec;
  /** m/s/day² (optional) */
  readonly quadratic?: ParamSpec;
  /** days; offsets are the values at this time */
  readonly referenceTime: number;
}

/** A move and its weight in the proposal mix. */
export interface MoveSpec {
  readonly kind: "stretch" | "de";
  readonly weight: number;
  /** Stretch scale `a` (stretch only). */
  readonly scale?: number;
}

export interface SamplerSpec {
  readonly walkers: number;
  readonly steps: number;
  readonly seed: number;
  readonly threads?: number;
  /** Store every `thin`-th step in the chain file (the sampler still takes every step). */
  readonly thin: number;
  readonly moves: readonly MoveSpec[];
  /** Stop early when converged (`--until-converged`). */
  readonly untilConverged: boolean;
  /** Steps between convergence checks when stopping on convergence. */
  readonly checkEvery: number;
  readonly thresholds: {
    readonly rhat: number;
    readonly essBulk: number;
    readonly stepsPerTau: number;
  };
  /** Flush the chain at least this often (seconds) and every this many steps. */
  readonly flushSeconds: number;
  readonly flushSteps: number;
}

export interface ModelSpec {
  readonly title: string;
  /** Absolute path of the spec file, or a label for built-in specs. */
  readonly specPath: string;
  readonly star: StarSpec;
  /** Data files, resolved relative to the spec file. */
  readonly dataFiles: readonly string[];
  readonly instruments: readonly InstrumentSpec[];
  readonly planets: readonly PlanetSpec[];
  readonly trend?: TrendSpec;
  readonly sampler: SamplerSpec;
}
