/** `rvwalk summary DIR`. @module */
import { readChain } from "../run/chain_file.ts";
import { readManifest } from "../run/manifest.ts";
import { readStatus } from "../run/status.ts";
import { summarise } from "../report/summary.ts";
import { summaryText } from "../report/summary_text.ts";
import { type Command, intOption, parseOptions, say, warn } from "./_common.ts";

export const summaryCommand: Command = {
  name: "summary",
  summary: "posterior medians, intervals, derived masses and convergence of a run",
  help: `Usage: rvwalk summary DIR [--json] [--burn N]

Prints the median and 68% / 95% intervals of every sampled parameter and of
the derived quantities (m sin i in Jupiter and Earth masses, semi-major
axis a, the other reference epoch), with units, and the convergence
diagnostics (R-hat, bulk/tail ESS, autocorrelation time, acceptance).
Percentiles use the draws after burn-in; the burn-in is chosen automatically
unless --burn N is given. Works on running, stopped, finished and merged runs.

Options:
  --json     machine-readable output
  --burn N   steps to discard from every walker`,
  async run(args) {
    const { values, positionals } = parseOptions(args, {
      json: { type: "boolean" },
      burn: { type: "string" },
    }, { min: 1, max: 1, names: "DIR" });
    if (values.help) return say(this.help), 0;
    const dir = positionals[0]!;
    const m = await readManifest(dir);
    const read = await readChain(dir, { walkers: m.walkers, columns: m.columns.length });
    if (read.stop === "corrupt") {
      warn(
        `warning: chain file damaged after step ${read.stepsOnDisk} (${read.detail}); summarising the valid part`,
      );
    }
    if (read.chain.steps === 0) {
      warn(`rvwalk summary: ${dir}: no steps written yet`);
      return 1;
    }
    const s = summarise(m, read.chain, { burn: intOption(values.burn, "burn", undefined, 0) });
    if (values.json) {
      say(
        JSON.stringify(s, (_k, v) => (typeof v === "number" && !Number.isFinite(v) ? null : v), 1),
      );
      return 0;
    }
    const status = await readStatus(dir);
    if (status && status.state !== "finished") {
      say(`run state: ${status.state} at step ${status.step}/${status.targetSteps}`);
    }
    for (const line of summaryText(s, { dir })) say(line);
    return 0;
  },
};
