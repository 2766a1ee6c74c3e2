/**
 * Seeded random numbers whose whole state is plain JSON-able data, so a
 * checkpoint can save it and a resumed run continues the very same stream.
 *
 * The generator is Baagøe's Alea as shipped in npm `seedrandom` 3.0.5
 * (`seedrandom.alea`); of that package's generators it has the smallest state
 * that `{ state: true }` can save and restore (four numbers), and the package
 * documents it as passing BigCrush. Uniform deviates take 53 bits
 * (`prng.double()`); normal deviates use the Box–Muller transform, whose second
 * value is cached and is therefore part of the saved state.
 * @module
 */

import seedrandom from "seedrandom";

/** Plain-data state of an {@linkcode Rng}; JSON round-trips it exactly. */
export interface RngState {
  /** Name of the generator, checked on restore. */
  readonly algorithm: "alea";
  /** Alea carry (an integer). */
  readonly c: number;
  /** Alea lag-3 register: multiples of 2^-32 in [0, 1). */
  readonly s0: number;
  readonly s1: number;
  readonly s2: number;
  /** Cached second Box–Muller value, or `null` when none is cached. */
  readonly spare: number | null;
}

type AleaPrng = seedrandom.StatefulPRNG<seedrandom.State.Alea>;

/** A seeded generator of uniform and standard normal deviates. */
export class Rng {
  #prng: AleaPrng;
  #spare: number | null;

  /** Use {@linkcode createRng} or {@linkcode restoreRng} instead. */
  constructor(prng: AleaPrng, spare: number | null) {
    this.#prng = prng;
    this.#spare = spare;
  }

  /** A uniform deviate in [0, 1) with 53 random bits. */
  uniform(): number {
    return this.#prng.double();
  }

  /**
   * A standard normal deviate.
   *
   * Method: Box & Muller (1958), Ann. Math. Stat. 29, 610, eq. (1):
   * z0 = sqrt(-2 ln u1) cos(2π u2), z1 = sqrt(-2 ln u1) sin(2π u2), with
   * u1 in (0, 1] (taken as 1 - uniform) so the logarithm is finite. z1 is
   * cached for the next call. `+ 0` turns a negative zero into +0 so that the
   * cached value survives a JSON round trip bit for bit.
   */
  normal(): number {
    const spare = this.#spare;
    if (spare !== null) {
      this.#spare = null;
      return spare;
    }
    const u1 = 1 - this.#prng.double();
    const u2 = this.#prng.double();
    const r = Math.sqrt(-2 * Math.log(u1));
    const theta = 2 * Math.PI * u2;
    this.#spare = r * Math.sin(theta) + 0;
    return r * Math.cos(theta) + 0;
  }

  /** The current state as plain data (a copy). */
  state(): RngState {
    const s = this.#prng.state();
    return { algorithm: "alea", c: s.c, s0: s.s0, s1: s.s1, s2: s.s2, spare: this.#spare };
  }
}

/**
 * Create a generator from a seed.
 *
 * @param seed Any number or string; equal seeds give equal streams.
 * @throws {TypeError} when the seed is neither a finite number nor a string.
 */
export function createRng(seed: number | string): Rng {
  if (typeof seed === "number" ? !Number.isFinite(seed) : typeof seed !== "string") {
    throw new TypeError(
      `Cannot seed random numbers as the seed is not a finite number or string: seed=${
        String(seed)
      }`,
    );
  }
  return new Rng(seedrandom.alea(String(seed), { state: true }), null);
}

/** The state of `rng` as plain data (a copy); see {@linkcode restoreRng}. */
export function rngState(rng: Rng): RngState {
  return rng.state();
}

/**
 * A generator that continues exactly where the one that produced `state` stood.
 *
 * @throws {TypeError} when `state` is not a valid {@linkcode RngState}.
 */
export function restoreRng(state: RngState): Rng {
  validateRngState(state);
  const prng = seedrandom.alea("", {
    state: { c: state.c, s0: state.s0, s1: state.s1, s2: state.s2 },
  });
  return new Rng(prng, state.spare);
}

/**
 * Check that `value` has the shape of an {@linkcode RngState}.
 *
 * @throws {TypeError} naming the first bad field.
 */
export function validateRngState(value: unknown): asserts value is RngState {
  if (typeof value !== "object" || value === null) {
    throw new TypeError(
      `Cannot restore random numbers as the state is not an object: state=${String(value)}`,
    );
  }
  const v = value as Record<string, unknown>;
  if (v.algorithm !== "alea") {
    throw new TypeError(
      `Cannot restore random numbers as the algorithm is unknown: algorithm=${String(v.algorithm)}`,
    );
  }
  for (const key of ["c", "s0", "s1", "s2"]) {
    const x = v[key];
    if (typeof x !== "number" || !Number.isFinite(x)) {
      throw new TypeError(
        `Cannot restore random numbers as a field is not a finite number: ${key}=${String(x)}`,
      );
    }
  }
  if (v.spare !== null && (typeof v.spare !== "number" || !Number.isFinite(v.spare))) {
    throw new TypeError(
      `Cannot restore random numbers as the cached normal is not a finite number or null: spare=${
        String(v.spare)
      }`,
    );
  }
}
