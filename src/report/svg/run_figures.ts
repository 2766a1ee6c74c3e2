/**
 * From a run (manifest + chain) to the figures: posterior draws through the
 * model on fine grids, pointwise bands, folded and corrected data. Pure: the
 * caller reads the run directory and writes the files.
 * @module
 */
import { CompiledModel } from "../../model/posterior.ts";
import {
  addKeplerianRv,
  timeConjunctionFromPeriastron,
  timePeriastronFromConjunction,
} from "../../model/keplerian.ts";
import type { ChainData } from "../../run/chain_file.ts";
import type { Manifest } from "../../run/manifest.ts";
import { frequencyGrid, glsPeriodogram, powerAtFalseAlarm } from "../../search/mod.ts";
import type { ModelSpec, ParamSpec } from "../../spec/types.ts";
import { derivedDraws } from "../derived.ts";
import { type Interval, interval, quantileSorted } from "../quantiles.ts";
import { roundByUncertainty } from "../rounding.ts";
import { selectKeys } from "../summary_formats.ts";
import { cornerFigure, type CornerParameter } from "./corner_figure.ts";
import { periodogramFigure } from "./periodogram_figure.ts";
import { phaseFigure } from "./phase_figure.ts";
import { rmFigure } from "./rm_figure.ts";
import { rvFigure } from "./rv_figure.ts";
import { traceFigure } from "./trace_figure.ts";
import type { DataSeries } from "./types.ts";

/** One rendered figure. */
export interface RenderedFigure {
  /** File name, e.g. `phase_b.svg`. */
  readonly file: string;
  readonly svg: string;
  /** One line on what it shows. */
  readonly description: string;
}

/** Options of {@link runFigures}. */
export interface RunFiguresOptions {
  /** Steps discarded from every walker. */
  burn: number;
  /** Posterior draws pushed through the model for the bands. @default 100 */
  draws?: number;
  /**
   * Keys (or `*` globs) for the corner and trace plots; sampled or derived.
   * @default each planet's period, semi-amplitude, eccentricity and λ where sampled
   */
  params?: readonly string[];
  /** Walkers shown in the traces. @default 16 */
  traceWalkers?: number;
  /** Points per walker in the traces (thinned to this). @default 800 */
  tracePoints?: number;
  /** Reference values to mark on the corner plot (e.g. planted truths). */
  truth?: Readonly<Record<string, number>>;
  /** Which figures. @default all */
  only?: readonly ("rv" | "phase" | "rm" | "corner" | "trace" | "periodogram")[];
}

/** Column of `log_posterior` and of the first parameter in a chain row. */
const LEAD = 2;

/** Band quantiles: the central 68% (16th and 84th percentiles). */
const BAND = [0.16, 0.84] as const;

/**
 * All figures of a run, chain read in full (steps from 0). Figures that do
 * not apply (RM without RM planets) are left out. Throws RangeError when the
 * chain has no steps after burn-in or does not match the manifest.
 */
export function runFigures(
  manifest: Manifest,
  chain: ChainData,
  options: RunFiguresOptions,
): RenderedFigure[] {
  const burn = Math.max(0, Math.min(Math.floor(options.burn), chain.steps - 1));
  const kept = chain.steps - burn;
  if (!(kept > 0) || chain.walkers <= 0) {
    throw new RangeError(
      `Cannot draw figures as no steps remain after burn-in: steps=${chain.steps}, burn=${burn}`,
    );
  }
  if (chain.columns !== manifest.columns.length) {
    throw new RangeError(
      `Cannot draw figures as the chain does not match the manifest: columns=${chain.columns}, manifest=${manifest.columns.length}`,
    );
  }
  const want = new Set(options.only ?? ["rv", "phase", "rm", "corner", "trace", "periodogram"]);
  const ctx = new RunContext(manifest, chain, burn, options.draws ?? 100);
  const out: RenderedFigure[] = [];
  if (want.has("rv")) out.push(ctx.rvFigure());
  if (want.has("phase")) {
    manifest.spec.planets.forEach((_, p) => out.push(ctx.phase(p)));
  }
  if (want.has("rm")) {
    manifest.spec.planets.forEach((pl, p) => {
      if (pl.rm !== undefined) {
        const f = ctx.rm(p);
        if (f) out.push(f);
      }
    });
  }
  const keys = ctx.chosenKeys(options.params);
  if (want.has("corner") && keys.length > 0) out.push(ctx.corner(keys, options.truth));
  if (want.has("trace")) {
    out.push(ctx.trace(keys, options.traceWalkers ?? 16, options.tracePoints ?? 800));
  }
  if (want.has("periodogram")) {
    const f = ctx.periodogram();
    if (f) out.push(f);
  }
  return out;
}

