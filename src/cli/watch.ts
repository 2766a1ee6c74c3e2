/** `rvwalk watch DIR`: the live dashboard on any run directory. @module */
import { RunWatcher } from "../run/snapshot.ts";
import { readManifest } from "../run/manifest.ts";
import { isShardDir } from "../run/shards.ts";
import { watchShardDirectory } from "./shards.ts";
import { type Command, formatDuration, intOption, parseOptions, say } from "./_common.ts";

export const watchCommand: Command = {
  name: "watch",
  summary: "live dashboard of a run (running, stopped, finished or merged)",
  help: `Usage: rvwalk watch DIR [--interval-ms MS]

Shows the run's progress, convergence per parameter, posteriors, a
two-parameter density, the log-posterior trace and per-planet derived
quantities. It only reads DIR: it can attach to a run started hours ago,
several can watch one run, and leaving (q) never touches the run.
Press ? inside for the keys. On a non-terminal, prints one plain status
report and exits.

Options:
  --interval-ms MS   refresh interval (default 1000, at least 500)`,
  async run(args) {
    const { values, positionals } = parseOptions(args, {
      "interval-ms": { type: "string" },
    }, { min: 1, max: 1, names: "DIR" });
    if (values.help) return say(this.help), 0;
    const dir = positionals[0]!;
    const interval = intOption(values["interval-ms"], "interval-ms", 1000, 500)!;
    if (await isShardDir(dir)) return await watchShardDirectory(dir, { intervalMs: interval });
    await readManifest(dir); // fail early, with a located message, on a non-run
    const watcher = new RunWatcher(dir);
    if (!Deno.stdout.isTerminal() || !Deno.stdin.isTerminal()) {
      const s = await watcher.load();
      say(
        `${dir}: ${s.state}, step ${s.step}/${s.totalSteps}, ${s.walkers} walkers` +
          (Number.isFinite(s.stepsPerSecond)
            ? `, ${s.stepsPerSecond.toFixed(0)} steps/s, ETA ${
              formatDuration((s.totalSteps - s.step) / s.stepsPerSecond)
            }`
            : ""),
      );
      const worst = Math.max(...s.diagnostics.map((d) => d.rhat).filter((x) => Number.isFinite(x)));
      say(
        `R-hat max ${Number.isFinite(worst) ? worst.toFixed(3) : "n/a"}; ${
          s.converged
            ? "criteria met (never a proof of convergence)"
            : "not converged by the criteria"
        }`,
      );
      return 0;
    }
    const { runDashboard } = await import("../../tui/mod.ts");
    await runDashboard(() => watcher.load(), { intervalMs: interval });
    return 0;
  },
};
