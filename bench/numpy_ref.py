"""Reference: the same affine-invariant stretch-move sampler and RV model in
vectorised NumPy, for `deno task bench` (bench/sampler_bench.ts runs it).

Model: sum of Keplerians (Newton on Kepler's equation, vectorised over walkers
and points), one offset and jitter per instrument, Gaussian likelihood with
full normalisation, uniform / log-uniform priors in the same internal space as
rvwalk (log period, log K, sqrt(e) cos w, sqrt(e) sin w, log jitter).
Stretch move: Goodman & Weare (2010), red/blue halves, a = 2.

Usage: python3 numpy_ref.py DATA.csv PLANETS WALKERS SECONDS START_JSON
Prints one line: steps_per_second=<float> steps=<int>
"""
import json
import sys
import time

import numpy as np


def main():
    path, planets, walkers, seconds, start_json = sys.argv[1:6]
    planets, walkers, seconds = int(planets), int(walkers), float(seconds)
    start = np.array(json.loads(start_json))
    rows = [l.strip().split(",") for l in open(path) if l.strip() and not l.startswith(("#", "time"))]
    t = np.array([float(r[0]) for r in rows])
    rv = np.array([float(r[1]) for r in rows])
    err = np.array([float(r[2]) for r in rows])
    names = sorted({r[3] for r in rows})
    inst = np.array([names.index(r[3]) for r in rows])
    n_inst = len(names)
    dim = 5 * planets + 2 * n_inst

    def log_prob(theta):  # theta: (W, D)
        W = theta.shape[0]
        lp = np.zeros(W)
        model = np.zeros((W, t.size))
        for p in range(planets):
            b = 5 * p
            period = np.exp(theta[:, b])
            tc = theta[:, b + 1]
            k = np.exp(theta[:, b + 2])
            h, q = theta[:, b + 3], theta[:, b + 4]
            e = h * h + q * q
            w = np.arctan2(q, h)
            bad = e >= 0.95
            e = np.where(bad, 0.0, e)
            lp += theta[:, b] + theta[:, b + 2]  # log-Jacobians
            nu_c = np.pi / 2 - w
            e_c = 2 * np.arctan2(np.sqrt(1 - e) * np.sin(nu_c / 2), np.sqrt(1 + e) * np.cos(nu_c / 2))
            tp = tc - period * (e_c - e * np.sin(e_c)) / (2 * np.pi)
            m = 2 * np.pi * (t[None, :] - tp[:, None]) / period[:, None]
            m = np.remainder(m, 2 * np.pi)
            ecc = e[:, None]
            # Starter E0 = M + 0.85 e sign(sin M) (Danby 1988), then Newton steps until
            # the largest correction is below 1e-12 (typically 3–5 for e < 0.95).
            big_e = m + 0.85 * ecc * np.sign(np.sin(m))
            for _ in range(30):
                sin_e, cos_e = np.sin(big_e), np.cos(big_e)
                step = (big_e - ecc * sin_e - m) / (1 - ecc * cos_e)
                big_e -= step
                if np.max(np.abs(step)) < 1e-12:
                    break
            cos_e, sin_e = np.cos(big_e), np.sin(big_e)
            den = 1 - ecc * cos_e
            cw, sw = np.cos(w)[:, None], np.sin(w)[:, None]
            model += k[:, None] * ((cw * (cos_e - ecc) - np.sqrt(1 - ecc * ecc) * sw * sin_e) / den + ecc * cw)
            lp = np.where(bad, -np.inf, lp)
        off = theta[:, 5 * planets::2][:, :n_inst]
        jit = np.exp(theta[:, 5 * planets + 1::2][:, :n_inst])
        lp += np.log(jit).sum(axis=1)
        model += off[:, inst]
        var = err[None, :] ** 2 + jit[:, inst] ** 2
        r = rv[None, :] - model
        lp += -0.5 * np.sum(r * r / var + np.log(2 * np.pi * var), axis=1)
        return lp

    rng = np.random.default_rng(7)
    pos = start[None, :] + 1e-4 * rng.standard_normal((walkers, dim))
    lp = log_prob(pos)
    half = walkers // 2
    steps = 0
    t0 = time.perf_counter()
    while time.perf_counter() - t0 < seconds:
        for first in (0, 1):
            s = slice(0, half) if first == 0 else slice(half, walkers)
            c = slice(half, walkers) if first == 0 else slice(0, half)
            x, comp = pos[s], pos[c]
            z = ((2.0 - 1.0) * rng.random(half) + 1.0) ** 2 / 2.0  # g(z) ∝ 1/sqrt(z) on [1/2, 2]
            j = rng.integers(0, half, half)
            y = comp[j] + z[:, None] * (x - comp[j])
            lpy = log_prob(y)
            accept = np.log(rng.random(half)) < (dim - 1) * np.log(z) + lpy - lp[s]
            pos[s][accept] = y[accept]
            lp[s] = np.where(accept, lpy, lp[s])
        steps += 1
    dt = time.perf_counter() - t0
    print(f"steps_per_second={steps / dt:.3f} steps={steps}")


if __name__ == "__main__":
    main()
