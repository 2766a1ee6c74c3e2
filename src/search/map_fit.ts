/**
 * Maximum a posteriori (MAP) fit of a compiled model, and start values for a
 * spec that lacks them: a periodogram search within each planet's period
 * prior, a joint sinusoid fit, then the MAP fit.
 * @module
 */
import { CompiledModel } from "../model/posterior.ts";
import { addKeplerianRv, timePeriastronFromConjunction } from "../model/keplerian.ts";
import { priorQuantile } from "../model/priors.ts";
import { support } from "../spec/parse.ts";
import type { Problem } from "../spec/resolve.ts";
import type { ModelSpec, ParamSpec, PlanetSpec, PriorSpec } from "../spec/types.ts";
import { fitSinusoids } from "./fit_sinusoids.ts";
import { nelderMead } from "./nelder_mead.ts";
import { searchSignals } from "./search_signals.ts";
import { type RvSeries, timeRange } from "./_series.ts";

/** Options of {@linkcode mapFit}. */
export interface MapFitOptions {
  /**
   * Rounds: each re-measures the step sizes at the best point so far and runs
   * Nelder–Mead (with restarts) again; stops early when a round gains less
   * than 1e-6 in log-posterior. @default 4
   */
  rounds?: number;
  /** Nelder–Mead restarts within a round. @default 2 */
  restarts?: number;
  /** Objective evaluations per round. @default 1500 * (dimensions + 1) */
  maxEvaluations?: number;
}

/** Result of {@linkcode mapFit}. */
export interface MapFitResult {
  /** Best point, internal (sampler) coordinates. */
  readonly internal: Float64Array;
  /** Best point, physical units, in `model.parameters` order. */
  readonly physical: Float64Array;
  /** Log-posterior at the best point (internal coordinates, Jacobian included). */
  readonly logPosterior: number;
  /** Log-posterior at the start. */
  readonly startLogPosterior: number;
  /** Log-posterior evaluations used. */
  readonly evaluations: number;
  /** True if the last round's simplex met its tolerances within its budget. */
  readonly converged: boolean;
}

/**
 * Maximises `model.logPosterior` over the internal parameter space from
 * `start` (internal coordinates) by minimising −log posterior with
 * {@linkcode nelderMead}.
 *
 * Method: the internal space mixes units (days near 2.46e6, log m/s,
 * √e cos ω), so the simplex works in scaled coordinates z with
 * θ = θ₀ + s ∘ z, where s_i = (−∂²ln p/∂θ_i²)^(−1/2) is the local standard
 * deviation from a central second difference at θ₀ (a diagonal
 * preconditioner; common practice, no source). Where the curvature is not
 * negative or not finite, s_i falls back to a prior-based width. Each round
 * re-centres θ₀ on the best point and re-measures s; the simplex starts with
 * unit steps in z and Nelder–Mead restarts against premature collapse.
 *
 * Maximises the density in internal coordinates (Jacobian included), the same
 * density the sampler explores. Throws RangeError when the start is not a
 * finite point of the posterior or has the wrong length.
 */
