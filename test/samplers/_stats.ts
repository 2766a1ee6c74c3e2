/**
 * Monte Carlo error helpers for the sampler's statistical tests, written here
 * independently of `src/diagnostics/`.
 * @module
 */

import {
  createEvaluator,
  createWorkspace,
  type EnsembleState,
  initEnsemble,
  type LogDensitySource,
  type MoveMix,
  step,
} from "../../samplers/mod.ts";

/**
 * In-place iterative radix-2 complex FFT (Cooley & Tukey 1965, Math. Comp. 19,
 * 297); n a power of two; `cos`/`sin` hold cos(2πk/n), sin(2πk/n) for k < n/2.
 */
function fft(re: Float64Array, im: Float64Array, cos: Float64Array, sin: Float64Array): void {
  const n = re.length;
  for (let i = 1, j = 0; i < n; i++) {
    let bit = n >> 1;
    for (; j & bit; bit >>= 1) j ^= bit;
    j ^= bit;
    if (i < j) {
      const tr = re[i]!;
      re[i] = re[j]!;
      re[j] = tr;
      const ti = im[i]!;
      im[i] = im[j]!;
      im[j] = ti;
    }
  }
  for (let len = 2; len <= n; len <<= 1) {
    const half = len >> 1;
    const stride = n / len;
    for (let i = 0; i < n; i += len) {
      for (let k = 0; k < half; k++) {
        const wr = cos[k * stride]!;
        const wi = -sin[k * stride]!;
        const a = i + k;
        const b = a + half;
        const xr = re[b]! * wr - im[b]! * wi;
        const xi = re[b]! * wi + im[b]! * wr;
        re[b] = re[a]! - xr;
        im[b] = im[a]! - xi;
        re[a] = re[a]! + xr;
        im[a] = im[a]! + xi;
      }
    }
  }
}

/**
 * Integrated autocorrelation time of a series stored [step][walker].
 *
 * Method: the autocovariance of each walker's series (its own mean removed) is
 * computed with a zero-padded FFT (Wiener–Khinchin; common practice, no
 * source), averaged over walkers and normalised to ρ(0) = 1; then
 * τ(M) = 1 + 2 Σ_{t=1..M} ρ(t) with the smallest window M ≥ c τ(M), c = 5
 * (Sokal 1997, "Monte Carlo methods in statistical mechanics: foundations and
 * new algorithms", NATO ASI Series B 361, 131; the self-consistent window and
 * c ≈ 5 are recalled from memory).
 */
export function autocorrelationTime(
  series: Float64Array,
  walkers: number,
  options: { c?: number } = {},
): number {
  const c = options.c ?? 5;
  const steps = series.length / walkers;
  let n = 1;
  while (n < 2 * steps) n <<= 1;
  const acf = new Float64Array(steps);
  const re = new Float64Array(n);
  const im = new Float64Array(n);
  const cos = new Float64Array(n / 2);
  const sin = new Float64Array(n / 2);
  for (let k = 0; k < n / 2; k++) {
    cos[k] = Math.cos((2 * Math.PI * k) / n);
    sin[k] = Math.sin((2 * Math.PI * k) / n);
  }
  for (let w = 0; w < walkers; w++) {
    let mean = 0;
    for (let s = 0; s < steps; s++) mean += series[s * walkers + w]!;
    mean /= steps;
    re.fill(0);
    im.fill(0);
    for (let s = 0; s < steps; s++) re[s] = series[s * walkers + w]! - mean;
    fft(re, im, cos, sin);
    for (let k = 0; k < n; k++) {
      re[k] = re[k]! * re[k]! + im[k]! * im[k]!;
      im[k] = 0;
    }
    // Inverse FFT via conjugation: the power spectrum is real and even, so a forward FFT suffices.
    fft(re, im, cos, sin);
    for (let t = 0; t < steps; t++) acf[t] = acf[t]! + re[t]! / n;
  }
  const c0 = acf[0]!;
  if (!(c0 > 0)) return NaN;
  let tau = 1;
  for (let m = 1; m < steps; m++) {
    tau += (2 * acf[m]!) / c0;
    if (m >= c * tau) return tau;
  }
  return tau;
}

