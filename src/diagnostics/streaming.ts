/**
 * Streaming diagnostics whose cost per update does not grow with run length.
 * @module
 */

import { type ChainView, validateChainView, validateColumn } from "./chain_view.ts";
import {
  buildReport,
  type ColumnConvergence,
  type ConvergenceOptions,
  type ConvergenceReport,
  convergenceReport,
} from "./convergence.ts";

/** Options of {@link StreamingDiagnostics}. */
export interface StreamingOptions {
  /** Steps kept per walker in the reservoir (at least 4). @default 1024 */
  capacity?: number;
  /** Column of the per-step accepted flag, or of cumulative accepted counts. */
  acceptedColumn?: number;
  /** True when `acceptedColumn` holds cumulative counts. @default false */
  acceptedCumulative?: boolean;
}

/** A convergence report from the reservoir, in full-chain step units. */
export interface StreamingReport extends ConvergenceReport {
  /** Thinning of the reservoir when the report was made. */
  readonly thin: number;
  /** Reservoir steps per walker the figures were computed from (after burn). */
  readonly keptSteps: number;
}

/**
 * Diagnostics over a thinned reservoir of the chain.
 *
 * Estimator: the reservoir holds the steps whose index (from 0) is a
 * multiple of `thin`, at most `capacity` of them per walker. When it is full
 * and another step is due, every other kept step is dropped (keeping indices
 * 0, 2 thin, 4 thin, ...) and `thin` doubles. So after N steps it holds
 * between capacity/2 and capacity steps evenly spread over the whole run, and
 * {@link report} always works on at most `capacity` steps: its cost does not
 * grow with N. {@link push} costs O(block steps) to inspect plus a copy of the
 * kept steps; a compaction costs O(capacity · walkers · columns), happens
 * each time the run doubles, and so is O(walkers · columns) per step amortised.
 *
 * Bias, stated for a stationary chain with autocorrelation time tau (steps):
 * - R-hat is computed from a systematic subsample of every walker; it has no
 *   extra bias but more noise than the full-chain value.
 * - tau is reported as thin · tau_thinned. For positively correlated chains
 *   this is >= tau (e.g. AR(1): thin (1 + rho^thin)/(1 - rho^thin) >=
 *   (1 + rho)/(1 - rho)), equal to it when thin << tau and tending to `thin`
 *   when thin >> tau, so steps/tau errs low (conservative).
 * - ESS (bulk, tail, mean) counts only the kept draws, so it is at most the
 *   full-chain ESS: about the full value while thin << tau, and about the
 *   number of kept draws once thin >> tau (conservative).
 * - Burn-in is chosen on the reservoir and is a multiple of `thin`.
 * - Acceptance is exact: it uses running per-walker sums over every step.
 * The final `summary` should use {@link convergenceReport} on the full chain.
 */
export class StreamingDiagnostics {
  readonly #walkers: number;
  readonly #columns: number;
  readonly #capacity: number;
  readonly #buffer: Float64Array;
  readonly #acceptedColumn: number | undefined;
  readonly #acceptedCumulative: boolean;
  readonly #acceptSum: Float64Array;
  #kept = 0;
  #thin = 1;
  #seen = 0;

  /**
   * @throws {RangeError} when `walkers`, `columns` or `capacity` are not
   * positive integers (capacity >= 4), or `acceptedColumn` is out of range.
   */
  constructor(walkers: number, columns: number, options: StreamingOptions = {}) {
    const capacity = options.capacity ?? 1024;
    if (!Number.isInteger(walkers) || walkers < 1 || !Number.isInteger(columns) || columns < 1) {
      throw new RangeError(
        `Cannot start streaming diagnostics as walkers and columns must be positive integers: walkers=${walkers}, columns=${columns}`,
      );
    }
    if (!Number.isInteger(capacity) || capacity < 4) {
      throw new RangeError(
        `Cannot start streaming diagnostics as capacity must be an integer >= 4: capacity=${capacity}`,
      );
    }
    const ac = options.acceptedColumn;
    if (ac !== undefined && (!Number.isInteger(ac) || ac < 0 || ac >= columns)) {
      throw new RangeError(
        `Cannot read acceptance as column is outside the chain: column=${ac}, columns=${columns}`,
      );
    }
    this.#walkers = walkers;
    this.#columns = columns;
    this.#capacity = capacity;
    this.#buffer = new Float64Array(capacity * walkers * columns);
    this.#acceptedColumn = ac;
    this.#acceptedCumulative = options.acceptedCumulative ?? false;
    this.#acceptSum = new Float64Array(walkers);
  }

