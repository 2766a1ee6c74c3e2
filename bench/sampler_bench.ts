/**
 * Sampler throughput: steps/s of the ensemble on the (N = 500 RVs, 3 planets,
 * 2 instruments, 64 walkers) model with 1 and 2 threads, the parallel
 * efficiency, and the same figure for a vectorised NumPy implementation of the
 * same sampler and model (bench/numpy_ref.py, run where python3 with numpy
 * exists), measured in the same run on the same invented data.
 *
 * Run alone: `deno run -A bench/sampler_bench.ts`.
 * @module
 */
import { createEvaluator, initEnsemble, step } from "../samplers/mod.ts";
import { parseRvCsv } from "../src/data/mod.ts";
import { CompiledModel } from "../src/model/posterior.ts";
import { addKeplerianRv, timePeriastronFromConjunction } from "../src/model/keplerian.ts";
import { parseSpecText, resolveProblem } from "../src/spec/mod.ts";

const SECONDS = 4;
const WALKERS = 64;
const PLANETS = [
  { period: 4.31, tc: 2460003.1, k: 35, e: 0.05, w: 40 },
  { period: 37.2, tc: 2460021.5, k: 18, e: 0.3, w: 110 },
  { period: 410, tc: 2460250, k: 25, e: 0.45, w: -60 },
];

/** Invented data: 500 RVs over 1500 d from two instruments. */
function makeProblem() {
  let seed = 12345;
  const rand = () => ((seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648);
  const n = 500;
  const time = Float64Array.from({ length: n }, () => 2460000 + 1500 * rand()).sort();
  const model = new Float64Array(n);
  for (const p of PLANETS) {
    const w = (p.w * Math.PI) / 180;
    addKeplerianRv(time, {
      period: p.period,
      timePeriastron: timePeriastronFromConjunction(p.tc, {
        period: p.period,
        eccentricity: p.e,
        argPeriastron: w,
      }),
      semiAmplitude: p.k,
      eccentricity: p.e,
      argPeriastron: w,
    }, { out: model });
  }
  const rows = ["time,rv,rv_err,instrument"];
  for (let i = 0; i < n; i++) {
    const g = Math.sqrt(-2 * Math.log(1 - rand())) * Math.cos(2 * Math.PI * rand());
    rows.push(
      `${time[i]!.toFixed(5)},${(model[i]! + 3 * g + (i % 2 ? 10 : -5)).toFixed(3)},2.5,${
        i % 2 ? "B" : "A"
      }`,
    );
  }
  const planets = PLANETS.map((p, i) => `
[[planet]]
name = "p${i}"
period = { loguniform = [${p.period * 0.9}, ${p.period * 1.1}], start = ${p.period} }
tc = { uniform = [${p.tc - p.period / 2}, ${p.tc + p.period / 2}], start = ${p.tc} }
semi_amplitude = { loguniform = [0.1, 200], start = ${p.k} }
eccentricity = { uniform = [0, 0.95], start = ${p.e} }
omega_deg = { uniform = [-180, 180], start = ${p.w} }`).join("\n");
  const spec = `[star]
mass_msun = { normal = [1, 0.05] }
[data]
files = ["bench.csv"]
[[instrument]]
name = "A"
offset = { uniform = [-100, 100], start = -5 }
jitter = { loguniform = [0.01, 50], start = 2 }
[[instrument]]
name = "B"
offset = { uniform = [-100, 100], start = 10 }
jitter = { loguniform = [0.01, 50], start = 2 }
${planets}`;
  const csv = rows.join("\n") + "\n";
  const problem = resolveProblem(
    parseSpecText(spec, { file: "bench.toml", dir: "/" }),
    parseRvCsv(csv, { file: "bench.csv" }),
  );
  return { problem, csv };
}

async function tsStepsPerSecond(
  threads: number,
  payload: ConstructorParameters<typeof CompiledModel>[0],
): Promise<number> {
  const model = new CompiledModel(payload);
  const evaluator = await createEvaluator(
    {
      moduleUrl: new URL("../src/model/posterior.ts", import.meta.url).href,
      exportName: "createLogPosterior",
      payload,
    },
    { threads, dimensions: model.dimensions },
  );
  let state = await initEnsemble(model.startInternal(), {
    walkers: WALKERS,
    seed: 3,
    scale: model.ballScales(),
    evaluator,
  });
  const moves = [{ kind: "stretch" as const, weight: 1, scale: 2 }];
  for (let i = 0; i < 50; i++) state = (await step(state, { evaluator, moves })).state; // warm-up
  const t0 = performance.now();
  let steps = 0;
  while (performance.now() - t0 < SECONDS * 1000) {
    state = (await step(state, { evaluator, moves, out: state })).state;
    steps++;
  }
  const rate = (1000 * steps) / (performance.now() - t0);
  await evaluator.close();
  return rate;
}

async function numpyStepsPerSecond(csv: string, start: number[]): Promise<number | string> {
  const dir = await Deno.makeTempDir({ prefix: "rvwalk-bench-" });
  try {
    await Deno.writeTextFile(`${dir}/bench.csv`, csv);
    const out = await new Deno.Command("python3", {
      args: [
        new URL("./numpy_ref.py", import.meta.url).pathname,
        `${dir}/bench.csv`,
        "3",
        String(WALKERS),
        String(SECONDS),
        JSON.stringify(start),
      ],
      stdout: "piped",
      stderr: "piped",
    }).output();
    const text = new TextDecoder().decode(out.stdout);
    const m = /steps_per_second=([\d.]+)/.exec(text);
    if (!out.success || !m) {
      return `skipped (python3 with numpy not available: ${
        new TextDecoder().decode(out.stderr).split("\n").filter(Boolean).pop() ?? "failed"
      })`;
    }
    return Number(m[1]);
  } catch {
    return "skipped (python3 not found)";
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
}

export async function bench(): Promise<void> {
  const { problem, csv } = makeProblem();
  const payload = { spec: problem.spec, data: problem.data };
  const model = new CompiledModel(payload);
  console.log(
    `model: N=${problem.data.count} RVs, 3 planets, 2 instruments, ${model.dimensions} parameters, ${WALKERS} walkers, stretch move, ${SECONDS} s per figure`,
  );
  const one = await tsStepsPerSecond(1, payload);
  const two = await tsStepsPerSecond(2, payload);
  // NumPy reference starts at the same point in the same internal space, in its parameter order
  // (planets: ln P, tc, ln K, √e cos ω, √e sin ω; then per instrument: offset, ln jitter).
  const start = Array.from(model.startInternal());
  const np = await numpyStepsPerSecond(csv, start);
  console.log(`TypeScript, 1 thread : ${one.toFixed(1)} steps/s`);
  console.log(
    `TypeScript, 2 threads: ${two.toFixed(1)} steps/s   parallel efficiency ${
      (two / (2 * one)).toFixed(2)
    } (target ≥ 0.85)`,
  );
  if (typeof np === "number") {
    console.log(`NumPy (vectorised)   : ${np.toFixed(1)} steps/s`);
    console.log(
      `ratio TS 2 threads / NumPy: ${
        (two / np).toFixed(2)
      }×   (target ≥ 3×); TS 1 thread / NumPy: ${(one / np).toFixed(2)}×`,
    );
  } else {
    console.log(`NumPy: ${np}`);
  }
  console.log(
    `cores seen: ${navigator.hardwareConcurrency}; load average now: ${
      (await Deno.readTextFile("/proc/loadavg").catch(() => "?")).split(" ").slice(0, 3).join(" ")
    } (figures are only comparable on a quiet machine)`,
  );
}

if (import.meta.main) await bench();