/** A safe file-name part from a planet name. */
export function fileSafe(name: string): string {
  return name.replace(/[^A-Za-z0-9_.-]/g, "_");
}

/** Spec value of every model quantity by key (free or fixed). */
function paramSpecs(spec: ModelSpec): Map<string, ParamSpec> {
  const m = new Map<string, ParamSpec>();
  for (const p of spec.planets) {
    m.set(`${p.name}.period`, p.period);
    m.set(`${p.name}.${p.epochKind}`, p.epoch);
    m.set(`${p.name}.semi_amplitude`, p.semiAmplitude);
    m.set(`${p.name}.eccentricity`, p.eccentricity);
    m.set(`${p.name}.omega_deg`, p.omegaDeg);
    if (p.rm) {
      m.set(`${p.name}.lambda_deg`, p.rm.lambdaDeg);
      m.set(`${p.name}.vsini_kms`, p.rm.vsiniKms);
      m.set(`${p.name}.radius_ratio`, p.rm.radiusRatio);
      m.set(`${p.name}.a_over_rstar`, p.rm.aOverRstar);
      m.set(`${p.name}.impact`, p.rm.impact);
      m.set(`${p.name}.u1`, p.rm.u1);
      m.set(`${p.name}.u2`, p.rm.u2);
    }
  }
  for (const ins of spec.instruments) {
    m.set(`${ins.name}.offset`, ins.offset);
    m.set(`${ins.name}.jitter`, ins.jitter);
  }
  if (spec.trend) {
    m.set("trend.slope", spec.trend.slope);
    if (spec.trend.quadratic) m.set("trend.quadratic", spec.trend.quadratic);
  }
  return m;
}

/** Pointwise 16/50/84% over draws: `values[d·n + i]`, NaN draws skipped. */
export function pointwiseBand(values: Float64Array, draws: number, n: number): {
  median: Float64Array;
  lo: Float64Array;
  hi: Float64Array;
} {
  const median = new Float64Array(n);
  const lo = new Float64Array(n);
  const hi = new Float64Array(n);
  const col = new Float64Array(draws);
  for (let i = 0; i < n; i++) {
    let m = 0;
    for (let d = 0; d < draws; d++) {
      const v = values[d * n + i]!;
      if (!Number.isNaN(v)) col[m++] = v;
    }
    const s = col.subarray(0, m).sort();
    median[i] = quantileSorted(s, 0.5);
    lo[i] = quantileSorted(s, BAND[0]);
    hi[i] = quantileSorted(s, BAND[1]);
  }
  return { median, lo, hi };
}

/** Orbit of one planet at one draw. */
interface DrawOrbit {
  period: number;
  timePeriastron: number;
  timeConjunction: number;
  semiAmplitude: number;
  eccentricity: number;
  argPeriastron: number;
}

class RunContext {
  readonly manifest: Manifest;
  readonly chain: ChainData;
  readonly burn: number;
  readonly model: CompiledModel;
  readonly specs: Map<string, ParamSpec>;
  /** Column of each chain key. */
  readonly column: Map<string, number>;
  /** Chain rows (step·walkers + walker) of the posterior draws used for bands. */
  readonly rows: number[];
  readonly n: number;
  readonly time: Float64Array;
  readonly rv: Float64Array;
  readonly rvErr: Float64Array;
  readonly inst: Int32Array;
  /** Model at the data times, per draw (all parts): full[d·n + i]. */
  readonly full: Float64Array;
  /** Keplerians + RM at the data times, per draw (no offsets, no trend). */
  readonly signal: Float64Array;
  readonly jitter: number[];
  readonly offset: number[];
  #medians = new Map<string, Interval>();