export function mapFit(
  model: CompiledModel,
  start: Float64Array,
  options: MapFitOptions = {},
): MapFitResult {
  const n = model.dimensions;
  if (start.length !== n) {
    throw new RangeError(
      `Cannot fit maximum a posteriori as start has the wrong length: start=${start.length}, ` +
        `dimensions=${n}`,
    );
  }
  const rounds = options.rounds ?? 4;
  const restarts = options.restarts ?? 2;
  const maxEvaluations = options.maxEvaluations ?? 1500 * (n + 1);
  if (!Number.isInteger(rounds) || rounds < 1) {
    throw new RangeError(
      `Cannot fit maximum a posteriori as rounds must be >= 1: rounds=${rounds}`,
    );
  }
  const best = Float64Array.from(start);
  let bestValue = model.logPosterior(best);
  const startLogPosterior = bestValue;
  if (!Number.isFinite(bestValue)) {
    throw new RangeError(
      `Cannot fit maximum a posteriori as the log-posterior at the start is not finite: ` +
        `logPosterior=${bestValue}`,
    );
  }
  let evaluations = 1;
  let converged = false;
  if (n === 0) {
    return {
      internal: best,
      physical: new Float64Array(0),
      logPosterior: bestValue,
      startLogPosterior,
      evaluations,
      converged: true,
    };
  }
  const theta = new Float64Array(n);
  const centre = new Float64Array(n);
  const scale = new Float64Array(n);
  const fallback = fallbackScales(model, best);
  for (let round = 0; round < rounds; round++) {
    centre.set(best);
    evaluations += curvatureScales(model, centre, bestValue, fallback, scale);
    const objective = (z: Float64Array): number => {
      for (let i = 0; i < n; i++) theta[i] = centre[i]! + scale[i]! * z[i]!;
      const lp = model.logPosterior(theta);
      return Number.isFinite(lp) ? -lp : Infinity;
    };
    const result = nelderMead(objective, new Float64Array(n), {
      scale: 1,
      maxEvaluations,
      tolerance: 1e-12,
      xTolerance: 1e-7,
      restarts,
    });
    evaluations += result.evaluations;
    converged = result.converged;
    const value = -result.value;
    const gain = value - bestValue;
    if (value > bestValue) {
      bestValue = value;
      for (let i = 0; i < n; i++) best[i] = centre[i]! + scale[i]! * result.x[i]!;
    }
    if (!(gain > 1e-6)) break;
  }
  const physical = new Float64Array(n);
  model.toPhysical(best, physical);
  // Re-evaluate at the stored point (the objective's rounding of θ₀ + s z).
  bestValue = model.logPosterior(best);
  return {
    internal: best,
    physical,
    logPosterior: bestValue,
    startLogPosterior,
    evaluations: evaluations + 1,
    converged,
  };
}

/**
 * Prior-based step per internal coordinate, used to start the curvature
 * probe and where curvature fails: 1e-3 of a finite uniform width, 1e-2 of a
 * normal sigma, 1e-3 in log or √e units.
 */
function fallbackScales(model: CompiledModel, at: Float64Array): Float64Array {
  const out = new Float64Array(model.dimensions);
  model.parameters.forEach((p, i) => {
    if (p.transform !== "identity") {
      out[i] = 1e-3;
      return;
    }
    const prior = p.prior;
    switch (prior.kind) {
      case "uniform":
      case "truncnormal":
        out[i] = 1e-3 * (prior.hi - prior.lo);
        break;
      case "normal":
        out[i] = 1e-2 * prior.sigma;
        break;
      default:
        out[i] = 1e-3 * Math.max(1, Math.abs(at[i]!));
    }
    if (!(out[i]! > 0) || !Number.isFinite(out[i]!)) out[i] = 1e-3;
  });
  return out;
}

/**
 * s_i = (−f'')^(−1/2) by central second differences of f = ln p, probed twice:
 * first with the fallback step h, then with h = s/4 from the first estimate.
 * Writes s into `out` (fallback × 10 where the curvature is not negative) and
 * returns the evaluations used.
 */
function curvatureScales(
  model: CompiledModel,
  x: Float64Array,
  f0: number,
  fallback: Float64Array,
  out: Float64Array,
): number {
  const probe = Float64Array.from(x);
  let evaluations = 0;
  for (let i = 0; i < x.length; i++) {
    let h = fallback[i]!;
    let s = NaN;
    for (let pass = 0; pass < 2; pass++) {
      probe[i] = x[i]! + h;
      const fp = model.logPosterior(probe);
      probe[i] = x[i]! - h;
      const fm = model.logPosterior(probe);
      probe[i] = x[i]!;
      evaluations += 2;
      // Central second difference (Press et al. 2007, Numerical Recipes 3rd ed., Sect. 5.7).
      const d2 = (fp - 2 * f0 + fm) / (h * h);
      if (!(d2 < 0) || !Number.isFinite(d2)) break;
      s = 1 / Math.sqrt(-d2);
      h = 0.25 * s;
    }
    out[i] = Number.isFinite(s) && s > 0 ? s : 10 * fallback[i]!;
  }
  return evaluations;
}

/** Options of {@linkcode fillStartValues}. */
export interface FillStartOptions {
  /** Frequency-grid oversampling of the period searches. @default 5 */
  oversample?: number;
  /** Shortest period searched when a period prior reaches below it, days. @default 0.5 */
  minPeriod?: number;
  /** Options of the MAP fit. @default {} */
  mapFit?: MapFitOptions;
}

