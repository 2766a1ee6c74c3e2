/**
 * Writing a spec: wide, honest priors around signals found by a periodogram
 * search ({@linkcode draftSpec}), start values by parameter key
 * ({@linkcode withDraftStarts}) and the TOML text itself ({@linkcode specToml}).
 * Pure functions: no files.
 * @module
 */
import type { ParamSpec, PlanetSpec, PriorSpec, StarSpec } from "../spec/types.ts";

/** An instrument as written in a spec. */
export interface DraftInstrument {
  readonly name: string;
  /** m/s */
  readonly offset: ParamSpec;
  /** m/s */
  readonly jitter: ParamSpec;
}

/** A planet as written in a spec, with an optional comment line above it. */
export interface DraftPlanet extends PlanetSpec {
  readonly comment?: string;
}

/** A spec to be written as TOML. */
export interface SpecDraft {
  /** Title line; "" writes none. */
  readonly title: string;
  /** Comment lines at the top of the file (without `#`). */
  readonly comments?: readonly string[];
  readonly star: StarSpec;
  /** Comment line above `[star]` (without `#`). */
  readonly starComment?: string;
  /** Data files as written: relative to the spec's folder, or absolute. */
  readonly dataFiles: readonly string[];
  readonly instruments: readonly DraftInstrument[];
  readonly planets: readonly DraftPlanet[];
  readonly trend?: {
    readonly slope: ParamSpec;
    readonly quadratic?: ParamSpec;
    readonly referenceTime?: number;
  };
  readonly sampler?: { readonly walkers?: number; readonly steps?: number; readonly seed?: number };
}

/**
 * TOML text of a spec in the layout `parseSpecText` reads: `title`, `[star]`,
 * `[data]`, `[[instrument]]`, `[[planet]]` (with `[planet.rm]`), `[trend]`,
 * `[sampler]`. A parameter with a fixed prior is written as a bare number,
 * any other as an inline table `{ kind = [...], start = x }`.
 *
 * Numbers are written in the shortest form that reads back exactly
 * (JavaScript's `String(number)`), so a parsed spec equals the draft.
 * Throws RangeError for non-finite numbers, which TOML specs do not accept.
 */
export function specToml(draft: SpecDraft): string {
  const lines: string[] = [];
  for (const c of draft.comments ?? []) lines.push(comment(c));
  // The reader refuses an empty title; an absent one means "".
  if (draft.title !== "") lines.push(`title = ${str(draft.title)}`);
  if (lines.length > 0) lines.push("");
  if (draft.starComment !== undefined) lines.push(comment(draft.starComment));
  lines.push("[star]");
  lines.push(`mass_msun = ${param(draft.star.massMsun, "star.mass_msun")}`);
  if (draft.star.radiusRsun !== undefined) {
    lines.push(`radius_rsun = ${param(draft.star.radiusRsun, "star.radius_rsun")}`);
  }
  if (draft.star.rotationPeriodDays !== undefined) {
    lines.push(
      `rotation_period_days = ${param(draft.star.rotationPeriodDays, "star.rotation_period_days")}`,
    );
  }
  lines.push("", "[data]", `files = [${draft.dataFiles.map(str).join(", ")}]`);
  for (const ins of draft.instruments) {
    lines.push("", "[[instrument]]", `name = ${str(ins.name)}`);
    lines.push(`offset = ${param(ins.offset, `${ins.name}.offset`)}`);
    lines.push(`jitter = ${param(ins.jitter, `${ins.name}.jitter`)}`);
  }
  for (const p of draft.planets) {
    lines.push("");
    if (p.comment !== undefined) lines.push(comment(p.comment));
    const k = (q: string) => `${p.name}.${q}`;
    lines.push("[[planet]]", `name = ${str(p.name)}`);
    lines.push(`period = ${param(p.period, k("period"))}`);
    lines.push(`${p.epochKind} = ${param(p.epoch, k(p.epochKind))}`);
    lines.push(`semi_amplitude = ${param(p.semiAmplitude, k("semi_amplitude"))}`);
    lines.push(`eccentricity = ${param(p.eccentricity, k("eccentricity"))}`);
    lines.push(`omega_deg = ${param(p.omegaDeg, k("omega_deg"))}`);
    if (p.rm !== undefined) {
      const r = p.rm;
      lines.push("", "[planet.rm]");
      lines.push(`lambda_deg = ${param(r.lambdaDeg, k("lambda_deg"))}`);
      lines.push(`vsini_kms = ${param(r.vsiniKms, k("vsini_kms"))}`);
      lines.push(`radius_ratio = ${param(r.radiusRatio, k("radius_ratio"))}`);
      lines.push(`a_over_rstar = ${param(r.aOverRstar, k("a_over_rstar"))}`);
      lines.push(`impact = ${param(r.impact, k("impact"))}`);
      lines.push(`limb_darkening = [${param(r.u1, k("u1"))}, ${param(r.u2, k("u2"))}]`);
      if (r.exposureS > 0) lines.push(`exposure_s = ${num(r.exposureS, k("exposure_s"))}`);
    }
  }
  if (draft.trend !== undefined) {
    const t = draft.trend;
    lines.push("", "[trend]", `slope = ${param(t.slope, "trend.slope")}`);
    if (t.quadratic !== undefined) {
      lines.push(`quadratic = ${param(t.quadratic, "trend.quadratic")}`);
    }
    if (t.referenceTime !== undefined) {
      lines.push(`reference_time = ${num(t.referenceTime, "trend.reference_time")}`);
    }
  }
  const s = draft.sampler;
  if (s !== undefined && (s.walkers ?? s.steps ?? s.seed) !== undefined) {
    lines.push("", "[sampler]");
    if (s.walkers !== undefined) lines.push(`walkers = ${integer(s.walkers, "sampler.walkers")}`);
    if (s.steps !== undefined) lines.push(`steps = ${integer(s.steps, "sampler.steps")}`);
    if (s.seed !== undefined) lines.push(`seed = ${integer(s.seed, "sampler.seed")}`);
  }
  return lines.join("\n") + "\n";
}

