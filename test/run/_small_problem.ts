/**
 * A small invented one-planet problem written to a temporary folder, for
 * run-directory tests: 30 RVs of a fictitious star, one instrument.
 */
import seedrandom from "seedrandom";
import { type CliResult, runCli } from "../_cli.ts";

export const SMALL_SPEC = `
title = "small invented test problem"
[star]
mass_msun = { normal = [1.0, 0.05] }
[data]
files = ["data.csv"]
[[instrument]]
name = "inst"
offset = { uniform = [-50, 50], start = 0 }
jitter = { loguniform = [0.1, 20], start = 1 }
[[planet]]
name = "b"
period = { loguniform = [8, 12], start = 10.1 }
tc = { uniform = [2460006, 2460014], start = 2460010 }
semi_amplitude = { loguniform = [1, 100], start = 20 }
eccentricity = 0
omega_deg = 90
[sampler]
walkers = 16
steps = 400
seed = 11
flush_steps = 50
flush_seconds = 0.2
`;

/** Write spec.toml and data.csv into a new temporary folder; returns the spec path. */
export async function writeSmallProblem(options: { spec?: string } = {}): Promise<string> {
  const dir = await Deno.makeTempDir({ prefix: "rvwalk-test-" });
  const rng = seedrandom("small-problem");
  const rows = ["time,rv,rv_err,instrument"];
  for (let i = 0; i < 30; i++) {
    const t = 2460000 + 60 * rng();
    const v = 20 * Math.sin((2 * Math.PI * (t - 2460005)) / 10) + 2 * gauss(rng);
    rows.push(`${t.toFixed(4)},${v.toFixed(3)},2.0,inst`);
  }
  await Deno.writeTextFile(`${dir}/data.csv`, rows.join("\n") + "\n");
  await Deno.writeTextFile(`${dir}/spec.toml`, options.spec ?? SMALL_SPEC);
  return `${dir}/spec.toml`;
}

function gauss(rng: () => number): number {
  return Math.sqrt(-2 * Math.log(1 - rng())) * Math.cos(2 * Math.PI * rng());
}

export { MAIN } from "../_cli.ts";

/** Run the CLI in a child process; returns code and output. */
export function cli(args: string[]): Promise<CliResult> {
  return runCli(args);
}

/** Byte equality of two arrays' contents (fast; vitest's deep equality is slow on megabytes). */
export function sameBytes(a: ArrayBufferView, b: ArrayBufferView): boolean {
  if (a.byteLength !== b.byteLength) return false;
  const x = new Uint8Array(a.buffer, a.byteOffset, a.byteLength);
  const y = new Uint8Array(b.buffer, b.byteOffset, b.byteLength);
  for (let i = 0; i < x.length; i++) if (x[i] !== y[i]) return false;
  return true;
}
