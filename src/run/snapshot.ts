/**
 * Snapshots of a run directory for the dashboard: manifest, status and the
 * chain as followed so far, reduced to plain data (tui/snapshot.ts). Reads
 * only; cost per refresh bounded by the reservoir size, not the run length.
 * @module
 */
import { findStuckWalkers } from "../diagnostics/mod.ts";
import { derivedDraws } from "../report/derived.ts";
import type { RunSnapshot, RunState, SnapshotPlanet } from "../../tui/snapshot.ts";
import { ChainFollower } from "./follow.ts";
import { type Manifest, readManifest } from "./manifest.ts";
import { readStatus } from "./status.ts";

/** Most posterior draws per parameter handed to the screen. */
const MAX_DRAWS = 4096;
/** Reservoir steps per walker kept for the screen's diagnostics. */
const CAPACITY = 512;

/** The part of a snapshot computed from the chain (diagnostics, draws, derived). */
type Heavy = Pick<
  RunSnapshot,
  | "burn"
  | "acceptance"
  | "stuckWalkers"
  | "parameters"
  | "draws"
  | "diagnostics"
  | "logPosteriorTrace"
  | "planets"
  | "thresholds"
  | "converged"
>;

/** Loads successive snapshots of one run directory. */
export class RunWatcher {
  readonly dir: string;
  #manifest: Manifest | undefined;
  #follower: ChainFollower | undefined;
  #heavy: Heavy | undefined;
  #heavySteps = -1;
  #heavyAt = -Infinity;
  readonly #heavyEveryMs: number;

  /**
   * `heavyEveryMs`: diagnostics, draws and derived quantities are recomputed
   * at most this often (and only when new steps arrived); progress figures are
   * fresh on every load. Keeps a watcher's CPU use small next to the sampler.
   */
  constructor(dir: string, options: { heavyEveryMs?: number } = {}) {
    this.dir = dir;
    this.#heavyEveryMs = options.heavyEveryMs ?? 10_000;
  }

