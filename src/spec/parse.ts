/**
 * Parsing and validating the TOML spec. Every problem is one {@link InputError}
 * naming the spec file, the key and what was found and expected.
 * @module
 */
import { parse as parseToml } from "smol-toml";
import { InputError } from "../errors.ts";
import type {
  ModelSpec,
  MoveSpec,
  ParamSpec,
  PlanetSpec,
  PriorSpec,
  RmSpec,
  SamplerSpec,
  StarSpec,
  TrendSpec,
} from "./types.ts";

/** Instrument as written in the spec, before it is matched against the data. */
export interface WrittenInstrument {
  readonly name: string;
  readonly offset?: ParamSpec;
  readonly jitter?: ParamSpec;
}

/** A spec as written: instruments not yet resolved against data. */
export interface WrittenSpec extends Omit<ModelSpec, "instruments" | "trend"> {
  readonly writtenInstruments: readonly WrittenInstrument[];
  readonly trend?: Omit<TrendSpec, "referenceTime"> & { readonly referenceTime?: number };
}

type Table = Record<string, unknown>;

const PRIOR_KINDS = ["uniform", "loguniform", "normal", "truncnormal", "beta", "fixed"] as const;

/** Defaults of the `[sampler]` table. */
export const SAMPLER_DEFAULTS = {
  walkers: 64,
  steps: 20000,
  seed: 1,
  untilConverged: false,
  checkEvery: 2500,
  // Vehtari et al. 2021 (Bayesian Analysis 16(2), 667, sec. 4): R-hat < 1.01, bulk ESS > 400.
  // 50 autocorrelation times: common practice for ensemble samplers (Foreman-Mackey et al. 2013).
  thresholds: { rhat: 1.01, essBulk: 400, stepsPerTau: 50 },
  flushSeconds: 5,
  flushSteps: 500,
} as const;

/**
 * Parse spec text. `file` is used in messages and to resolve data paths
 * (relative to the spec file's folder).
 */
export function parseSpecText(text: string, options: { file: string; dir: string }): WrittenSpec {
  const file = options.file;
  let doc: Table;
  try {
    doc = parseToml(text) as Table;
  } catch (err) {
    const e = err as { line?: number; column?: number; message?: string };
    const first = String(e.message ?? err).split("\n")[0]!.replace(/^Invalid TOML document: /, "");
    const col = typeof e.column === "number" ? ` at column ${e.column}` : "";
    throw new InputError(`cannot parse TOML: found ${first}${col}: expected TOML syntax`, {
      file,
      line: typeof e.line === "number" ? e.line : undefined,
    });
  }
  const ctx = new Ctx(file);
  ctx.allowKeys(doc, "", ["title", "star", "data", "instrument", "planet", "trend", "sampler"]);
  const title = doc.title === undefined ? "" : ctx.string(doc.title, "title");

  const star = parseStar(ctx, ctx.table(doc.star, "star"));

  const dataT = ctx.table(doc.data, "data");
  ctx.allowKeys(dataT, "data", ["files"]);
  const filesRaw = dataT.files;
  if (!Array.isArray(filesRaw) || filesRaw.length === 0) {
    throw ctx.err("data.files", `found ${show(filesRaw)}: expected a list of CSV paths`);
  }
  const dataFiles = filesRaw.map((f, i) => {
    const s = ctx.string(f, `data.files[${i}]`);
    return s.startsWith("/") ? s : joinPath(options.dir, s);
  });

  const instRaw = doc.instrument === undefined ? [] : ctx.array(doc.instrument, "instrument");
  const names = new Set<string>();
  const writtenInstruments = instRaw.map((it, i) => {
    const key = `instrument[${i}]`;
    const t = ctx.table(it, key);
    ctx.allowKeys(t, key, ["name", "offset", "jitter"]);
    const name = ctx.string(t.name, `${key}.name`);
    if (names.has(name)) throw ctx.err(`${key}.name`, `instrument \`${name}\` is defined twice`);
    names.add(name);
    return {
      name,
      offset: t.offset === undefined ? undefined : ctx.param(t.offset, `${name}.offset`),
      jitter: t.jitter === undefined ? undefined : ctx.param(t.jitter, `${name}.jitter`, {
        positive: true,
      }),
    };
  });

  const planetRaw = doc.planet === undefined ? [] : ctx.array(doc.planet, "planet");
  const pnames = new Set<string>();
  const planets = planetRaw.map((p, i) => {
    const pl = parsePlanet(ctx, ctx.table(p, `planet[${i}]`), i);
    if (pnames.has(pl.name)) throw ctx.err(`planet[${i}].name`, `planet \`${pl.name}\` twice`);
    pnames.add(pl.name);
    return pl;
  });

  let trend: WrittenSpec["trend"];
  if (doc.trend !== undefined) {
    const t = ctx.table(doc.trend, "trend");
    ctx.allowKeys(t, "trend", ["slope", "quadratic", "reference_time"]);
    trend = {
      slope: t.slope === undefined
        ? { prior: { kind: "fixed", value: 0 } }
        : ctx.param(t.slope, "trend.slope"),
      quadratic: t.quadratic === undefined ? undefined : ctx.param(t.quadratic, "trend.quadratic"),
      referenceTime: t.reference_time === undefined
        ? undefined
        : ctx.finite(t.reference_time, "trend.reference_time"),
    };
  }

  const sampler = parseSampler(
    ctx,
    doc.sampler === undefined ? {} : ctx.table(doc.sampler, "sampler"),
  );
  return { title, specPath: file, star, dataFiles, writtenInstruments, planets, trend, sampler };
}

