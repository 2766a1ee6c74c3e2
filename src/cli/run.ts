/** `rvwalk run` and `rvwalk resume`. @module */
import { InputError } from "../errors.ts";
import { CompiledModel } from "../model/posterior.ts";
import { runPath } from "../run/layout.ts";
import { resumeRun, type SessionResult, startRun } from "../run/session.ts";
import { loadProblem } from "../spec/mod.ts";
import { type Command, defaultThreads, intOption, parseOptions, say, warn } from "./_common.ts";
import { describeProblem } from "./describe.ts";
import { progressPrinter } from "./progress.ts";

export const runCommand: Command = {
  name: "run",
  summary: "sample the posterior of a spec into a run directory",
  help: `Usage: rvwalk run SPEC.toml --out DIR [options]

Samples the posterior with the affine-invariant ensemble sampler and writes
the run directory DIR (manifest, chain, checkpoints). Progress is printed as
plain lines (step, steps/s, ETA, acceptance).

Options:
  --out DIR          run directory to create (required; must not hold a run)
  --steps N          steps to take (default: [sampler] steps)
  --walkers W        walkers, even and > 2 × free parameters (default: [sampler] walkers)
  --seed S           random seed (default: [sampler] seed)
  --threads T        worker threads evaluating the posterior (default: cores)
  --until-converged  stop early once the convergence criteria hold
  --no-ui            plain progress lines even on a terminal
  --debug            show stack traces on errors

Stop with Ctrl-C: the chain is flushed and checkpointed; continue with
\`rvwalk resume DIR\`.`,
  async run(args) {
    const { values, positionals } = parseOptions(args, {
      out: { type: "string" },
      steps: { type: "string" },
      walkers: { type: "string" },
      seed: { type: "string" },
      threads: { type: "string" },
      "until-converged": { type: "boolean" },
      "no-ui": { type: "boolean" },
    }, { min: 1, max: 1, names: "SPEC" });
    if (values.help) return say(this.help), 0;
    if (values.out === undefined) {
      throw new InputError("missing: expected --out DIR", { field: "--out" });
    }
    const problem = await loadProblem(positionals[0]!);
    for (const n of problem.notes) say(`note: ${n}`);
    for (const w of problem.warnings) warn(`warning: ${w}`);
    const s = problem.spec.sampler;
    const steps = intOption(values.steps, "steps", s.steps)!;
    const walkers = intOption(values.walkers, "walkers", s.walkers)!;
    const seed = intOption(values.seed, "seed", s.seed, 0)!;
    const threads = intOption(values.threads, "threads", s.threads ?? defaultThreads())!;
    const model = new CompiledModel({ spec: problem.spec, data: problem.data });
    for (const line of describeProblem(problem, model)) say(line);
    say(
      `sampling: ${walkers} walkers × ${steps} steps, seed ${seed}, ${threads} thread(s) → ${values.out}`,
    );
    const result = await startRun(values.out, problem, {
      steps,
      walkers,
      seed,
      threads,
      onProgress: progressPrinter(),
    });
    return reportEnd(values.out, result);
  },
};

export const resumeCommand: Command = {
  name: "resume",
  summary: "continue a stopped or finished run from its checkpoint",
  help: `Usage: rvwalk resume DIR [options]

Continues the run in DIR from its last checkpoint; the chain continues exactly
as if the run had never stopped (same numbers for the same seed).

Options:
  --steps N      total steps to reach (default: the run's target)
  --more N       take N steps beyond the checkpoint instead
  --threads T    worker threads (default: cores)
  --no-ui        plain progress lines even on a terminal`,
  async run(args) {
    const { values, positionals } = parseOptions(args, {
      steps: { type: "string" },
      more: { type: "string" },
      threads: { type: "string" },
      "no-ui": { type: "boolean" },
    }, { min: 1, max: 1, names: "DIR" });
    if (values.help) return say(this.help), 0;
    const dir = positionals[0]!;
    const result = await resumeRun(dir, {
      steps: intOption(values.steps, "steps", undefined),
      addSteps: intOption(values.more, "more", undefined),
      threads: intOption(values.threads, "threads", defaultThreads())!,
      onProgress: progressPrinter(),
    });
    for (const n of result.notes) say(`note: ${n}`);
    return reportEnd(dir, result);
  },
};

function reportEnd(dir: string, r: SessionResult): number {
  switch (r.state) {
    case "finished":
      say(`finished at step ${r.step}; summary: rvwalk summary ${dir}`);
      return 0;
    case "stopped":
      say(`stopped at step ${r.step}, chain and checkpoint saved; continue: rvwalk resume ${dir}`);
      return 0;
    case "failed":
      warn(
        `rvwalk: run failed at step ${r.step}: ${r.message}; the checkpoint in ${
          runPath(dir, "checkpoint")
        } is intact; after fixing the cause: rvwalk resume ${dir}`,
      );
      return 1;
  }
}
