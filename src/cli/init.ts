/** `rvwalk init DATA.csv --out SPEC.toml`: a ready spec from a periodogram search. @module */
import { basename, dirname, relative, resolve } from "node:path";
import { InputError } from "../errors.ts";
import { CompiledModel } from "../model/posterior.ts";
import {
  draftSpec,
  fillStartValues,
  searchSignals,
  type SpecDraft,
  specToml,
  withDraftStarts,
} from "../search/mod.ts";
import { parseSpecText, resolveProblem } from "../spec/mod.ts";
import type { RvTable } from "../data/mod.ts";
import { type Command, intOption, parseOptions, say, warn } from "./_common.ts";
import {
  dataLines,
  fmt,
  fmtProb,
  harmonicNotes,
  numberOption,
  readRvTable,
  searchSettings,
  seriesFromTable,
} from "./periodogram.ts";

export const initCommand: Command = {
  name: "init",
  summary: "write a ready spec from RV data: periodogram search, wide priors, MAP start",
  help: `Usage: rvwalk init DATA.csv --out SPEC.toml [options]

Searches the data for periodic signals (as \`rvwalk periodogram\`), puts a
planet on each, fits all planets, offsets, jitters and the trend by maximising
the posterior (Nelder–Mead with restarts), and writes a spec with wide priors
and the fitted values as start values. Priors: period loguniform within ±25 %
of the signal (inside the searched range); tc uniform over one period centred
on the fitted conjunction; K loguniform [0.1, 10 K + 10] m/s; e uniform
[0, 0.95]; ω uniform [-180, 180] deg; each instrument's offset uniform around
its mean ± (10 sd + 100) m/s and jitter loguniform [0.01, 100] m/s. Read the
spec before running it: it is a starting point, not a verdict.

Options:
  --out SPEC.toml      spec file to write (required; the data path in it is
                       written relative to the spec's folder)
  --planets N          planets to include: the N strongest signals, even if
                       their FAP is above the threshold (default: every signal
                       with FAP at most the threshold, up to 5)
  --star-mass M,SIGMA  normal prior on the star's mass, solar masses
                       (default: a placeholder 1,0.1 that you should replace)
  --trend              fit a linear trend (in the search and in the spec)
  --quadratic          fit a quadratic trend (implies --trend)
  --min-period D       shortest period searched, days (default 1)
  --max-period D       longest period searched, days (default: the data span)
  --fap-threshold F    significance threshold of a signal (default 0.001)
  --title TEXT         title written in the spec
  --force              replace SPEC.toml if it exists`,
  async run(args) {
    const { values, positionals } = parseOptions(args, {
      out: { type: "string" },
      planets: { type: "string" },
      "star-mass": { type: "string" },
      trend: { type: "boolean" },
      quadratic: { type: "boolean" },
      "min-period": { type: "string" },
      "max-period": { type: "string" },
      "fap-threshold": { type: "string" },
      title: { type: "string" },
      force: { type: "boolean" },
    }, { min: 1, max: 1, names: "DATA.csv" });
    if (values.help) return say(this.help), 0;
    if (values.out === undefined) {
      throw new InputError("missing: expected --out SPEC.toml", { field: "--out" });
    }
    const out = values.out;
    const outAbs = resolve(out);
    if (!values.force && await exists(outAbs)) {
      throw new InputError("exists: pass --force to replace it", { file: out });
    }
    const dataFile = positionals[0]!;
    const starMass = values["star-mass"] === undefined
      ? undefined
      : parseStarMass(values["star-mass"]);
    const planets = intOption(values.planets, "planets", undefined, 0);
    const table = await readRvTable(dataFile);
    const series = seriesFromTable(table);
    const trendDegree = values.quadratic ? 2 : values.trend ? 1 : 0;
    const settings = searchSettings(
      { ...values, signals: String(planets ?? 5) },
      series,
      { trendDegree },
    );
    for (const line of dataLines(table, dataFile)) say(line);
    say(
      `search: periods ${fmt(settings.minPeriod)} to ${fmt(settings.maxPeriod)} d, ` +
        `${
          trendDegree === 0
            ? "offsets"
            : trendDegree === 1
            ? "offsets + linear trend"
            : "offsets + quadratic trend"
        }, ` +
        (planets === undefined
          ? `signals with FAP ≤ ${fmtProb(settings.fapThreshold)} (at most 5)`
          : `the ${planets} strongest signal(s)`),
    );
    const result = planets === 0 ? null : searchSignals(series, {
      minPeriod: settings.minPeriod,
      maxPeriod: settings.maxPeriod,
      maxSignals: settings.maxSignals,
      fapThreshold: planets === undefined ? settings.fapThreshold : 1,
      trendDegree,
    });
    const signals = result?.signals ?? [];
    signals.forEach((s, k) => {
      const weak = s.fap > settings.fapThreshold ? "  (above the FAP threshold: doubtful)" : "";
      say(
        `  signal ${k + 1}: period ${fmt(s.period)} d, power ${s.power.toFixed(4)}, FAP ${
          fmtProb(s.fap)
        }, K ${s.semiAmplitude.toFixed(2)} m/s${weak}`,
      );
      if (weak !== "") {
        warn(
          `warning: signal ${k + 1} (${fmt(s.period)} d) has FAP ${fmtProb(s.fap)} > ${
            fmtProb(settings.fapThreshold)
          }; kept because --planets ${planets} asked for it`,
        );
      }
    });
    const span = series.time[series.count - 1]! - series.time[0]!;
    for (const note of harmonicNotes(signals.map((s) => s.period), span)) say(note);
    if (signals.length === 0) {
      warn("warning: no signal found; the spec has no planet (offsets, jitter and trend only)");
    } else if (result?.nextPeak && planets === undefined) {
      say(
        `  next peak ${fmt(result.nextPeak.period)} d has FAP ${
          fmtProb(result.nextPeak.fap)
        }: not included (use --planets N to include more)`,
      );
    }

    const dataRel = relative(dirname(outAbs), resolve(dataFile)) || dataFile;
    const options = {
      title: values.title ?? `Spec drafted by rvwalk init from ${basename(dataFile)}`,
      comments: [
        "Written by `rvwalk init`: priors are wide around the signals of an iterative GLS",
        "periodogram search; start values are the maximum a posteriori fit. Check them.",
      ],
      dataFiles: [dataRel],
      periodRange: [settings.minPeriod, settings.maxPeriod] as const,
      trendDegree,
      starMass,
    };
    const described = signals.map((s, k) => ({
      period: s.period,
      timeOfConjunction: s.timeOfConjunction,
      semiAmplitude: s.semiAmplitude,
      comment: `Signal ${k + 1} of the search: period ${fmt(s.period)} d, power ${
        s.power.toFixed(4)
      }, FAP ${fmtProb(s.fap)}, K ${s.semiAmplitude.toFixed(2)} m/s (circular fit)`,
    }));
    const first = draftSpec(described, table, options);
    const problem = problemOf(first, table, outAbs);
    say("fitting: maximum a posteriori (Nelder–Mead with restarts) ...");
    const filled = fillStartValues(problem);
    const model = new CompiledModel({ spec: filled.problem.spec, data: filled.problem.data });
    const starts = new Map(model.parameters.map((p) => [p.key, p.start]));
    // Re-centre each tc window on the fitted conjunction (uniform prior: the MAP point is unchanged).
    const recentred = draftSpec(
      described.map((s, k) => ({
        ...s,
        timeOfConjunction: starts.get(`${first.planets[k]!.name}.tc`) ?? s.timeOfConjunction,
      })),
      table,
      options,
    );
    const draft = withDraftStarts(recentred, starts);
    const text = specToml(draft);
    const check = problemOf(draft, table, outAbs);
    const checkModel = new CompiledModel({ spec: check.spec, data: check.data });
    const lp = checkModel.logPosterior(checkModel.startInternal());
    if (!Number.isFinite(lp)) {
      throw new Error(`the written spec's log-posterior at its start is ${lp}`);
    }
    for (const line of fitLines(model, filled.map?.logPosterior ?? lp)) say(line);
    await Deno.mkdir(dirname(outAbs), { recursive: true });
    const tmp = `${outAbs}.tmp-${Deno.pid}`;
    await Deno.writeTextFile(tmp, text);
    await Deno.rename(tmp, outAbs);
    if (starMass === undefined) {
      warn("warning: no --star-mass given: the spec has a placeholder star mass normal [1, 0.1]");
    }
    say(`wrote ${out} (${model.dimensions} free parameters, ${draft.sampler?.walkers} walkers)`);
    say(`next: rvwalk check ${out}   then   rvwalk run ${out} --out runs/NAME`);
    return 0;
  },
};

