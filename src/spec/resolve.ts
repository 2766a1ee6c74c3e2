/**
 * Matching a written spec against its data: instruments get defaults where the
 * spec has none, an `[[instrument]]` without data is an error, the trend's
 * reference time defaults to mid-span, and doubtful priors are warned about.
 * @module
 */
import type { RvTable } from "../data/mod.ts";
import { InputError } from "../errors.ts";
import type { WrittenSpec } from "./parse.ts";
import { support } from "./parse.ts";
import type { InstrumentSpec, ModelSpec, ParamSpec } from "./types.ts";

/** RV data with instruments as indices into `ModelSpec.instruments`. */
export interface ProblemData {
  readonly time: Float64Array;
  readonly rv: Float64Array;
  readonly rvErr: Float64Array;
  readonly instrument: Int32Array;
  readonly count: number;
}

/** A spec matched with its data, ready to compile into a model. */
export interface Problem {
  readonly spec: ModelSpec;
  readonly data: ProblemData;
  /** Things done on the user's behalf (defaults, sorting). */
  readonly notes: readonly string[];
  /** Things that may be wrong but do not stop the run. */
  readonly warnings: readonly string[];
}

/** Resolve instruments and defaults. Throws {@link InputError} on a mismatch. */
export function resolveProblem(written: WrittenSpec, table: RvTable): Problem {
  const notes = [...table.notes];
  const warnings: string[] = [];
  const file = written.specPath;
  const dataNames = table.instruments;
  const byName = new Map(written.writtenInstruments.map((w) => [w.name, w]));
  for (const w of written.writtenInstruments) {
    if (!dataNames.includes(w.name)) {
      throw new InputError(
        `instrument \`${w.name}\` has no rows in the data (${
          table.files.join(", ")
        }): expected one of the instruments found there: ${dataNames.join(", ")}`,
        { file, field: `instrument[${written.writtenInstruments.indexOf(w)}].name` },
      );
    }
  }
  // Order: as written in the spec, then instruments found only in the data.
  const order = [
    ...written.writtenInstruments.map((w) => w.name),
    ...dataNames.filter((n) => !byName.has(n)),
  ];
  const instruments: InstrumentSpec[] = order.map((name) => {
    const w = byName.get(name);
    const dflt = defaultInstrument(table, dataNames.indexOf(name));
    if (w === undefined || w.offset === undefined || w.jitter === undefined) {
      const which = w === undefined ? "no [[instrument]] table" : "missing offset or jitter";
      notes.push(
        `instrument ${name}: ${which} in the spec; using offset uniform [${
          fmt(support(dflt.offset.prior)[0])
        }, ${fmt(support(dflt.offset.prior)[1])}] m/s and jitter loguniform [0.01, 100] m/s`,
      );
    }
    return {
      name,
      offset: w?.offset ?? dflt.offset,
      jitter: w?.jitter ?? dflt.jitter,
      defaulted: w === undefined,
    };
  });
  const index = new Map(instruments.map((ins, i) => [ins.name, i]));
  const count = table.time.length;
  const instrument = new Int32Array(count);
  const toSpec = Int32Array.from(dataNames, (n) => index.get(n)!);
  for (let i = 0; i < count; i++) instrument[i] = toSpec[table.instrumentIndex[i]!]!;

  const t0 = table.time[0]!;
  const t1 = table.time[count - 1]!;
  const span = t1 - t0;
  for (const p of written.planets) {
    const [, hi] = support(p.period.prior);
    if (span > 0 && Number.isFinite(hi) && hi > 10 * span) {
      warnings.push(
        `${file}: ${p.name}.period: prior reaches ${
          fmt(hi)
        } d, more than ten times the data span of ${
          fmt(span)
        } d; the period is then weakly constrained by the data and the prior shapes the result`,
      );
    }
  }
  const trend = written.trend === undefined ? undefined : {
    ...written.trend,
    referenceTime: written.trend.referenceTime ?? round3((t0 + t1) / 2),
  };
  const spec: ModelSpec = {
    title: written.title,
    specPath: written.specPath,
    star: written.star,
    dataFiles: written.dataFiles,
    instruments,
    planets: written.planets,
    trend,
    sampler: written.sampler,
  };
  return {
    spec,
    data: { time: table.time, rv: table.rv, rvErr: table.rvErr, instrument, count },
    notes,
    warnings,
  };
}

function defaultInstrument(
  table: RvTable,
  k: number,
): { offset: ParamSpec; jitter: ParamSpec } {
  // Two passes over the rows of instrument k: mean, then sample standard deviation.
  let n = 0;
  let sum = 0;
  for (let i = 0; i < table.rv.length; i++) {
    if (table.instrumentIndex[i] === k) {
      n++;
      sum += table.rv[i]!;
    }
  }
  const mean = sum / n;
  let ss = 0;
  for (let i = 0; i < table.rv.length; i++) {
    if (table.instrumentIndex[i] === k) ss += (table.rv[i]! - mean) ** 2;
  }
  const sd = Math.sqrt(ss / Math.max(1, n - 1));
  const half = Math.ceil(10 * sd + 100);
  const centre = Math.round(mean);
  return {
    offset: { prior: { kind: "uniform", lo: centre - half, hi: centre + half }, start: centre },
    jitter: { prior: { kind: "loguniform", lo: 0.01, hi: 100 }, start: 1 },
  };
}

function fmt(x: number): string {
  return Number.isInteger(x) ? String(x) : String(Number(x.toPrecision(6)));
}

function round3(x: number): number {
  return Math.round(x * 1000) / 1000;
}
