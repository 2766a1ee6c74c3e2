/** `rvwalk merge`. @module */
import { InputError } from "../errors.ts";
import { mergeRuns } from "../run/merge.ts";
import { isShardDir } from "../run/shards.ts";
import { mergeShardDirectory } from "./shards.ts";
import { type Command, parseOptions, say } from "./_common.ts";

export const mergeCommand: Command = {
  name: "merge",
  summary: "pool runs of the same model and data into one run directory",
  help: `Usage: rvwalk merge DIR... --out DIR
       rvwalk merge SHARD_DIR --out DIR

Pools the chains of several runs (other sessions, other machines) into a new
run directory. Refuses runs of a different model or data, naming the
difference (exit 2). Each source run's walkers stay separate chains, so
R-hat compares the runs. Steps are cut to the shortest run. \`summary\`,
\`export\` and \`watch\` work on the result. Given a shard directory (from
\`rvwalk shards\`), pools its finished shards and lists the others with the
command that resubmits them.`,
  async run(args) {
    const { values, positionals } = parseOptions(args, { out: { type: "string" } }, {
      min: 1,
      max: 10000,
      names: "one or more run directories",
    });
    if (values.help) return say(this.help), 0;
    if (values.out === undefined) {
      throw new InputError("missing: expected --out DIR", { field: "--out" });
    }
    if (positionals.length === 1 && await isShardDir(positionals[0]!)) {
      return await mergeShardDirectory(positionals[0]!, values.out);
    }
    const r = await mergeRuns(positionals, values.out);
    for (const n of r.notes) say(`note: ${n}`);
    say(`merged ${r.sources.length} runs: ${r.walkers} walkers × ${r.steps} steps → ${values.out}`);
    say(`summary: rvwalk summary ${values.out}`);
    return 0;
  },
};
