import { describe, expect, test } from "vitest";
import {
  createEvaluator,
  deserializeState,
  type EnsembleState,
  type Evaluator,
  initEnsemble,
  type LogDensitySource,
  type MoveMix,
  type SerializedEnsembleState,
  serializeState,
  step,
} from "../../samplers/mod.ts";
import { choleskyLower, correlatedGaussianCase, targetSource } from "./_targets.ts";

const mix: MoveMix = [{ kind: "stretch", weight: 1, scale: 2 }, { kind: "de", weight: 0.5 }];

async function withEvaluator<T>(
  source: LogDensitySource,
  threads: number,
  dimensions: number,
  body: (evaluator: Evaluator) => Promise<T>,
): Promise<T> {
  const evaluator = await createEvaluator(source, { threads, dimensions });
  try {
    return await body(evaluator);
  } finally {
    await evaluator.close();
  }
}

/** Serialized state after each of `steps` steps. */
async function trace(
  state: EnsembleState,
  evaluator: Evaluator,
  steps: number,
  moves: MoveMix,
): Promise<string[]> {
  const out: string[] = [];
  for (let s = 0; s < steps; s++) {
    ({ state } = await step(state, { evaluator, moves }));
    out.push(JSON.stringify(serializeState(state)));
  }
  return out;
}

describe("initEnsemble()", () => {
  test("initEnsemble() rejects walkers <= 2 * dimensions", async () => {
    await withEvaluator(targetSource("halfSpace", { dimensions: 4 }), 1, 4, async (evaluator) => {
      const options = { seed: 1, scale: new Float64Array(4).fill(0.1), evaluator };
      await expect(initEnsemble(new Float64Array(4), { ...options, walkers: 8 })).rejects.toThrow(
        new RangeError(
          "Cannot start sampler as walkers must exceed twice the dimensions: walkers=8, dimensions=4",
        ),
      );
      await expect(initEnsemble(new Float64Array(4), { ...options, walkers: 2 })).rejects.toThrow(
        RangeError,
      );
      await expect(initEnsemble(new Float64Array(4), { ...options, walkers: 11 })).rejects.toThrow(
        /walkers must be even for the red\/blue split: walkers=11/,
      );
      await expect(initEnsemble(new Float64Array(3), { ...options, walkers: 10 })).rejects.toThrow(
        /wrong length/,
      );
    });
  });

  test("initEnsemble() redraws walkers whose log-probability is -Infinity", async () => {
    // halfSpace is −∞ for θ0 < 0; the ball is centred on θ0 = 0, so about half the first draws fail.
    const dims = 3;
    await withEvaluator(
      targetSource("halfSpace", { dimensions: dims }),
      1,
      dims,
      async (evaluator) => {
        const walkers = 40;
        const state = await initEnsemble(new Float64Array(dims), {
          walkers,
          seed: "half",
          scale: new Float64Array(dims).fill(1),
          evaluator,
        });
        const recomputed = new Float64Array(walkers);
        await evaluator.evaluate(state.positions, walkers, recomputed);
        for (let w = 0; w < walkers; w++) {
          expect(state.positions[w * dims]).toBeGreaterThanOrEqual(0);
          expect(state.logProb[w]).toBe(recomputed[w]);
        }
        expect(state.step).toBe(0);
        expect(Array.from(state.accepted)).toEqual(new Array(walkers).fill(0));
      },
    );
  });

  test("initEnsemble() throws a RangeError after maxTries draws without a finite log-probability", async () => {
    await withEvaluator(targetSource("nowhere", null), 1, 2, async (evaluator) => {
      await expect(
        initEnsemble(new Float64Array(2), {
          walkers: 6,
          seed: 1,
          scale: new Float64Array(2).fill(1),
          evaluator,
          maxTries: 5,
        }),
      ).rejects.toThrow(
        new RangeError(
          "Cannot start sampler as some walkers found no finite log-probability: walkersWithout=6, maxTries=5",
        ),
      );
    });
  });

  test("initEnsemble() draws the ball with the given per-dimension scale", async () => {
    // Start + scale_d · N(0, 1): the sample sd of n walkers has sd ≈ scale/√(2n) (normal theory,
    // textbook large-sample result); tolerance 4× that. Means within 4·scale/√n.
    const dims = 2;
    const walkers = 4000;
    const scale = Float64Array.from([0.01, 3]);
    const start = Float64Array.from([5, -2]);
    await withEvaluator(targetSource("sumOf", null), 1, dims, async (evaluator) => {
      const state = await initEnsemble(start, { walkers, seed: 3, scale, evaluator });
      for (let d = 0; d < dims; d++) {
        let sum = 0;
        for (let w = 0; w < walkers; w++) sum += state.positions[w * dims + d]!;
        const mean = sum / walkers;
        let ss = 0;
        for (let w = 0; w < walkers; w++) ss += (state.positions[w * dims + d]! - mean) ** 2;
        const sd = Math.sqrt(ss / (walkers - 1));
        expect(Math.abs(mean - start[d]!)).toBeLessThan((4 * scale[d]!) / Math.sqrt(walkers));
        expect(Math.abs(sd - scale[d]!)).toBeLessThan((4 * scale[d]!) / Math.sqrt(2 * walkers));
      }
    });
  });
});

