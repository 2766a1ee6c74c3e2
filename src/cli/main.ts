/**
 * rvwalk command line: `rvwalk <command> [options]`.
 * Exit codes: 0 ok, 1 run failure, 2 bad input or usage.
 * @module
 */
import { InputError } from "../errors.ts";
import type { Command } from "./_common.ts";
import { calibrateCommand } from "./calibrate.ts";
import { checkCommand } from "./check.ts";
import { demoCommand } from "./demo.ts";
import { exportCommand } from "./export.ts";
import { initCommand } from "./init.ts";
import { mergeCommand } from "./merge.ts";
import { periodogramCommand } from "./periodogram.ts";
import { plotCommand } from "./plot.ts";
import { shardsCommand } from "./shards.ts";
import { resumeCommand, runCommand } from "./run.ts";
import { summaryCommand } from "./summary.ts";
import { watchCommand } from "./watch.ts";

const COMMANDS: readonly Command[] = [
  demoCommand,
  periodogramCommand,
  initCommand,
  checkCommand,
  runCommand,
  resumeCommand,
  watchCommand,
  mergeCommand,
  shardsCommand,
  calibrateCommand,
  summaryCommand,
  exportCommand,
  plotCommand,
];

function usage(): string {
  const w = Math.max(...COMMANDS.map((c) => c.name.length));
  return [
    "rvwalk — posterior sampling of radial-velocity orbits",
    "",
    "Usage: rvwalk <command> [options]     (rvwalk <command> --help for details)",
    "",
    "Commands:",
    ...COMMANDS.map((c) => `  ${c.name.padEnd(w)}  ${c.summary}`),
    "",
    "Exit codes: 0 ok, 1 run failure, 2 bad input or usage.",
  ].join("\n");
}

/** Run the CLI; returns the exit code. */
export async function main(args: string[]): Promise<number> {
  const debug = args.includes("--debug");
  const [name, ...rest] = args;
  if (name === undefined || name === "--help" || name === "-h" || name === "help") {
    console.log(usage());
    return name === undefined ? 2 : 0;
  }
  const cmd = COMMANDS.find((c) => c.name === name);
  if (cmd === undefined) {
    console.error(
      `rvwalk: unknown command \`${name}\`: expected one of ${
        COMMANDS.map((c) => c.name).join(", ")
      }`,
    );
    return 2;
  }
  try {
    return await cmd.run(rest);
  } catch (err) {
    if (err instanceof InputError) {
      console.error(`rvwalk ${name}: ${err.message}`);
      if (debug) console.error(err.stack);
      return 2;
    }
    console.error(`rvwalk ${name}: failed: ${(err as Error)?.message ?? String(err)}`);
    if (debug) console.error((err as Error)?.stack);
    else console.error("(run again with --debug for details)");
    return 1;
  }
}

if (import.meta.main) {
  const code = await main(Deno.args);
  Deno.exit(code);
}
