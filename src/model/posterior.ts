/**
 * The log-posterior of a spec over a flat internal parameter vector: the layout
 * of free parameters, transforms to the sampler's internal space with their
 * log-Jacobians, priors, and the RV likelihood (Keplerians, RM anomaly, offsets,
 * trend, jitter). Pure: a compiled model reads only its arrays.
 *
 * `createLogPosterior(payload)` is the factory the sampler's workers import.
 * @module
 */
import type { ModelSpec, ParamSpec, PriorSpec } from "../spec/types.ts";
import type { ProblemData } from "../spec/resolve.ts";
import {
  addKeplerianRv,
  type Orbit,
  timeConjunctionFromPeriastron,
  timePeriastronFromConjunction,
} from "./keplerian.ts";
import { gaussianLogLikelihood } from "./likelihood.ts";
import { logPriorDensity, priorQuantile } from "./priors.ts";
import { addRmAnomaly, type RmParams } from "./rm.ts";

/** How a free parameter maps to the sampler's internal coordinate. */
export type Transform =
  | "identity"
  /** internal u = ln x; log-Jacobian + u */
  | "log"
  /** the pair (√e cos ω, √e sin ω) held in the eccentricity and ω slots */
  | "sqrt-e-cos"
  | "sqrt-e-sin";

/** One free (sampled) parameter. */
export interface FreeParameter {
  /** Summary key, e.g. `b.period`, `spectroA.jitter`. */
  readonly key: string;
  /** Unit for display, e.g. `d`, `m/s`, `deg`, `` for none. */
  readonly unit: string;
  readonly prior: PriorSpec;
  readonly transform: Transform;
  /** Start value in physical units. */
  readonly start: number;
  /** Initial walker-ball radius in internal units. */
  readonly ballScale: number;
}

/** Everything a worker needs to build the same log-posterior. Structured-cloneable. */
export interface ModelPayload {
  readonly spec: ModelSpec;
  readonly data: ProblemData;
}

interface Slot {
  key: string;
  unit: string;
  param: ParamSpec;
  positive: boolean;
}

/** Options of {@link CompiledModel.predict}. */
export interface PredictOptions {
  /** Times to predict at. @default the data's times */
  readonly times?: Float64Array;
  /** Instrument index per time. @default the data's instruments */
  readonly instrument?: Int32Array;
  /** `no-offsets`: planets only, without offsets and trend. @default "all" */
  readonly parts?: "all" | "no-offsets";
}

// Shared default, so that the per-evaluation call allocates nothing.
const NO_OPTIONS: PredictOptions = Object.freeze({});

/** A compiled model: parameter layout plus evaluation functions. */
export class CompiledModel {
  readonly spec: ModelSpec;
  readonly data: ProblemData;
  /** Free parameters in vector order. */
  readonly parameters: readonly FreeParameter[];
  readonly dimensions: number;
  #slots: Slot[];
  /** slot → index into the free vector, or -1 when fixed */
  #freeIndex: Int32Array;
  #fixed: Float64Array;
  #phys: Float64Array;
  #values: Float64Array;
  #model: Float64Array;
  #jitter: Float64Array;
  #orbits: Orbit[];
  #rm: (RmParams | undefined)[];
  #slotsPerPlanet: number[];
  #planetBase: number[];
  #instBase: number;
  #trendBase: number;

