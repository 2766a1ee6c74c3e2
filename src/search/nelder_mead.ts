/**
 * Nelder–Mead downhill simplex minimiser with adaptive parameters and restarts.
 * @module
 */

/** Options of {@linkcode nelderMead}. */
export interface NelderMeadOptions {
  /**
   * Initial simplex step per dimension (vertex i = x0 + scale_i e_i), a number
   * for all dimensions or one per dimension. @default 0.05 |x0_i|, or 0.05 where x0_i = 0
   */
  scale?: number | ArrayLike<number>;
  /**
   * Stop after this many objective evaluations in total (a shrink step or a
   * restart simplex already begun may exceed it by at most n). @default 1000 * (n + 1)
   */
  maxEvaluations?: number;
  /**
   * Convergence: spread of objective values over the simplex,
   * max f - min f <= tolerance * (|min f| + tolerance). @default 1e-12
   */
  tolerance?: number;
  /** Convergence: max-norm distance of every vertex from the best one. @default 1e-10 */
  xTolerance?: number;
  /** Fresh simplices started at the best point after convergence. @default 2 */
  restarts?: number;
  /** Gao & Han (2012) dimension-dependent coefficients (n >= 2) instead of (1, 2, 0.5, 0.5). @default true */
  adaptive?: boolean;
}

/** Result of {@linkcode nelderMead}. */
export interface NelderMeadResult {
  /** Best point found. */
  readonly x: Float64Array;
  /** Objective at `x`. */
  readonly value: number;
  /** Objective evaluations used. */
  readonly evaluations: number;
  /** Simplex iterations used (all restarts). */
  readonly iterations: number;
  /** Restarts actually run. */
  readonly restarts: number;
  /** True if the last simplex met both tolerances before the evaluation budget ran out. */
  readonly converged: boolean;
}

/**
 * Minimises `objective` from `x0` with the Nelder–Mead simplex method
 * (Nelder & Mead 1965, Computer Journal 7, 308), in the form of Lagarias et al.
 * (1998, SIAM J. Optim. 9, 112, Sect. 2: reflect, expand, outside/inside
 * contract, shrink; ties kept in order) with the adaptive coefficients of Gao &
 * Han (2012, Comput. Optim. Appl. 51, 259, Sect. 4; equation number not verified):
 *   reflection alpha = 1, expansion beta = 1 + 2/n,
 *   contraction gamma = 0.75 - 1/(2n), shrink delta = 1 - 1/n,
 * which equal the standard (1, 2, 1/2, 1/2) at n = 2; for n = 1 the standard
 * values are used (delta = 0 would collapse the simplex).
 *
 * Restarts: after convergence a fresh simplex of the initial size is built
 * around the best point, as recommended against premature collapse (Press et
 * al. 2007, Numerical Recipes 3rd ed., Sect. 10.5; recalled from memory);
 * restarting stops early when a restart improves the value by no more than the
 * tolerance.
 *
 * The objective may return NaN or Infinity (e.g. outside a constrained region);
 * NaN is treated as +Infinity. The objective receives a scratch array that is
 * reused between calls: it must not keep it. Work arrays are allocated once per
 * call; the loop allocates nothing.
 *
 * Throws RangeError for an empty or non-finite `x0`, a non-positive scale or
 * bad option values.
 */
