/** `rvwalk periodogram DATA.csv`: iterative GLS search for periodic signals. @module */
import { readRvCsvFile, type RvTable } from "../data/mod.ts";
import { InputError } from "../errors.ts";
import {
  asciiPeriodogram,
  frequencyGrid,
  glsPeriodogram,
  powerAtFalseAlarm,
  type RvSeries,
  type SearchResult,
  searchSignals,
  spectralWindow,
} from "../search/mod.ts";
import { type Command, intOption, parseOptions, say } from "./_common.ts";

export const periodogramCommand: Command = {
  name: "periodogram",
  summary: "search RV data for periodic signals (GLS periodogram, FAP, window function)",
  help: `Usage: rvwalk periodogram DATA.csv [options]

Searches the velocities for periodic signals, one at a time: the generalised
Lomb–Scargle periodogram (Zechmeister & Kürster 2009) with one free offset per
instrument, its highest peak and false-alarm probability (Baluev 2008), a fit
of all signals found so far, then the periodogram of what is left. Stops after
N signals or when the highest peak's FAP exceeds the threshold. Prints a plot
per step (dotted line: the threshold), the window function's strongest peaks
(sampling alone: a true signal at frequency f also shows at f ± the window
peak's frequency), and a table of the signals found.

Options:
  --signals N          most signals to look for (default 5)
  --min-period D       shortest period searched, days (default 1)
  --max-period D       longest period searched, days (default: the data span)
  --fap-threshold F    accept a peak only if its FAP is at most F (default 0.001)
  --trend              fit a linear trend with the offsets at every step
  --json               print only { "signals": [ { "period", "power", "fap",
                       "semi_amplitude" } ] } in the order found`,
  async run(args) {
    const { values, positionals } = parseOptions(args, {
      signals: { type: "string" },
      "min-period": { type: "string" },
      "max-period": { type: "string" },
      "fap-threshold": { type: "string" },
      trend: { type: "boolean" },
      json: { type: "boolean" },
    }, { min: 1, max: 1, names: "DATA.csv" });
    if (values.help) return say(this.help), 0;
    const file = positionals[0]!;
    const table = await readRvTable(file);
    const series = seriesFromTable(table);
    const settings = searchSettings(values, series);
    const result = searchSignals(series, settings);
    if (values.json) {
      say(JSON.stringify({
        signals: result.signals.map((s) => ({
          period: s.period,
          power: s.power,
          fap: s.fap,
          semi_amplitude: s.semiAmplitude,
        })),
      }));
      return 0;
    }
    for (const line of dataLines(table, file)) say(line);
    for (const line of searchReport(series, result, settings)) say(line);
    return 0;
  },
};

/** Search settings shared by `periodogram` and `init`. */
export interface SearchSettings {
  readonly minPeriod: number;
  readonly maxPeriod: number;
  readonly maxSignals: number;
  readonly fapThreshold: number;
  readonly trendDegree: number;
}

/** Reads `--min-period`, `--max-period`, `--signals`, `--fap-threshold`, `--trend`. */
export function searchSettings(
  values: {
    "min-period"?: string;
    "max-period"?: string;
    signals?: string;
    "fap-threshold"?: string;
    trend?: boolean;
  },
  series: RvSeries,
  options: { trendDegree?: number } = {},
): SearchSettings {
  const span = timeSpan(series);
  if (!(span > 0)) {
    throw new InputError(`all ${series.count} rows share one time: expected a time span > 0`, {
      field: "time",
    });
  }
  const minPeriod = numberOption(values["min-period"], "min-period", 1, { positive: true });
  const maxPeriod = numberOption(values["max-period"], "max-period", span, { positive: true });
  if (!(maxPeriod > minPeriod)) {
    throw new InputError(
      `found min ${minPeriod} d, max ${maxPeriod} d: expected --min-period < --max-period`,
      { field: "--max-period" },
    );
  }
  const fapThreshold = numberOption(values["fap-threshold"], "fap-threshold", 1e-3);
  if (!(fapThreshold > 0 && fapThreshold <= 1)) {
    throw new InputError(`found ${fapThreshold}: expected a probability in (0, 1]`, {
      field: "--fap-threshold",
    });
  }
  return {
    minPeriod,
    maxPeriod,
    maxSignals: intOption(values.signals, "signals", 5, 1)!,
    fapThreshold,
    trendDegree: options.trendDegree ?? (values.trend ? 1 : 0),
  };
}

