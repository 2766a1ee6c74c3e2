/**
 * `deno task bench`: every benchmark in turn. Each prints its figures and the
 * ratios to its reference; none asserts timings (machines are noisy).
 * @module
 */
const BENCHES = [
  "./kepler_bench.ts",
  "./sampler_bench.ts",
  "./diagnostics_bench.ts",
  "./store_bench.ts",
  "./watch_bench.ts",
];

const only = Deno.args[0];
for (const path of BENCHES) {
  if (only !== undefined && !path.includes(only)) continue;
  let mod: { bench?: () => Promise<void> };
  try {
    mod = await import(path);
  } catch (err) {
    if (err instanceof TypeError && /Module not found/.test(String(err))) continue;
    throw err;
  }
  console.log(`\n== ${path.replace("./", "").replace(".ts", "")} ==`);
  await mod.bench?.();
}