  /** Steps pushed so far. */
  get stepsSeen(): number {
    return this.#seen;
  }

  /** Current thinning: kept step i is chain step i · thin. */
  get thin(): number {
    return this.#thin;
  }

  /** Steps per walker currently in the reservoir. */
  get keptSteps(): number {
    return this.#kept;
  }

  /**
   * Append the steps of `block` (same walkers and columns).
   * @throws {TypeError} on a malformed block or a shape mismatch.
   */
  push(block: ChainView): void {
    validateChainView(block);
    if (block.walkers !== this.#walkers || block.columns !== this.#columns) {
      throw new TypeError(
        `Cannot add block as its shape differs from the stream: walkers=${block.walkers}, columns=${block.columns}, expected walkers=${this.#walkers}, columns=${this.#columns}`,
      );
    }
    const rowLength = this.#walkers * this.#columns;
    const ac = this.#acceptedColumn;
    for (let s = 0; s < block.steps; s++) {
      const src = s * rowLength;
      if (ac !== undefined) {
        for (let w = 0; w < this.#walkers; w++) {
          const v = block.data[src + w * this.#columns + ac]!;
          if (this.#acceptedCumulative) this.#acceptSum[w] = v;
          else if (v !== 0) this.#acceptSum[w] = this.#acceptSum[w]! + 1;
        }
      }
      const global = this.#seen;
      this.#seen++;
      if (global % this.#thin !== 0) continue;
      if (this.#kept === this.#capacity) {
        this.#compact();
        if (global % this.#thin !== 0) continue;
      }
      this.#buffer.set(block.data.subarray(src, src + rowLength), this.#kept * rowLength);
      this.#kept++;
    }
  }

  #compact(): void {
    const rowLength = this.#walkers * this.#columns;
    const keep = Math.ceil(this.#kept / 2);
    for (let i = 1; i < keep; i++) {
      this.#buffer.copyWithin(i * rowLength, 2 * i * rowLength, (2 * i + 1) * rowLength);
    }
    this.#kept = keep;
    this.#thin *= 2;
  }

  /** The reservoir as a chain (a view on internal memory, valid until the next push). */
  view(): ChainView {
    const rowLength = this.#walkers * this.#columns;
    return {
      data: this.#buffer.subarray(0, this.#kept * rowLength),
      steps: this.#kept,
      walkers: this.#walkers,
      columns: this.#columns,
    };
  }

  /** Exact per-walker acceptance over all steps seen; NaN without an accepted column. */
  acceptance(): Float64Array {
    const out = new Float64Array(this.#walkers);
    if (this.#acceptedColumn === undefined || this.#seen === 0) return out.fill(NaN);
    for (let w = 0; w < this.#walkers; w++) out[w] = this.#acceptSum[w]! / this.#seen;
    return out;
  }

  /**
   * {@link convergenceReport} of the reservoir, converted to full-chain steps
   * (see the class comment for the bias). A given `burn` is in full-chain
   * steps and is rounded up to the reservoir's thinning.
   * @throws as {@link convergenceReport}.
   */
  report(options: ConvergenceOptions): StreamingReport {
    const view = this.view();
    let burn: number | undefined;
    if (options.burn !== undefined) {
      if (!Number.isInteger(options.burn) || options.burn < 0 || options.burn > this.#seen) {
        throw new RangeError(
          `Cannot discard burn-in as it is not a step count within the chain: burn=${options.burn}, steps=${this.#seen}`,
        );
      }
      burn = Math.min(this.#kept, Math.ceil(options.burn / this.#thin));
    }
    for (const c of options.columns) validateColumn(view, c);
    const inner = convergenceReport(view, { ...options, burn });
    const thin = this.#thin;
    const fullBurn = Math.min(this.#seen, inner.burn * thin);
    const fullSteps = this.#seen - fullBurn;
    const columns: ColumnConvergence[] = inner.columns.map((c) => {
      const tau = c.tau * thin;
      return { ...c, tau, stepsPerTau: fullSteps / tau };
    });
    const outer = buildReport(fullBurn, fullSteps, this.#walkers, columns, inner.thresholds);
    return { ...outer, thin, keptSteps: inner.steps };
  }
}