  constructor(manifest: Manifest, chain: ChainData, burn: number, draws: number) {
    this.manifest = manifest;
    this.chain = chain;
    this.burn = burn;
    const d = manifest.data;
    this.time = Float64Array.from(d.time);
    this.rv = Float64Array.from(d.rv);
    this.rvErr = Float64Array.from(d.rvErr);
    this.inst = Int32Array.from(d.instrument);
    this.n = this.time.length;
    this.model = new CompiledModel({
      spec: manifest.spec,
      data: {
        time: this.time,
        rv: this.rv,
        rvErr: this.rvErr,
        instrument: this.inst,
        count: this.n,
      },
    });
    const keys = this.model.keys;
    const expected = manifest.parameters.map((p) => p.key);
    if (keys.join("\n") !== expected.join("\n")) {
      throw new RangeError(
        `Cannot draw figures as the model's parameters differ from the manifest's: model=${
          keys.join(",")
        }, manifest=${expected.join(",")}`,
      );
    }
    this.specs = paramSpecs(manifest.spec);
    this.column = new Map(manifest.columns.map((k, i) => [k, i]));
    const total = (chain.steps - burn) * chain.walkers;
    const nd = Math.max(1, Math.min(draws, total));
    this.rows = [];
    for (let k = 0; k < nd; k++) {
      this.rows.push(burn * chain.walkers + Math.floor(((k + 0.5) * total) / nd));
    }
    this.full = new Float64Array(nd * this.n);
    this.signal = new Float64Array(nd * this.n);
    const buf = new Float64Array(this.n);
    this.rows.forEach((row, k) => {
      const phys = this.phys(row);
      if (this.model.predict(phys, buf)) this.full.set(buf, k * this.n);
      else this.full.fill(NaN, k * this.n, (k + 1) * this.n);
      if (this.model.predict(phys, buf, { parts: "no-offsets" })) this.signal.set(buf, k * this.n);
      else this.signal.fill(NaN, k * this.n, (k + 1) * this.n);
    });
    this.jitter = manifest.spec.instruments.map((ins) => this.median(`${ins.name}.jitter`));
    this.offset = manifest.spec.instruments.map((ins) => this.median(`${ins.name}.offset`));
  }

  /** Physical free vector of a chain row. */
  phys(row: number): Float64Array {
    const c = this.chain.columns;
    const dim = this.model.dimensions;
    return this.chain.data.slice(row * c + LEAD, row * c + LEAD + dim);
  }

  /** Value of a model quantity at a chain row (fixed quantities give their value). */
  value(key: string, row: number): number {
    const c = this.column.get(key);
    if (c !== undefined) return this.chain.data[row * this.chain.columns + c]!;
    const p = this.specs.get(key)?.prior;
    return p?.kind === "fixed" ? p.value : NaN;
  }

  /** Interval over all draws after burn-in (fixed quantities: a point). */
  interval(key: string): Interval {
    const hit = this.#medians.get(key);
    if (hit) return hit;
    const c = this.column.get(key);
    let iv: Interval;
    if (c === undefined) {
      const v = this.value(key, 0);
      iv = { median: v, lo68: v, hi68: v, lo95: v, hi95: v, unit: "" };
    } else {
      iv = interval(this.draws(c), "");
    }
    this.#medians.set(key, iv);
    return iv;
  }

  median(key: string): number {
    return this.interval(key).median;
  }

  /** Draws of one column after burn-in (all walkers). */
  draws(c: number): Float64Array {
    const { walkers, columns, data } = this.chain;
    const out = new Float64Array((this.chain.steps - this.burn) * walkers);
    let k = 0;
    for (let s = this.burn; s < this.chain.steps; s++) {
      for (let w = 0; w < walkers; w++) out[k++] = data[(s * walkers + w) * columns + c]!;
    }
    return out;
  }

  /** Orbit of planet p at a chain row (median row values when row < 0). */
  orbit(p: number, row: number): DrawOrbit {
    const pl = this.manifest.spec.planets[p]!;
    const get = (
      q: string,
    ) => (row < 0 ? this.median(`${pl.name}.${q}`) : this.value(`${pl.name}.${q}`, row));
    const period = get("period");
    const eccentricity = get("eccentricity");
    const argPeriastron = (get("omega_deg") * Math.PI) / 180;
    const o = { period, eccentricity, argPeriastron };
    const epoch = get(pl.epochKind);
    const timePeriastron = pl.epochKind === "tp" ? epoch : timePeriastronFromConjunction(epoch, o);
    const timeConjunction = pl.epochKind === "tc" ? epoch : timeConjunctionFromPeriastron(epoch, o);
    return { ...o, semiAmplitude: get("semi_amplitude"), timePeriastron, timeConjunction };
  }

