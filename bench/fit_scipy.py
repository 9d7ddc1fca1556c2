#!/usr/bin/env python3
"""The fitting benchmark's reference: the same fits as org.dendrokin.io.fit.FitBenchmark, by SciPy's least_squares.

Reads each CASE.csv (kymograph) and CASE.json (truth, starting point, tolerance) written by FitBenchmark, fits
the same free parameters on the same scales (log D, log k, logistic a on (0, 0.5), the rest linear) from the same
start with ftol = xtol = gtol = the same tolerance, Levenberg-Marquardt (method='lm'), two-point finite-difference
Jacobian (default step; the Nagumo fits are repeated once with diff_step = 1e-4, which converges), and prints the best-of-N wall time with the errors, in the same columns as the Java run.
Diffusion-decay: the closed-form Gaussian pulse with decay (Crank 1975). Nagumo: method of lines on the same grid
(h = dx_um, 3-point Laplacian, sealed ends), LSODA (rtol 1e-6, atol 1e-9, banded Jacobian), the stimulus as a
Gaussian added at its time. Intervals: covariance s^2 (J^T J)^-1 at the solution, as in the Java run.

Usage: python3 bench/fit_scipy.py OUT_DIR [repeats] [all|diffusion-decay|nagumo]
"""
import json
import sys
import time

import numpy as np
from scipy.integrate import solve_ivp
from scipy.optimize import least_squares


def read_case(prefix):
    raw = np.genfromtxt(prefix + ".csv", delimiter=",")
    x = raw[0, 1:]
    t = raw[1:, 0]
    y = raw[1:, 1:]
    with open(prefix + ".json") as f:
        meta = json.load(f)
    return x, t, y, meta


def logistic(u):
    return 0.5 / (1 + np.exp(-u))


def dd_model(theta, x, t, t0):
    d, k, amp, x0, s0, base = theta
    tau = (t - t0)[:, None]
    v = s0 ** 2 + 2 * d * np.maximum(tau, 0)
    c = amp * s0 / np.sqrt(v) * np.exp(-(x[None, :] - x0) ** 2 / (2 * v)) * np.exp(-k * np.maximum(tau, 0))
    return base + np.where(tau >= 0, c, 0.0)


def dd_theta(u):
    return np.array([np.exp(u[0]), np.exp(u[1]), u[2], u[3], np.exp(u[4]), u[5]])


def dd_internal(theta):
    return np.array([np.log(theta[0]), np.log(theta[1]), theta[2], theta[3], np.log(theta[4]), theta[5]])


def nagumo_solution(theta3, x, t, stim, h):
    d, k, a = theta3
    n = int(round((x[-1] - x[0]) / h)) + 1
    nodes = x[0] + h * np.arange(n)
    u0 = np.exp(-0.5 * ((nodes - stim["position_um"]) / stim["width_um"]) ** 2) * stim["amount"]
    t0 = stim["time_s"]
    after = t >= t0

    def rhs(_, u):
        lap = np.empty_like(u)
        lap[1:-1] = u[:-2] - 2 * u[1:-1] + u[2:]
        lap[0] = 2 * (u[1] - u[0])
        lap[-1] = 2 * (u[-2] - u[-1])
        return d * lap / h ** 2 + k * u * (1 - u) * (u - a)

    out = np.zeros((len(t), len(x)))
    sol = solve_ivp(rhs, (t0, t[-1]), u0, method="LSODA", t_eval=t[after], rtol=1e-6, atol=1e-9, lband=1, uband=1)
    for j, row in enumerate(sol.y.T):
        out[np.flatnonzero(after)[j]] = np.interp(x, nodes, row)
    return out


def ng_theta(u):
    return np.array([np.exp(u[0]), np.exp(u[1]), logistic(u[2]), u[3], u[4]])


def ng_internal(theta):
    f = theta[2] / 0.5
    return np.array([np.log(theta[0]), np.log(theta[1]), np.log(f / (1 - f)), theta[3], theta[4]])


def run_case(prefix, repeats, diff_step=None, label=""):
    x, t, y, meta = read_case(prefix)
    tol = meta["tolerance"]
    sigma = meta["sigma"]
    finite = np.isfinite(y)
    if meta["model"] == "diffusion-decay":
        t0 = meta["stimulus_time_s"]

        def resid(u):
            return ((y - dd_model(dd_theta(u), x, t, t0)) / sigma)[finite]
        to_theta, u0 = dd_theta, dd_internal(np.array(meta["start"]))
    else:
        stim = meta["stimulus"]
        h = meta["dx_um"]

        def resid(u):
            th = ng_theta(u)
            return ((y - (th[4] + th[3] * nagumo_solution(th[:3], x, t, stim, h))) / sigma)[finite]
        to_theta, u0 = ng_theta, ng_internal(np.array(meta["start"]))
    best = np.inf
    for _ in range(repeats):
        t_start = time.perf_counter()
        r = least_squares(resid, u0, method="lm", ftol=tol, xtol=tol, gtol=tol, diff_step=diff_step)
        jac = r.jac
        dof = r.fun.size - u0.size
        s2 = np.sum(r.fun ** 2) / dof
        cov = s2 * np.linalg.inv(jac.T @ jac)
        best = min(best, time.perf_counter() - t_start)
    theta = to_theta(r.x)
    truth = np.array(meta["truth"])
    se = np.sqrt(np.diag(cov))
    # Student t 95% interval of D on the log scale, mapped back
    from scipy.stats import t as student
    q = student.ppf(0.975, dof)
    lo, hi = np.exp(r.x[0] - q * se[0]), np.exp(r.x[0] + q * se[0])
    rel = (theta[:3] - truth[:3]) / truth[:3]
    name = prefix.split("/")[-1] + label
    print("%s,%d,%d,%.4f,,%d,%.4f,%.4f,%.4f,%.5g,%.5g" % (name, len(x), len(t), best, r.nfev, rel[0], rel[1],
                                                         rel[2], lo, hi))


def main():
    out = sys.argv[1] if len(sys.argv) > 1 else "bench/out"
    repeats = int(sys.argv[2]) if len(sys.argv) > 2 else 3
    cases = sys.argv[3] if len(sys.argv) > 3 else "all"
    print("case,positions,frames,scipy_fit_s,,nfev,rel_err_D,rel_err_k,rel_err_third,ci_D_lo,ci_D_hi")
    for model in ("diffusion-decay", "nagumo") if cases == "all" else (cases,):
        for nx, nt in ((60, 150), (200, 400), (400, 1500)):
            run_case("%s/%s-%dx%d" % (out, model, nx, nt), repeats)
    if cases in ("all", "nagumo"):
        # The same Nagumo fits with a finite-difference step above LSODA's own error (rtol 1e-6): the default
        # step (about 1.5e-8 relative) differentiates solver noise, and the fits above stop far from the truth.
        # One timed fit each, as the largest takes about a minute.
        for nx, nt in ((60, 150), (200, 400), (400, 1500)):
            run_case("%s/nagumo-%dx%d" % (out, nx, nt), 1, diff_step=1e-4, label="-diffstep1e-4")


if __name__ == "__main__":
    main()
