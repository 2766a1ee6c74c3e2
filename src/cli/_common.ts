/**
 * Shared pieces of the command-line interface: option parsing, errors, output.
 * @module
 */
import { parseArgs, type ParseArgsConfig } from "node:util";
import { InputError } from "../errors.ts";

/** One CLI command. */
export interface Command {
  readonly name: string;
  /** One line for the command list. */
  readonly summary: string;
  /** Full `--help` text. */
  readonly help: string;
  run(args: string[]): Promise<number>;
}

type Options = NonNullable<ParseArgsConfig["options"]>;

/** Parsed option values typed from their declarations. */
export type OptionValues<O extends Options> =
  & { [K in keyof O]?: O[K]["type"] extends "boolean" ? boolean : string }
  & { help?: boolean; debug?: boolean };

/** Parse options; unknown options and bad values become {@link InputError}. */
export function parseOptions<O extends Options>(
  args: string[],
  options: O,
  positionals: { min: number; max: number; names: string },
): { values: OptionValues<O>; positionals: string[] } {
  let parsed: { values: Record<string, unknown>; positionals: string[] };
  try {
    parsed = parseArgs({
      args,
      options: { ...options, help: { type: "boolean", short: "h" }, debug: { type: "boolean" } },
      allowPositionals: true,
      strict: true,
    });
  } catch (err) {
    throw optionError(err as Error, Object.keys(options));
  }
  const n = parsed.positionals.length;
  if (!parsed.values.help && (n < positionals.min || n > positionals.max)) {
    throw new InputError(
      `found ${n} arguments: expected ${positionals.names}; see --help`,
      { field: "arguments" },
    );
  }
  return { values: parsed.values as OptionValues<O>, positionals: parsed.positionals };
}

/** Turn a `node:util` parseArgs error into one located line. */
function optionError(err: Error, names: string[]): InputError {
  const msg = String(err.message);
  const valid = [...names.map((n) => `--${n}`), "--help", "--debug"].join(", ");
  const unknown = /^Unknown option '([^']+)'/.exec(msg);
  if (unknown) {
    return new InputError(`found unknown option \`${unknown[1]}\`: expected one of ${valid}`, {
      field: unknown[1],
    });
  }
  const ambiguous = /^Option '([^' ]+)[^']*' argument is ambiguous/.exec(msg);
  if (ambiguous) {
    return new InputError(
      `found a value starting with "-": expected ${ambiguous[1]}=VALUE for such values, or a value`,
      { field: ambiguous[1] },
    );
  }
  const missing = /^Option '([^' ]+)[^']*' argument missing/.exec(msg);
  if (missing) {
    return new InputError("found no value: expected a value after the option", {
      field: missing[1],
    });
  }
  const boolValue = /^Option '([^' ]+)' does not take an argument/.exec(msg);
  if (boolValue) {
    return new InputError("found a value: expected the option alone (it is a switch)", {
      field: boolValue[1],
    });
  }
  return new InputError(`${msg.split("\n")[0]}; see --help`, { field: "options" });
}

/** A whole number option, or the default. */
export function intOption(
  v: string | undefined,
  name: string,
  dflt: number | undefined,
  min = 1,
): number | undefined {
  if (v === undefined) return dflt;
  if (!/^[+-]?\d+$/.test(v) || Number(v) < min) {
    throw new InputError(`found \`${v}\`: expected a whole number ≥ ${min}`, {
      field: `--${name}`,
    });
  }
  return Number(v);
}

/**
 * One line saying that a chain file ends early, or `undefined` when it was
 * read to a clean end. Printed by the commands that read chains.
 */
export function chainNotice(
  dir: string,
  read: { stop: "end" | "torn" | "corrupt"; stepsOnDisk: number; detail?: string },
): string | undefined {
  if (read.stop === "end") return undefined;
  const file = `${dir.replace(/\/+$/, "")}/chain.bin`;
  return read.stop === "torn"
    ? `note: ${file}: ends in an incomplete block (${read.detail}; a write cut short, or a run still writing): using the ${read.stepsOnDisk} complete steps before it`
    : `warning: ${file}: damaged after step ${read.stepsOnDisk} (${read.detail}): using the ${read.stepsOnDisk} valid steps before it; the rest is ignored`;
}

export { checkWalkers } from "../run/session.ts";

/** Durations are written as on the dashboard (`42s`, `3m 05s`, `1h 02m`, `2d 03h`). */
export { formatDuration } from "../../tui/format.ts";

/** Write a line to stdout. */
export function say(line = ""): void {
  console.log(line);
}

/** Write a line to stderr. */
export function warn(line: string): void {
  console.error(line);
}

/** Number of logical cores, for the default `--threads`. */
export function defaultThreads(): number {
  return Math.max(1, navigator.hardwareConcurrency || 1);
}
