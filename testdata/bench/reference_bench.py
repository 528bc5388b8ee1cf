#!/usr/bin/python3
"""Write the benchmark inputs and time the same computations with numpy,
scipy and statsmodels (Debian's python3-statsmodels, python3-scipy).

Usage: reference_bench.py write DIR   -- model{10,30,100}.json, ols.csv
       reference_bench.py time DIR    -- prints "name seconds_per_op" lines
"""
import json
import sys
import time

import numpy as np
import statsmodels.api as sm
from scipy import optimize, stats

from numpy_em import em


def simulated_model(p, rng):
    parents = [[] for _ in range(p)]
    B = np.zeros((p, p))
    for i in range(1, p):
        for j in range(i):
            if rng.uniform() < 2 / (i + 1):
                parents[i].append(j)
                B[i, j] = 0.2 + 0.3 * rng.uniform()
    A = np.linalg.inv(np.eye(p) - B)
    cov = A @ A.T
    d = np.sqrt(np.diag(cov))
    return parents, cov / np.outer(d, d)


def write(out):
    rng = np.random.default_rng(7)
    for p in (10, 30, 100):
        parents, cor = simulated_model(p, rng)
        with open(f"{out}/model{p}.json", "w") as f:
            json.dump({"parents": parents, "cor": cor.tolist(), "n": 1000}, f)
    for n_rows, p_vars in ((10_000, 10), (10_000, 30), (100_000, 10), (100_000, 30)):
        f = rng.normal(size=(n_rows, 1))
        data = 0.6 * f + 0.8 * rng.normal(size=(n_rows, p_vars))
        data[rng.uniform(size=data.shape) < 0.1] = np.nan
        np.savetxt(f"{out}/em_{n_rows}_{p_vars}.csv", data, delimiter=",", fmt="%.17g")
    n, k = 100_000, 30
    X = rng.normal(size=(n, k))
    y = X @ np.full(k, 0.1) + rng.normal(size=n)
    np.savetxt(f"{out}/ols.csv", np.column_stack([X, y]), delimiter=",", fmt="%.17g",
               header=",".join([f"x{j}" for j in range(k)] + ["y"]), comments="")


def ncp(t, df, target):
    f = lambda lam: stats.ncx2.cdf(t, df, lam) - target if lam > 0 else stats.chi2.cdf(t, df) - target
    if f(0) <= 0:
        return 0.0
    hi = max(t, 1.0)
    while f(hi) > 0:
        hi *= 2
    return optimize.brentq(f, 0, hi, xtol=1e-10)


def fit_dag(S, n, parents):
    """The same computation as sem.FitDAG: node regressions, implied
    covariance, F_ML, chi-square, RMSEA with its 90% interval, CFI, TLI, SRMR."""
    p = S.shape[0]
    B = np.zeros((p, p))
    psi = np.diag(S).copy()
    for i, pa in enumerate(parents):
        if pa:
            b = np.linalg.solve(S[np.ix_(pa, pa)], S[pa, i])
            B[i, pa] = b
            psi[i] = S[i, i] - b @ S[pa, i]
    A = np.linalg.inv(np.eye(p) - B)
    implied = A @ np.diag(psi) @ A.T
    fml = np.linalg.slogdet(implied)[1] - np.linalg.slogdet(S)[1] + np.trace(S @ np.linalg.inv(implied)) - p
    t = max((n - 1) * fml, 0)
    q = sum(len(pa) for pa in parents) + p
    df = p * (p + 1) // 2 - q
    tb = (n - 1) * (np.sum(np.log(np.diag(S))) - np.linalg.slogdet(S)[1])
    dfb = p * (p - 1) / 2
    rmsea = np.sqrt(max(t - df, 0) / (df * (n - 1)))
    ci = [np.sqrt(ncp(t, df, 0.95) / (df * (n - 1))), np.sqrt(ncp(t, df, 0.05) / (df * (n - 1)))]
    cfi = 1 - max(t - df, 0) / max(tb - dfb, t - df, 1e-300)
    tli = (tb / dfb - t / df) / (tb / dfb - 1)
    iu = np.tril_indices(p)
    srmr = np.sqrt(np.mean(((S - implied) / np.sqrt(np.outer(np.diag(S), np.diag(S))))[iu] ** 2))
    return t, stats.chi2.sf(t, df), rmsea, ci, cfi, tli, srmr


def timeit(fn, min_seconds=1.0):
    reps, start = 0, time.perf_counter()
    while True:
        fn()
        reps += 1
        elapsed = time.perf_counter() - start
        if elapsed >= min_seconds:
            return elapsed / reps


def time_all(out):
    for p in (10, 30, 100):
        with open(f"{out}/model{p}.json") as f:
            m = json.load(f)
        S = np.array(m["cor"])
        print(f"BenchmarkFitDAG/p={p} {timeit(lambda: fit_dag(S, m['n'], m['parents'])):.6g}")
    data = np.loadtxt(f"{out}/ols.csv", delimiter=",", skiprows=1)
    X, y = sm.add_constant(data[:, :-1]), data[:, -1]

    def ols():
        r = sm.OLS(y, X).fit()
        return r.params, r.bse, r.pvalues

    print(f"BenchmarkOLS100kx30 {timeit(ols):.6g}")
    for n_rows, p_vars in ((10_000, 10), (10_000, 30), (100_000, 10), (100_000, 30)):
        data = np.loadtxt(f"{out}/em_{n_rows}_{p_vars}.csv", delimiter=",")
        print(f"BenchmarkEM/n={n_rows}/p={p_vars} {timeit(lambda: em(data, tol=1e-8)):.6g}")


if __name__ == "__main__":
    {"write": write, "time": time_all}[sys.argv[1]](sys.argv[2])