function parseStar(ctx: Ctx, t: Table): StarSpec {
  ctx.allowKeys(t, "star", ["mass_msun", "radius_rsun", "rotation_period_days"]);
  if (t.mass_msun === undefined) {
    throw ctx.err("star.mass_msun", "missing: expected a prior on the star's mass in solar masses");
  }
  return {
    massMsun: ctx.param(t.mass_msun, "star.mass_msun", { positive: true }),
    radiusRsun: t.radius_rsun === undefined
      ? undefined
      : ctx.param(t.radius_rsun, "star.radius_rsun", { positive: true }),
    rotationPeriodDays: t.rotation_period_days === undefined
      ? undefined
      : ctx.param(t.rotation_period_days, "star.rotation_period_days", { positive: true }),
  };
}

function parsePlanet(ctx: Ctx, t: Table, i: number): PlanetSpec {
  const key = `planet[${i}]`;
  ctx.allowKeys(t, key, [
    "name",
    "period",
    "tc",
    "tp",
    "semi_amplitude",
    "eccentricity",
    "omega_deg",
    "rm",
  ]);
  const name = ctx.string(t.name, `${key}.name`);
  if (!/^[A-Za-z0-9_-]+$/.test(name)) {
    throw ctx.err(`${key}.name`, `found \`${name}\`: expected letters, digits, _ or -`);
  }
  const need = (k: string) => {
    if (t[k] === undefined) throw ctx.err(`${name}.${k}`, "missing: expected a prior or value");
    return t[k];
  };
  if (t.tc !== undefined && t.tp !== undefined) {
    throw ctx.err(`${name}.tc`, "found both tc and tp: expected one reference epoch");
  }
  const epochKind = t.tp !== undefined ? "tp" : "tc";
  const ecc = t.eccentricity === undefined
    ? { prior: { kind: "fixed", value: 0 } as PriorSpec }
    : ctx.param(t.eccentricity, `${name}.eccentricity`);
  const [elo, ehi] = support(ecc.prior);
  if (elo < 0 || ehi > 1 || (ecc.prior.kind === "fixed" && ecc.prior.value >= 1)) {
    throw ctx.err(`${name}.eccentricity`, `prior support [${elo}, ${ehi}]: expected within [0, 1)`);
  }
  let rm: RmSpec | undefined;
  if (t.rm !== undefined) rm = parseRm(ctx, ctx.table(t.rm, `${name}.rm`), name);
  return {
    name,
    period: ctx.param(need("period"), `${name}.period`, { positive: true }),
    epochKind,
    epoch: ctx.param(need(epochKind), `${name}.${epochKind}`),
    semiAmplitude: ctx.param(need("semi_amplitude"), `${name}.semi_amplitude`, { positive: true }),
    eccentricity: ecc,
    omegaDeg: t.omega_deg === undefined
      ? { prior: { kind: "fixed", value: 90 } }
      : ctx.param(t.omega_deg, `${name}.omega_deg`),
    rm,
  };
}

