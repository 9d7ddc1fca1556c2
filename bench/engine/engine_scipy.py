#!/usr/bin/env python3
"""SciPy side of the reaction-diffusion engine benchmark (docs/benchmarks.md, "Reaction-diffusion engine").

For each benchmark problem this script
  1. computes a fine-grid reference (8x finer grid, LSODA at rtol 1e-10) sampled at the coarse nodes and
     output times, and writes it to OUT_DIR/<name>.ref.f64 (little-endian doubles, frame-major);
  2. solves the coarse problem by the method of lines with LSODA and a banded analytic Jacobian at rtol 1e-6,
     the strongest plain SciPy approach, and reports its wall time (best of several runs) and its largest
     error against the reference.
The Java benchmark (EngineBenchmark) reads the references, so both sides are judged against the same one.

Usage: engine_scipy.py OUT_DIR
"""
import json
import sys
import time

import numpy as np
from scipy.integrate import solve_ivp

# The problems: keep in step with EngineBenchmark.java.
PROBLEMS = [
    {"name": "nagumo-60x150", "kind": "nagumo", "length": 30.0, "nodes": 60, "duration": 15.0, "interval": 0.1},
    {"name": "nagumo-200x400", "kind": "nagumo", "length": 100.0, "nodes": 200, "duration": 40.0, "interval": 0.1},
    {"name": "nagumo-400x1500", "kind": "nagumo", "length": 200.0, "nodes": 400, "duration": 150.0, "interval": 0.1},
    {"name": "network3-200x400", "kind": "network", "length": 100.0, "nodes": 200, "duration": 40.0, "interval": 0.1},
]
NAGUMO = {"D": 1.0, "k": 2.0, "a": 0.2}
# Three species: A (D 1), B (D 0.1, rest 1), C (D 0.1); A + B -> C (k1), C -> A + B (k2), A -> 0 (k3),
# 0 -> A at vmax A^2 / (K^2 + A^2) (Hill, n = 2).
NETWORK = {"D": [1.0, 0.1, 0.1], "rest": [0.0, 1.0, 0.0], "k1": 2.0, "k2": 0.5, "k3": 0.3, "vmax": 1.0, "K": 0.5}
PULSE = {"position": 5.0, "width": 2.0, "amount": 1.0}


def laplacian_coeffs(n, h):
    """3-point Laplacian with mirror (no-flux) ends, as the engine's CableGrid for a uniform cable."""
    lower = np.full(n, 1.0 / h**2)
    upper = np.full(n, 1.0 / h**2)
    lower[0] = 0.0
    upper[-1] = 0.0
    upper[0] = 2.0 / h**2
    lower[-1] = 2.0 / h**2
    diag = -(lower + upper)
    return lower, diag, upper


def lap(u, lower, diag, upper):
    out = diag * u
    out[1:] += lower[1:] * u[:-1]
    out[:-1] += upper[:-1] * u[1:]
    return out


def make_nagumo(n, h):
    D, k, a = NAGUMO["D"], NAGUMO["k"], NAGUMO["a"]
    lo, di, up = laplacian_coeffs(n, h)

    def f(t, u):
        return D * lap(u, lo, di, up) + k * u * (1 - u) * (u - a)

    def jac(t, u):
        # packed banded: row 0 = upper diagonal (shifted), row 1 = diagonal, row 2 = lower diagonal
        J = np.zeros((3, n))
        J[0, 1:] = D * up[:-1]
        J[1, :] = D * di + k * (-3 * u**2 + 2 * (1 + a) * u - a)
        J[2, :-1] = D * lo[1:]
        return J

    x = np.arange(n) * h
    u0 = PULSE["amount"] * np.exp(-0.5 * ((x - PULSE["position"]) / PULSE["width"]) ** 2)
    return f, jac, u0, 1, 1


