/**
 * cos/sin of 2 pi f (t_i - tRef) for all points at successive frequencies of a
 * grid (private to `src/search/`).
 *
 * Method: on an evenly spaced grid f_k = f_0 + k df the phase advances by
 * 2 pi df (t_i - tRef) per step, so the pair (cos, sin) is rotated by the
 * angle-addition formulas cos(a + b) = cos a cos b - sin a sin b,
 * sin(a + b) = sin a cos b + cos a sin b (Press et al. 2007, Numerical Recipes
 * 3rd ed., Sect. 5.4, "trigonometric recurrences"; recalled from memory).
 * Rounding grows about linearly with the number of rotations, so the values
 * are recomputed exactly every `RESEED` steps (error stays below ~1e-14).
 * @module
 */
import type { FrequencyGrid } from "./frequency_grid.ts";

const RESEED = 64;
const TWO_PI = 2 * Math.PI;

/** Caller-visible cos/sin tables, refreshed by {@linkcode TrigTable.set}. */
export class TrigTable {
  /** cos(2 pi f t'_i) at the current frequency. */
  readonly cos: Float64Array;
  /** sin(2 pi f t'_i) at the current frequency. */
  readonly sin: Float64Array;
  readonly #shifted: Float64Array;
  readonly #stepCos: Float64Array;
  readonly #stepSin: Float64Array;
  readonly #frequencies: Float64Array;
  readonly #even: boolean;
  #last = -2;

  constructor(time: Float64Array, count: number, tRef: number, grid: FrequencyGrid | Float64Array) {
    this.cos = new Float64Array(count);
    this.sin = new Float64Array(count);
    this.#shifted = new Float64Array(count);
    for (let i = 0; i < count; i++) this.#shifted[i] = time[i]! - tRef;
    this.#stepCos = new Float64Array(count);
    this.#stepSin = new Float64Array(count);
    if (grid instanceof Float64Array) {
      this.#frequencies = grid;
      this.#even = false;
    } else {
      this.#frequencies = grid.frequencies;
      this.#even = true;
      for (let i = 0; i < count; i++) {
        const a = TWO_PI * grid.step * this.#shifted[i]!;
        this.#stepCos[i] = Math.cos(a);
        this.#stepSin[i] = Math.sin(a);
      }
    }
  }

  /** Number of frequencies. */
  get length(): number {
    return this.#frequencies.length;
  }

  /** Frequency number k, 1/d. */
  frequency(k: number): number {
    return this.#frequencies[k]!;
  }

  /** Fills `cos`/`sin` for frequency index k (fastest when k runs 0, 1, 2, ...). */
  set(k: number): void {
    const c = this.cos, s = this.sin, n = c.length;
    if (this.#even && k === this.#last + 1 && k % RESEED !== 0) {
      const dc = this.#stepCos, ds = this.#stepSin;
      for (let i = 0; i < n; i++) {
        const ci = c[i]!, si = s[i]!, a = dc[i]!, b = ds[i]!;
        c[i] = ci * a - si * b;
        s[i] = si * a + ci * b;
      }
    } else {
      const w = TWO_PI * this.#frequencies[k]!, t = this.#shifted;
      for (let i = 0; i < n; i++) {
        const a = w * t[i]!;
        c[i] = Math.cos(a);
        s[i] = Math.sin(a);
      }
    }
    this.#last = k;
  }
}