function parseRm(ctx: Ctx, t: Table, planet: string): RmSpec {
  const k = `${planet}.rm`;
  ctx.allowKeys(t, k, [
    "lambda_deg",
    "vsini_kms",
    "radius_ratio",
    "a_over_rstar",
    "impact",
    "limb_darkening",
    "exposure_s",
  ]);
  const need = (name: string, opts: { positive?: boolean } = {}) => {
    if (t[name] === undefined) throw ctx.err(`${k}.${name}`, "missing: expected a prior or value");
    return ctx.param(t[name], `${planet}.${name}`, opts);
  };
  const ld = t.limb_darkening;
  if (!Array.isArray(ld) || ld.length !== 2) {
    throw ctx.err(`${k}.limb_darkening`, `found ${show(ld)}: expected [u1, u2]`);
  }
  const impact = need("impact");
  if (support(impact.prior)[0] < 0) {
    throw ctx.err(`${planet}.impact`, "prior allows negative values: expected impact ≥ 0");
  }
  const exposureS = t.exposure_s === undefined ? 0 : ctx.finite(t.exposure_s, `${k}.exposure_s`);
  if (exposureS < 0) {
    throw ctx.err(`${k}.exposure_s`, `found ${exposureS}: expected seconds ≥ 0`);
  }
  return {
    lambdaDeg: need("lambda_deg"),
    vsiniKms: need("vsini_kms", { positive: true }),
    radiusRatio: need("radius_ratio", { positive: true }),
    aOverRstar: need("a_over_rstar", { positive: true }),
    impact,
    u1: ctx.param(ld[0], `${planet}.u1`),
    u2: ctx.param(ld[1], `${planet}.u2`),
    exposureS,
  };
}