  /** Data errors with the instrument's median jitter in quadrature. */
  totalError(i: number): number {
    const j = this.jitter[this.inst[i]!]!;
    const e = this.rvErr[i]!;
    return Math.sqrt(e * e + (Number.isFinite(j) ? j * j : 0));
  }

  /** Pointwise median over draws of `f(d, i)` at the data points. */
  dataMedian(f: (d: number, i: number) => number): Float64Array {
    const nd = this.rows.length;
    const m = new Float64Array(nd * this.n);
    for (let d = 0; d < nd; d++) for (let i = 0; i < this.n; i++) m[d * this.n + i] = f(d, i);
    return pointwiseBand(m, nd, this.n).median;
  }

  /** Split per instrument into series. */
  series(
    x: ArrayLike<number>,
    y: ArrayLike<number>,
    residual: ArrayLike<number>,
    keep?: (i: number) => boolean,
  ): DataSeries[] {
    return this.manifest.spec.instruments.map((ins, k) => {
      const idx: number[] = [];
      for (let i = 0; i < this.n; i++) if (this.inst[i] === k && (keep?.(i) ?? true)) idx.push(i);
      return {
        name: ins.name,
        x: idx.map((i) => x[i]!),
        y: idx.map((i) => y[i]!),
        error: idx.map((i) => this.rvErr[i]!),
        errorWithJitter: idx.map((i) => this.totalError(i)),
        residual: idx.map((i) => residual[i]!),
        styleIndex: k,
      };
    }).filter((s) => s.x.length > 0);
  }

  /** Residuals rv − pointwise median of the full model. */
  residuals(): Float64Array {
    const med = this.dataMedian((d, i) => this.full[d * this.n + i]!);
    return this.rv.map((v, i) => v - med[i]!);
  }

  /** Transit half-duration estimate (days) and a/R★, k of an RM planet at the medians. */
  transitHalfDuration(p: number): number {
    const pl = this.manifest.spec.planets[p]!;
    const o = this.orbit(p, -1);
    const aR = this.median(`${pl.name}.a_over_rstar`);
    const k = this.median(`${pl.name}.radius_ratio`);
    const b = this.median(`${pl.name}.impact`);
    // Winn 2010, "Transits and occultations", arXiv:1001.2010, eqs. 14 and 16
    // (recalled from memory): T14 = (P/π) asin(√((1+k)² − b²)/(a/R★ sin i)) ×
    // √(1 − e²)/(1 + e sin ω), with cos i ≈ b/(a/R★) for the circular case.
    const sinI = Math.sqrt(Math.max(0, 1 - (b / aR) ** 2));
    const arg = Math.sqrt(Math.max(0, (1 + k) ** 2 - b * b)) / (aR * sinI);
    const ecc = Math.sqrt(1 - o.eccentricity ** 2) /
      (1 + o.eccentricity * Math.sin(o.argPeriastron));
    const t14 = (o.period / Math.PI) * Math.asin(Math.min(1, arg)) * ecc;
    return Number.isFinite(t14) && t14 > 0 ? t14 / 2 : 0.1;
  }

  rvFigure(): RenderedFigure {
    const nd = this.rows.length;
    let tmin = Infinity;
    let tmax = -Infinity;
    for (const t of this.time) {
      tmin = Math.min(tmin, t);
      tmax = Math.max(tmax, t);
    }
    const span = Math.max(tmax - tmin, 1e-3);
    const planets = this.manifest.spec.planets;
    let pmin = Infinity;
    planets.forEach((_, p) => (pmin = Math.min(pmin, this.orbit(p, -1).period)));
    const count = Math.max(1000, Math.min(12000, Math.ceil((span / pmin) * 40)));
    // Leave transit windows of RM planets out of the grid: the RM spikes are
    // shown on their own figure and would read as noise here.
    const windows = planets.map((pl, p) =>
      pl.rm ? { o: this.orbit(p, -1), half: 2 * this.transitHalfDuration(p) } : undefined
    );
    const grid: number[] = [];
    for (let k = 0; k < count; k++) {
      const t = tmin - 0.02 * span + ((k / (count - 1)) * 1.04) * span;
      const inTransit = windows.some((w) => {
        if (!w) return false;
        const ph = (t - w.o.timeConjunction) / w.o.period;
        return Math.abs(ph - Math.round(ph)) * w.o.period < w.half;
      });
      if (!inTransit) grid.push(t);
    }
    const times = Float64Array.from(grid);
    const m = grid.length;
    const zeros = new Int32Array(m);
    const vals = new Float64Array(nd * m);
    const buf = new Float64Array(m);
    const off0Key = `${this.manifest.spec.instruments[0]!.name}.offset`;
    this.rows.forEach((row, d) => {
      const ok = this.model.predict(this.phys(row), buf, { times, instrument: zeros });
      const off0 = this.value(off0Key, row);
      for (let i = 0; i < m; i++) vals[d * m + i] = ok ? buf[i]! - off0 : NaN;
    });
    const band = pointwiseBand(vals, nd, m);
    const residual = this.residuals();
    const corrected = this.rv.map((v, i) => v - this.offset[this.inst[i]!]!);
    const svg = rvFigure({
      title: `${this.manifest.spec.title || "Radial velocities"}`,
      instruments: this.series(this.time, corrected, residual),
      model: { x: times, ...band },
      bandLabel: `68% band of ${nd} posterior draws`,
    });
    return {
      file: "rv.svg",
      svg,
      description:
        "RVs per instrument (offsets subtracted) with the posterior model, band and residuals",
    };
  }