/**
 * Mean, standard deviation, Monte Carlo standard error and effective sample
 * size of a [step][walker] series.
 *
 * Method: walkers of one ensemble are not independent (each move uses the
 * other walkers), so the error of the overall mean is taken from the series of
 * ensemble averages m_s = mean over walkers at step s: its variance times its
 * integrated autocorrelation time τ_m over the number of steps,
 * MCSE² = var(m) τ_m / steps (Sokal 1997, as above); ESS = sd² / MCSE².
 */
export function summarise(series: Float64Array, walkers: number) {
  const n = series.length;
  const steps = n / walkers;
  let mean = 0;
  for (let i = 0; i < n; i++) mean += series[i]!;
  mean /= n;
  let ss = 0;
  for (let i = 0; i < n; i++) ss += (series[i]! - mean) ** 2;
  const sd = Math.sqrt(ss / (n - 1));
  const averages = new Float64Array(steps);
  for (let s = 0; s < steps; s++) {
    let sum = 0;
    for (let w = 0; w < walkers; w++) sum += series[s * walkers + w]!;
    averages[s] = sum / walkers;
  }
  let vm = 0;
  for (let s = 0; s < steps; s++) vm += (averages[s]! - mean) ** 2;
  vm /= steps - 1;
  const tau = autocorrelationTime(averages, 1);
  const mcse = Math.sqrt((vm * tau) / steps);
  return { mean, sd, tau, ess: (sd / mcse) ** 2, mcse };
}

/** A [step][walker] series f(chain) from a chain stored [step][walker][dim]. */
export function seriesOf(
  chain: Float64Array,
  options: { dimensions: number; f: (row: Float64Array, offset: number) => number },
): Float64Array {
  const { dimensions: dims, f } = options;
  const n = chain.length / dims;
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) out[i] = f(chain, i * dims);
  return out;
}

/** Options of {@linkcode runChain}. */
export interface RunOptions {
  walkers: number;
  seed: number | string;
  start: Float64Array;
  scale: Float64Array;
  burn: number;
  steps: number;
  threads?: number;
  moves?: MoveMix;
}

/** Run burn + steps steps and keep the last `steps` positions [step][walker][dim]. */
export async function runChain(source: LogDensitySource, options: RunOptions): Promise<{
  chain: Float64Array;
  logProb: Float64Array;
  acceptance: number;
  state: EnsembleState;
}> {
  const dims = options.start.length;
  const evaluator = await createEvaluator(source, {
    threads: options.threads ?? 1,
    dimensions: dims,
  });
  try {
    let state = await initEnsemble(options.start, {
      walkers: options.walkers,
      seed: options.seed,
      scale: options.scale,
      evaluator,
    });
    const workspace = createWorkspace(options.walkers, dims);
    const size = options.walkers * dims;
    // Two states used in turn as `out`, so the loop allocates nothing per step.
    let other: EnsembleState = {
      ...state,
      positions: new Float64Array(size),
      logProb: new Float64Array(options.walkers),
      accepted: new Float64Array(options.walkers),
    };
    const chain = new Float64Array(options.steps * size);
    const logProb = new Float64Array(options.steps * options.walkers);
    let acceptedAtBurn = 0;
    for (let s = 0; s < options.burn + options.steps; s++) {
      const result = await step(state, { evaluator, moves: options.moves, workspace, out: other });
      other = state;
      state = result.state;
      if (s === options.burn - 1) acceptedAtBurn = state.accepted.reduce((a, b) => a + b, 0);
      const k = s - options.burn;
      if (k >= 0) {
        chain.set(state.positions, k * size);
        logProb.set(state.logProb, k * options.walkers);
      }
    }
    const acceptedTotal = state.accepted.reduce((a, b) => a + b, 0);
    return {
      chain,
      logProb,
      acceptance: (acceptedTotal - acceptedAtBurn) / (options.steps * options.walkers),
      state,
    };
  } finally {
    await evaluator.close();
  }
}
