/**
 * Stopping a run once the convergence criteria hold (`--until-converged`):
 * at the session's check steps (after a flush), the chain appended since the last
 * check is read into streaming diagnostics and the criteria are tested
 * (R-hat, bulk ESS, steps/τ as in `[sampler]`). When the reservoir says the
 * criteria hold, the whole chain is read and judged exactly as `summary` judges
 * it (same burn-in rule, full-chain diagnostics), and the run stops only if
 * that agrees. A met criterion is a flag, never a proof of convergence.
 * @module
 */
import { fullConvergence } from "../report/summary.ts";
import { readChain } from "./chain_file.ts";
import { ChainFollower } from "./follow.ts";
import { type Manifest, readManifest } from "./manifest.ts";

/** What the last check found. */
export interface StopCheck {
  readonly step: number;
  readonly converged: boolean;
  readonly reasons: readonly string[];
}

/** A `shouldStop` callback for a session, and the last check it made. */
export function convergenceStopper(
  dir: string,
  options: { everyMs?: number; onCheck?: (c: StopCheck) => void } = {},
): (step: number) => Promise<boolean> {
  const every = options.everyMs ?? 0;
  let follower: ChainFollower | undefined;
  let manifest: Manifest | undefined;
  let keys: string[] = [];
  let thresholds = { rhat: 1.01, essBulk: 400, stepsPerTau: 50 };
  let last = -Infinity;
  return async (step) => {
    const now = performance.now();
    if (now - last < every) return false;
    last = now;
    if (follower === undefined) {
      const m = await readManifest(dir);
      manifest = m;
      keys = m.parameters.map((p) => p.key);
      thresholds = m.spec.sampler.thresholds;
      follower = new ChainFollower(dir, {
        walkers: m.walkers,
        columns: m.columns.length,
        capacity: 512,
      });
    }
    await follower.poll();
    if (follower.stream.keptSteps < 16) return false;
    const r = follower.stream.report({
      columns: keys.map((_, i) => 2 + i),
      names: keys,
      logPosteriorColumn: 0,
      thresholds,
    });
    if (!r.converged) {
      options.onCheck?.({ step, converged: false, reasons: r.reasons });
      return false;
    }
    const full = await readChain(dir, {
      walkers: manifest!.walkers,
      columns: manifest!.columns.length,
    });
    const f = fullConvergence(manifest!, full.chain).report;
    const converged = f?.converged ?? false;
    options.onCheck?.({
      step,
      converged,
      reasons: converged ? [] : (f?.reasons ?? ["too few steps"]).map((x) => `full chain: ${x}`),
    });
    return converged;
  };
}