  phase(p: number): RenderedFigure {
    const pl = this.manifest.spec.planets[p]!;
    const nd = this.rows.length;
    const n = this.n;
    // Keplerian of planet p per draw at the data times.
    const kep = new Float64Array(nd * n);
    const gridN = 400;
    const phases = Float64Array.from({ length: gridN }, (_, k) => -0.5 + k / (gridN - 1));
    const curve = new Float64Array(nd * gridN);
    const tg = new Float64Array(gridN);
    const one = new Float64Array(n);
    const oneG = new Float64Array(gridN);
    this.rows.forEach((row, d) => {
      const o = this.orbit(p, row);
      one.fill(0);
      addKeplerianRv(this.time, o, { out: one });
      kep.set(one, d * n);
      for (let k = 0; k < gridN; k++) tg[k] = o.timeConjunction + phases[k]! * o.period;
      oneG.fill(0);
      addKeplerianRv(tg, o, { out: oneG });
      curve.set(oneG, d * gridN);
    });
    const others = this.dataMedian((d, i) => this.full[d * n + i]! - kep[d * n + i]!);
    const y = this.rv.map((v, i) => v - others[i]!);
    const residual = this.residuals();
    const med = this.orbit(p, -1);
    const phase = this.time.map((t) => {
      const f = (t - med.timeConjunction) / med.period;
      return f - Math.round(f);
    });
    const band = pointwiseBand(curve, nd, gridN);
    const fmt = (key: string, unit: string, label: string) => {
      const iv = this.interval(key);
      if (!this.column.has(key)) return `${label} = ${iv.median}${unit ? " " + unit : ""} (fixed)`;
      const r = roundByUncertainty(iv.median, iv.median - iv.lo68, iv.hi68 - iv.median);
      const e = r.minus === r.plus ? `± ${r.minus}` : `+${r.plus}/−${r.minus}`;
      return `${label} = ${r.value} ${e}${unit ? " " + unit : ""}`;
    };
    const subtitle = [
      fmt(`${pl.name}.period`, "d", "P"),
      fmt(`${pl.name}.semi_amplitude`, "m/s", "K"),
      fmt(`${pl.name}.eccentricity`, "", "e"),
    ].join(",  ");
    const svg = phaseFigure({
      planet: pl.name,
      subtitle: `${subtitle}; other signals subtracted`,
      instruments: this.series(phase, y, residual),
      model: { x: phases, ...band },
      bandLabel: `68% band of ${nd} posterior draws`,
    });
    return {
      file: `phase_${fileSafe(pl.name)}.svg`,
      svg,
      description:
        `planet ${pl.name} folded on its period (phase 0 at conjunction), other planets, offsets and trend subtracted`,
    };
  }