  constructor(payload: ModelPayload) {
    const { spec, data } = payload;
    this.spec = spec;
    this.data = data;
    const slots: Slot[] = [];
    const add = (key: string, unit: string, param: ParamSpec, positive = false) =>
      slots.push({ key, unit, param, positive });
    this.#planetBase = [];
    this.#slotsPerPlanet = [];
    for (const p of spec.planets) {
      this.#planetBase.push(slots.length);
      add(`${p.name}.period`, "d", p.period, true);
      add(`${p.name}.${p.epochKind}`, "d", p.epoch);
      add(`${p.name}.semi_amplitude`, "m/s", p.semiAmplitude, true);
      add(`${p.name}.eccentricity`, "", p.eccentricity);
      add(`${p.name}.omega_deg`, "deg", p.omegaDeg);
      if (p.rm !== undefined) {
        const r = p.rm;
        add(`${p.name}.lambda_deg`, "deg", r.lambdaDeg);
        add(`${p.name}.vsini_kms`, "km/s", r.vsiniKms, true);
        add(`${p.name}.radius_ratio`, "", r.radiusRatio, true);
        add(`${p.name}.a_over_rstar`, "", r.aOverRstar, true);
        add(`${p.name}.impact`, "", r.impact);
        add(`${p.name}.u1`, "", r.u1);
        add(`${p.name}.u2`, "", r.u2);
      }
      this.#slotsPerPlanet.push(slots.length - this.#planetBase[this.#planetBase.length - 1]!);
    }
    this.#instBase = slots.length;
    for (const ins of spec.instruments) {
      add(`${ins.name}.offset`, "m/s", ins.offset);
      add(`${ins.name}.jitter`, "m/s", ins.jitter, true);
    }
    this.#trendBase = slots.length;
    if (spec.trend !== undefined) {
      add("trend.slope", "m/s/d", spec.trend.slope);
      add(
        "trend.quadratic",
        "m/s/d²",
        spec.trend.quadratic ?? { prior: { kind: "fixed", value: 0 } },
      );
    }
    this.#slots = slots;
    this.#freeIndex = new Int32Array(slots.length).fill(-1);
    this.#fixed = new Float64Array(slots.length);
    const params: FreeParameter[] = [];
    // Eccentricity and ω both free: sample the pair (√e cos ω, √e sin ω).
    const pairOf = new Set<number>();
    spec.planets.forEach((_, pi) => {
      const b = this.#planetBase[pi]!;
      if (
        slots[b + 3]!.param.prior.kind !== "fixed" && slots[b + 4]!.param.prior.kind !== "fixed"
      ) {
        pairOf.add(b + 3);
        pairOf.add(b + 4);
      }
    });
    slots.forEach((s, i) => {
      const prior = s.param.prior;
      if (prior.kind === "fixed") {
        this.#fixed[i] = prior.value;
        return;
      }
      this.#freeIndex[i] = params.length;
      const start = s.param.start ?? defaultStart(prior);
      let transform: Transform = s.positive ? "log" : "identity";
      if (pairOf.has(i)) transform = s.key.endsWith(".eccentricity") ? "sqrt-e-cos" : "sqrt-e-sin";
      params.push({
        key: s.key,
        unit: s.unit,
        prior,
        transform,
        start,
        ballScale: ballScale(prior, transform, start),
      });
    });
    this.parameters = params;
    this.dimensions = params.length;
    this.#phys = new Float64Array(params.length);
    this.#values = new Float64Array(slots.length);
    this.#model = new Float64Array(data.count);
    this.#jitter = new Float64Array(spec.instruments.length);
    this.#orbits = spec.planets.map(() => ({
      period: 1,
      timePeriastron: 0,
      semiAmplitude: 0,
      eccentricity: 0,
      argPeriastron: 0,
    }));
    this.#rm = spec.planets.map((p) =>
      p.rm === undefined ? undefined : {
        period: 1,
        timeConjunction: 0,
        eccentricity: 0,
        argPeriastron: 0,
        lambda: 0,
        vsini: 0,
        radiusRatio: 0,
        aOverRstar: 1,
        impact: 0,
        u1: 0,
        u2: 0,
        exposure: p.rm.exposureS > 0 ? p.rm.exposureS : undefined,
      }
    );
  }

  /** Parameter keys in vector order. */
  get keys(): string[] {
    return this.parameters.map((p) => p.key);
  }

  /** The start point in internal coordinates. */
  startInternal(): Float64Array {
    const phys = Float64Array.from(this.parameters, (p) => p.start);
    return this.toInternal(phys);
  }

  /** Initial ball radius per internal coordinate. */
  ballScales(): Float64Array {
    return Float64Array.from(this.parameters, (p) => p.ballScale);
  }

  /** Physical → internal coordinates (inverse of {@link toPhysical}). */
  toInternal(phys: Float64Array): Float64Array {
    const out = new Float64Array(this.dimensions);
    for (let i = 0; i < this.dimensions; i++) {
      const p = this.parameters[i]!;
      const x = phys[i]!;
      switch (p.transform) {
        case "identity":
          out[i] = x;
          break;
        case "log":
          out[i] = Math.log(x);
          break;
        case "sqrt-e-cos": {
          const w = (phys[i + 1]! * Math.PI) / 180;
          out[i] = Math.sqrt(x) * Math.cos(w);
          out[i + 1] = Math.sqrt(x) * Math.sin(w);
          i++;
          break;
        }
        case "sqrt-e-sin":
          break;
      }
    }
    return out;
  }

  /**
   * Internal → physical coordinates into `out`; returns the log-Jacobian
   * ln |d(physical)/d(internal)|, so that p_internal = p_physical · |J|.
   *
   * Method: for u = ln x, dx/du = x, so ln|J| = u. For the pair
   * (h, k) = (√e cos ω, √e sin ω): e = h² + k², ω = atan2(k, h), and
   * ∂(e, ω)/∂(h, k) has determinant 2 (with ω in radians), so ln|J| = ln 2 +
   * ln(180/π) with ω in degrees; a constant, kept for correct normalisation
   * (Ford 2006, ApJ 642, 505, discusses this parameterisation). ω is wrapped
   * into the prior's range when that range spans a full turn.
   */
  toPhysical(theta: Float64Array, out: Float64Array): number {
    let logJ = 0;
    const n = this.dimensions;
    for (let i = 0; i < n; i++) {
      const p = this.parameters[i]!;
      const u = theta[i]!;
      switch (p.transform) {
        case "identity":
          out[i] = u;
          break;
        case "log":
          out[i] = Math.exp(u);
          logJ += u;
          break;
        case "sqrt-e-cos": {
          const k = theta[i + 1]!;
          out[i] = u * u + k * k;
          let w = (Math.atan2(k, u) * 180) / Math.PI;
          const wp = this.parameters[i + 1]!.prior;
          if ((wp.kind === "uniform") && wp.hi - wp.lo >= 360 - 1e-9) {
            while (w < wp.lo) w += 360;
            while (w >= wp.lo + 360) w -= 360;
          }
          out[i + 1] = w;
          logJ += LOG_PAIR_JACOBIAN;
          i++;
          break;
        }
        case "sqrt-e-sin":
          break;
      }
    }
    return logJ;
  }

  /** Sum of the log prior densities of physical values (−∞ outside support). */
  logPrior(phys: Float64Array): number {
    let lp = 0;
    for (let i = 0; i < this.dimensions; i++) {
      lp += logPriorDensity(this.parameters[i]!.prior, phys[i]!);
      if (lp === -Infinity) return lp;
    }
    return lp;
  }

  /** Fill all slot values (free and fixed) from a physical free vector. */
  #fill(phys: Float64Array): Float64Array {
    const v = this.#values;
    const fi = this.#freeIndex;
    for (let s = 0; s < v.length; s++) v[s] = fi[s]! >= 0 ? phys[fi[s]!]! : this.#fixed[s]!;
    return v;
  }

  /**
   * Predicted RV (Keplerians + RM anomaly + offsets + trend) at the data's
   * times into `out`, from a physical free vector. Returns false when the
   * parameters are outside the model's domain (e ≥ 1 and the like).
   */
  predict(
    phys: Float64Array,
    out: Float64Array,
    options: PredictOptions = NO_OPTIONS,
  ): boolean {
    const v = this.#fill(phys);
    const times = options.times ?? this.data.time;
    const inst = options.instrument ?? this.data.instrument;
    const n = times.length;
    out.fill(0, 0, n);
    const planets = this.spec.planets;
    for (let p = 0; p < planets.length; p++) {
      const b = this.#planetBase[p]!;
      const period = v[b]!;
      const e = v[b + 3]!;
      if (!(period > 0) || !(e >= 0 && e < 1)) return false;
      const w = (v[b + 4]! * Math.PI) / 180;
      const o = this.#orbits[p]!;
      o.period = period;
      o.semiAmplitude = v[b + 2]!;
      o.eccentricity = e;
      o.argPeriastron = w;
      const tc = planets[p]!.epochKind === "tc" ? v[b + 1]! : Number.NaN;
      o.timePeriastron = planets[p]!.epochKind === "tp"
        ? v[b + 1]!
        : timePeriastronFromConjunction(tc, o);
      addKeplerianRv(times, o, { out, count: n });
      const rm = this.#rm[p];
      if (rm !== undefined) {
        rm.period = period;
        rm.timeConjunction = planets[p]!.epochKind === "tc"
          ? tc
          : timeConjunctionFromPeriastron(o.timePeriastron, o);
        rm.eccentricity = e;
        rm.argPeriastron = w;
        rm.lambda = (v[b + 5]! * Math.PI) / 180;
        rm.vsini = v[b + 6]!;
        rm.radiusRatio = v[b + 7]!;
        rm.aOverRstar = v[b + 8]!;
        rm.impact = v[b + 9]!;
        rm.u1 = v[b + 10]!;
        rm.u2 = v[b + 11]!;
        addRmAnomaly(times, rm, { out, count: n });
      }
    }
    if (options.parts === "no-offsets") return true;
    const ib = this.#instBase;
    const hasTrend = this.spec.trend !== undefined;
    const t0 = hasTrend ? this.spec.trend!.referenceTime : 0;
    const slope = hasTrend ? v[this.#trendBase]! : 0;
    const quad = hasTrend ? v[this.#trendBase + 1]! : 0;
    for (let i = 0; i < n; i++) {
      const dt = times[i]! - t0;
      out[i] = out[i]! + v[ib + 2 * inst[i]!]! + slope * dt + quad * dt * dt;
    }
    return true;
  }

  /**
   * Gaussian log-likelihood with variance σᵢ² + jitter² per point and its full
   * normalisation: ln L = −½ Σ [rᵢ²/(σᵢ² + s²) + ln(2π(σᵢ² + s²))].
   */
  logLikelihood(phys: Float64Array): number {
    const m = this.#model;
    if (!this.predict(phys, m)) return -Infinity;
    const v = this.#values;
    const jitter = this.#jitter;
    for (let k = 0; k < jitter.length; k++) jitter[k] = v[this.#instBase + 2 * k + 1]!;
    return gaussianLogLikelihood(this.data, { model: m, jitter });
  }

  /** Log-posterior (up to the evidence) at an internal point. */
  logPosterior(theta: Float64Array): number {
    const phys = this.#phys;
    const logJ = this.toPhysical(theta, phys);
    const lp = this.logPrior(phys);
    if (!(lp > -Infinity)) return -Infinity;
    const ll = this.logLikelihood(phys);
    const out = lp + logJ + ll;
    return Number.isNaN(out) ? -Infinity : out;
  }

  /** Number of slots (free or fixed quantities) of each planet. */
  get slotsPerPlanet(): readonly number[] {
    return this.#slotsPerPlanet;
  }
}

/** Factory imported by sampler workers: payload → log-posterior of an internal vector. */
export function createLogPosterior(payload: ModelPayload): (theta: Float64Array) => number {
  const model = new CompiledModel(payload);
  return (theta) => model.logPosterior(theta);
}

const LOG_PAIR_JACOBIAN = Math.log(2) + Math.log(180 / Math.PI);

function defaultStart(prior: PriorSpec): number {
  return priorQuantile(prior, 0.5);
}

function ballScale(prior: PriorSpec, transform: Transform, start: number): number {
  if (transform === "log") return 1e-3;
  if (transform === "sqrt-e-cos" || transform === "sqrt-e-sin") return 1e-3;
  switch (prior.kind) {
    case "uniform":
    case "truncnormal":
      return Math.min(1e-3 * (prior.hi - prior.lo), 1e-3 * Math.max(Math.abs(start), 1) + 1e-6);
    case "loguniform":
      return 1e-3 * Math.max(Math.abs(start), prior.lo);
    case "normal":
      return 1e-2 * prior.sigma;
    case "beta":
      return 1e-3;
    case "fixed":
      return 0;
  }
}
