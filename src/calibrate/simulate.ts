/**
 * The generative half of simulation-based calibration: a draw of every free
 * parameter (and the star's mass) from the spec's priors, and RVs simulated
 * from it at the spec's observation times, errors and instruments.
 * @module
 */
import type { CompiledModel } from "../model/posterior.ts";
import { priorQuantile } from "../model/priors.ts";
import { minimumMass, solarToJupiterMasses } from "../physics/mod.ts";
import type { ProblemData } from "../spec/resolve.ts";
import type { ParamSpec, PriorSpec } from "../spec/types.ts";
import type { Rng } from "../../samplers/mod.ts";

/** One draw from the prior. */
export interface PriorDraw {
  /** Free parameters in physical units, in `model.parameters` order. */
  readonly physical: Float64Array;
  /** The star's mass in solar masses (enters only derived quantities). */
  readonly starMass: number;
}

/** Tries before {@link drawFromPrior} gives up on a draw the model accepts. */
const MAX_TRIES = 1000;

/**
 * A draw x = F⁻¹(U) of one prior, U uniform on (0, 1) (inverse-transform
 * sampling; Devroye 1986, Non-Uniform Random Variate Generation, §II.2.1).
 * Redraws U = 0, whose quantile may be infinite.
 */
export function drawPrior(prior: PriorSpec, rng: Rng): number {
  for (let i = 0; i < MAX_TRIES; i++) {
    const x = priorQuantile(prior, rng.uniform());
    if (Number.isFinite(x)) return x;
  }
  throw new RangeError(
    `Cannot draw from prior as no finite value came out: kind=${prior.kind}, tries=${MAX_TRIES}`,
  );
}

/**
 * Draw every free parameter of `model` independently from its prior (the
 * priors are independent in the spec), then the star's mass. A draw with a
 * finite log-prior that the model still rejects (its log-posterior is not
 * finite, e.g. e ≥ 1 from a fixed ω pair) is drawn again.
 *
 * @throws {RangeError} when no acceptable draw comes out in 1000 tries.
 */
export function drawFromPrior(model: CompiledModel, rng: Rng): PriorDraw {
  const n = model.dimensions;
  const physical = new Float64Array(n);
  for (let t = 0; t < MAX_TRIES; t++) {
    for (let i = 0; i < n; i++) physical[i] = drawPrior(model.parameters[i]!.prior, rng);
    const starMass = drawPrior(model.spec.star.massMsun.prior, rng);
    if (Number.isFinite(model.logPosterior(model.toInternal(physical)))) {
      return { physical, starMass };
    }
  }
  throw new RangeError(
    `Cannot draw from the priors as the model rejected every draw: tries=${MAX_TRIES}`,
  );
}

/**
 * RVs simulated from `physical` at the data's times, errors and instruments:
 * vᵢ = model(tᵢ) + √(σᵢ² + sⱼ²) · zᵢ, zᵢ ~ N(0, 1) in data order, sⱼ the
 * jitter of point i's instrument (the model's own likelihood: Gaussian with
 * variance σᵢ² + jitter², DESIGN.md "Model"). Returns a new
 * {@link ProblemData} sharing the time, error and instrument arrays.
 *
 * @throws {RangeError} when the model rejects `physical`.
 */
export function simulateData(
  model: CompiledModel,
  physical: Float64Array,
  rng: Rng,
): ProblemData {
  const data = model.data;
  const rv = new Float64Array(data.count);
  if (!model.predict(physical, rv)) {
    throw new RangeError(
      `Cannot simulate RVs as the model rejects the parameters: parameters=${
        Array.from(physical).join(",")
      }`,
    );
  }
  const jitter = instrumentJitters(model, physical);
  for (let i = 0; i < data.count; i++) {
    const e = data.rvErr[i]!;
    const s = jitter[data.instrument[i]!]!;
    rv[i] = rv[i]! + Math.sqrt(e * e + s * s) * rng.normal();
  }
  return {
    time: data.time,
    rv,
    rvErr: data.rvErr,
    instrument: data.instrument,
    count: data.count,
  };
}

/** Jitter of each instrument (m/s) at `physical`: the free value or the fixed one. */
export function instrumentJitters(model: CompiledModel, physical: Float64Array): Float64Array {
  const keys = model.keys;
  return Float64Array.from(model.spec.instruments, (ins) => {
    const i = keys.indexOf(`${ins.name}.jitter`);
    return i >= 0 ? physical[i]! : fixedValue(ins.jitter);
  });
}

/**
 * Keys of the derived quantities calibrated beside the free parameters:
 * `<planet>.msini_mjup`, the minimum mass in Jupiter masses, as the summary
 * names it.
 */
export function derivedKeys(model: CompiledModel): string[] {
  return model.spec.planets.map((p) => `${p.name}.msini_mjup`);
}

/**
 * A function computing the derived quantities of {@link derivedKeys} from a
 * physical vector and a star mass into `out`: m sin i from the full mass
 * function (`minimumMass`, src/physics/mass.ts), in Jupiter masses.
 */
export function derivedFunction(
  model: CompiledModel,
): (draw: { physical: Float64Array; starMass: number }, out: Float64Array) => Float64Array {
  const keys = model.keys;
  const getters = model.spec.planets.map((p) => {
    const get = (name: string, spec: ParamSpec): (x: Float64Array) => number => {
      const j = keys.indexOf(`${p.name}.${name}`);
      const v = fixedValue(spec);
      return j >= 0 ? (x) => x[j]! : () => v;
    };
    return {
      period: get("period", p.period),
      semiAmplitude: get("semi_amplitude", p.semiAmplitude),
      eccentricity: get("eccentricity", p.eccentricity),
    };
  });
  return ({ physical, starMass }, out) => {
    for (let i = 0; i < getters.length; i++) {
      const g = getters[i]!;
      const orbit = {
        period: g.period(physical),
        semiAmplitude: g.semiAmplitude(physical),
        eccentricity: g.eccentricity(physical),
      };
      out[i] = solarToJupiterMasses(minimumMass(orbit, starMass));
    }
    return out;
  };
}

function fixedValue(spec: ParamSpec): number {
  return spec.prior.kind === "fixed" ? spec.prior.value : NaN;
}
