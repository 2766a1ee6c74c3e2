/** `rvwalk run` and `rvwalk resume`. @module */
import { InputError } from "../errors.ts";
import { CompiledModel } from "../model/posterior.ts";
import { runPath } from "../run/layout.ts";
import { resumeRun, type SessionResult, startRun } from "../run/session.ts";
import { convergenceStopper } from "../run/stopper.ts";
import { loadProblem } from "../spec/mod.ts";
import { fillStartValues, startsGiven } from "../search/mod.ts";
import {
  checkWalkers,
  type Command,
  defaultThreads,
  intOption,
  parseOptions,
  say,
  warn,
} from "./_common.ts";
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
  --thin K           store every K-th step (default: [sampler] thin, 1)
  --threads T        worker threads evaluating the posterior (default: cores)
  --until-converged  stop early once the convergence criteria hold
  --detach           keep sampling in the background after you log out;
                     prints how to watch and stop it (output in DIR/log.txt)
  --no-ui            plain progress lines even on a terminal
  --debug            show stack traces on errors

On a terminal the live dashboard is shown: q leaves it while the run goes on
in the background, Ctrl-C stops the run. Stopping (Ctrl-C, or kill -INT/-TERM
PID) flushes the chain and checkpoints; continue with \`rvwalk resume DIR\`.`,
  async run(args) {
    const { values, positionals } = parseOptions(args, {
      out: { type: "string" },
      steps: { type: "string" },
      walkers: { type: "string" },
      seed: { type: "string" },
      thin: { type: "string" },
      threads: { type: "string" },
      "until-converged": { type: "boolean" },
      detach: { type: "boolean" },
      "no-ui": { type: "boolean" },
    }, { min: 1, max: 1, names: "SPEC" });
    if (values.help) return say(this.help), 0;
    if (values.out === undefined) {
      throw new InputError("missing: expected --out DIR", { field: "--out" });
    }
    const loaded = await loadProblem(positionals[0]!);
    for (const n of loaded.notes) say(`note: ${n}`);
    for (const w of loaded.warnings) warn(`warning: ${w}`);
    const interactive = !values["no-ui"] && Deno.stdout.isTerminal() && Deno.stdin.isTerminal();
    const inBackground = values.detach || interactive;
    // Free parameters without a start value: periodogram search + MAP fit first.
    // A background run does this once, in the child that samples.
    let problem = loaded;
    const { missing } = startsGiven(loaded);
    if (missing.length > 0 && inBackground) {
      say(`start values missing for ${missing.join(", ")}: the run searches and optimises first`);
    } else if (missing.length > 0) {
      const filled = fillStartValues(loaded);
      say(`start values missing for ${filled.filled.join(", ")}: searching and optimising`);
      for (const line of filled.report) say(`  ${line}`);
      problem = filled.problem;
    }
    const s = problem.spec.sampler;
    const steps = intOption(values.steps, "steps", s.steps)!;
    const walkers = intOption(values.walkers, "walkers", s.walkers)!;
    const seed = intOption(values.seed, "seed", s.seed, 0)!;
    const threads = intOption(values.threads, "threads", s.threads ?? defaultThreads())!;
    const model = new CompiledModel({ spec: problem.spec, data: problem.data });
    checkWalkers(
      walkers,
      model.dimensions,
      values.walkers === undefined
        ? { file: positionals[0]!, field: "sampler.walkers" }
        : { field: "--walkers" },
    );
    for (const line of describeProblem(problem, model)) say(line);
    say(
      `sampling: ${walkers} walkers × ${steps} steps, seed ${seed}, ${threads} thread(s) → ${values.out}`,
    );
    const untilConverged = values["until-converged"] ?? s.untilConverged;
    const thin = intOption(values.thin, "thin", s.thin)!;
    if (inBackground) {
      const childArgs = [
        "run",
        positionals[0]!,
        "--out",
        values.out,
        "--no-ui",
        "--steps",
        String(steps),
        "--walkers",
        String(walkers),
        "--seed",
        String(seed),
        "--thin",
        String(thin),
        "--threads",
        String(threads),
      ];
      if (untilConverged) childArgs.push("--until-converged");
      return await background(values.out, childArgs, { detached: !!values.detach });
    }
    const result = await startRun(values.out, problem, {
      steps,
      walkers,
      seed,
      thin,
      threads,
      onProgress: progressPrinter(),
      shouldStop: untilConverged ? stopper(values.out) : undefined,
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
  --steps N          total steps to reach (default: the run's target)
  --more N           take N steps beyond the checkpoint instead
  --threads T        worker threads (default: cores)
  --until-converged  stop early once the convergence criteria hold
  --take-lock        take over a lock left by a process on another host
                     (only when you know it is gone, e.g. a lost cluster node)
  --no-ui            plain progress lines even on a terminal`,
  async run(args) {
    const { values, positionals } = parseOptions(args, {
      steps: { type: "string" },
      more: { type: "string" },
      threads: { type: "string" },
      "until-converged": { type: "boolean" },
      "take-lock": { type: "boolean" },
      "no-ui": { type: "boolean" },
    }, { min: 1, max: 1, names: "DIR" });
    if (values.help) return say(this.help), 0;
    const dir = positionals[0]!;
    const interactive = !values["no-ui"] && Deno.stdout.isTerminal() && Deno.stdin.isTerminal();
    if (interactive) {
      const childArgs = ["resume", dir, "--no-ui"];
      for (const k of ["steps", "more", "threads"] as const) {
        if (values[k] !== undefined) childArgs.push(`--${k}`, values[k]!);
      }
      if (values["until-converged"]) childArgs.push("--until-converged");
      if (values["take-lock"]) childArgs.push("--take-lock");
      return await background(dir, childArgs, { detached: false });
    }
    const result = await resumeRun(dir, {
      steps: intOption(values.steps, "steps", undefined),
      addSteps: intOption(values.more, "more", undefined),
      threads: intOption(values.threads, "threads", defaultThreads())!,
      onProgress: progressPrinter(),
      onNote: (n) => say(`note: ${n}`),
      takeLock: values["take-lock"],
      shouldStop: values["until-converged"] ? stopper(dir) : undefined,
    });
    return reportEnd(dir, result);
  },
};

function stopper(dir: string): (step: number) => Promise<boolean> {
  return convergenceStopper(dir, {
    onCheck: (c) =>
      say(
        c.converged
          ? `step ${c.step}: convergence criteria met; stopping (a flag, never a proof of convergence)`
          : `step ${c.step}: not converged yet (${c.reasons[0] ?? "criteria not met"}${
            c.reasons.length > 1 ? `, +${c.reasons.length - 1} more` : ""
          })`,
      ),
  });
}

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

/**
 * Run the sampler as a child process writing to DIR/log.txt, always in a
 * session of its own, so a dropped SSH link or a closed terminal never stops
 * it. With `detached` we return at once; otherwise the dashboard is shown:
 * q leaves it with the run going on, Ctrl-C sends the run SIGINT, which
 * flushes, checkpoints and stops it cleanly.
 */
async function background(
  dir: string,
  childArgs: string[],
  options: { detached: boolean },
): Promise<number> {
  await Deno.mkdir(dir, { recursive: true });
  const main = new URL("./main.ts", import.meta.url).pathname;
  // The child writes straight to DIR/log.txt, so it never depends on our pipes.
  const child = new Deno.Command("/bin/sh", {
    args: [
      "-c",
      'log="$1"; shift; exec "$@" >>"$log" 2>&1',
      "sh",
      runPath(dir, "log"),
      Deno.execPath(),
      "run",
      "-A",
      main,
      ...childArgs,
    ],
    stdin: "null",
    stdout: "null",
    stderr: "null",
    detached: true,
  }).spawn();
  if (options.detached) {
    child.unref();
    say(`running in the background as process ${child.pid}; output in ${runPath(dir, "log")}`);
    say(`watch:  deno task rvwalk watch ${dir}`);
    say(
      `stop:   kill -INT ${child.pid}   (flushes and checkpoints; then: deno task rvwalk resume ${dir})`,
    );
    return 0;
  }
  const { RunWatcher } = await import("../run/snapshot.ts");
  const { runDashboard } = await import("../../tui/mod.ts");
  const watcher = new RunWatcher(dir);
  // Wait for the manifest before drawing.
  for (let i = 0; i < 100; i++) {
    try {
      await Deno.stat(runPath(dir, "manifest"));
      break;
    } catch {
      await new Promise((r) => setTimeout(r, 100));
    }
  }
  let exited = false;
  const status = child.status.then((s) => {
    exited = true;
    return s;
  });
  const reason = await runDashboard(() => watcher.load());
  if (!exited && reason === "interrupt") {
    // Ctrl-C: stop the run cleanly (it flushes and checkpoints on SIGINT).
    say(`stopping the run (process ${child.pid}): flushing and checkpointing…`);
    child.kill("SIGINT");
    const s = await status;
    say(`stopped (exit ${s.code}); continue: deno task rvwalk resume ${dir}`);
    return s.code === 0 ? 0 : 1;
  }
  if (!exited) {
    say(`the run goes on in process ${child.pid}; output in ${runPath(dir, "log")}`);
    say(`watch again: deno task rvwalk watch ${dir}   stop: kill -INT ${child.pid}`);
    child.unref();
    Deno.exit(0);
  }
  const s = await status;
  say(`run process ended with code ${s.code}; see ${runPath(dir, "log")}`);
  return s.code === 0 ? 0 : 1;
}
