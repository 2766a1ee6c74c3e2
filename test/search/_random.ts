/**
 * Seeded random numbers for the search tests (seedrandom's ARC4 generator;
 * normal deviates by the Box–Muller transform, Box & Muller 1958, Ann. Math.
 * Stat. 29, 610).
 */
import seedrandom from "seedrandom";

export interface TestRandom {
  /** Uniform on [0, 1). */
  uniform(): number;
  /** Standard normal. */
  normal(): number;
}

export function testRandom(seed: string): TestRandom {
  const rng = seedrandom(seed);
  return {
    uniform: () => rng(),
    normal: () => {
      const u = 1 - rng(); // (0, 1]
      const v = rng();
      return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
    },
  };
}

/** Random uneven series: `count` times uniform in [t0, t0 + span), sorted. */
export function randomTimes(
  random: TestRandom,
  count: number,
  t0: number,
  span: number,
): Float64Array {
  const t = new Float64Array(count);
  for (let i = 0; i < count; i++) t[i] = t0 + span * random.uniform();
  return t.sort();
}

/**
 * Independent weighted least squares for the tests: minimises
 * sum w_i (y_i - sum_j X_ij beta_j)^2 through the normal equations solved by
 * Gaussian elimination with partial pivoting (Golub & Van Loan 2013, Matrix
 * Computations 4th ed., Sect. 3.4), and returns the minimum chi^2 from the
 * residuals. `columns` are the design columns (each of length n).
 */
export function leastSquaresChi2(
  columns: Float64Array[],
  y: ArrayLike<number>,
  w: ArrayLike<number>,
): { chi2: number; beta: number[] } {
  const p = columns.length, n = y.length;
  const a: number[][] = [];
  for (let r = 0; r < p; r++) {
    const row: number[] = [];
    for (let c = 0; c < p; c++) {
      let s = 0;
      for (let i = 0; i < n; i++) s += w[i]! * columns[r]![i]! * columns[c]![i]!;
      row.push(s);
    }
    let b = 0;
    for (let i = 0; i < n; i++) b += w[i]! * columns[r]![i]! * y[i]!;
    row.push(b);
    a.push(row);
  }
  for (let k = 0; k < p; k++) {
    let piv = k;
    for (let r = k + 1; r < p; r++) if (Math.abs(a[r]![k]!) > Math.abs(a[piv]![k]!)) piv = r;
    [a[k], a[piv]] = [a[piv]!, a[k]!];
    for (let r = k + 1; r < p; r++) {
      const f = a[r]![k]! / a[k]![k]!;
      for (let c = k; c <= p; c++) a[r]![c]! -= f * a[k]![c]!;
    }
  }
  const beta = new Array<number>(p).fill(0);
  for (let r = p - 1; r >= 0; r--) {
    let s = a[r]![p]!;
    for (let c = r + 1; c < p; c++) s -= a[r]![c]! * beta[c]!;
    beta[r] = s / a[r]![r]!;
  }
  let chi2 = 0;
  for (let i = 0; i < n; i++) {
    let m = 0;
    for (let j = 0; j < p; j++) m += columns[j]![i]! * beta[j]!;
    chi2 += w[i]! * (y[i]! - m) ** 2;
  }
  return { chi2, beta };
}
