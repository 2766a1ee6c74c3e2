import { describe, expect, test } from "vitest";
import { createEvaluator, createRng } from "../../samplers/mod.ts";
import { targetSource } from "./_targets.ts";

function randomPoints(count: number, dims: number, seed: number): Float64Array {
  const rng = createRng(seed);
  const points = new Float64Array(count * dims);
  for (let i = 0; i < points.length; i++) points[i] = rng.normal();
  return points;
}

describe("createEvaluator()", () => {
  test("createEvaluator() gives identical results for 1, 2 and 3 threads, equal to a direct computation", async () => {
    const dims = 5;
    const count = 101; // uneven chunks for 2 and 3 threads
    const points = randomPoints(count, dims, 1);
    // Independent computation of Σ_d sin((d + 1) θ_d) for each point.
    const expected = new Float64Array(count);
    for (let i = 0; i < count; i++) {
      for (let d = 0; d < dims; d++) {
        expected[i] = expected[i]! + Math.sin(points[i * dims + d]! * (d + 1));
      }
    }
    for (const threads of [1, 2, 3]) {
      const evaluator = await createEvaluator(targetSource("sumOf", null), {
        threads,
        dimensions: dims,
      });
      try {
        const out = new Float64Array(count);
        await evaluator.evaluate(points, count, out);
        expect(new Uint8Array(out.buffer)).toEqual(new Uint8Array(expected.buffer));
      } finally {
        await evaluator.close();
      }
    }
  });

  test("createEvaluator() gives the log-density exactly D entries per point", async () => {
    const evaluator = await createEvaluator(targetSource("lengthOf", null), {
      threads: 2,
      dimensions: 7,
    });
    try {
      const out = new Float64Array(9);
      await evaluator.evaluate(randomPoints(9, 7, 2), 9, out);
      expect(Array.from(out)).toEqual(new Array(9).fill(7));
    } finally {
      await evaluator.close();
    }
  });

  test("createEvaluator() evaluates batches larger than its capacity in rounds", async () => {
    const dims = 3;
    const count = 50;
    const points = randomPoints(count, dims, 3);
    const single = await createEvaluator(targetSource("sumOf", null), {
      threads: 1,
      dimensions: dims,
    });
    const pooled = await createEvaluator(targetSource("sumOf", null), {
      threads: 2,
      dimensions: dims,
      capacity: 7,
    });
    try {
      const a = new Float64Array(count);
      const b = new Float64Array(count);
      await single.evaluate(points, count, a);
      await pooled.evaluate(points, count, b);
      expect(new Uint8Array(b.buffer)).toEqual(new Uint8Array(a.buffer));
    } finally {
      await single.close();
      await pooled.close();
    }
  });

  test("evaluate() rejects when the log-density throws in a worker, and the evaluator keeps working", async () => {
    const evaluator = await createEvaluator(targetSource("throwsAbove", { threshold: 5 }), {
      threads: 2,
      dimensions: 1,
    });
    try {
      const out = new Float64Array(4);
      // Chunk of the worker (thread 2 of 2) is points 2 and 3; point 3 throws.
      await expect(evaluator.evaluate(Float64Array.from([0, 1, 2, 9]), 4, out)).rejects.toThrow(
        /theta0 too large: theta0=9/,
      );
      // Chunk of the calling thread throws.
      await expect(evaluator.evaluate(Float64Array.from([9, 1, 2, 3]), 4, out)).rejects.toThrow(
        RangeError,
      );
      await evaluator.evaluate(Float64Array.from([0, 1, 2, 3]), 4, out);
      expect(Array.from(out)).toEqual([-0, -0.5, -2, -4.5]); // −0.5 · 0 · 0 = −0
    } finally {
      await evaluator.close();
    }
  });

  test("createEvaluator() rejects a missing export, in the calling thread and in workers", async () => {
    await expect(createEvaluator(targetSource("noSuchExport", null), { threads: 1, dimensions: 2 }))
      .rejects.toThrow(TypeError);
    await expect(createEvaluator(targetSource("noSuchExport", null), { threads: 2, dimensions: 2 }))
      .rejects.toThrow(/export is not a function/);
    await expect(
      createEvaluator({ moduleUrl: "relative.ts", exportName: "x", payload: null }, {
        threads: 1,
        dimensions: 2,
      }),
    ).rejects.toThrow(TypeError);
  });

  test("createEvaluator() rejects non-positive threads, dimensions and short buffers", async () => {
    await expect(createEvaluator(targetSource("sumOf", null), { threads: 0, dimensions: 2 }))
      .rejects.toThrow(
        RangeError,
      );
    await expect(createEvaluator(targetSource("sumOf", null), { threads: 1, dimensions: 1.5 }))
      .rejects.toThrow(
        RangeError,
      );
    const evaluator = await createEvaluator(targetSource("sumOf", null), {
      threads: 2,
      dimensions: 2,
    });
    try {
      await expect(evaluator.evaluate(new Float64Array(3), 2, new Float64Array(2))).rejects.toThrow(
        RangeError,
      );
    } finally {
      await evaluator.close();
    }
    await expect(evaluator.evaluate(new Float64Array(4), 2, new Float64Array(2))).rejects.toThrow(
      /closed/,
    );
  });
});
