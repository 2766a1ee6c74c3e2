/**
 * Terminal report of a calibration: one line per quantity with its p-value,
 * contraction and a one-line rank histogram drawn with block characters.
 * Plain text, no escape codes.
 * @module
 */
import type { CalibrationResult } from "./calibrate.ts";

const BLOCKS = [" ", "▁", "▂", "▃", "▄", "▅", "▆", "▇", "█"] as const;

/** Options of {@link calibrationText}. */
export interface CalibrationTextOptions {
  /** p-values below this are flagged. @default 0.01 */
  alpha?: number;
}

/**
 * Bars of a rank histogram: one block character per bin, height ∝ count on
 * the scale 0 … max(count, band top); a bin outside the 99% band is shown
 * as `!` beneath, in a second string of the same length.
 */
export function histogramBars(
  counts: readonly number[],
  band: readonly [number, number],
): { bars: string; marks: string } {
  const top = Math.max(band[1], ...counts);
  let bars = "";
  let marks = "";
  for (const c of counts) {
    const level = top > 0 ? Math.round((c / top) * 8) : 0;
    bars += BLOCKS[Math.min(8, Math.max(0, level))]!;
    marks += c < band[0] || c > band[1] ? "!" : " ";
  }
  return { bars, marks };
}

/** The report as lines. */
export function calibrationText(
  result: CalibrationResult,
  options: CalibrationTextOptions = {},
): string[] {
  const alpha = options.alpha ?? 0.01;
  const n = result.simulations;
  const lines: string[] = [];
  lines.push(
    `simulation-based calibration: ${n} simulations, truth ranked among ${result.draws} ` +
      `thinned posterior draws each, ${result.bins} bins of ${
        (result.draws + 1) / result.bins
      } ranks`,
  );
  lines.push(
    `expected ${(n / result.bins).toFixed(1)} per bin; 99% band for uniform ranks ` +
      `${result.band[0]}–${result.band[1]} (bins outside marked !)`,
  );
  lines.push("");
  const w = Math.max(8, ...result.keys.map((k) => k.length));
  const df = result.bins - 1;
  const row = (cells: [string, string, string, string], tail: string) =>
    `  ${cells[0].padEnd(w)}  ${cells[1].padEnd(8)}  ${cells[2].padEnd(7)}  ${
      cells[3].padEnd(11)
    }  ${tail}`;
  lines.push(row(["quantity", "p-value", `χ²(${df})`, "contraction"], `ranks 0 → ${result.draws}`));
  let flagged = 0;
  for (const key of result.keys) {
    const q = result.parameters[key]!;
    const { bars, marks } = histogramBars(q.counts, result.band);
    const bad = !(q.pValue >= alpha);
    if (bad) flagged++;
    const p = q.pValue < 1e-4 ? q.pValue.toExponential(1) : q.pValue.toFixed(4);
    lines.push(
      row(
        [key, p, q.chiSquare.toFixed(1), fmtContraction(q.contraction)],
        `|${bars}|${bad ? `  ← p < ${alpha}` : ""}`,
      ),
    );
    if (marks.trim() !== "") lines.push(row(["", "", "", ""], ` ${marks}`).trimEnd());
  }
  lines.push("");
  const d = result.diagnostics;
  lines.push(
    `sampler: ${result.walkers} walkers × ${result.steps} steps (first ${result.burn} burn-in), ` +
      `walkers started from ${
        result.start === "prior" ? "independent prior draws" : "the spec start"
      }`,
  );
  const tau = `τ median ${d.tauMedian.toFixed(0)}, max ${d.tauMax.toFixed(0)} steps`;
  const kept = `kept steps ≥ ${d.keptPerTauMin.toFixed(1)} τ`;
  lines.push(`  ${tau}; ${kept}; thinned pools short of ${result.draws}: ${d.shortPools} of ${n}`);
  lines.push(
    `  split R-hat median ${d.rhatMedian.toFixed(3)}, above 1.1 in ${d.rhatAbove} of ${n}; ` +
      `acceptance ${d.acceptanceMedian.toFixed(2)}; ` +
      `stranded walkers moved in ${d.relocatedSimulations} of ${n}`,
  );
  lines.push(
    flagged === 0
      ? `verdict: no quantity departs from uniform ranks at p < ${alpha}`
      : `verdict: ${flagged} of ${result.keys.length} quantities have p < ${alpha}; ` +
        "the sampler settings (more steps) or the model may be at fault",
  );
  return lines;
}

function fmtContraction(c: number): string {
  return Number.isFinite(c) ? c.toFixed(2) : "?";
}
