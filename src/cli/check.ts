/** `rvwalk check SPEC`. @module */
import { CompiledModel } from "../model/posterior.ts";
import { loadProblem } from "../spec/mod.ts";
import { checkWalkers, type Command, parseOptions, say, warn } from "./_common.ts";
import { describeProblem } from "./describe.ts";

export const checkCommand: Command = {
  name: "check",
  summary: "validate a spec and its data files, print the model",
  help: `Usage: rvwalk check SPEC.toml

Reads the spec and every data file it names, checks them, and prints the data,
instruments, planets and free parameters with their priors and start values,
then evaluates the log-posterior at the start point. Exit 0 when all is well,
2 with one line naming the file, line or key on bad input.`,
  async run(args) {
    const { values, positionals } = parseOptions(args, {}, { min: 1, max: 1, names: "SPEC" });
    if (values.help) return say(this.help), 0;
    const problem = await loadProblem(positionals[0]!);
    for (const n of problem.notes) say(`note: ${n}`);
    for (const w of problem.warnings) warn(`warning: ${w}`);
    const model = new CompiledModel({ spec: problem.spec, data: problem.data });
    checkWalkers(problem.spec.sampler.walkers, model.dimensions, {
      file: positionals[0]!,
      field: "sampler.walkers",
    });
    for (const line of describeProblem(problem, model)) say(line);
    const lp = model.logPosterior(model.startInternal());
    if (!Number.isFinite(lp)) {
      warn(`warning: the log-posterior at the start point is ${lp}; check start values and priors`);
      return 2;
    }
    say(`log-posterior at start: ${lp.toFixed(3)}`);
    say("ok");
    return 0;
  },
};