  rm(p: number): RenderedFigure | undefined {
    const pl = this.manifest.spec.planets[p]!;
    const med = this.orbit(p, -1);
    const half = this.transitHalfDuration(p);
    const window = Math.min(Math.max(2.5 * half, 0.25), med.period / 4);
    // The transit epoch with the most points in its window.
    const counts = new Map<number, number>();
    for (const t of this.time) {
      const e = Math.round((t - med.timeConjunction) / med.period);
      if (Math.abs(t - (med.timeConjunction + e * med.period)) <= window) {
        counts.set(e, (counts.get(e) ?? 0) + 1);
      }
    }
    if (counts.size === 0) return undefined;
    const epoch = [...counts.entries()].sort((a, b) => b[1] - a[1] || a[0] - b[0])[0]![0];
    const mid = med.timeConjunction + epoch * med.period;
    const inNight = (i: number) => Math.abs(this.time[i]! - mid) <= window;
    const n = this.n;
    const nd = this.rows.length;
    const hours = this.time.map((t) => (t - mid) * 24);
    // Offsets and trend: full − signal.
    const nuisance = this.dataMedian((d, i) => this.full[d * n + i]! - this.signal[d * n + i]!);
    const y = this.rv.map((v, i) => v - nuisance[i]!);
    const residual = this.residuals();
    let lo = -1.3 * half;
    let hi = 1.3 * half;
    for (let i = 0; i < n; i++) {
      if (!inNight(i)) continue;
      lo = Math.min(lo, this.time[i]! - mid);
      hi = Math.max(hi, this.time[i]! - mid);
    }
    const pad = 0.03 * (hi - lo);
    const gridN = 500;
    const times = Float64Array.from(
      { length: gridN },
      (_, k) => mid + lo - pad + ((hi - lo + 2 * pad) * k) / (gridN - 1),
    );
    const vals = new Float64Array(nd * gridN);
    const buf = new Float64Array(gridN);
    const zeros = new Int32Array(gridN);
    this.rows.forEach((row, d) => {
      const ok = this.model.predict(this.phys(row), buf, {
        times,
        instrument: zeros,
        parts: "no-offsets",
      });
      for (let k = 0; k < gridN; k++) vals[d * gridN + k] = ok ? buf[k]! : NaN;
    });
    const band = pointwiseBand(vals, nd, gridN);
    // The Keplerians alone at the medians.
    const kepOnly = new Float64Array(gridN);
    this.manifest.spec.planets.forEach((_, q) =>
      addKeplerianRv(times, this.orbit(q, -1), { out: kepOnly })
    );
    const xh = times.map((t) => (t - mid) * 24);
    const lam = this.interval(`${pl.name}.lambda_deg`);
    const r = roundByUncertainty(lam.median, lam.median - lam.lo68, lam.hi68 - lam.median);
    const lamText = this.column.has(`${pl.name}.lambda_deg`)
      ? `λ = ${r.value} ${r.minus === r.plus ? `± ${r.minus}` : `+${r.plus}/−${r.minus}`} deg`
      : `λ = ${lam.median} deg (fixed)`;
    const svg = rmFigure({
      planet: pl.name,
      subtitle: `transit at ${mid.toFixed(4)} d;  ${lamText};  offsets and trend subtracted`,
      instruments: this.series(hours, y, residual, inNight),
      model: { x: xh, ...band },
      keplerian: { x: xh, y: kepOnly },
      contacts: [-half * 24, half * 24],
      bandLabel: `68% band of ${nd} posterior draws`,
    });
    return {
      file: `rm_${fileSafe(pl.name)}.svg`,
      svg,
      description: `transit night of planet ${pl.name} with the Keplerian + RM model`,
    };
  }

  /** Keys for the corner and trace plots. */
  chosenKeys(params: readonly string[] | undefined): string[] {
    const sampled = this.manifest.parameters.map((p) => p.key);
    if (params !== undefined && params.length > 0) {
      const derived = [...this.derived().keys()];
      return selectKeys([...sampled, ...derived], params);
    }
    const out: string[] = [];
    for (const pl of this.manifest.spec.planets) {
      for (const q of ["period", "semi_amplitude", "eccentricity", "lambda_deg"]) {
        const k = `${pl.name}.${q}`;
        if (this.column.has(k)) out.push(k);
      }
    }
    return out.length > 0 ? out : sampled.slice(0, 6);
  }

  #derived?: Map<string, { unit: string; values: Float64Array }>;
  derived(): Map<string, { unit: string; values: Float64Array }> {
    this.#derived ??= derivedDraws(this.manifest, this.chain, { burn: this.burn });
    return this.#derived;
  }

