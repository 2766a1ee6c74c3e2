/**
 * Benchmark: cost of one streaming diagnostics update (push a 100-step block,
 * then a full report with automatic burn-in) after 10^4, 10^5 and 10^6 steps
 * of 64 walkers x 15 parameters. The update should cost the same at every
 * run length: the reservoir holds between capacity/2 and capacity steps, so
 * the raw ratio may wander within a factor 2; the ratio per kept step
 * removes that. Both ratios to the 10^4 figure are printed.
 * Run: `deno run -A bench/diagnostics_bench.ts`.
 * @module
 */

import { type ChainView, StreamingDiagnostics } from "../src/diagnostics/mod.ts";

const WALKERS = 64;
const PARAMS = 15;
const FILL_BLOCK = 1000;
const UPDATE_BLOCK = 100;
const REPEATS = 5;

/** Deterministic AR(1)-like filler (xorshift32 + sum of uniforms), not statistics. */
function makeBlock(steps: number, seed: number): ChainView {
  let state = seed >>> 0 || 1;
  const uniform = (): number => {
    state ^= state << 13;
    state >>>= 0;
    state ^= state >>> 17;
    state ^= state << 5;
    state >>>= 0;
    return state / 4294967296;
  };
  const data = new Float64Array(steps * WALKERS * PARAMS);
  const last = new Float64Array(WALKERS * PARAMS);
  for (let s = 0; s < steps; s++) {
    for (let j = 0; j < WALKERS * PARAMS; j++) {
      const noise = uniform() + uniform() + uniform() - 1.5;
      last[j] = 0.9 * last[j]! + noise;
      data[s * WALKERS * PARAMS + j] = last[j]!;
    }
  }
  return { data, steps, walkers: WALKERS, columns: PARAMS };
}

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)]!;
}

/** Run the benchmark and print one line per run length plus the ratios. */
export async function bench(): Promise<void> {
  const fill = makeBlock(FILL_BLOCK, 12345);
  const update = makeBlock(UPDATE_BLOCK, 678);
  const columns = Array.from({ length: PARAMS }, (_, i) => i);
  const results: { steps: number; ms: number; pushMs: number; thin: number; kept: number }[] = [];
  for (const steps of [1e4, 1e5, 1e6]) {
    const stream = new StreamingDiagnostics(WALKERS, PARAMS);
    for (let s = 0; s < steps; s += FILL_BLOCK) stream.push(fill);
    const totals: number[] = [];
    const pushes: number[] = [];
    for (let r = 0; r < REPEATS; r++) {
      const t0 = performance.now();
      stream.push(update);
      const t1 = performance.now();
      stream.report({ columns });
      const t2 = performance.now();
      pushes.push(t1 - t0);
      totals.push(t2 - t0);
      await Promise.resolve();
    }
    results.push({
      steps,
      ms: median(totals),
      pushMs: median(pushes),
      thin: stream.thin,
      kept: stream.keptSteps,
    });
  }
  const base = results[0]!;
  console.log(
    `streaming update (push ${UPDATE_BLOCK} steps + report), ${WALKERS} walkers x ${PARAMS} params, median of ${REPEATS}`,
  );
  for (const r of results) {
    console.log(
      `  steps=${r.steps.toExponential(0)} thin=${r.thin} kept=${r.kept}: update ${
        r.ms.toFixed(1)
      } ms (push ${r.pushMs.toFixed(2)} ms), ratio to 1e4 ${
        (r.ms / base.ms).toFixed(2)
      }, per kept step ${((r.ms / r.kept) / (base.ms / base.kept)).toFixed(2)}`,
    );
  }
}

if (import.meta.main) {
  await bench();
}