/** A signal around which {@linkcode draftSpec} puts a planet's priors. */
export interface DraftSignal {
  /** Period, days. */
  readonly period: number;
  /** Time of inferior conjunction of the circular-orbit fit, days. */
  readonly timeOfConjunction: number;
  /** Semi-amplitude, m/s. */
  readonly semiAmplitude: number;
  /** Comment written above the planet (e.g. the periodogram power and FAP). */
  readonly comment?: string;
}

/** The data {@linkcode draftSpec} needs (an `RvTable` has it). */
export interface DraftData {
  /** Times, days. */
  readonly time: ArrayLike<number>;
  /** Velocities, m/s. */
  readonly rv: ArrayLike<number>;
  /** Instrument names, in the order they are written. */
  readonly instruments: readonly string[];
  /** Per row: index into `instruments`. */
  readonly instrumentIndex: ArrayLike<number>;
}

/** Options of {@linkcode draftSpec}. */
export interface DraftSpecOptions {
  /** Title line. @default "" */
  title?: string;
  /** Comment lines at the top of the file. @default [] */
  comments?: readonly string[];
  /** Data files as written in the spec. @default ["data.csv"] */
  dataFiles?: readonly string[];
  /** Period search range [min, max] that period priors are clipped to, days. @default [0, Infinity] */
  periodRange?: readonly [number, number];
  /** Trend: 0 none, 1 linear, 2 quadratic. @default 0 */
  trendDegree?: number;
  /** Star mass prior as normal [mean, sigma], solar masses. @default [1, 0.1], marked as a placeholder */
  starMass?: readonly [number, number];
  /** Planet names in order. @default b, c, d, ... */
  names?: readonly string[];
  /** Sampler steps written. @default 20000 */
  steps?: number;
  /** Sampler seed written. @default 1 */
  seed?: number;
}

/**
 * Spec draft with wide priors around `signals` (in the given order, named b,
 * c, d, ...), for data `data`:
 * - period loguniform [0.75 P, 1.25 P], clipped to `periodRange`;
 * - tc uniform [Tc − P/2, Tc + P/2], one period centred on the conjunction;
 * - K loguniform [0.1, 10 K + 10] m/s; e uniform [0, 0.95]; ω uniform [−180, 180];
 * - per instrument: offset uniform [m − (10 sd + 100), m + (10 sd + 100)] m/s
 *   around the mean m and standard deviation sd of its velocities, jitter
 *   loguniform [0.01, 100] m/s;
 * - trend (degree ≥ 1): slope uniform ±10 (max rv − min rv)/span m/s/d,
 *   quadratic ±10 (max rv − min rv)/span² m/s/d², reference time mid-span;
 * - star mass normal [mean, sigma];
 * - walkers max(32, 3 × free parameters) rounded up to even.
 * Bounds are rounded outward to four significant digits (tc to 1e-4 d).
 * These widths are choices of this program (common practice is "wide and
 * uninformative"; no source), meant to contain any orbit the search could
 * have mistaken for the found one while excluding other peaks.
 *
 * Throws RangeError for a non-positive or non-finite period or K, or when
 * `data` has fewer than two distinct times and a trend is asked for.
 */
