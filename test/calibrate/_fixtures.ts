/**
 * The calibration fixtures (invented star Oru-88, 24 epochs over 53 days, one
 * invented spectrograph; see fixtures/generate.ts) loaded as problems.
 * @module
 */
import type { ModelPayload } from "../../src/model/posterior.ts";
import { loadProblem } from "../../src/spec/mod.ts";

/** Path of a fixture spec: `circular` or `eccentric`. */
export function fixtureSpec(name: "circular" | "eccentric"): string {
  return new URL(`./fixtures/${name}/spec.toml`, import.meta.url).pathname;
}

/** A fixture as `{ spec, data }`. */
export async function fixtureProblem(name: "circular" | "eccentric"): Promise<ModelPayload> {
  const p = await loadProblem(fixtureSpec(name));
  return { spec: p.spec, data: p.data };
}

/** One line per quantity: key, p-value, χ², contraction (for the test log). */
export function describeResult(
  label: string,
  result: {
    keys: readonly string[];
    parameters: Readonly<
      Record<string, { pValue: number; chiSquare: number; contraction: number }>
    >;
    seconds: number;
  },
): string {
  const lines = result.keys.map((k) => {
    const q = result.parameters[k]!;
    return `  ${k.padEnd(18)} p = ${q.pValue.toPrecision(3).padEnd(9)} χ² = ${
      q.chiSquare.toFixed(1).padEnd(6)
    } contraction = ${q.contraction.toFixed(2)}`;
  });
  return [`${label} (${result.seconds.toFixed(1)} s)`, ...lines].join("\n");
}
