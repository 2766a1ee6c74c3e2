/** `rvwalk demo`: the whole job on built-in invented data. @module */
import { readChain } from "../run/chain_file.ts";
import { readManifest } from "../run/manifest.ts";
import { startRun } from "../run/session.ts";
import { convergenceStopper } from "../run/stopper.ts";
import { summarise } from "../report/summary.ts";
import { summaryText } from "../report/summary_text.ts";
import { loadProblem } from "../spec/mod.ts";
import { CompiledModel } from "../model/posterior.ts";
import { type Command, defaultThreads, intOption, parseOptions, say } from "./_common.ts";
import { describeProblem } from "./describe.ts";
import { progressPrinter } from "./progress.ts";

const DEMO_DIR = new URL("../../examples/demo/", import.meta.url);

export const demoCommand: Command = {
  name: "demo",
  summary: "fit the built-in invented two-planet data set end to end",
  help: `Usage: rvwalk demo [--out DIR] [--steps N] [--threads T]

Runs the whole job on built-in invented data: the fictitious star Tavi-2207,
observed by two invented spectrographs (120 RVs), with two planted planets
(one eccentric). Samples the posterior into a run directory (default
runs/demo-<time>) and prints the summary with the planted values beside it.
The spec and data used are in examples/demo/.`,
  async run(args) {
    const { values } = parseOptions(args, {
      out: { type: "string" },
      steps: { type: "string" },
      threads: { type: "string" },
    }, { min: 0, max: 0, names: "no arguments" });
    if (values.help) return say(this.help), 0;
    const stamp = new Date().toISOString().replace(/[-:]/g, "").replace("T", "-").slice(0, 15);
    const out = values.out ?? `runs/demo-${stamp}`;
    const problem = await loadProblem(new URL("spec.toml", DEMO_DIR).pathname);
    const s = problem.spec.sampler;
    const steps = intOption(values.steps, "steps", s.steps)!;
    const threads = intOption(values.threads, "threads", defaultThreads())!;
    const model = new CompiledModel({ spec: problem.spec, data: problem.data });
    say("rvwalk demo: invented star Tavi-2207, two invented spectrographs, two planted planets");
    for (const line of describeProblem(problem, model)) say(line);
    say(
      `sampling: ${s.walkers} walkers, up to ${steps} steps${
        s.untilConverged && values.steps === undefined ? " (stopping once converged)" : ""
      }, seed ${s.seed}, ${threads} thread(s) → ${out}`,
    );
    const t0 = performance.now();
    const r = await startRun(out, problem, {
      steps,
      walkers: s.walkers,
      seed: s.seed,
      thin: s.thin,
      threads,
      onProgress: progressPrinter(),
      shouldStop: s.untilConverged && values.steps === undefined
        ? convergenceStopper(out, {
          onCheck: (c) =>
            say(
              c.converged
                ? `step ${c.step}: convergence criteria met; stopping (a flag, never a proof)`
                : `step ${c.step}: not converged yet (${c.reasons[0] ?? "criteria not met"})`,
            ),
        })
        : undefined,
    });
    if (r.state !== "finished") {
      say(`demo ${r.state} at step ${r.step}${r.message ? `: ${r.message}` : ""}`);
      return r.state === "failed" ? 1 : 0;
    }
    say(`sampled in ${((performance.now() - t0) / 1000).toFixed(1)} s`);
    const m = await readManifest(out);
    const read = await readChain(out, { walkers: m.walkers, columns: m.columns.length });
    const summary = summarise(m, read.chain);
    const truth = await demoTruth();
    say("");
    for (const line of summaryText(summary, { dir: out, truth })) say(line);
    const keys = Object.keys(truth).filter((k) => summary.parameters[k] !== undefined);
    const inside = keys.filter((k) => {
      const iv = summary.parameters[k]!;
      return truth[k]! >= iv.lo95 && truth[k]! <= iv.hi95;
    });
    say("");
    say(`planted values inside the 95% intervals: ${inside.length} of ${keys.length}`);
    say(`next: rvwalk summary ${out} --json   |   rvwalk export ${out} --csv chain.csv`);
    return 0;
  },
};

/** Planted values keyed like summary parameters. */
export async function demoTruth(): Promise<Record<string, number>> {
  const t = JSON.parse(await Deno.readTextFile(new URL("truth.json", DEMO_DIR))) as {
    planets: { name: string; [k: string]: number | string }[];
    instruments: { name: string; offset: number; jitter: number }[];
  };
  const out: Record<string, number> = {};
  for (const p of t.planets) {
    for (const k of ["period", "tc", "semi_amplitude", "eccentricity", "omega_deg"]) {
      out[`${p.name}.${k}`] = p[k] as number;
    }
  }
  for (const i of t.instruments) {
    out[`${i.name}.offset`] = i.offset;
    out[`${i.name}.jitter`] = i.jitter;
  }
  return out;
}
