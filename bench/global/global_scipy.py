#!/usr/bin/env python3
"""The global-fit benchmark's reference: the joint fit of org.dendrokin.bench.GlobalFitBenchmark's study by SciPy.

Reads OUT_DIR/study.json (stimulus, per-session noise SD per position, starting values) and OUT_DIR/<id>.csv (one
kymograph per session, rows frames, columns positions) as GlobalFitBenchmark writes them, and fits the same model
to the same data: the diffusion-decay pulse (Crank 1975)

    c(x, t) = b_i + A_i s_i / sqrt(V) exp(-(x - x0)^2 / (2 V)) exp(-k tau),  V = s_i^2 + 2 D tau,  tau = t - t0 >= 0

with D and k shared by all sessions and amplitude A_i, width s_i and baseline b_i per session, on the same scales
(ln D, ln k, A, ln s, b). The objective is the Java one, sum_i n_i ln chi2_i (each session's noise scale profiled
out; chi2_i weighted by 1 / sigma^2 per position). SciPy has no such objective, so it is reached the usual way, by
iteratively reweighted least squares: least_squares on sum_i chi2_i / c_i with c_i = chi2_i / n_i from the last
fit, until the scales change by less than 1e-6 (the fixed point is a stationary point of the Java objective, since
the gradients agree there). Solver: least_squares, method 'trf' with tr_solver 'lsmr' and the analytic Jacobian as
a sparse matrix (5 non-zeros a row), as SciPy's documentation advises for large sparse problems (a dense Jacobian
would take 8e6 x 302 doubles, 19 GB); x_scale 'jac'; ftol = xtol = gtol = 1e-10.

Prints the best-of-N wall and CPU time, the passes, and D and k with their Wald standard errors from the
Gauss-Newton covariance (Schur complement of the per-session blocks of J^T J, as the Java run), beside the
Java estimates when OUT_DIR/java.csv (the Java run's output) is there.

Usage: python3 bench/global/global_scipy.py OUT_DIR [repeats]
"""
import csv
import json
import sys
import time

import numpy as np
import scipy
import scipy.sparse as sp
from scipy.optimize import least_squares


def read(out):
    with open(out + "/study.json") as f:
        meta = json.load(f)
    sessions = []
    for s in meta["sessions"]:
        raw = np.loadtxt(out + "/" + s["id"] + ".csv", delimiter=",", dtype=str)
        x = raw[0, 1:].astype(float)
        t = raw[1:, 0].astype(float)
        y = raw[1:, 1:].astype(float)
        sessions.append((x, t, y, np.asarray(s["sigma"]), np.asarray(s["start"])))
    return meta, sessions


class Study:
    """All sessions stacked: residuals and the sparse Jacobian on u = (ln D, ln k, (A, ln s, b) per session)."""

    def __init__(self, meta, sessions):
        self.t0 = meta["stimulus_time_s"]
        self.x0 = meta["stimulus_position_um"]
        self.sessions = sessions
        self.n = [y.size for (_, _, y, _, _) in sessions]
        self.rows = sum(self.n)
        self.scale = np.ones(len(sessions))
        # sparsity pattern, the same at every point: columns 0, 1 and the session's three
        cols = []
        for i, n in enumerate(self.n):
            c = np.empty((n, 5), dtype=np.int32)
            c[:, 0] = 0
            c[:, 1] = 1
            c[:, 2:] = 2 + 3 * i + np.arange(3)
            cols.append(c)
        self.indices = np.concatenate(cols).ravel()
        self.indptr = np.arange(0, 5 * self.rows + 1, 5, dtype=np.int64)

    def start(self):
        s0 = self.sessions[0][4]
        u = [np.log(s0[0]), np.log(s0[1])]
        for (_, _, _, _, st) in self.sessions:
            u += [st[2], np.log(st[3]), st[4]]
        return np.array(u)

    def _parts(self, u, i):
        x, t, y, sigma, _ = self.sessions[i]
        d, k = np.exp(u[0]), np.exp(u[1])
        amp, s0, base = u[2 + 3 * i], np.exp(u[3 + 3 * i]), u[4 + 3 * i]
        tau = np.maximum(t - self.t0, 0)[:, None]
        after = (t >= self.t0)[:, None]
        v = s0 * s0 + 2 * d * tau
        q = (x[None, :] - self.x0) ** 2
        g = np.where(after, s0 / np.sqrt(v) * np.exp(-q / (2 * v) - k * tau), 0.0)
        w = 1 / (sigma[None, :] * np.sqrt(self.scale[i]))
        return d, k, amp, s0, base, tau, v, q, g, w, y

    def residuals(self, u):
        out = []
        for i in range(len(self.sessions)):
            _, _, amp, _, base, _, _, _, g, w, y = self._parts(u, i)
            out.append(((y - base - amp * g) * w).ravel())
        return np.concatenate(out)

    def jacobian(self, u):
        data = []
        for i in range(len(self.sessions)):
            d, k, amp, s0, _, tau, v, q, g, w, _ = self._parts(u, i)
            c = amp * g
            j = np.empty(g.shape + (5,))
            j[..., 0] = -(c * d * tau * (q / v ** 2 - 1 / v)) * w           # d r / d ln D
            j[..., 1] = (c * k * tau) * w                                      # d r / d ln k
            j[..., 2] = -g * w                                                 # d r / d A
            j[..., 3] = -(c * (1 - s0 * s0 / v + s0 * s0 * q / v ** 2)) * w   # d r / d ln s
            j[..., 4] = -np.broadcast_to(w, g.shape)                          # d r / d b
            data.append(j.reshape(-1))
        return sp.csr_matrix((np.concatenate(data), self.indices, self.indptr), shape=(self.rows, 2 + 3 * len(
            self.sessions)))

    def chi2(self, u):
        """Each session's chi^2 with weights 1 / sigma^2 (scales 1)."""
        out = []
        for i in range(len(self.sessions)):
            _, _, amp, _, base, _, _, _, g, w, y = self._parts(u, i)
            out.append(float(np.sum(((y - base - amp * g) * w) ** 2) * self.scale[i]))
        return np.array(out)


