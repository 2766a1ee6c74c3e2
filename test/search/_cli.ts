/**
 * Helpers for the search CLI tests: capture what a command prints in-process,
 * run the real CLI as a child process, and the invented three-planet example.
 * @module
 */

/** Folder of the invented three-planet example (examples/three_planets/). */
export const THREE_PLANETS = new URL("../../examples/three_planets/", import.meta.url).pathname;

/** The planted values of examples/three_planets/truth.json. */
export interface Truth {
  readonly planets: readonly {
    readonly name: string;
    readonly period: number;
    readonly tc: number;
    readonly semi_amplitude: number;
    readonly eccentricity: number;
    readonly omega_deg: number;
  }[];
  readonly trend: { readonly slope: number; readonly reference_time: number };
  readonly instruments: readonly {
    readonly name: string;
    readonly offset: number;
    readonly jitter: number;
  }[];
}

export async function readTruth(): Promise<Truth> {
  return JSON.parse(await Deno.readTextFile(`${THREE_PLANETS}truth.json`)) as Truth;
}

/** Runs `fn` with console.log and console.error captured; returns its value and the lines. */
export async function capture<T>(
  fn: () => Promise<T>,
): Promise<{ value: T; stdout: string[]; stderr: string[] }> {
  const stdout: string[] = [], stderr: string[] = [];
  const log = console.log, error = console.error;
  console.log = (...a: unknown[]) => stdout.push(a.map(String).join(" "));
  console.error = (...a: unknown[]) => stderr.push(a.map(String).join(" "));
  try {
    const value = await fn();
    return { value, stdout, stderr };
  } finally {
    console.log = log;
    console.error = error;
  }
}

export { type CliResult, runCli } from "../_cli.ts";
