/** `rvwalk calibrate SPEC --sims N`. @module */
import {
  calibrate,
  calibrationJson,
  type CalibrationProgress,
  calibrationText,
  rankHistogramSvg,
  type StartKind,
} from "../calibrate/mod.ts";
import { InputError } from "../errors.ts";
import { CompiledModel } from "../model/posterior.ts";
import { fileSafe } from "../report/svg/mod.ts";
import { loadProblem } from "../spec/mod.ts";
import {
  type Command,
  defaultThreads,
  formatDuration,
  intOption,
  parseOptions,
  say,
  warn,
} from "./_common.ts";

export const calibrateCommand: Command = {
  name: "calibrate",
  summary: "check that the posterior is calibrated on data simulated from the priors",
  help: `Usage: rvwalk calibrate SPEC.toml --sims N [--steps S] [--walkers W] [--seed K]
                        [--threads T] [--draws L] [--bins B] [--start prior|spec]
                        [--json] [--out DIR]

Simulation-based calibration (Talts, Betancourt, Simpson, Vehtari & Gelman
2018, arXiv:1804.06788). N times: draw every free parameter and the star's
mass from the spec's priors, simulate RVs at the spec's observation times,
errors and instruments (noise sd √(error² + jitter²)), sample their posterior
with a short ensemble run, thin it by the integrated autocorrelation time and
rank each true value among L posterior draws. With calibrated posteriors the
ranks are uniform on 0…L; a χ² test over B bins gives a p-value per
parameter (and per derived m sin i).

Options:
  --sims N         number of simulations (≥ 100 recommended; 200 is typical)
  --steps S        ensemble steps per simulation, half of them burn-in (default 2000)
  --walkers W      walkers (default: the spec's [sampler] walkers)
  --seed K         base seed; simulation i is seeded from (K, i) (default: the spec's)
  --threads T      simulations run at once, one worker each (default: all cores)
  --draws L        posterior draws per simulation (default 99)
  --bins B         histogram bins, dividing L + 1 (default: 20 for N ≥ 100)
  --start KIND     prior: walkers start at independent prior draws (default);
                   spec: a small ball around the spec's start values
  --json           print the result as JSON on stdout
  --out DIR        folder for one SVG rank histogram per parameter and
                   calibration.json (default ./calibration)

Results do not depend on --threads. Progress and ETA go to stderr.
Exit 0 when the calibration ran (whatever the p-values), 2 on bad input.`,
  async run(args) {
    const { values, positionals } = parseOptions(args, {
      sims: { type: "string" },
      steps: { type: "string" },
      walkers: { type: "string" },
      seed: { type: "string" },
      threads: { type: "string" },
      draws: { type: "string" },
      bins: { type: "string" },
      start: { type: "string" },
      json: { type: "boolean" },
      out: { type: "string" },
    }, { min: 1, max: 1, names: "SPEC" });
    if (values.help) return say(this.help), 0;
    if (values.sims === undefined) {
      throw new InputError("missing: expected --sims N; see --help", { field: "--sims" });
    }
    const simulations = intOption(values.sims, "sims", undefined)!;
    const steps = intOption(values.steps, "steps", 2000, 4)!;
    const threads = intOption(values.threads, "threads", defaultThreads())!;
    const draws = intOption(values.draws, "draws", 99)!;
    const bins = intOption(values.bins, "bins", undefined, 2);
    if (bins !== undefined && (draws + 1) % bins !== 0) {
      throw new InputError(`found ${bins}: expected a divisor of draws + 1 = ${draws + 1}`, {
        field: "--bins",
      });
    }
    const start = values.start ?? "prior";
    if (start !== "prior" && start !== "spec") {
      throw new InputError(`found \`${start}\`: expected prior or spec`, { field: "--start" });
    }
    const problem = await loadProblem(positionals[0]!);
    const walkers = intOption(values.walkers, "walkers", problem.spec.sampler.walkers, 2)!;
    const seed = intOption(values.seed, "seed", problem.spec.sampler.seed, 0)!;
    const dims = new CompiledModel(problem).dimensions;
    if (walkers <= 2 * dims || walkers % 2 !== 0) {
      throw new InputError(
        `found ${walkers}: expected an even number above twice the ${dims} free parameters`,
        { field: "--walkers" },
      );
    }
    for (const w of problem.warnings) warn(`warning: ${w}`);
    const out = values.out ?? "calibration";
    warn(
      `calibrate: ${simulations} simulations × ${walkers} walkers × ${steps} steps, ` +
        `seed ${seed}, ${Math.min(threads, simulations)} at a time`,
    );
    let result;
    try {
      result = await calibrate(problem, {
        simulations,
        steps,
        walkers,
        seed,
        threads,
        draws,
        bins,
        start: start as StartKind,
        onProgress: progressLine(),
      });
    } catch (err) {
      // Option checks made before any simulation runs are bad input (exit 2).
      const m = err instanceof RangeError
        ? /^Cannot (?:calibrate|bin ranks) as ((?:walkers|fewer than|draws|bins).*)$/.exec(
          err.message,
        )
        : null;
      if (m !== null) throw new InputError(m[1]!, { field: "options" });
      throw err;
    }
    const json = calibrationJson(result);
    await Deno.mkdir(out, { recursive: true });
    for (const key of result.keys) {
      const q = result.parameters[key]!;
      await Deno.writeTextFile(
        `${out}/rank_${fileSafe(key)}.svg`,
        rankHistogramSvg({
          key,
          counts: q.counts,
          draws: result.draws,
          simulations: result.simulations,
          band: result.band,
          pValue: q.pValue,
          chiSquare: q.chiSquare,
          df: q.df,
        }),
      );
    }
    await Deno.writeTextFile(`${out}/calibration.json`, JSON.stringify(json, null, 2) + "\n");
    if (values.json) {
      say(JSON.stringify(json));
    } else {
      for (const line of calibrationText(result)) say(line);
      say(`wrote ${result.keys.length} rank histograms (SVG) and calibration.json to ${out}/`);
    }
    return 0;
  },
};

/** Progress on stderr: one rewritten line on a terminal, else a line every 5 s. */
function progressLine(): (p: CalibrationProgress) => void {
  const tty = Deno.stderr.isTerminal();
  const encoder = new TextEncoder();
  let last = -Infinity;
  return (p) => {
    const now = performance.now();
    const final = p.done === p.total;
    if (!final && now - last < (tty ? 250 : 5000)) return;
    last = now;
    const rate = p.done / Math.max(p.elapsedSeconds, 1e-9);
    const eta = final ? 0 : (p.total - p.done) / rate;
    const width = 24;
    const filled = Math.round((p.done / p.total) * width);
    const bar = "#".repeat(filled) + ".".repeat(width - filled);
    const line = `[${bar}] ${p.done}/${p.total} simulations  ${rate.toFixed(2)}/s  ` +
      `elapsed ${formatDuration(p.elapsedSeconds)}  ETA ${formatDuration(eta)}`;
    if (tty) {
      Deno.stderr.writeSync(encoder.encode(`\r${line}\x1b[K${final ? "\n" : ""}`));
    } else {
      Deno.stderr.writeSync(encoder.encode(`${line}\n`));
    }
  };
}