/** Result of {@linkcode fillStartValues}. */
export interface FilledStart {
  /** The problem with every free parameter's `start` set. */
  readonly problem: Problem;
  /** What was done, one line each, for the user. */
  readonly report: string[];
  /** The MAP fit (null when every start was already given). */
  readonly map: MapFitResult | null;
  /** Keys (as in `CompiledModel.parameters`) whose start was filled. */
  readonly filled: string[];
}

/**
 * Which free parameters have a start value written in the spec and which do
 * not (instruments given defaults count as missing). Cheap: no search.
 */
export function startsGiven(problem: Problem): { given: Set<string>; missing: string[] } {
  const given = new Set<string>();
  const base = new CompiledModel({ spec: problem.spec, data: problem.data });
  forEachParam(problem.spec, (key, param, owner) => {
    if (param.prior.kind === "fixed") return param;
    if (param.start !== undefined && owner !== "defaulted") given.add(key);
    return param;
  });
  const missing = base.parameters.map((p) => p.key).filter((k) => !given.has(k));
  return { given, missing };
}

/**
 * Gives every free parameter of `problem` a start value. Starts written in
 * the spec are kept; defaulted instruments (no `[[instrument]]` table) count
 * as not written. When nothing is missing the problem is returned unchanged.
 *
 * Method:
 * 1. Planets whose period has no start get one from a generalised
 *    Lomb–Scargle search ({@linkcode searchSignals}, one signal, offsets and
 *    the spec's free trend terms fitted) restricted to the planet's period
 *    prior, in the residuals of the periods known so far; of all pending
 *    planets the one with the most significant peak (lowest FAP) is taken
 *    first, then the others are searched again. A period prior holding fewer
 *    than three grid frequencies (spacing 1/(oversample span)) gives its
 *    median instead: the prior is then sharper than the periodogram.
 * 2. All periods are fitted jointly as sinusoids with offsets and trend
 *    ({@linkcode fitSinusoids}): K and the conjunction time of each planet (moved
 *    by whole periods into the epoch prior; converted to periastron for `tp`),
 *    each instrument's offset (the weighted mean of its residuals from the
 *    signals and trend) and the trend coefficients.
 * 3. e = 0.1 (prior median if 0.1 is outside the prior), ω the prior median;
 *    jitter from the excess scatter sqrt(max(0, mean r² − mean σ²)) per
 *    instrument (at least a tenth of its mean σ); other quantities (RM) the
 *    prior median. Every guess is clamped inside its prior.
 * 4. {@linkcode mapFit} from there; the missing starts are set to the MAP point.
 *
 * Does not mutate `problem`; ParamSpec objects are rebuilt.
 */
export function fillStartValues(problem: Problem, options: FillStartOptions = {}): FilledStart {
  const spec = problem.spec;
  const data = problem.data;
  const { given, missing } = startsGiven(problem);
  if (missing.length === 0) {
    return { problem, report: [], map: null, filled: [] };
  }
  const report: string[] = [];
  const guesses = guessStarts(problem, options, report);
  const guessed = withStarts(spec, (key, param) => {
    if (given.has(key)) return param.start;
    const g = guesses.get(key);
    return g === undefined ? priorQuantile(param.prior, 0.5) : clampInside(g, param.prior);
  });
  const model = new CompiledModel({ spec: guessed, data });
  let start = model.startInternal();
  if (!Number.isFinite(model.logPosterior(start))) {
    // Fall back to prior medians for the guessed values.
    const medians = withStarts(
      spec,
      (key, param) => given.has(key) ? param.start : priorQuantile(param.prior, 0.5),
    );
    start = new CompiledModel({ spec: medians, data }).startInternal();
    report.push("start guesses gave a non-finite posterior; started from prior medians");
  }
  const map = mapFit(model, start, options.mapFit);
  report.push(
    `maximum a posteriori: log-posterior ${map.logPosterior.toFixed(3)} ` +
      `(from ${map.startLogPosterior.toFixed(3)} at the guesses; ${map.evaluations} evaluations` +
      `${map.converged ? "" : ", not converged"})`,
  );
  const mapValue = new Map(model.parameters.map((p, i) => [p.key, map.physical[i]!]));
  const filledSpec = withStarts(spec, (key, param) => {
    if (given.has(key)) return param.start;
    const v = mapValue.get(key);
    return v === undefined ? param.start : clampInside(v, param.prior);
  });
  return {
    problem: { ...problem, spec: filledSpec },
    report,
    map,
    filled: missing,
  };
}