  corner(keys: readonly string[], truth?: Readonly<Record<string, number>>): RenderedFigure {
    const units = new Map(this.manifest.parameters.map((p) => [p.key, p.unit]));
    const params: CornerParameter[] = keys.map((k) => {
      const c = this.column.get(k);
      if (c !== undefined) {
        return { key: k, unit: units.get(k) ?? "", draws: this.draws(c), truth: truth?.[k] };
      }
      const d = this.derived().get(k)!;
      return { key: k, unit: d.unit, draws: d.values, truth: truth?.[k] };
    });
    // Keep the histogramming light: at most 200 000 draws, evenly spaced.
    const total = params[0]!.draws.length;
    const stride = Math.max(1, Math.ceil(total / 200_000));
    const thinned = stride === 1 ? params : params.map((p) => ({
      ...p,
      draws: Float64Array.from(
        { length: Math.floor(total / stride) },
        (_, i) => p.draws[i * stride]!,
      ),
    }));
    return {
      file: "corner.svg",
      svg: cornerFigure(thinned),
      description: `corner plot of ${keys.join(", ")}`,
    };
  }

  trace(keys: readonly string[], walkers: number, points: number): RenderedFigure {
    const { steps, walkers: nw, columns, data } = this.chain;
    const shown = Math.max(1, Math.min(walkers, nw));
    const ws = Array.from({ length: shown }, (_, k) => Math.floor(((k + 0.5) * nw) / shown));
    const stride = Math.max(1, Math.ceil(steps / points));
    const idx: number[] = [];
    for (let s = 0; s < steps; s += stride) idx.push(s);
    if (idx[idx.length - 1] !== steps - 1) idx.push(steps - 1);
    const chainKeys = keys.filter((k) => this.column.has(k));
    const units = new Map(this.manifest.parameters.map((p) => [p.key, p.unit]));
    const panel = (key: string, c: number, unit: string) => ({
      key,
      unit,
      walkers: ws.map((w) => idx.map((s) => data[(s * nw + w) * columns + c]!)),
    });
    const panels = [
      panel("log posterior", 0, ""),
      ...chainKeys.map((k) => panel(k, this.column.get(k)!, units.get(k) ?? "")),
    ];
    return {
      file: "trace.svg",
      svg: traceFigure({
        title: "Traces",
        subtitle: `${shown} of ${nw} walkers, every ${
          stride === 1 ? "" : ordinal(stride) + " "
        }step; burn-in ${this.burn} steps shaded`,
        steps: idx,
        panels,
        burn: this.burn,
      }),
      description: `traces of the log posterior${
        chainKeys.length ? " and " + chainKeys.join(", ") : ""
      }`,
    };
  }

  periodogram(): RenderedFigure | undefined {
    const residual = this.residuals();
    const err = Float64Array.from({ length: this.n }, (_, i) => this.totalError(i));
    const series = {
      time: this.time,
      rv: residual,
      rvErr: err,
      instrument: this.inst,
      count: this.n,
      instruments: this.manifest.spec.instruments.length,
    };
    const planets = this.manifest.spec.planets.map((pl, p) => ({
      name: pl.name,
      period: this.orbit(p, -1).period,
    }));
    const pmin = Math.min(1, ...planets.map((p) => 0.8 * p.period));
    let result;
    try {
      const grid = frequencyGrid(this.time, {
        minPeriod: pmin,
        oversample: 10,
        maxFrequencies: 2_000_000,
      });
      result = glsPeriodogram(series, grid);
    } catch {
      return undefined; // too few points or too short a span for a periodogram
    }
    const period = result.frequencies.map((f) => 1 / f);
    const levels = [0.1, 0.01, 0.001].map((fap) => ({
      // Each fitted Keplerian spent about five parameters on the data (Baluev 2008's d_H).
      power: powerAtFalseAlarm(fap, result, { extraParameters: 5 * planets.length }),
      label: `FAP ${fap * 100}%`,
    }));
    return {
      file: "periodogram.svg",
      svg: periodogramFigure({
        title: "Periodogram of the residuals",
        subtitle: "generalised Lomb–Scargle, one offset per instrument; dashed: fitted periods",
        period,
        power: result.power,
        marks: planets.map((p) => ({ period: p.period, label: p.name })),
        levels,
      }),
      description:
        "GLS periodogram of the residuals with the fitted periods marked and false-alarm levels",
    };
  }
}

function ordinal(n: number): string {
  const s = n % 100 >= 11 && n % 100 <= 13 ? "th" : ["th", "st", "nd", "rd"][n % 10] ?? "th";
  return `${n}${s}`;
}