export function draftSpec(
  signals: readonly DraftSignal[],
  data: DraftData,
  options: DraftSpecOptions = {},
): SpecDraft {
  const [rangeLo, rangeHi] = options.periodRange ?? [0, Infinity];
  const trendDegree = options.trendDegree ?? 0;
  const names = options.names ?? signals.map((_, i) => planetName(i));
  const planets: DraftPlanet[] = signals.map((s, i) => {
    const { period, timeOfConjunction: tc, semiAmplitude: k } = s;
    if (!(period > 0) || !Number.isFinite(period) || !(k >= 0) || !Number.isFinite(k)) {
      throw new RangeError(
        `Cannot draft spec as a signal is not a finite orbit: index=${i}, period=${period}, ` +
          `semiAmplitude=${k}`,
      );
    }
    const pLo = Math.max(roundSig(0.75 * period, 4, Math.floor), rangeLo);
    const pHi = Math.min(roundSig(1.25 * period, 4, Math.ceil), rangeHi);
    return {
      name: names[i] ?? planetName(i),
      comment: s.comment,
      period: { prior: { kind: "loguniform", lo: pLo, hi: pHi } },
      epochKind: "tc",
      epoch: {
        prior: {
          kind: "uniform",
          lo: Math.floor((tc - period / 2) * 1e4) / 1e4,
          hi: Math.ceil((tc + period / 2) * 1e4) / 1e4,
        },
      },
      semiAmplitude: {
        prior: { kind: "loguniform", lo: 0.1, hi: roundSig(10 * k + 10, 4, Math.ceil) },
      },
      eccentricity: { prior: { kind: "uniform", lo: 0, hi: 0.95 } },
      omegaDeg: { prior: { kind: "uniform", lo: -180, hi: 180 } },
    };
  });
  const instruments: DraftInstrument[] = data.instruments.map((name, k) => {
    const rows: number[] = [];
    for (let i = 0; i < data.time.length; i++) {
      if (data.instrumentIndex[i] === k) rows.push(data.rv[i]!);
    }
    const mean = rows.reduce((a, b) => a + b, 0) / rows.length;
    const sd = Math.sqrt(
      rows.reduce((a, b) => a + (b - mean) ** 2, 0) / Math.max(1, rows.length - 1),
    );
    const half = Math.ceil(10 * sd + 100);
    const centre = Math.round(mean);
    return {
      name,
      offset: { prior: { kind: "uniform", lo: centre - half, hi: centre + half } },
      jitter: { prior: { kind: "loguniform", lo: 0.01, hi: 100 } },
    };
  });
  let trend: SpecDraft["trend"];
  if (trendDegree >= 1) {
    let t0 = Infinity, t1 = -Infinity, v0 = Infinity, v1 = -Infinity;
    for (let i = 0; i < data.time.length; i++) {
      t0 = Math.min(t0, data.time[i]!);
      t1 = Math.max(t1, data.time[i]!);
      v0 = Math.min(v0, data.rv[i]!);
      v1 = Math.max(v1, data.rv[i]!);
    }
    const span = t1 - t0;
    if (!(span > 0)) {
      throw new RangeError(
        `Cannot draft spec with a trend as the time span is not positive: span=${span}`,
      );
    }
    const range = Math.max(v1 - v0, 1);
    const b1 = roundSig(10 * range / span, 2, Math.ceil);
    const b2 = roundSig(10 * range / (span * span), 2, Math.ceil);
    trend = {
      slope: { prior: { kind: "uniform", lo: -b1, hi: b1 } },
      quadratic: trendDegree >= 2 ? { prior: { kind: "uniform", lo: -b2, hi: b2 } } : undefined,
      referenceTime: Math.round(0.5 * (t0 + t1) * 1000) / 1000,
    };
  }
  const [mass, massSigma] = options.starMass ?? [1, 0.1];
  const free = 5 * planets.length + 2 * instruments.length + trendDegree;
  const walkers = 2 * Math.ceil(Math.max(32, 3 * free) / 2);
  return {
    title: options.title ?? "",
    comments: options.comments,
    star: { massMsun: { prior: { kind: "normal", mu: mass, sigma: massSigma } } },
    starComment: options.starMass === undefined
      ? "Placeholder star mass (no --star-mass given): replace with your star's value."
      : undefined,
    dataFiles: options.dataFiles ?? ["data.csv"],
    instruments,
    planets,
    trend,
    sampler: { walkers, steps: options.steps ?? 20000, seed: options.seed ?? 1 },
  };
}

/**
 * The draft with `start` set for every free parameter whose key (as in
 * `CompiledModel.parameters`: `b.period`, `b.tc`, `lyra.offset`, `trend.slope`, ...)
 * is in `starts`. Each start is rounded to 12 significant digits and kept
 * strictly inside its prior's support; fixed parameters are left alone.
 */
