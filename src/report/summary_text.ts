/**
 * The summary as a plain-text table with cautions.
 * @module
 */
import type { Interval } from "./quantiles.ts";
import { roundByUncertainty } from "./rounding.ts";
import { selectKeys } from "./summary_formats.ts";
import type { Summary } from "./summary.ts";

/** Lines of the text summary. */
export function summaryText(
  s: Summary,
  options: { dir: string; truth?: Record<string, number>; params?: readonly string[] },
): string[] {
  const lines: string[] = [];
  lines.push(`posterior summary: ${s.title || "(untitled)"}  [${options.dir}]`);
  lines.push(
    `${s.steps} steps × ${s.walkers} walkers; burn-in ${s.burn} steps (${
      s.burnRule === "auto" ? "chosen automatically; override with --burn N" : "given"
    }); ${s.draws} draws${s.thin > 1 ? ` (every ${s.thin}th step stored)` : ""}`,
  );
  const truth = options.truth;
  const rows: string[][] = [[
    "parameter",
    "median",
    "−1σ",
    "+1σ",
    "95% interval",
    "unit",
    ...(truth ? ["truth"] : []),
  ]];
  const add = (key: string, iv: Interval) => {
    const r = roundByUncertainty(iv.median, iv.median - iv.lo68, iv.hi68 - iv.median);
    const r95lo = roundByUncertainty(iv.lo95, iv.median - iv.lo68, iv.hi68 - iv.median).value;
    const r95hi = roundByUncertainty(iv.hi95, iv.median - iv.lo68, iv.hi68 - iv.median).value;
    const row = [key, r.value, `−${r.minus}`, `+${r.plus}`, `[${r95lo}, ${r95hi}]`, iv.unit || "-"];
    if (truth) {
      const t = truth[key];
      row.push(
        t === undefined
          ? ""
          : `${t}${t >= iv.lo95 && t <= iv.hi95 ? " (in 95%)" : " (OUTSIDE 95%)"}`,
      );
    }
    rows.push(row);
  };
  const wanted = options.params && options.params.length > 0
    ? new Set(selectKeys([...Object.keys(s.parameters), ...Object.keys(s.derived)], options.params))
    : undefined;
  for (const [k, iv] of Object.entries(s.parameters)) if (!wanted || wanted.has(k)) add(k, iv);
  const derivedStart = rows.length;
  for (const [k, iv] of Object.entries(s.derived)) if (!wanted || wanted.has(k)) add(k, iv);
  const widths = rows[0]!.map((_, c) => Math.max(...rows.map((r) => r[c]!.length)));
  const fmtRow = (r: string[]) =>
    r.map((cell, c) => (c === 0 || c >= 4 ? cell.padEnd(widths[c]!) : cell.padStart(widths[c]!)))
      .join("  ")
      .trimEnd();
  lines.push("");
  lines.push(fmtRow(rows[0]!));
  rows.slice(1, derivedStart).forEach((r) => lines.push(fmtRow(r)));
  if (rows.length > derivedStart) {
    lines.push("derived (star mass drawn from its prior for each sample):");
    rows.slice(derivedStart).forEach((r) => lines.push(fmtRow(r)));
  }
  lines.push("");
  const d = s.diagnostics;
  lines.push(
    `convergence: R-hat max ${f(d.rhat_max, 4)} (want < ${thr(s, "rhat")}), bulk ESS min ${
      f(d.ess_bulk_min, 0)
    } (want > ${thr(s, "ess")}), tail ESS min ${f(d.ess_tail_min, 0)}, τ max ${
      f(d.tau_max, 1)
    } steps, steps/τ min ${f(d.steps_per_tau_min, 1)} (want > ${thr(s, "tau")}), acceptance ${
      f(d.acceptance_mean, 2)
    }`,
  );
  if (d.stuck_walkers.length > 0) {
    lines.push(
      `stuck walkers: ${d.stuck_walkers.join(", ")} (acceptance far below the ensemble's)`,
    );
  }
  if (d.converged) {
    lines.push(
      "verdict: no sign of non-convergence. Diagnostics can flag problems but never prove convergence.",
    );
  } else {
    lines.push(
      "verdict: NOT CONVERGED by these criteria; run longer (rvwalk resume DIR --more N):",
    );
    for (const r of d.reasons.slice(0, 6)) lines.push(`  - ${r}`);
    if (d.reasons.length > 6) lines.push(`  - … and ${d.reasons.length - 6} more`);
  }
  lines.push(
    "cautions: m sin i is a lower limit on the mass (the orbit's inclination is unknown from RVs alone);",
  );
  lines.push(
    "          priors shape the result where the data constrain weakly (check them with `rvwalk check`).",
  );
  return lines;
}

function thr(s: Summary, which: "rhat" | "ess" | "tau"): string {
  const t = s.thresholds;
  return String(which === "rhat" ? t.rhat : which === "ess" ? t.essBulk : t.stepsPerTau);
}

function f(x: number, digits: number): string {
  return Number.isFinite(x) ? x.toFixed(digits) : "n/a";
}