def make_network(n, h):
    p = NETWORK
    Ds = p["D"]
    lo, di, up = laplacian_coeffs(n, h)
    m = 3

    def f(t, y):
        Y = y.reshape(n, m)
        A, B, C = Y[:, 0], Y[:, 1], Y[:, 2]
        bind = p["k1"] * A * B
        unbind = p["k2"] * C
        hill = p["vmax"] * A**2 / (p["K"] ** 2 + A**2)
        out = np.empty_like(Y)
        out[:, 0] = Ds[0] * lap(A, lo, di, up) - bind + unbind - p["k3"] * A + hill
        out[:, 1] = Ds[1] * lap(B, lo, di, up) - bind + unbind
        out[:, 2] = Ds[2] * lap(C, lo, di, up) + bind - unbind
        return out.reshape(-1)

    band = m  # node-major ordering: diffusion couples entries m apart

    def jac(t, y):
        Y = y.reshape(n, m)
        A, B = Y[:, 0], Y[:, 1]
        J = np.zeros((2 * band + 1, n * m))

        def put(i_rows, j_cols, vals):
            J[i_rows - j_cols + band, j_cols] += vals

        idx = np.arange(n)
        dhill = p["vmax"] * 2 * A * p["K"] ** 2 / (p["K"] ** 2 + A**2) ** 2
        local = [
            [-p["k1"] * B - p["k3"] + dhill, -p["k1"] * A, np.full(n, p["k2"])],
            [-p["k1"] * B, -p["k1"] * A, np.full(n, p["k2"])],
            [p["k1"] * B, p["k1"] * A, np.full(n, -p["k2"])],
        ]
        for s in range(m):
            for q in range(m):
                put(idx * m + s, idx * m + q, local[s][q])
            put(idx * m + s, idx * m + s, Ds[s] * di)
            put(idx[1:] * m + s, (idx[1:] - 1) * m + s, Ds[s] * lo[1:])
            put(idx[:-1] * m + s, (idx[:-1] + 1) * m + s, Ds[s] * up[:-1])
        return J

    x = np.arange(n) * h
    y0 = np.tile(np.array(p["rest"]), (n, 1))
    y0[:, 0] += PULSE["amount"] * np.exp(-0.5 * ((x - PULSE["position"]) / PULSE["width"]) ** 2)
    return f, jac, y0.reshape(-1), band, m


def solve(prob, nodes, rtol, atol):
    h = prob["length"] / (nodes - 1)
    maker = make_nagumo if prob["kind"] == "nagumo" else make_network
    f, jac, y0, band, m = maker(nodes, h)
    frames = int(np.floor(prob["duration"] / prob["interval"] + 1e-9)) + 1
    t_eval = np.arange(frames) * prob["interval"]
    sol = solve_ivp(f, (0.0, prob["duration"]), y0, method="LSODA", t_eval=t_eval, jac=jac, lband=band,
                    uband=band, rtol=rtol, atol=atol)
    if not sol.success:
        raise RuntimeError(sol.message)
    # observed species = first one; samples [frame, node]
    return sol.y.reshape(nodes, m, frames)[:, 0, :].T, sol


def main():
    out_dir = sys.argv[1]
    results = []
    for prob in PROBLEMS:
        fine_nodes = (prob["nodes"] - 1) * 8 + 1
        ref, _ = solve(prob, fine_nodes, 1e-10, 1e-12)
        ref = ref[:, ::8]
        ref.astype("<f8").tofile(f"{out_dir}/{prob['name']}.ref.f64")
        times = []
        for _ in range(7):
            t0 = time.perf_counter()
            coarse, sol = solve(prob, prob["nodes"], 1e-6, 1e-9)
            times.append(time.perf_counter() - t0)
        err = float(np.max(np.abs(coarse - ref)))
        results.append({"name": prob["name"], "best_ms": 1e3 * min(times), "median_ms": 1e3 * float(np.median(times)),
                        "max_error": err, "rhs_evaluations": int(sol.nfev), "jacobians": int(sol.njev)})
        print(json.dumps(results[-1]), flush=True)
    with open(f"{out_dir}/scipy.json", "w") as fh:
        json.dump(results, fh, indent=1)


if __name__ == "__main__":
    main()
