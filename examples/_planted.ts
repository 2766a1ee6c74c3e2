/**
 * The planted RV signal of invented example data sets: a sum of Keplerians
 * given in spec terms (period, time of conjunction, K, e, ω in degrees).
 * @module
 */
import { addKeplerianRv, timePeriastronFromConjunction } from "../src/model/keplerian.ts";

/** One planted planet, in the units of a spec. */
export interface PlantedPlanet {
  readonly period: number;
  readonly tc: number;
  readonly semi_amplitude: number;
  readonly eccentricity: number;
  readonly omega_deg: number;
}

/** The star's RV from all `planets` at `times`, m/s. */
export function plantedRv(times: Float64Array, planets: readonly PlantedPlanet[]): Float64Array {
  const model = new Float64Array(times.length);
  for (const p of planets) {
    const w = (p.omega_deg * Math.PI) / 180;
    addKeplerianRv(times, {
      period: p.period,
      timePeriastron: timePeriastronFromConjunction(p.tc, {
        period: p.period,
        eccentricity: p.eccentricity,
        argPeriastron: w,
      }),
      semiAmplitude: p.semi_amplitude,
      eccentricity: p.eccentricity,
      argPeriastron: w,
    }, { out: model });
  }
  return model;
}
