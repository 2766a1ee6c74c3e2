/** `rvwalk summary DIR`. @module */
import { InputError } from "../errors.ts";
import { readChain } from "../run/chain_file.ts";
import { readManifest } from "../run/manifest.ts";
import { readStatus } from "../run/status.ts";
import { summarise } from "../report/summary.ts";
import { summaryText } from "../report/summary_text.ts";
import { formatSummary } from "../report/summary_formats.ts";
import { chainNotice, type Command, intOption, parseOptions, say, warn } from "./_common.ts";

export const summaryCommand: Command = {
  name: "summary",
  summary: "posterior medians, intervals, derived masses and convergence of a run",
  help: `Usage: rvwalk summary DIR [--format text|json|csv|md|latex] [--params KEYS] [--burn N]

Prints the median and 68% / 95% intervals of every sampled parameter and of
the derived quantities (m sin i in Jupiter and Earth masses, semi-major
axis a, the other reference epoch), with units, and the convergence
diagnostics (R-hat, bulk/tail ESS, autocorrelation time, acceptance).
Percentiles use the draws after burn-in; the burn-in is chosen automatically
unless --burn N is given. Works on running, stopped, finished and merged runs.

Values are rounded by their uncertainty: two significant digits on the
smaller error, the value to the same decimal place.

Options:
  --format F     text (default), json, csv, md or latex
  --json         same as --format json
  --params KEYS  comma-separated keys or globs (b.*, *.jitter) to show
  --burn N       steps to discard from every walker`,
  async run(args) {
    const { values, positionals } = parseOptions(args, {
      json: { type: "boolean" },
      format: { type: "string" },
      params: { type: "string" },
      burn: { type: "string" },
    }, { min: 1, max: 1, names: "DIR" });
    if (values.help) return say(this.help), 0;
    const dir = positionals[0]!;
    const format = values.json ? "json" : values.format ?? "text";
    if (!["text", "json", "csv", "md", "latex"].includes(format)) {
      throw new InputError(`found \`${format}\`: expected text, json, csv, md or latex`, {
        field: "--format",
      });
    }
    const m = await readManifest(dir);
    const read = await readChain(dir, { walkers: m.walkers, columns: m.columns.length });
    const notice = chainNotice(dir, read);
    if (notice !== undefined) warn(notice);
    if (read.chain.steps === 0) {
      warn(`rvwalk summary: ${dir}: no steps written yet`);
      return 1;
    }
    const burn = intOption(values.burn, "burn", undefined, 0);
    if (burn !== undefined && burn >= read.chain.steps) {
      throw new InputError(
        `found ${burn}: expected fewer burn-in steps than the ${read.chain.steps} on disk`,
        { field: "--burn" },
      );
    }
    const s = summarise(m, read.chain, { burn });
    const params = values.params?.split(",").map((x) => x.trim()).filter((x) => x.length > 0);
    if (format === "json") {
      say(
        JSON.stringify(s, (_k, v) => (typeof v === "number" && !Number.isFinite(v) ? null : v), 1),
      );
      return 0;
    }
    if (format !== "text") {
      say(formatSummary(s, format as "csv" | "md" | "latex", { params }).trimEnd());
      return 0;
    }
    const status = await readStatus(dir);
    if (status && status.state !== "finished") {
      say(`run state: ${status.state} at step ${status.step}/${status.targetSteps}`);
    }
    for (const line of summaryText(s, { dir, params })) say(line);
    return 0;
  },
};
