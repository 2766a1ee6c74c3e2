/**
 * Helpers for the bad-input corpus: a small invented problem written to a
 * temporary folder, and the real CLI run as a child process.
 * @module
 */

export { type CliResult, runCli } from "../_cli.ts";

/** Lines of `text` without the final newline. */
export function lines(text: string): string[] {
  const t = text.replace(/\n$/, "");
  return t === "" ? [] : t.split("\n");
}

/**
 * The base problem: invented star "Quill-7", one invented instrument "specA",
 * 30 invented RVs of a 12.3-day sinusoid. Five free parameters, so walkers
 * must exceed 10.
 */
export const BASE_SPEC = `# Invented test star "Quill-7"; the data are invented.
title = "Quill-7 (invented)"
[star]
mass_msun = { normal = [1.0, 0.05] }
[data]
files = ["data.csv"]
[[instrument]]
name = "specA"
offset = { uniform = [-100, 100], start = 0 }
jitter = { loguniform = [0.01, 50], start = 1 }
[[planet]]
name = "b"
period = { uniform = [10, 15], start = 12.3 }
tc = { uniform = [2460000, 2460015], start = 2460005 }
semi_amplitude = { loguniform = [0.1, 100], start = 20 }
[sampler]
walkers = 16
steps = 60
seed = 3
flush_steps = 20
`;

/** Header plus 30 rows, time-sorted, specA only; row i is on line i + 2. */
export function baseRows(): string[] {
  const rows = ["time,rv,rv_err,instrument"];
  for (let i = 0; i < 30; i++) {
    const t = 2460000 + i * 3.1;
    // Invented: a sinusoid plus a deterministic wiggle standing in for noise.
    const v = 20 * Math.sin((2 * Math.PI * (t - 2460005)) / 12.3) + (((i * 37) % 11) - 5) * 0.4;
    rows.push(`${t.toFixed(4)},${v.toFixed(3)},1.5,specA`);
  }
  return rows;
}

/** Write spec.toml and data.csv (and any extra files) into a fresh folder under `root`. */
export async function writeCase(
  root: string,
  name: string,
  files: { spec?: string; data?: string | Uint8Array; extra?: Record<string, string> },
): Promise<string> {
  const dir = `${root}/${name}`;
  await Deno.mkdir(dir, { recursive: true });
  await Deno.writeTextFile(`${dir}/spec.toml`, files.spec ?? BASE_SPEC);
  const data = files.data ?? baseRows().join("\n") + "\n";
  if (typeof data === "string") await Deno.writeTextFile(`${dir}/data.csv`, data);
  else await Deno.writeFile(`${dir}/data.csv`, data);
  for (const [k, v] of Object.entries(files.extra ?? {})) {
    await Deno.writeTextFile(`${dir}/${k}`, v);
  }
  return dir;
}

/** Run `fn` over `items` with at most `limit` running at once (the machine has 2 cores). */
export async function pool<T, R>(
  items: readonly T[],
  limit: number,
  fn: (item: T) => Promise<R>,
): Promise<R[]> {
  const out: R[] = new Array(items.length);
  let next = 0;
  const worker = async () => {
    while (next < items.length) {
      const i = next++;
      out[i] = await fn(items[i]!);
    }
  };
  await Promise.all(Array.from({ length: Math.min(limit, items.length) }, worker));
  return out;
}