describe("step()", () => {
  // 9 dimensions and 26 walkers: a DE half-step draws 13 × 9 normals, an odd number, so the
  // cached Box–Muller value is part of some saved states.
  const dims = 9;
  const gauss = correlatedGaussianCase(dims);
  const init = (evaluator: Evaluator, seed: number | string) =>
    initEnsemble(gauss.mean, {
      walkers: 26,
      seed,
      scale: new Float64Array(dims).fill(0.1),
      evaluator,
    });

  test("step() is a deterministic function of the state and leaves its input untouched", async () => {
    await withEvaluator(gauss.source, 1, dims, async (evaluator) => {
      const state = await init(evaluator, 11);
      const before = JSON.stringify(serializeState(state));
      const a = await step(state, { evaluator, moves: mix });
      const b = await step(state, { evaluator, moves: mix });
      expect(JSON.stringify(serializeState(state))).toBe(before);
      expect(JSON.stringify(serializeState(b.state))).toBe(JSON.stringify(serializeState(a.state)));
      expect(a.state.step).toBe(1);
      // In place (out = state) gives the same result as a fresh output state.
      const copy = deserializeState(JSON.parse(before));
      const inPlace = await step(copy, { evaluator, moves: mix, out: copy });
      expect(inPlace.state).toBe(copy);
      expect(JSON.stringify(serializeState(copy))).toBe(JSON.stringify(serializeState(a.state)));
      // Accepted counts match the per-step flags.
      expect(Array.from(a.state.accepted)).toEqual(Array.from(a.info.acceptedThisStep));
    });
  });

  test("step() gives a byte-identical chain with 1, 2 and 3 threads for the same seed", async () => {
    const traces: string[][] = [];
    for (const threads of [1, 2, 3]) {
      traces.push(
        await withEvaluator(gauss.source, threads, dims, async (evaluator) => {
          return await trace(await init(evaluator, "threads"), evaluator, 60, mix);
        }),
      );
    }
    expect(traces[1]).toEqual(traces[0]);
    expect(traces[2]).toEqual(traces[0]);
    // A different seed gives a different chain (the comparison above can fail).
    const other = await withEvaluator(gauss.source, 1, dims, async (evaluator) => {
      return await trace(await init(evaluator, "other"), evaluator, 1, mix);
    });
    expect(other[0]).not.toBe(traces[0]![0]);
  });

  test("step() resumed in a new process after N steps equals 2N steps straight, byte for byte", async () => {
    const n = 30;
    const straight = await withEvaluator(gauss.source, 1, dims, async (evaluator) => {
      return await trace(await init(evaluator, "resume"), evaluator, 2 * n, mix);
    });
    const half = await withEvaluator(gauss.source, 1, dims, async (evaluator) => {
      let state = await init(evaluator, "resume");
      for (let s = 0; s < n; s++) ({ state } = await step(state, { evaluator, moves: mix }));
      return serializeState(state);
    });
    const dir = await Deno.makeTempDir({ prefix: "rvwalk-resume-" });
    try {
      const input = `${dir}/input.json`;
      await Deno.writeTextFile(
        input,
        JSON.stringify({ state: half, source: gauss.source, moves: mix, threads: 2, steps: n }),
      );
      const root = new URL("../../", import.meta.url);
      const output = await new Deno.Command(Deno.execPath(), {
        args: [
          "run",
          "-A",
          "--config",
          new URL("deno.json", root).pathname,
          new URL("./_resume_child.ts", import.meta.url).pathname,
          input,
        ],
        cwd: root.pathname,
        stdout: "piped",
        stderr: "piped",
      }).output();
      expect(output.code, new TextDecoder().decode(output.stderr)).toBe(0);
      const resumed =
        (JSON.parse(new TextDecoder().decode(output.stdout)) as SerializedEnsembleState[]).map((
          s,
        ) => JSON.stringify(s));
      expect(half.rng.spare).not.toBeNull(); // the split point carries a cached normal
      expect(resumed).toHaveLength(n);
      expect(resumed).toEqual(straight.slice(n));
    } finally {
      await Deno.remove(dir, { recursive: true });
    }
  });

  test("step() is affine invariant: a linearly mapped ensemble makes the same decisions", async () => {
    // Goodman & Weare (2010), CAMCoS 5, 65: the stretch move commutes with affine maps
    // x → μ + L x (the property the paper is named after).
    // The same random stream on N(0, I) and on N(μ, L Lᵀ) started from mapped walkers must
    // accept and reject identically, and positions must stay mapped (to rounding).
    const d = 3;
    const cov = Float64Array.from([4, 1.2, -0.6, 1.2, 1, 0.3, -0.6, 0.3, 0.5]);
    const l = choleskyLower(cov, d);
    const mu = [1, -2, 30];
    const identity = [1, 0, 0, 0, 1, 0, 0, 0, 1];
    const iso = targetSource("gaussian", { mean: [0, 0, 0], cholesky: identity });
    const corr = targetSource("gaussian", { mean: mu, cholesky: Array.from(l) });
    const map = (x: Float64Array, walkers: number) => {
      const y = new Float64Array(x.length);
      for (let w = 0; w < walkers; w++) {
        for (let i = 0; i < d; i++) {
          let s = mu[i]!;
          for (let k = 0; k <= i; k++) s += l[i * d + k]! * x[w * d + k]!;
          y[w * d + i] = s;
        }
      }
      return y;
    };
    const isoEval = await createEvaluator(iso, { threads: 1, dimensions: d });
    const corrEval = await createEvaluator(corr, { threads: 1, dimensions: d });
    try {
      const walkers = 16;
      let a = await initEnsemble(new Float64Array(d), {
        walkers,
        seed: 5,
        scale: new Float64Array(d).fill(1),
        evaluator: isoEval,
      });
      const positions = map(a.positions, walkers);
      const logProb = new Float64Array(walkers);
      await corrEval.evaluate(positions, walkers, logProb);
      let b: EnsembleState = { ...a, positions, logProb, accepted: new Float64Array(walkers) };
      let differing = 0;
      for (let s = 0; s < 200; s++) {
        const ra = await step(a, { evaluator: isoEval });
        const rb = await step(b, { evaluator: corrEval });
        for (let w = 0; w < walkers; w++) {
          if (ra.info.acceptedThisStep[w] !== rb.info.acceptedThisStep[w]) differing++;
        }
        a = ra.state;
        b = rb.state;
      }
      expect(differing).toBe(0);
      const mapped = map(a.positions, walkers);
      for (let i = 0; i < mapped.length; i++) expect(b.positions[i]).toBeCloseTo(mapped[i]!, 8);
      expect(a.accepted.reduce((x, y) => x + y, 0)).toBeGreaterThan(0);
    } finally {
      await isoEval.close();
      await corrEval.close();
    }
  });
});