function parseSampler(ctx: Ctx, t: Table): SamplerSpec {
  ctx.allowKeys(t, "sampler", [
    "walkers",
    "steps",
    "seed",
    "threads",
    "thin",
    "moves",
    "until_converged",
    "check_every",
    "rhat_max",
    "ess_bulk_min",
    "steps_per_tau_min",
    "flush_seconds",
    "flush_steps",
  ]);
  const d = SAMPLER_DEFAULTS;
  const int = (k: string, dflt: number, min: number) => {
    if (t[k] === undefined) return dflt;
    const v = t[k];
    const n = typeof v === "bigint" ? Number(v) : v;
    if (typeof n !== "number" || !Number.isInteger(n) || n < min) {
      throw ctx.err(`sampler.${k}`, `found ${show(v)}: expected an integer ≥ ${min}`);
    }
    return n;
  };
  const num = (k: string, dflt: number) =>
    t[k] === undefined ? dflt : ctx.finite(t[k], `sampler.${k}`);
  let moves: MoveSpec[] = [{ kind: "stretch", weight: 0.8, scale: 2 }, { kind: "de", weight: 0.2 }];
  if (t.moves !== undefined) {
    const m = ctx.table(t.moves, "sampler.moves");
    ctx.allowKeys(m, "sampler.moves", ["stretch", "de", "stretch_scale"]);
    const ws = m.stretch === undefined ? 1 : ctx.finite(m.stretch, "sampler.moves.stretch");
    const wd = m.de === undefined ? 0 : ctx.finite(m.de, "sampler.moves.de");
    if (ws < 0 || wd < 0 || ws + wd <= 0) {
      throw ctx.err(
        "sampler.moves",
        `found stretch=${ws}, de=${wd}: expected weights ≥ 0, sum > 0`,
      );
    }
    const scale = m.stretch_scale === undefined
      ? 2
      : ctx.finite(m.stretch_scale, "sampler.moves.stretch_scale");
    if (!(scale > 1)) throw ctx.err("sampler.moves.stretch_scale", `found ${scale}: expected > 1`);
    moves = [];
    if (ws > 0) moves.push({ kind: "stretch", weight: ws, scale });
    if (wd > 0) moves.push({ kind: "de", weight: wd });
  }
  const uc = t.until_converged;
  if (uc !== undefined && typeof uc !== "boolean") {
    throw ctx.err("sampler.until_converged", `found ${show(uc)}: expected true or false`);
  }
  return {
    walkers: int("walkers", d.walkers, 2),
    steps: int("steps", d.steps, 1),
    seed: int("seed", d.seed, 0),
    threads: t.threads === undefined ? undefined : int("threads", 1, 1),
    thin: int("thin", 1, 1),
    moves,
    untilConverged: uc ?? d.untilConverged,
    checkEvery: int("check_every", d.checkEvery, 1),
    thresholds: {
      rhat: num("rhat_max", d.thresholds.rhat),
      essBulk: num("ess_bulk_min", d.thresholds.essBulk),
      stepsPerTau: num("steps_per_tau_min", d.thresholds.stepsPerTau),
    },
    flushSeconds: num("flush_seconds", d.flushSeconds),
    flushSteps: int("flush_steps", d.flushSteps, 1),
  };
}

/** Support of a prior as [lo, hi]. */
export function support(p: PriorSpec): [number, number] {
  switch (p.kind) {
    case "uniform":
    case "loguniform":
    case "truncnormal":
      return [p.lo, p.hi];
    case "normal":
      return [-Infinity, Infinity];
    case "beta":
      return [0, 1];
    case "fixed":
      return [p.value, p.value];
  }
}