type Owner = "planet" | "instrument" | "defaulted" | "trend";

/** Visits every ParamSpec of the model with its parameter key; rebuilds the spec from the results. */
function forEachParam(
  spec: ModelSpec,
  visit: (key: string, param: ParamSpec, owner: Owner) => ParamSpec,
): ModelSpec {
  const planets: PlanetSpec[] = spec.planets.map((p) => {
    const k = (q: string) => `${p.name}.${q}`;
    const v = (q: string, param: ParamSpec) => visit(k(q), param, "planet");
    return {
      ...p,
      period: v("period", p.period),
      epoch: v(p.epochKind, p.epoch),
      semiAmplitude: v("semi_amplitude", p.semiAmplitude),
      eccentricity: v("eccentricity", p.eccentricity),
      omegaDeg: v("omega_deg", p.omegaDeg),
      rm: p.rm === undefined ? undefined : {
        ...p.rm,
        lambdaDeg: v("lambda_deg", p.rm.lambdaDeg),
        vsiniKms: v("vsini_kms", p.rm.vsiniKms),
        radiusRatio: v("radius_ratio", p.rm.radiusRatio),
        aOverRstar: v("a_over_rstar", p.rm.aOverRstar),
        impact: v("impact", p.rm.impact),
        u1: v("u1", p.rm.u1),
        u2: v("u2", p.rm.u2),
      },
    };
  });
  const instruments = spec.instruments.map((ins) => {
    const owner: Owner = ins.defaulted ? "defaulted" : "instrument";
    return {
      ...ins,
      offset: visit(`${ins.name}.offset`, ins.offset, owner),
      jitter: visit(`${ins.name}.jitter`, ins.jitter, owner),
    };
  });
  const trend = spec.trend === undefined ? undefined : {
    ...spec.trend,
    slope: visit("trend.slope", spec.trend.slope, "trend"),
    quadratic: spec.trend.quadratic === undefined
      ? undefined
      : visit("trend.quadratic", spec.trend.quadratic, "trend"),
  };
  return { ...spec, planets, instruments, trend };
}

/** New spec with `start` of every free parameter set by `startOf` (undefined leaves none). */
function withStarts(
  spec: ModelSpec,
  startOf: (key: string, param: ParamSpec) => number | undefined,
): ModelSpec {
  return forEachParam(spec, (key, param) => {
    if (param.prior.kind === "fixed") return param;
    const start = startOf(key, param);
    return start === undefined ? { prior: param.prior } : { prior: param.prior, start };
  });
}

/** A value moved inside the prior's support (a hair inside finite bounds). */
function clampInside(x: number, prior: PriorSpec): number {
  if (prior.kind === "fixed") return prior.value;
  if (prior.kind === "beta") return Math.min(1 - 1e-9, Math.max(1e-9, x));
  const [lo, hi] = support(prior);
  if (!Number.isFinite(x)) return priorQuantile(prior, 0.5);
  const pad = Number.isFinite(hi - lo) ? 1e-9 * (hi - lo) : 0;
  if (x <= lo) return lo + pad;
  if (x >= hi) return hi - pad;
  return x;
}

/** Finite search window [lo, hi] of a period prior, or null when it has none. */
function periodWindow(prior: PriorSpec, floor: number, span: number): [number, number] | null {
  let lo: number, hi: number;
  if (prior.kind === "normal") {
    lo = prior.mu - 5 * prior.sigma;
    hi = prior.mu + 5 * prior.sigma;
  } else if (prior.kind === "fixed" || prior.kind === "beta") {
    return null;
  } else {
    [lo, hi] = support(prior);
  }
  lo = Math.max(lo, floor);
  hi = Math.min(hi, 20 * span);
  return lo < hi ? [lo, hi] : null;
}

/**
 * Start guesses by parameter key (steps 1–3 of {@linkcode fillStartValues}).
 * Appends a line per searched planet to `report`.
 */