describe("serializeState()", () => {
  test("serializeState() round-trips through JSON bit for bit, including -0 and -Infinity", () => {
    const state: EnsembleState = {
      walkers: 6,
      dimensions: 2,
      positions: Float64Array.from([0.1, -0, 1e-310, -1.5e300, Math.PI, 2, 3, 4, 5, 6, 7, 8]),
      logProb: Float64Array.from([-Infinity, 0, -1, -2, -3, -4]),
      rng: { algorithm: "alea", c: 3, s0: 0.25, s1: 0.5, s2: 0.125, spare: -0.75 },
      step: 17,
      accepted: Float64Array.from([1, 2, 3, 4, 5, 6]),
    };
    const back = deserializeState(JSON.parse(JSON.stringify(serializeState(state))));
    expect(new Uint8Array(back.positions.buffer)).toEqual(new Uint8Array(state.positions.buffer));
    expect(new Uint8Array(back.logProb.buffer)).toEqual(new Uint8Array(state.logProb.buffer));
    expect(new Uint8Array(back.accepted.buffer)).toEqual(new Uint8Array(state.accepted.buffer));
    expect(back.rng).toEqual(state.rng);
    expect(back.step).toBe(17);
  });

  test("deserializeState() rejects malformed input", () => {
    const good = serializeState({
      walkers: 6,
      dimensions: 2,
      positions: new Float64Array(12),
      logProb: new Float64Array(6),
      rng: { algorithm: "alea", c: 1, s0: 0.5, s1: 0.5, s2: 0.5, spare: null },
      step: 0,
      accepted: new Float64Array(6),
    });
    expect(() => deserializeState(null)).toThrow(TypeError);
    expect(() => deserializeState({ ...good, format: "other" })).toThrow(TypeError);
    expect(() => deserializeState({ ...good, positions: good.logProb })).toThrow(
      /positions has the wrong size/,
    );
    expect(() => deserializeState({ ...good, step: -1 })).toThrow(TypeError);
    expect(() => deserializeState({ ...good, walkers: 4 })).toThrow(RangeError);
    expect(() => deserializeState({ ...good, rng: { ...good.rng, c: "1" } })).toThrow(TypeError);
  });
});