/** A decimal number option, or the default. */
export function numberOption(
  v: string | undefined,
  name: string,
  dflt: number,
  options: { positive?: boolean } = {},
): number {
  if (v === undefined) return dflt;
  const x = Number(v);
  if (v.trim() === "" || !Number.isFinite(x) || (options.positive && !(x > 0))) {
    throw new InputError(
      `found \`${v}\`: expected a ${options.positive ? "positive" : "finite"} number`,
      { field: `--${name}` },
    );
  }
  return x;
}

/** Reads and validates an RV CSV file; a missing or unreadable file is an InputError. */
export function readRvTable(file: string): Promise<RvTable> {
  return readRvCsvFile(file);
}

/** The table as a search series; instruments numbered in order of first appearance. */
export function seriesFromTable(table: RvTable): RvSeries {
  const count = table.time.length;
  if (count < 4) {
    throw new InputError(`found ${count} rows: expected at least 4 to search for a signal`, {
      file: table.files[0],
    });
  }
  return {
    time: table.time,
    rv: table.rv,
    rvErr: table.rvErr,
    instrument: table.instrumentIndex,
    count,
    instruments: table.instruments.length,
  };
}

/** One line on the data: rows, instruments, span. */
export function dataLines(table: RvTable, file: string): string[] {
  const names = table.instruments;
  const n = table.time.length;
  const counts = names.map(() => 0);
  for (let i = 0; i < n; i++) counts[table.instrumentIndex[i]!]!++;
  const span = table.time[n - 1]! - table.time[0]!;
  return [
    `data: ${file}: ${n} RVs, ${names.length} instrument(s) (${
      names.map((name, i) => `${name} ${counts[i]}`).join(", ")
    }), span ${span.toFixed(1)} d`,
    ...table.notes.map((note) => `note: ${note}`),
  ];
}

/**
 * The full text report of a search: settings, window-function peaks, one plot
 * per step, and the table of signals.
 */
export function searchReport(
  series: RvSeries,
  result: SearchResult,
  settings: SearchSettings,
): string[] {
  const lines: string[] = [];
  const grid = frequencyGrid(series.time, {
    minPeriod: settings.minPeriod,
    maxPeriod: settings.maxPeriod,
    count: series.count,
  });
  const gls = glsPeriodogram(series, grid, { trendDegree: settings.trendDegree });
  const nullModel = `one offset per instrument${
    settings.trendDegree === 1
      ? " + linear trend"
      : settings.trendDegree > 1
      ? ` + degree-${settings.trendDegree} trend`
      : ""
  }`;
  lines.push(
    `search: periods ${fmt(settings.minPeriod)} to ${fmt(settings.maxPeriod)} d (${grid.count} ` +
      `frequencies), ${nullModel}, FAP threshold ${fmtProb(settings.fapThreshold)}, ` +
      `at most ${settings.maxSignals} signal(s); plots: power against period, dotted line at ` +
      "the threshold, # the signals found",
  );
  lines.push("");
  const peaks = windowPeaks(series, settings.minPeriod);
  lines.push("window function (sampling alone), strongest peaks:");
  if (peaks.length === 0) lines.push("  (none)");
  for (const w of peaks) {
    lines.push(
      `  period ${fmt(1 / w.frequency).padStart(10)} d   power ${w.power.toFixed(3)}   ` +
        `(frequency ${w.frequency.toPrecision(5)} 1/d)`,
    );
  }
  if (peaks.length > 0) {
    lines.push(
      "  a signal at frequency f may also show at f ± these frequencies (aliases): check both",
    );
  }

  const periods = Float64Array.from(grid.frequencies, (f) => 1 / f);
  const marks = result.signals.map((s) => s.period);
  result.periodograms.forEach((power, k) => {
    const found = result.signals[k];
    const level = powerAtFalseAlarm(settings.fapThreshold, gls, {
      extraParameters: 3 * k,
    });
    lines.push("");
    if (found !== undefined) {
      lines.push(
        `step ${k + 1}: highest peak ${fmt(found.period)} d, power ${found.power.toFixed(4)}, ` +
          `FAP ${fmtProb(found.fap)} → signal ${k + 1}`,
      );
    } else if (result.nextPeak !== null) {
      const p = result.nextPeak;
      const why = p.fap > settings.fapThreshold
        ? " above the threshold: search stops"
        : ` (not taken: --signals ${settings.maxSignals} reached)`;
      lines.push(
        `step ${k + 1}: highest peak ${fmt(p.period)} d, power ${p.power.toFixed(4)}, ` +
          `FAP ${fmtProb(p.fap)}${why}`,
      );
    }
    lines.push(
      ...asciiPeriodogram(periods, power, {
        marks: marks.slice(0, k + 1),
        level,
      }),
    );
  });

  lines.push("");
  const next = result.nextPeak;
  if (next !== null && next.fap > settings.fapThreshold) {
    lines.push(
      `stopped: highest remaining peak ${fmt(next.period)} d has FAP ${fmtProb(next.fap)} > ` +
        fmtProb(settings.fapThreshold),
    );
  } else if (result.signals.length >= settings.maxSignals) {
    lines.push(
      `stopped after ${settings.maxSignals} signal(s) (--signals)${
        next === null ? "" : `; next highest peak ${fmt(next.period)} d, FAP ${fmtProb(next.fap)}`
      }`,
    );
  }
  if (result.signals.length === 0) {
    lines.push("no signal found");
    return lines;
  }
  const top = peaks[0];
  lines.push(
    "signals (K from the joint sinusoid fit of all signals with offsets" +
      `${settings.trendDegree > 0 ? " and trend" : ""}):`,
  );
  const header = `  #  ${"period [d]".padStart(12)}  ${"power".padStart(7)}  ${
    "FAP".padStart(9)
  }  ${"K [m/s]".padStart(8)}${top === undefined ? "" : "  aliases via window peak [d]"}`;
  lines.push(header);
  result.signals.forEach((s, k) => {
    let aliases = "";
    if (top !== undefined) {
      const f = 1 / s.period;
      const list = [f + top.frequency, Math.abs(f - top.frequency)]
        .filter((a) => a > 0)
        .map((a) => fmt(1 / a));
      aliases = `  ${list.join(", ")}`;
    }
    lines.push(
      `  ${String(k + 1).padStart(1)}  ${fmt(s.period).padStart(12)}  ${
        s.power.toFixed(4).padStart(7)
      }  ${fmtProb(s.fap).padStart(9)}  ${s.semiAmplitude.toFixed(2).padStart(8)}${aliases}`,
    );
  });
  for (
    const note of harmonicNotes(
      result.signals.map((s) => s.period),
      timeSpan(series),
    )
  ) lines.push(note);
  lines.push(`residual rms after the fit: ${result.residualRms.toFixed(2)} m/s`);
  return lines;
}

