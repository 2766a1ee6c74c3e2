/**
 * Plain progress lines for non-terminal output (logs, pipes, `--no-ui`).
 * No escape codes; at most one line every `everyMs`.
 * @module
 */
import type { Progress } from "../run/session.ts";
import { formatDuration, say } from "./_common.ts";

/** A progress callback printing lines like `step 1200/20000  310 steps/s  ETA 1m01s  acceptance 0.32`. */
export function progressPrinter(
  options: { everyMs?: number; label?: string } = {},
): (p: Progress) => void {
  const every = options.everyMs ?? 2000;
  let last = 0;
  return (p) => {
    const now = performance.now();
    if (now - last < every && p.step < p.targetSteps) return;
    last = now;
    const eta = (p.targetSteps - p.step) / p.stepsPerSecond;
    const rate = Number.isFinite(p.stepsPerSecond) ? p.stepsPerSecond.toFixed(0) : "?";
    say(
      `${options.label ?? ""}step ${p.step}/${p.targetSteps}  ${rate} steps/s  ETA ${
        p.step >= p.targetSteps ? "0s" : formatDuration(eta)
      }  acceptance ${Number.isFinite(p.acceptance) ? p.acceptance.toFixed(2) : "?"}`,
    );
  };
}