export function withDraftStarts(draft: SpecDraft, starts: ReadonlyMap<string, number>): SpecDraft {
  const set = (key: string, p: ParamSpec): ParamSpec => {
    const v = starts.get(key);
    if (v === undefined || p.prior.kind === "fixed" || !Number.isFinite(v)) return p;
    return { prior: p.prior, start: inside(Number(v.toPrecision(12)), p.prior) };
  };
  return {
    ...draft,
    instruments: draft.instruments.map((ins) => ({
      ...ins,
      offset: set(`${ins.name}.offset`, ins.offset),
      jitter: set(`${ins.name}.jitter`, ins.jitter),
    })),
    planets: draft.planets.map((p) => {
      const k = (q: string) => `${p.name}.${q}`;
      return {
        ...p,
        period: set(k("period"), p.period),
        epoch: set(k(p.epochKind), p.epoch),
        semiAmplitude: set(k("semi_amplitude"), p.semiAmplitude),
        eccentricity: set(k("eccentricity"), p.eccentricity),
        omegaDeg: set(k("omega_deg"), p.omegaDeg),
      };
    }),
    trend: draft.trend === undefined ? undefined : {
      ...draft.trend,
      slope: set("trend.slope", draft.trend.slope),
      quadratic: draft.trend.quadratic === undefined
        ? undefined
        : set("trend.quadratic", draft.trend.quadratic),
    },
  };
}

/** b, c, ..., z, then b2, c2, ... (planet letters start at b by convention). */
function planetName(i: number): string {
  const letters = "bcdefghijklmnopqrstuvwxyz";
  const round = Math.floor(i / letters.length);
  return letters[i % letters.length]! + (round === 0 ? "" : String(round + 1));
}

/** x rounded to `digits` significant digits with `mode` (Math.floor or Math.ceil). */
function roundSig(x: number, digits: number, mode: (v: number) => number): number {
  if (x === 0 || !Number.isFinite(x)) return x;
  const e = Math.floor(Math.log10(Math.abs(x))) - digits + 1;
  const f = Math.pow(10, -e);
  // mode() may step one unit further out when x * f carries binary noise (still
  // outward); toPrecision removes the noise of the quotient.
  return Number((mode(x * f) / f).toPrecision(digits + 1));
}

/** A start value kept strictly inside the prior's support. */
function inside(x: number, prior: PriorSpec): number {
  let lo = -Infinity, hi = Infinity;
  switch (prior.kind) {
    case "uniform":
    case "loguniform":
    case "truncnormal":
      lo = prior.lo;
      hi = prior.hi;
      break;
    case "beta":
      lo = 0;
      hi = 1;
      break;
    default:
      break;
  }
  if (x > lo && x < hi) return x;
  const width = hi - lo;
  const pad = Number.isFinite(width) ? 1e-9 * width : 1e-9 * Math.max(1, Math.abs(x));
  return x <= lo ? lo + pad : hi - pad;
}

function param(p: ParamSpec, key: string): string {
  const pr = p.prior;
  if (pr.kind === "fixed") return num(pr.value, key);
  let body: string;
  switch (pr.kind) {
    case "uniform":
    case "loguniform":
      body = `${pr.kind} = [${num(pr.lo, key)}, ${num(pr.hi, key)}]`;
      break;
    case "normal":
      body = `normal = [${num(pr.mu, key)}, ${num(pr.sigma, key)}]`;
      break;
    case "truncnormal":
      body = `truncnormal = [${num(pr.mu, key)}, ${num(pr.sigma, key)}, ${num(pr.lo, key)}, ${
        num(pr.hi, key)
      }]`;
      break;
    case "beta":
      body = `beta = [${num(pr.a, key)}, ${num(pr.b, key)}]`;
      break;
  }
  return p.start === undefined ? `{ ${body} }` : `{ ${body}, start = ${num(p.start, key)} }`;
}

function num(x: number, key: string): string {
  if (!Number.isFinite(x)) {
    throw new RangeError(`Cannot write spec as a number is not finite: key=${key}, value=${x}`);
  }
  // String() is the shortest text that reads back to the same double; its forms
  // (123, 0.5, 1e-7, 1e+21) are all valid TOML numbers.
  return Object.is(x, -0) ? "0" : String(x);
}

function integer(x: number, key: string): string {
  if (!Number.isInteger(x)) {
    throw new RangeError(`Cannot write spec as a whole number is expected: key=${key}, value=${x}`);
  }
  return String(x);
}

function str(s: string): string {
  return JSON.stringify(s);
}

function comment(text: string): string {
  return text.split("\n").map((l) => (l.length === 0 ? "#" : `# ${l}`)).join("\n");
}