/** The draft parsed back as the spec reader would, matched with the data. */
function problemOf(draft: SpecDraft, table: RvTable, specAbs: string) {
  const written = parseSpecText(specToml(draft), { file: specAbs, dir: dirname(specAbs) });
  return resolveProblem(written, table);
}

/** The MAP orbit and instrument values, one line each. */
function fitLines(model: CompiledModel, logPosterior: number): string[] {
  const lines = [`maximum a posteriori (log-posterior ${logPosterior.toFixed(3)}):`];
  const byKey = new Map(model.parameters.map((p) => [p.key, p.start]));
  const v = (key: string, digits: number) => {
    const x = byKey.get(key);
    return x === undefined ? "fixed" : x.toFixed(digits);
  };
  for (const p of model.spec.planets) {
    lines.push(
      `  planet ${p.name}: period ${fmt(byKey.get(`${p.name}.period`) ?? NaN)} d, tc ${
        v(`${p.name}.tc`, 4)
      }, K ${v(`${p.name}.semi_amplitude`, 2)} m/s, e ${v(`${p.name}.eccentricity`, 3)}, ω ${
        v(`${p.name}.omega_deg`, 1)
      } deg`,
    );
  }
  for (const ins of model.spec.instruments) {
    lines.push(
      `  instrument ${ins.name}: offset ${v(`${ins.name}.offset`, 2)} m/s, jitter ${
        v(`${ins.name}.jitter`, 2)
      } m/s`,
    );
  }
  if (model.spec.trend !== undefined) {
    lines.push(
      `  trend: slope ${v("trend.slope", 5)} m/s/d${
        byKey.has("trend.quadratic") ? `, quadratic ${v("trend.quadratic", 8)} m/s/d²` : ""
      } about t = ${model.spec.trend.referenceTime}`,
    );
  }
  return lines;
}

function parseStarMass(text: string): [number, number] {
  const parts = text.split(",");
  const nums = parts.map((p) => numberOption(p, "star-mass", NaN, { positive: true }));
  if (nums.length !== 2) {
    throw new InputError(`found \`${text}\`: expected M,SIGMA in solar masses, e.g. 0.92,0.04`, {
      field: "--star-mass",
    });
  }
  return [nums[0]!, nums[1]!];
}

async function exists(path: string): Promise<boolean> {
  try {
    await Deno.lstat(path);
    return true;
  } catch (err) {
    if (err instanceof Deno.errors.NotFound) return false;
    throw err;
  }
}