def fit(study, tol):
    study.scale[:] = 1
    u = study.start()
    nfev = njev = 0
    for outer in range(50):
        r = least_squares(study.residuals, u, jac=study.jacobian, method="trf", tr_solver="lsmr", x_scale="jac",
                          ftol=tol, xtol=tol, gtol=tol)
        u = r.x
        nfev += r.nfev
        njev += r.njev
        new = study.chi2(u) / np.array(study.n)
        change = np.max(np.abs(new / study.scale - 1))
        study.scale[:] = new
        if change < 1e-6:
            break
    return u, nfev, njev, outer + 1


def shared_se(study, u):
    """Wald SE of ln D and ln k: the (2 x 2) block of (J^T J)^-1 at the solution (per-session scales applied)."""
    j = study.jacobian(u).tocsc()
    h = (j.T @ j).toarray()
    cov = np.linalg.inv(h)
    return np.sqrt(np.diag(cov)[:2])


def main():
    out = sys.argv[1] if len(sys.argv) > 1 else "bench/out/global"
    repeats = int(sys.argv[2]) if len(sys.argv) > 2 else 1
    meta, sessions = read(out)
    study = Study(meta, sessions)
    print("scipy %s, numpy %s, python %s" % (scipy.__version__, np.__version__, sys.version.split()[0]))
    best_wall = best_cpu = np.inf
    for _ in range(repeats):
        w0, c0 = time.perf_counter(), time.process_time()
        u, nfev, njev, outer = fit(study, 1e-10)
        best_wall = min(best_wall, time.perf_counter() - w0)
        best_cpu = min(best_cpu, time.process_time() - c0)
    se = shared_se(study, u)
    d, k = np.exp(u[0]), np.exp(u[1])
    objective = float(np.sum(np.array(study.n) * np.log(study.chi2(u))))
    print("what,sessions,positions,frames,wall_s,cpu_s,evaluations,D,k,se_lnD,se_lnk,objective")
    x, t, _, _, _ = sessions[0]
    print("scipy joint fit,%d,%d,%d,%.3f,%.3f,%d,%.8f,%.8f,%.3g,%.3g,%.6f" % (
        len(sessions), len(x), len(t), best_wall, best_cpu, nfev + njev, d, k, se[0], se[1], objective))
    print("(%d function and %d Jacobian evaluations over %d reweighting rounds)" % (nfev, njev, outer))
    try:
        with open(out + "/java.csv") as f:
            java = {row["what"]: row for row in csv.DictReader(f)}
        g = java["global fit"]
        jd, jk = float(g["D"]), float(g["k"])
        print("Java global fit: D %.8f, k %.8f; difference from SciPy %.3g and %.3g standard errors; wall time "
              "ratio SciPy / Java %.1f" % (jd, jk, (np.log(jd) - u[0]) / se[0], (np.log(jk) - u[1]) / se[1],
                                           best_wall / float(g["wall_s"])))
    except (OSError, KeyError):
        pass


if __name__ == "__main__":
    main()