export function nelderMead(
  objective: (x: Float64Array) => number,
  x0: ArrayLike<number>,
  options: NelderMeadOptions = {},
): NelderMeadResult {
  const n = x0.length;
  if (n < 1) throw new RangeError(`Cannot minimise as x0 is empty: length=${n}`);
  for (let j = 0; j < n; j++) {
    if (!Number.isFinite(x0[j]!)) {
      throw new RangeError(`Cannot minimise as x0 must be finite: index=${j}, value=${x0[j]}`);
    }
  }
  const maxEvaluations = options.maxEvaluations ?? 1000 * (n + 1);
  const tolerance = options.tolerance ?? 1e-12;
  const xTolerance = options.xTolerance ?? 1e-10;
  const maxRestarts = options.restarts ?? 2;
  if (!(maxEvaluations >= n + 1) || !(tolerance >= 0) || !(xTolerance >= 0)) {
    throw new RangeError(
      `Cannot minimise as options are out of range: maxEvaluations=${maxEvaluations}, ` +
        `tolerance=${tolerance}, xTolerance=${xTolerance}`,
    );
  }
  if (!Number.isInteger(maxRestarts) || maxRestarts < 0) {
    throw new RangeError(
      `Cannot minimise as restarts must be an integer >= 0: restarts=${maxRestarts}`,
    );
  }
  const step = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    const sc = options.scale;
    const v = sc === undefined
      ? (x0[j] === 0 ? 0.05 : 0.05 * Math.abs(x0[j]!))
      : typeof sc === "number"
      ? sc
      : sc[j]!;
    if (!(v > 0) || !Number.isFinite(v)) {
      throw new RangeError(
        `Cannot minimise as scale must be finite and positive: index=${j}, scale=${v}`,
      );
    }
    step[j] = v;
  }
  const adaptive = (options.adaptive ?? true) && n >= 2;
  const alpha = 1;
  const beta = adaptive ? 1 + 2 / n : 2;
  const gamma = adaptive ? 0.75 - 1 / (2 * n) : 0.5;
  const delta = adaptive ? 1 - 1 / n : 0.5;

  const simplex = new Float64Array((n + 1) * n); // vertex v at [v * n + j]
  const values = new Float64Array(n + 1);
  const order = new Int32Array(n + 1); // order[0] best ... order[n] worst
  const centroid = new Float64Array(n);
  const xr = new Float64Array(n);
  const xe = new Float64Array(n);
  const xc = new Float64Array(n);
  const scratch = new Float64Array(n);
  const best = new Float64Array(n);
  for (let j = 0; j < n; j++) best[j] = x0[j]!;

  let evaluations = 0;
  const evaluate = (x: Float64Array): number => {
    scratch.set(x);
    evaluations++;
    const f = objective(scratch);
    return Number.isNaN(f) ? Infinity : f;
  };
  let bestValue = evaluate(best);
  let iterations = 0;
  let restartsRun = 0;
  let converged = false;

  for (let round = 0; round <= maxRestarts; round++) {
    if (round > 0) restartsRun++;
    const startValue = bestValue;
    // Initial simplex around the best point.
    for (let v = 0; v <= n; v++) {
      for (let j = 0; j < n; j++) simplex[v * n + j] = best[j]! + (v === j + 1 ? step[j]! : 0);
    }
    values[0] = bestValue;
    for (let v = 1; v <= n; v++) values[v] = evaluate(simplex.subarray(v * n, v * n + n));
    for (let v = 0; v <= n; v++) order[v] = v;
    sortOrder(order, values);
    converged = false;

    while (evaluations < maxEvaluations) {
      const bi = order[0]!, wi = order[n]!, si = order[n - 1]!;
      const fBest = values[bi]!, fWorst = values[wi]!, fSecond = values[si]!;
      // Convergence test on function spread and simplex size.
      if (fWorst - fBest <= tolerance * (Math.abs(fBest) + tolerance) || fWorst === fBest) {
        let size = 0;
        for (let v = 1; v <= n; v++) {
          const o = order[v]! * n;
          for (let j = 0; j < n; j++) {
            const d = Math.abs(simplex[o + j]! - simplex[bi * n + j]!);
            if (d > size) size = d;
          }
        }
        if (size <= xTolerance || !Number.isFinite(fBest)) {
          converged = Number.isFinite(fBest);
          break;
        }
      }
      iterations++;
      // Centroid of all vertices except the worst.
      centroid.fill(0);
      for (let v = 0; v < n; v++) {
        const o = order[v]! * n;
        for (let j = 0; j < n; j++) centroid[j]! += simplex[o + j]!;
      }
      for (let j = 0; j < n; j++) centroid[j]! /= n;
      const ow = wi * n;
      for (let j = 0; j < n; j++) xr[j] = centroid[j]! + alpha * (centroid[j]! - simplex[ow + j]!);
      const fr = evaluate(xr);
      let accepted: Float64Array | null = null;
      let fAccepted = 0;
      if (fr < fBest) {
        for (let j = 0; j < n; j++) xe[j] = centroid[j]! + beta * (xr[j]! - centroid[j]!);
        const fe = evaluate(xe);
        if (fe < fr) {
          accepted = xe;
          fAccepted = fe;
        } else {
          accepted = xr;
          fAccepted = fr;
        }
      } else if (fr < fSecond) {
        accepted = xr;
        fAccepted = fr;
      } else if (fr < fWorst) {
        for (let j = 0; j < n; j++) xc[j] = centroid[j]! + gamma * (xr[j]! - centroid[j]!);
        const fc = evaluate(xc);
        if (fc <= fr) {
          accepted = xc;
          fAccepted = fc;
        }
      } else {
        for (let j = 0; j < n; j++) {
          xc[j] = centroid[j]! - gamma * (centroid[j]! - simplex[ow + j]!);
        }
        const fc = evaluate(xc);
        if (fc < fWorst) {
          accepted = xc;
          fAccepted = fc;
        }
      }
      if (accepted !== null) {
        for (let j = 0; j < n; j++) simplex[ow + j] = accepted[j]!;
        values[wi] = fAccepted;
        insertWorst(order, values);
      } else {
        // Shrink towards the best vertex.
        const ob = bi * n;
        for (let v = 1; v <= n; v++) {
          const idx = order[v]!, o = idx * n;
          for (let j = 0; j < n; j++) {
            simplex[o + j] = simplex[ob + j]! + delta * (simplex[o + j]! - simplex[ob + j]!);
          }
          values[idx] = evaluate(simplex.subarray(o, o + n));
        }
        sortOrder(order, values);
      }
    }
    const b = order[0]!;
    if (values[b]! <= bestValue) {
      bestValue = values[b]!;
      for (let j = 0; j < n; j++) best[j] = simplex[b * n + j]!;
    }
    if (!converged || evaluations >= maxEvaluations) break;
    if (round > 0 && !(startValue - bestValue > tolerance * (Math.abs(bestValue) + tolerance))) {
      break;
    }
  }
  return {
    x: best,
    value: bestValue,
    evaluations,
    iterations,
    restarts: restartsRun,
    converged,
  };
}

/** Insertion sort of vertex indices by value (stable: ties keep their order). */
function sortOrder(order: Int32Array, values: Float64Array): void {
  for (let a = 1; a < order.length; a++) {
    const idx = order[a]!, v = values[idx]!;
    let b = a - 1;
    while (b >= 0 && values[order[b]!]! > v) {
      order[b + 1] = order[b]!;
      b--;
    }
    order[b + 1] = idx;
  }
}

/**
 * Moves the replaced worst vertex (last in `order`) to its place. A new vertex
 * goes after existing vertices of equal value (Lagarias et al. 1998 ordering).
 */
function insertWorst(order: Int32Array, values: Float64Array): void {
  const last = order.length - 1;
  const idx = order[last]!, v = values[idx]!;
  let b = last - 1;
  while (b >= 0 && values[order[b]!]! > v) {
    order[b + 1] = order[b]!;
    b--;
  }
  order[b + 1] = idx;
}