  /** Read what is new and build a snapshot. Throws InputError if DIR is not a run. */
  async load(): Promise<RunSnapshot> {
    if (this.#manifest === undefined) {
      this.#manifest = await readManifest(this.dir);
      this.#follower = new ChainFollower(this.dir, {
        walkers: this.#manifest.walkers,
        columns: this.#manifest.columns.length,
        capacity: CAPACITY,
      });
    }
    const m = this.#manifest;
    const follower = this.#follower!;
    await follower.poll();
    const status = await readStatus(this.dir);
    const now = performance.now();
    if (
      this.#heavy === undefined ||
      (follower.steps !== this.#heavySteps && now - this.#heavyAt >= this.#heavyEveryMs)
    ) {
      this.#heavy = this.#computeHeavy(m, follower);
      this.#heavySteps = follower.steps;
      this.#heavyAt = performance.now();
    }
    const storeThin = m.thin ?? 1;
    const state: RunState = status?.state ?? (follower.steps > 0 ? "stopped" : "starting");
    return {
      ...this.#heavy,
      dir: this.dir,
      title: m.spec.title,
      state,
      step: Math.max(status?.step ?? 0, follower.steps * storeThin),
      totalSteps: status?.targetSteps ?? follower.steps * storeThin,
      walkers: m.walkers,
      threads: status?.threads ?? 0,
      stepsPerSecond: state === "running" ? status?.stepsPerSecond ?? NaN : NaN,
      message: follower.corruptDetail !== undefined
        ? `chain damaged: ${follower.corruptDetail}`
        : status?.message,
    };
  }

  #computeHeavy(m: Manifest, follower: ChainFollower): Heavy {
    const stream = follower.stream;
    const keys = m.parameters.map((p) => p.key);
    const columns = keys.map((_, i) => 2 + i);
    const thresholds = m.spec.sampler.thresholds;
    const W = m.walkers;
    const C = m.columns.length;
    const storeThin = m.thin ?? 1;
    const enough = stream.keptSteps >= 8;
    const report = enough
      ? stream.report({ columns, names: keys, logPosteriorColumn: 0, thresholds })
      : undefined;
    const view = stream.view();
    const thin = stream.thin;
    const burnIdx = report ? Math.min(view.steps, Math.ceil(report.burn / thin)) : 0;
    const keptAfter = view.steps - burnIdx;
    // Evenly spaced steps after burn-in, at most MAX_DRAWS draws per parameter.
    const every = Math.max(1, Math.ceil((keptAfter * W) / MAX_DRAWS));
    const pick: number[] = [];
    for (let s = burnIdx; s < view.steps; s += every) pick.push(s);
    const sub = new Float64Array(pick.length * W * C);
    pick.forEach((s, i) => sub.set(view.data.subarray(s * W * C, (s + 1) * W * C), i * W * C));
    const subChain = { data: sub, steps: pick.length, walkers: W, columns: C };
    const draws = columns.map((c) => {
      const out = new Float64Array(pick.length * W);
      for (let i = 0, k = 0; i < pick.length; i++) {
        for (let w = 0; w < W; w++) out[k++] = sub[(i * W + w) * C + c]!;
      }
      return out;
    });
    const traceSteps = new Float64Array(view.steps);
    const traceValues = new Float64Array(view.steps);
    for (let s = 0; s < view.steps; s++) {
      let sum = 0;
      for (let w = 0; w < W; w++) sum += view.data[(s * W + w) * C]!;
      traceSteps[s] = (s * thin + 1) * storeThin;
      traceValues[s] = sum / W;
    }
    const derived = pick.length > 0 ? derivedDraws(m, subChain, { burn: 0 }) : new Map();
    const planets: SnapshotPlanet[] = m.spec.planets.map((p) => {
      const col = (k: string) => {
        const i = keys.indexOf(`${p.name}.${k}`);
        return i < 0 ? undefined : draws[i];
      };
      const fixedE = p.eccentricity.prior.kind === "fixed" ? p.eccentricity.prior.value : NaN;
      const empty = new Float64Array(0);
      return {
        name: p.name,
        msiniMjup: derived.get(`${p.name}.msini_mjup`)?.values ?? empty,
        msiniMearth: derived.get(`${p.name}.msini_mearth`)?.values ?? empty,
        aAu: derived.get(`${p.name}.a_au`)?.values ?? empty,
        eccentricity: col("eccentricity") ?? new Float64Array(pick.length * W).fill(fixedE),
        lambdaDeg: p.rm
          ? col("lambda_deg") ?? fixedArray(p.rm.lambdaDeg.prior, pick.length * W)
          : undefined,
        psiDeg: derived.get(`${p.name}.psi_deg`)?.values,
      };
    });
    const acc = stream.acceptance();
    let accMean = 0;
    for (const a of acc) accMean += a / Math.max(1, acc.length);
    return {
      burn: (report?.burn ?? 0) * storeThin,
      acceptance: follower.steps > 0 ? accMean : NaN,
      stuckWalkers: follower.steps > 20 ? findStuckWalkers(acc) : [],
      parameters: m.parameters.map((p) => ({ key: p.key, unit: p.unit })),
      draws,
      diagnostics: keys.map((_, i) => {
        const c = report?.columns[i];
        return {
          rhat: c?.rhat ?? NaN,
          essBulk: c?.essBulk ?? NaN,
          essTail: c?.essTail ?? NaN,
          tau: (c?.tau ?? NaN) * storeThin,
          stepsPerTau: c?.stepsPerTau ?? NaN,
        };
      }),
      logPosteriorTrace: { steps: traceSteps, values: traceValues },
      planets,
      thresholds,
      converged: report?.converged ?? false,
    };
  }
}

function fixedArray(prior: { kind: string; value?: number }, n: number): Float64Array {
  return new Float64Array(n).fill(prior.kind === "fixed" ? prior.value ?? NaN : NaN);
}
