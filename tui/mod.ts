/**
 * The live terminal dashboard. `runDashboard(load)` draws it until the user
 * presses `q`; `load` reads the run directory into a {@link RunSnapshot}.
 * The pure parts (view-model reducer, screen layout, statistics, text
 * helpers) are exported for tests and for other front ends.
 * @module
 */

import { render } from "ink";
import { createElement } from "react";
import { App } from "./App.tsx";
import type { RunSnapshot } from "./snapshot.ts";

export { App, type AppProps, MIN_INTERVAL_MS } from "./App.tsx";
export { Dashboard, type DashboardProps } from "./components/Dashboard.tsx";
export * from "./model.ts";
export * from "./screen.ts";
export * from "./stats.ts";
export * from "./format.ts";
export * from "./draw.ts";
export type * from "./snapshot.ts";

/** Options of {@link runDashboard}. */
export interface RunDashboardOptions {
  /** Time between reads of the run directory in ms. @default 1000 (minimum 500) */
  readonly intervalMs?: number;
  /** Whether to use colour. @default true unless the NO_COLOR environment variable is set and non-empty */
  readonly color?: boolean;
  /** Draw on the terminal's alternate screen and restore the terminal on leaving. @default true */
  readonly alternateScreen?: boolean;
  /** Output stream. @default process.stdout */
  readonly stdout?: NodeJS.WriteStream;
  /** Input stream. @default process.stdin */
  readonly stdin?: NodeJS.ReadStream;
}

/**
 * True when the NO_COLOR environment variable is set to a non-empty value
 * (convention at no-color.org); false when it is unset or unreadable.
 */
export function noColorRequested(): boolean {
  try {
    const deno = (globalThis as { Deno?: { env: { get(name: string): string | undefined } } }).Deno;
    const value = deno
      ? deno.env.get("NO_COLOR")
      : (globalThis as { process?: { env: Record<string, string | undefined> } }).process?.env
        .NO_COLOR;
    return value !== undefined && value !== "";
  } catch {
    return false;
  }
}

/**
 * Draw the dashboard in the terminal, re-reading the run directory with
 * `load` every `intervalMs`, and resolve when the user leaves with `q` (or
 * Ctrl-C). Leaving never touches the run: the dashboard only reads.
 */
export async function runDashboard(
  load: () => Promise<RunSnapshot>,
  options: RunDashboardOptions = {},
): Promise<"quit" | "interrupt"> {
  let reason: "quit" | "interrupt" = "quit";
  const color = options.color ?? !noColorRequested();
  const instance = render(
    createElement(App, {
      load,
      color,
      onExit: (r: "quit" | "interrupt") => {
        reason = r;
      },
      ...(options.intervalMs ? { intervalMs: options.intervalMs } : {}),
    }),
    {
      alternateScreen: options.alternateScreen ?? true,
      exitOnCtrlC: false,
      ...(options.stdout ? { stdout: options.stdout } : {}),
      ...(options.stdin ? { stdin: options.stdin } : {}),
    },
  );
  await instance.waitUntilExit();
  return reason;
}
