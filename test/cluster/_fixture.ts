/**
 * A small invented problem for the shard tests: the invented star
 * Kelvara-41 with one circular planet, 40 RVs from one invented
 * spectrograph, white noise of 3 m/s, from a fixed seed.
 */
import seedrandom from "seedrandom";

/** Planted orbit (invented). */
export const TRUTH = {
  period: 4.2,
  tc: 2460100.3,
  semiAmplitude: 25,
  offset: -12,
  sigma: 3,
} as const;

/** Absolute path of the repository's deno.json and CLI entry. */
export const CONFIG = new URL("../../deno.json", import.meta.url).pathname;
export const MAIN = new URL("../../src/cli/main.ts", import.meta.url).pathname;

/**
 * Write `data.csv` (40 points over 60 days) and `spec.toml` into `dir`
 * (optionally the data into a subfolder). Circular orbit:
 * v(t) = offset − K sin(2π (t − tc) / P), the Keplerian
 * v = K [cos(ν + ω) + e cos ω] with e = 0, ω = 90° and ν = 2π(t − tc)/P,
 * as the true anomaly at conjunction is ν = π/2 − ω (common practice, no
 * source). The shard tests compare two samplings of this same posterior, so
 * nothing below depends on the phase convention.
 */
export function writeProblem(
  dir: string,
  options: { dataDir?: string; seed?: number; steps?: number; flushSteps?: number } = {},
): string {
  const rng = seedrandom("kelvara-41");
  // Box–Muller transform (Box & Muller 1958, Ann. Math. Stat. 29, 610).
  const gauss = () => Math.sqrt(-2 * Math.log(1 - rng())) * Math.cos(2 * Math.PI * rng());
  const rows = [
    "# invented data: the star Kelvara-41 and spectrograph spec1 are fictitious",
    "time,rv,rv_err,instrument",
  ];
  const { period, tc, semiAmplitude, offset, sigma } = TRUTH;
  for (let i = 0; i < 40; i++) {
    const t = 2460100 + 60 * rng();
    const v = offset - semiAmplitude * Math.sin((2 * Math.PI * (t - tc)) / period) +
      sigma * gauss();
    rows.push(`${t.toFixed(5)},${v.toFixed(3)},${sigma},spec1`);
  }
  const dataRel = options.dataDir === undefined ? "data.csv" : `${options.dataDir}/data.csv`;
  if (options.dataDir !== undefined) {
    Deno.mkdirSync(`${dir}/${options.dataDir}`, { recursive: true });
  }
  Deno.writeTextFileSync(`${dir}/${dataRel}`, rows.join("\n") + "\n");
  const spec = `# invented: one circular planet around the fictitious star Kelvara-41
title = "Kelvara-41 (invented): one circular planet"

[star]
mass_msun = { normal = [0.8, 0.03] }

[data]
files = ["${dataRel}"]

[[instrument]]
name = "spec1"
offset = { uniform = [-100, 100], start = -10 }
jitter = { loguniform = [0.01, 30], start = 2 }

[[planet]]
name = "b"
period = { uniform = [4.0, 4.4], start = 4.2 }
tc = { uniform = [2460099.5, 2460101.5], start = 2460100.3 }
semi_amplitude = { uniform = [1, 100], start = 25 }

[sampler]
walkers = 16
steps = ${options.steps ?? 2000}
seed = ${options.seed ?? 11}
flush_steps = ${options.flushSteps ?? 100}
`;
  const path = `${dir}/spec.toml`;
  Deno.writeTextFileSync(path, spec);
  return path;
}

/** Run a program; returns exit code and output. */
export async function sh(
  cmd: string,
  args: readonly string[],
  options: { env?: Record<string, string>; cwd?: string } = {},
): Promise<{ code: number; stdout: string; stderr: string }> {
  const out = await new Deno.Command(cmd, {
    args: [...args],
    env: options.env,
    cwd: options.cwd,
    stdin: "null",
  }).output();
  const dec = new TextDecoder();
  return { code: out.code, stdout: dec.decode(out.stdout), stderr: dec.decode(out.stderr) };
}