function guessStarts(
  problem: Problem,
  options: FillStartOptions,
  report: string[],
): Map<string, number> {
  const { spec, data } = problem;
  const n = data.count;
  const guesses = new Map<string, number>();
  const [t0, t1] = timeRange(data.time, n);
  const span = t1 - t0;

  // Data minus what is fixed: planets with every orbital element fixed and fixed trend terms.
  const rv = Float64Array.from(data.rv.subarray(0, n));
  const known = (p: ParamSpec): number | undefined =>
    p.prior.kind === "fixed" ? p.prior.value : p.start;
  const fixedValue = (p: ParamSpec): number | undefined =>
    p.prior.kind === "fixed" ? p.prior.value : undefined;
  const searchPlanets: PlanetSpec[] = [];
  const fixedModel = new Float64Array(n);
  for (const p of spec.planets) {
    const values = [p.period, p.epoch, p.semiAmplitude, p.eccentricity, p.omegaDeg].map(
      fixedValue,
    );
    if (values.every((v) => v !== undefined)) {
      const [period, epoch, k, e, wDeg] = values as number[];
      const w = (wDeg! * Math.PI) / 180;
      const orbit = { period: period!, eccentricity: e!, argPeriastron: w };
      addKeplerianRv(data.time, {
        ...orbit,
        semiAmplitude: k!,
        timePeriastron: p.epochKind === "tp"
          ? epoch!
          : timePeriastronFromConjunction(epoch!, orbit),
      }, { out: fixedModel, count: n });
    } else {
      searchPlanets.push(p);
    }
  }
  let trendDegree = 0;
  const tRef = spec.trend?.referenceTime ?? 0.5 * (t0 + t1);
  if (spec.trend !== undefined) {
    const slope = fixedValue(spec.trend.slope);
    const quad = spec.trend.quadratic === undefined ? 0 : fixedValue(spec.trend.quadratic);
    trendDegree = quad === undefined ? 2 : slope === undefined ? 1 : 0;
    for (let i = 0; i < n; i++) {
      const dt = data.time[i]! - tRef;
      if (trendDegree < 1) fixedModel[i]! += (slope ?? 0) * dt;
      if (trendDegree < 2) fixedModel[i]! += (quad ?? 0) * dt * dt;
    }
  }
  for (let i = 0; i < n; i++) rv[i]! -= fixedModel[i]!;
  const series: RvSeries = {
    time: data.time,
    rv,
    rvErr: data.rvErr,
    instrument: data.instrument,
    count: n,
    instruments: spec.instruments.length,
  };

  // 1. Periods: given or fixed ones first; a prior window holding fewer than three points
  // of the frequency grid gives its median; the rest are searched, strongest first.
  const periods = new Map<string, number>();
  const pending: { planet: PlanetSpec; window: [number, number] }[] = [];
  for (const p of searchPlanets) {
    const given = known(p.period);
    if (given !== undefined) {
      periods.set(p.name, given);
      continue;
    }
    const window = periodWindow(p.period.prior, options.minPeriod ?? 0.5, span);
    const median = priorQuantile(p.period.prior, 0.5);
    const gridStep = 1 / ((options.oversample ?? 5) * span);
    if (window === null || 1 / window[0] - 1 / window[1] < 2 * gridStep) {
      periods.set(p.name, median);
      report.push(
        `${p.name}: period start ${fmt(median)} d, the prior median (${
          window === null ? "no finite search window" : "prior narrower than the frequency grid"
        })`,
      );
    } else {
      pending.push({ planet: p, window });
    }
  }
  while (pending.length > 0) {
    const current = searchPlanets.filter((q) => periods.has(q.name)).map((q) =>
      periods.get(q.name)!
    );
    let residual = series;
    if (current.length > 0) {
      const fit = fitSinusoids(series, current, { trendDegree, referenceTime: tRef });
      if (Number.isFinite(fit.chi2)) residual = { ...series, rv: fit.residuals };
    }
    // The most significant peak among all pending windows is taken first, so a strong
    // signal is removed before a weak one is searched for in its residuals.
    let best = -1, bestPeriod = NaN, bestFap = Infinity;
    pending.forEach(({ window }, j) => {
      const found = searchSignals(residual, {
        minPeriod: window[0],
        maxPeriod: window[1],
        maxSignals: 1,
        fapThreshold: 1,
        trendDegree,
        oversample: options.oversample,
      }).signals[0];
      if (found !== undefined && (best < 0 || found.fap < bestFap)) {
        best = j;
        bestFap = found.fap;
        bestPeriod = Math.min(window[1], Math.max(window[0], found.period));
      }
    });
    if (best < 0) {
      for (const { planet } of pending) {
        const median = priorQuantile(planet.period.prior, 0.5);
        periods.set(planet.name, median);
        report.push(`${planet.name}: period start ${fmt(median)} d, the prior median (no peak)`);
      }
      break;
    }
    const { planet, window } = pending.splice(best, 1)[0]!;
    periods.set(planet.name, bestPeriod);
    report.push(
      `${planet.name}: period start ${fmt(bestPeriod)} d from the periodogram peak in [${
        fmt(window[0])
      }, ${fmt(window[1])}] d, FAP ${bestFap.toExponential(1)}`,
    );
  }

  // 2. Joint sinusoid fit: K, conjunctions, offsets, trend.
  const fitPlanets = searchPlanets.filter((p) => Number.isFinite(periods.get(p.name)));
  const fit = fitSinusoids(series, fitPlanets.map((p) => periods.get(p.name)!), {
    trendDegree,
    referenceTime: tRef,
  });
  const ok = Number.isFinite(fit.chi2);
  fitPlanets.forEach((p, j) => {
    const period = periods.get(p.name)!;
    guesses.set(`${p.name}.period`, period);
    const s = fit.sinusoids[j]!;
    const e = (() => {
      const [lo, hi] = support(p.eccentricity.prior);
      return known(p.eccentricity) ?? (0.1 > lo && 0.1 < hi ? 0.1 : priorQuantile(
        p.eccentricity.prior,
        0.5,
      ));
    })();
    const wDeg = known(p.omegaDeg) ?? priorQuantile(p.omegaDeg.prior, 0.5);
    guesses.set(`${p.name}.eccentricity`, e);
    guesses.set(`${p.name}.omega_deg`, wDeg);
    if (!ok) return;
    guesses.set(`${p.name}.semi_amplitude`, s.semiAmplitude);
    let epoch = s.timeOfConjunction;
    if (p.epochKind === "tp") {
      epoch = timePeriastronFromConjunction(epoch, {
        period,
        eccentricity: e,
        argPeriastron: (wDeg * Math.PI) / 180,
      });
    }
    guesses.set(`${p.name}.${p.epochKind}`, shiftIntoPrior(epoch, period, p.epoch.prior));
  });
  if (ok) {
    spec.instruments.forEach((ins, k) => {
      let sr2 = 0, ss2 = 0, count = 0;
      for (let i = 0; i < n; i++) {
        if (data.instrument[i] !== k) continue;
        const r = fit.residuals[i]!, s = data.rvErr[i]!;
        sr2 += r * r;
        ss2 += s * s;
        count++;
      }
      if (count === 0) return;
      const offset = fit.offsets[k]!;
      if (Number.isFinite(offset)) guesses.set(`${ins.name}.offset`, offset);
      const excess = Math.sqrt(Math.max(0, sr2 / count - ss2 / count));
      guesses.set(`${ins.name}.jitter`, Math.max(excess, 0.1 * Math.sqrt(ss2 / count)));
    });
    if (trendDegree >= 1) guesses.set("trend.slope", fit.trend[0]!);
    if (trendDegree >= 2) guesses.set("trend.quadratic", fit.trend[1]!);
  }
  return guesses;
}

/**
 * The epoch t + m P (integer m) nearest the centre of the prior's support (its
 * median for unbounded priors), so a conjunction found anywhere lands inside a
 * prior window at least one period wide.
 */
function shiftIntoPrior(epoch: number, period: number, prior: PriorSpec): number {
  if (!Number.isFinite(epoch) || !(period > 0)) return epoch;
  const [lo, hi] = support(prior);
  const centre = Number.isFinite(lo) && Number.isFinite(hi)
    ? 0.5 * (lo + hi)
    : priorQuantile(prior, 0.5);
  return epoch + period * Math.round((centre - epoch) / period);
}

function fmt(x: number): string {
  return Number.isFinite(x) ? String(Number(x.toPrecision(6))) : String(x);
}