class Ctx {
  constructor(readonly file: string) {}
  err(field: string, message: string): InputError {
    return new InputError(message, { file: this.file, field });
  }
  allowKeys(t: Table, where: string, keys: readonly string[]): void {
    for (const k of Object.keys(t)) {
      if (!keys.includes(k)) {
        const at = where === "" ? k : `${where}.${k}`;
        throw this.err(at, `unknown key: expected one of ${keys.join(", ")}`);
      }
    }
  }
  table(v: unknown, key: string): Table {
    if (v === undefined) throw this.err(key, "missing table");
    if (typeof v !== "object" || v === null || Array.isArray(v)) {
      throw this.err(key, `found ${show(v)}: expected a table`);
    }
    return v as Table;
  }
  array(v: unknown, key: string): unknown[] {
    if (!Array.isArray(v)) throw this.err(key, `found ${show(v)}: expected [[${key}]] tables`);
    return v;
  }
  string(v: unknown, key: string): string {
    if (typeof v !== "string" || v.length === 0) {
      throw this.err(key, `found ${show(v)}: expected a non-empty string`);
    }
    return v;
  }
  finite(v: unknown, key: string): number {
    const n = typeof v === "bigint" ? Number(v) : v;
    if (typeof n !== "number" || !Number.isFinite(n)) {
      throw this.err(key, `found ${show(v)}: expected a finite number`);
    }
    return n;
  }
  /** A prior table `{ uniform = [lo, hi], start = x }` or a bare number (fixed). */
  param(v: unknown, key: string, opts: { positive?: boolean } = {}): ParamSpec {
    if (typeof v === "number" || typeof v === "bigint") {
      const value = this.finite(v, key);
      if (opts.positive && !(value > 0)) throw this.err(key, `found ${value}: expected > 0`);
      return { prior: { kind: "fixed", value } };
    }
    if (typeof v !== "object" || v === null || Array.isArray(v)) {
      throw this.err(
        key,
        `found ${show(v)}: expected a number or a prior such as { uniform = [lo, hi] }`,
      );
    }
    const t = v as Table;
    const kinds = Object.keys(t).filter((k) => k !== "start");
    if (kinds.length !== 1 || !(PRIOR_KINDS as readonly string[]).includes(kinds[0]!)) {
      throw this.err(
        key,
        `found keys ${kinds.join(", ") || "(none)"}: expected one prior kind of ${
          PRIOR_KINDS.join(", ")
        } (and optional start)`,
      );
    }
    const kind = kinds[0] as (typeof PRIOR_KINDS)[number];
    const raw = t[kind];
    const nums = (count: number): number[] => {
      if (!Array.isArray(raw) || raw.length !== count) {
        throw this.err(key, `found ${kind} = ${show(raw)}: expected ${count} numbers`);
      }
      return raw.map((x, i) => this.finite(x, `${key}.${kind}[${i}]`));
    };
    let prior: PriorSpec;
    switch (kind) {
      case "uniform":
      case "loguniform": {
        const [lo, hi] = nums(2) as [number, number];
        if (!(lo < hi)) throw this.err(key, `found ${kind} = [${lo}, ${hi}]: expected lo < hi`);
        if (kind === "loguniform" && !(lo > 0)) {
          throw this.err(key, `found loguniform lower bound ${lo}: expected > 0`);
        }
        prior = { kind, lo, hi };
        break;
      }
      case "normal": {
        const [mu, sigma] = nums(2) as [number, number];
        if (!(sigma > 0)) throw this.err(key, `found normal sigma ${sigma}: expected > 0`);
        prior = { kind, mu, sigma };
        break;
      }
      case "truncnormal": {
        const [mu, sigma, lo, hi] = nums(4) as [number, number, number, number];
        if (!(sigma > 0)) throw this.err(key, `found truncnormal sigma ${sigma}: expected > 0`);
        if (!(lo < hi)) {
          throw this.err(key, `found truncnormal bounds [${lo}, ${hi}]: expected lo < hi`);
        }
        prior = { kind, mu, sigma, lo, hi };
        break;
      }
      case "beta": {
        const [a, b] = nums(2) as [number, number];
        if (!(a > 0 && b > 0)) throw this.err(key, `found beta = [${a}, ${b}]: expected a, b > 0`);
        prior = { kind, a, b };
        break;
      }
      case "fixed":
        prior = { kind, value: this.finite(raw, `${key}.fixed`) };
        break;
    }
    const [lo, hi] = support(prior);
    // A normal prior on a positive quantity acts as a normal truncated at zero.
    if (opts.positive && lo < 0 && prior.kind !== "normal") {
      throw this.err(key, `prior support starts at ${lo}: expected a positive quantity`);
    }
    if (opts.positive && prior.kind === "fixed" && !(prior.value > 0)) {
      throw this.err(key, `found ${prior.value}: expected > 0`);
    }
    let start: number | undefined;
    if (t.start !== undefined) {
      start = this.finite(t.start, `${key}.start`);
      if (prior.kind === "fixed") throw this.err(`${key}.start`, "a fixed value takes no start");
      const inside = prior.kind === "beta" ? start > 0 && start < 1 : start >= lo && start <= hi;
      if (!inside || (opts.positive && start <= 0)) {
        throw this.err(`${key}.start`, `found ${start}: expected inside the prior [${lo}, ${hi}]`);
      }
    }
    return start === undefined ? { prior } : { prior, start };
  }
}

function show(v: unknown): string {
  if (v === undefined) return "nothing";
  if (typeof v === "string") return `"${v}"`;
  if (typeof v === "bigint" || typeof v === "number") return String(v);
  try {
    return JSON.stringify(v) ?? String(v);
  } catch {
    return String(v);
  }
}

function joinPath(dir: string, rel: string): string {
  return dir.endsWith("/") ? dir + rel : `${dir}/${rel}`;
}
