/**
 * Human-readable description of a problem and its compiled model (`check`, `run`).
 * @module
 */
import type { CompiledModel } from "../model/posterior.ts";
import type { Problem } from "../spec/resolve.ts";
import type { PriorSpec } from "../spec/types.ts";

/** Text form of a prior as a user would write it. */
export function describePrior(p: PriorSpec): string {
  switch (p.kind) {
    case "uniform":
    case "loguniform":
      return `${p.kind} [${p.lo}, ${p.hi}]`;
    case "normal":
      return `normal (${p.mu}, ${p.sigma})`;
    case "truncnormal":
      return `truncnormal (${p.mu}, ${p.sigma}) on [${p.lo}, ${p.hi}]`;
    case "beta":
      return `beta (${p.a}, ${p.b})`;
    case "fixed":
      return `fixed ${p.value}`;
  }
}

/** Lines describing data, instruments and free parameters. */
export function describeProblem(problem: Problem, model: CompiledModel): string[] {
  const { spec, data } = problem;
  const lines: string[] = [];
  lines.push(`model: ${spec.title || "(untitled)"}  [${spec.specPath}]`);
  const t0 = data.time[0]!;
  const t1 = data.time[data.count - 1]!;
  lines.push(
    `data: ${data.count} RVs from ${spec.dataFiles.length} file(s), ${t0} to ${t1} (span ${
      (t1 - t0).toFixed(1)
    } d)`,
  );
  spec.instruments.forEach((ins, k) => {
    let n = 0;
    let errSum = 0;
    for (let i = 0; i < data.count; i++) {
      if (data.instrument[i] === k) {
        n++;
        errSum += data.rvErr[i]!;
      }
    }
    lines.push(
      `  instrument ${ins.name}: ${n} points, mean error ${(errSum / n).toFixed(2)} m/s${
        ins.defaulted ? " (defaults: no [[instrument]] in the spec)" : ""
      }`,
    );
  });
  lines.push(
    `planets: ${spec.planets.map((p) => p.name + (p.rm ? " (with RM)" : "")).join(", ") || "none"}${
      spec.trend ? `; trend about t = ${spec.trend.referenceTime}` : ""
    }`,
  );
  lines.push(`free parameters (${model.dimensions}):`);
  const w = Math.max(...model.parameters.map((p) => p.key.length), 9);
  lines.push(
    `  ${"parameter".padEnd(w)}  ${"unit".padEnd(6)}  ${"prior".padEnd(34)}  ${
      "start".padEnd(12)
    }  sampled as`,
  );
  for (const p of model.parameters) {
    lines.push(
      `  ${p.key.padEnd(w)}  ${(p.unit || "-").padEnd(6)}  ${describePrior(p.prior).padEnd(34)}  ${
        String(Number(p.start.toPrecision(8))).padEnd(12)
      }  ${transformName(p.transform)}`,
    );
  }
  return lines;
}

function transformName(t: string): string {
  switch (t) {
    case "log":
      return "log";
    case "sqrt-e-cos":
      return "√e cos ω";
    case "sqrt-e-sin":
      return "√e sin ω";
    default:
      return "as is";
  }
}
