/**
 * Derived quantities, sample by sample: m sin i from the full mass function,
 * the semi-major axis from Kepler's third law, the other reference epoch, and
 * for transiting planets with an RM model the orbital inclination, true mass
 * and (where the star's inclination is constrained) the 3D obliquity ψ.
 *
 * The star's mass (and radius and rotation period, where given) are not
 * constrained by RVs; each posterior sample is paired with an independent draw
 * from their priors (seeded, so summaries are reproducible).
 * @module
 */
import seedrandom from "seedrandom";
import { priorQuantile } from "../model/priors.ts";
import {
  timeConjunctionFromPeriastron,
  timePeriastronFromConjunction,
} from "../model/keplerian.ts";
import {
  inclinationFromImpact,
  obliquity,
  starInclinationFromRotation,
} from "../physics/obliquity.ts";
import {
  minimumMass,
  semiMajorAxis,
  SOLAR_TO_EARTH_MASS,
  SOLAR_TO_JUPITER_MASS,
  trueMass,
} from "../physics/mod.ts";
import type { ChainData } from "../run/chain_file.ts";
import type { Manifest } from "../run/manifest.ts";
import type { ParamSpec } from "../spec/types.ts";

/** Draws of one derived quantity. */
export interface DerivedDraws {
  readonly unit: string;
  readonly values: Float64Array;
}

/** Derived draws keyed `<planet>.msini_mjup` etc., for steps ≥ burn, all walkers. */
export function derivedDraws(
  manifest: Manifest,
  chain: ChainData,
  options: { burn: number },
): Map<string, DerivedDraws> {
  const { walkers, columns, data } = chain;
  const n = Math.max(0, chain.steps - options.burn) * walkers;
  const keyIndex = new Map(manifest.columns.map((k, i) => [k, i]));
  const spec = manifest.spec;
  const rng = seedrandom(`${manifest.seed}:star-draws`);
  const star = drawPrior(spec.star.massMsun, n, rng);
  const radius = spec.star.radiusRsun ? drawPrior(spec.star.radiusRsun, n, rng) : undefined;
  const prot = spec.star.rotationPeriodDays
    ? drawPrior(spec.star.rotationPeriodDays, n, rng)
    : undefined;
  const out = new Map<string, DerivedDraws>();
  for (const p of spec.planets) {
    const get = (name: string, fixed: ParamSpec | undefined): (row: number) => number => {
      const c = keyIndex.get(`${p.name}.${name}`);
      if (c !== undefined) return (row) => data[row * columns + c]!;
      const v = fixed?.prior.kind === "fixed" ? fixed.prior.value : NaN;
      return () => v;
    };
    const period = get("period", p.period);
    const epoch = get(p.epochKind, p.epoch);
    const k = get("semi_amplitude", p.semiAmplitude);
    const ecc = get("eccentricity", p.eccentricity);
    const omega = get("omega_deg", p.omegaDeg);
    const mj = new Float64Array(n);
    const me = new Float64Array(n);
    const a = new Float64Array(n);
    const other = new Float64Array(n);
    const rm = p.rm;
    const incl = rm ? new Float64Array(n) : undefined;
    const mtrue = rm ? new Float64Array(n) : undefined;
    const psi = rm && radius && prot ? new Float64Array(n) : undefined;
    const impact = rm ? get("impact", rm.impact) : undefined;
    const aR = rm ? get("a_over_rstar", rm.aOverRstar) : undefined;
    const lam = rm ? get("lambda_deg", rm.lambdaDeg) : undefined;
    const vsini = rm ? get("vsini_kms", rm.vsiniKms) : undefined;
    let i = 0;
    for (let s = options.burn; s < chain.steps; s++) {
      for (let w = 0; w < walkers; w++, i++) {
        const row = s * walkers + w;
        const P = period(row);
        const e = ecc(row);
        const wr = (omega(row) * Math.PI) / 180;
        const msini = minimumMass({ period: P, semiAmplitude: k(row), eccentricity: e }, star[i]!);
        mj[i] = msini * SOLAR_TO_JUPITER_MASS;
        me[i] = msini * SOLAR_TO_EARTH_MASS;
        a[i] = semiMajorAxis(P, star[i]!, { planetMass: msini });
        const orbit = { period: P, eccentricity: e, argPeriastron: wr };
        other[i] = p.epochKind === "tc"
          ? timePeriastronFromConjunction(epoch(row), orbit)
          : timeConjunctionFromPeriastron(epoch(row), orbit);
        if (incl && mtrue && impact && aR && lam) {
          const inc = inclinationFromImpact(impact(row), aR(row), {
            eccentricity: e,
            argPeriastron: wr,
          });
          incl[i] = (inc * 180) / Math.PI;
          mtrue[i] = trueMass({ period: P, semiAmplitude: k(row), eccentricity: e }, star[i]!, {
            inclination: inc,
          }) * SOLAR_TO_JUPITER_MASS;
          if (psi && radius && prot && vsini) {
            // Rotation gives only sin i★: i★ and π − i★ fit equally, so draw the branch too.
            const i0 = starInclinationFromRotation(vsini(row), {
              rotationPeriod: prot[i]!,
              radius: radius[i]!,
            });
            const istar = rng() < 0.5 ? i0 : Math.PI - i0;
            psi[i] = (obliquity((lam(row) * Math.PI) / 180, {
              starInclination: istar,
              orbitInclination: inc,
            }) * 180) /
              Math.PI;
          }
        }
      }
    }
    out.set(`${p.name}.msini_mjup`, { unit: "Mjup", values: mj });
    out.set(`${p.name}.msini_mearth`, { unit: "Mearth", values: me });
    out.set(`${p.name}.a_au`, { unit: "au", values: a });
    out.set(`${p.name}.${p.epochKind === "tc" ? "tp" : "tc"}`, { unit: "d", values: other });
    if (incl && mtrue) {
      out.set(`${p.name}.inclination_deg`, { unit: "deg", values: incl });
      out.set(`${p.name}.mass_mjup`, { unit: "Mjup", values: mtrue });
    }
    if (psi) out.set(`${p.name}.psi_deg`, { unit: "deg", values: psi });
  }
  return out;
}

function drawPrior(p: ParamSpec, n: number, rng: () => number): Float64Array {
  const out = new Float64Array(n);
  if (p.prior.kind === "fixed") return out.fill(p.prior.value);
  // Positive quantities only: a normal prior acts as truncated at zero (redraw).
  for (let i = 0; i < n; i++) {
    let x = priorQuantile(p.prior, rng());
    while (!(x > 0)) x = priorQuantile(p.prior, rng());
    out[i] = x;
  }
  return out;
}