/**
 * Notes for signals whose frequency is within one resolution element (1/span)
 * of twice or three times the frequency of an earlier, stronger signal: an eccentric orbit puts power at its harmonics (its RV
 * curve's Fourier series has terms at P/2, P/3, ... with amplitudes ~e K; common
 * practice, no source), so such a signal may be that orbit, not a new planet.
 */
export function harmonicNotes(periods: readonly number[], span: number): string[] {
  const notes: string[] = [];
  periods.forEach((p, k) => {
    for (let j = 0; j < k; j++) {
      for (const h of [2, 3]) {
        if (Math.abs(1 / p - h / periods[j]!) < 1 / span) {
          notes.push(
            `note: signal ${k + 1} (${fmt(p)} d) is near 1/${h} of signal ${j + 1}'s period: ` +
              `it may be the harmonic of an eccentric orbit rather than another planet`,
          );
          return;
        }
      }
    }
  });
  return notes;
}

/**
 * The three highest local maxima of the unweighted spectral window between
 * 1.5/span (past the central lobe) and max(2, 1/minPeriod) cycles per day.
 */
function windowPeaks(
  series: RvSeries,
  minPeriod: number,
): { frequency: number; power: number }[] {
  const n = series.count;
  const grid = frequencyGrid(series.time, {
    minPeriod: Math.min(0.5, 0.9 * minPeriod),
    maxPeriod: timeSpan(series) / 1.5,
    count: n,
  });
  const w = spectralWindow(series.time, grid, { count: n });
  const peaks: { frequency: number; power: number }[] = [];
  for (let k = 1; k < grid.count - 1; k++) {
    if (w[k]! > w[k - 1]! && w[k]! >= w[k + 1]!) {
      peaks.push({ frequency: grid.frequencies[k]!, power: w[k]! });
    }
  }
  peaks.sort((a, b) => b.power - a.power);
  return peaks.slice(0, 3);
}

/** max(time) − min(time) of the series, days. */
function timeSpan(series: RvSeries): number {
  let t0 = Infinity, t1 = -Infinity;
  for (let i = 0; i < series.count; i++) {
    t0 = Math.min(t0, series.time[i]!);
    t1 = Math.max(t1, series.time[i]!);
  }
  return t1 - t0;
}

/** A period or time with six significant digits. */
export function fmt(x: number): string {
  return Number.isFinite(x) ? String(Number(x.toPrecision(6))) : String(x);
}

/** A probability: fixed for >= 0.001, exponent form below. */
export function fmtProb(p: number): string {
  if (!Number.isFinite(p)) return String(p);
  return p >= 1e-3 ? String(Number(p.toPrecision(2))) : p.toExponential(1);
}
