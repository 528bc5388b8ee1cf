#!/usr/bin/python3
"""Reference values from Debian's python3-statsmodels and python3-scipy.

Writes regression.csv (a simulated dataset, seeded) and reference.json (the
fits and distribution values the Go tests compare against). Run with
Debian's interpreter, which has the packages:

    apt-get install python3-statsmodels python3-scipy
    cd testdata/reference/scipy && /usr/bin/python3 make_reference.py
"""
import json

import numpy as np
import scipy
import statsmodels
import statsmodels.api as sm
from scipy import stats

rng = np.random.default_rng(20261201)
n = 300
x1 = rng.normal(size=n)
x2 = 0.5 * x1 + rng.normal(size=n)
x3 = rng.normal(size=n)
y = 1.0 + 0.4 * x1 - 0.3 * x2 + 0.1 * x3 + rng.normal(scale=1.5, size=n)
eta = -0.3 + 0.8 * x1 - 0.5 * x2
yb = (rng.uniform(size=n) < 1 / (1 + np.exp(-eta))).astype(int)

with open("regression.csv", "w") as f:
    f.write("x1,x2,x3,y,yb\n")
    for row in zip(x1, x2, x3, y, yb):
        f.write(",".join(repr(float(v)) for v in row[:4]) + f",{row[4]}\n")

X = sm.add_constant(np.column_stack([x1, x2, x3]))
ols = sm.OLS(y, X).fit()
logit = sm.Logit(yb, sm.add_constant(np.column_stack([x1, x2]))).fit(disp=0, tol=1e-12, maxiter=200)

def partial_r(a, b, given):
    Z = sm.add_constant(np.column_stack(given))
    ra = a - Z @ np.linalg.lstsq(Z, a, rcond=None)[0]
    rb = b - Z @ np.linalg.lstsq(Z, b, rcond=None)[0]
    return float(np.corrcoef(ra, rb)[0, 1])

# The worked path-model example of reference-values.md: X ⊥ Y | M with
# r_XM = .5, r_XY = .3, r_MY = .4, N = 200 (Fisher z, SE 1/sqrt(N − 1 − 3)).
pr = (.3 - .5 * .4) / np.sqrt((1 - .5 ** 2) * (1 - .4 ** 2))
p_worked = 2 * stats.norm.sf(np.arctanh(pr) * np.sqrt(200 - 1 - 3))

ref = {
    "versions": {"scipy": scipy.__version__, "statsmodels": statsmodels.__version__, "numpy": np.__version__},
    "ols": {"params": ols.params.tolist(), "bse": ols.bse.tolist(), "pvalues": ols.pvalues.tolist(),
            "conf_int": ols.conf_int(0.05).tolist(), "rsquared": ols.rsquared, "df_resid": ols.df_resid},
    "logit": {"params": logit.params.tolist(), "bse": logit.bse.tolist(), "pvalues": logit.pvalues.tolist(),
              "conf_int": logit.conf_int(0.05).tolist(), "llf": logit.llf, "llnull": logit.llnull,
              "llr": logit.llr, "llr_pvalue": logit.llr_pvalue},
    "worked_example": {"partial_r": pr, "p": p_worked, "shipley_c": -2 * np.log(p_worked),
                       "shipley_p": stats.chi2.sf(-2 * np.log(p_worked), 2)},
    "partial_r_x1_y_given_x2_x3": partial_r(x1, y, [x2, x3]),
    "chi2_sf": [{"x": x, "df": df, "sf": stats.chi2.sf(x, df)} for x, df in
                [(3.1841, 1), (95.129, 3), (5.1487, 2), (12.0, 7), (250.0, 200), (0.5, 4)]],
    "ncx2_cdf": [{"x": x, "df": df, "nc": nc, "cdf": stats.ncx2.cdf(x, df, nc)} for x, df, nc in
                 [(3.1841, 1, 0.5), (3.1841, 1, 9.0), (20.0, 5, 10.0), (150.0, 100, 40.0), (900.0, 800, 300.0)]],
    "ncx2_ppf": [{"q": q, "df": df, "nc": nc, "ppf": stats.ncx2.ppf(q, df, nc)} for q, df, nc in
                 [(0.05, 1, 2.0), (0.95, 1, 2.0), (0.05, 10, 25.0), (0.95, 40, 60.0)]],
    "t_two_sided_p": [{"t": t, "df": df, "p": 2 * stats.t.sf(abs(t), df)} for t, df in
                      [(2.1, 10), (-3.5, 25), (1.96, 1000), (0.4, 3), (6.2, 296)]],
    "t_quantile": [{"q": q, "df": df, "x": stats.t.ppf(q, df)} for q, df in [(0.975, 10), (0.975, 296), (0.95, 3), (0.975, 1e5), (0.995, 1e6), (0.975, 1e9), (0.975, 1e15), (1e-10, 50)]],
    # Power of the two-sided Fisher-z test of a correlation rho with n cases:
    # P(|Z| > z_crit) with Z ~ N(atanh(rho) sqrt(n - 3), 1).
    "power_fisher_z": [{"rho": r, "n": n, "alpha": a,
                        "power": stats.norm.sf(stats.norm.ppf(1 - a / 2) - np.arctanh(r) * np.sqrt(n - 3))
                                 + stats.norm.cdf(-stats.norm.ppf(1 - a / 2) - np.arctanh(r) * np.sqrt(n - 3))}
                       for r, n, a in [(0.1, 300, 0.05), (0.2, 100, 0.05), (0.3, 84, 0.05), (0.1, 1000, 0.01)]],
    # Far tails (issue: tails taken as 1 - CDF underflow to 0 past |z| ~ 8):
    # survival functions down to 1e-300, and t with very many df.
    "norm_sf_tail": [{"z": z, "sf": stats.norm.sf(z)} for z in [5.0, 8.5, 10.0, 15.0, 20.0, 30.0, 37.5]],
    "t_sf_tail": [{"t": t, "df": df, "sf": stats.t.sf(t, df)} for t, df in
                  [(12.0, 5), (40.0, 30), (30.0, 296), (25.0, 2000), (5.0, 1e6), (12.0, 1e6), (30.0, 1e6), (5.0, 1e5), (30.0, 1e5), (5.0, 1e9), (37.0, 1e9),
                   (20.0, 1e12), (5.0, 1e15), (30.0, 1e15)]],
    "chi2_sf_tail": [{"x": x, "df": df, "sf": stats.chi2.sf(x, df)} for x, df in
                     [(300.0, 2), (500.0, 10), (1000.0, 50), (1200.0, 1), (2500.0, 400)]],
    # The noncentral chi-square on both sides of the switch to Sankaran's
    # approximation in ../../../checks/sem/ncx2.go (lambda = 2000), and far
    # past it, for quantiles near the 5th and 95th percentile.
    "ncx2_cdf_switch": [{"x": float(stats.ncx2.ppf(q, df, nc)), "df": df, "nc": nc, "q": q,
                         "cdf": stats.ncx2.cdf(stats.ncx2.ppf(q, df, nc), df, nc)} for q, df, nc in
                        [(q, df, nc) for q in (0.05, 0.5, 0.95) for df in (1, 10, 200)
                         for nc in (1999.0, 2001.0, 2e4, 1e6)]],
    # Power of the two-sided t test on df degrees of freedom to detect an
    # effect delta/se standard errors from zero: exact, by the noncentral t.
    "power_t": [{"ncp": ncp, "df": df, "alpha": a,
                 "power": stats.nct.sf(stats.t.ppf(1 - a / 2, df), df, ncp)
                          + stats.nct.cdf(-stats.t.ppf(1 - a / 2, df), df, ncp)}
                for ncp, df, a in [(1.0, 20, 0.05), (2.8, 20, 0.05), (2.0, 50, 0.05), (3.5, 97, 0.01),
                                   (1.5, 296, 0.05), (2.5, 1e6, 0.05)]],
    # Two one-sided tests under t: max(P(T > (b + d)/se), P(T < (b - d)/se)).
    "tost_t": [{"b": b, "se": se, "delta": d, "df": df,
                "p": max(stats.t.sf((b + d) / se, df), stats.t.cdf((b - d) / se, df))}
               for b, se, d, df in [(0.02, 0.03, 0.1, 30), (0.02, 0.08, 0.1, 12), (-0.05, 0.02, 0.1, 197)]],
    # Shipley's C over three Fisher-z tests far in the tail (z = 8.5, 10, 12):
    # C = -2 sum ln p with p = 2 norm.sf(z), and P(chi2 on 6 df > C).
    "shipley_tiny": {"z": [8.5, 10.0, 12.0],
                     "c": float(-2 * sum(np.log(2 * stats.norm.sf(z)) for z in [8.5, 10.0, 12.0])),
                     "p": float(stats.chi2.sf(-2 * sum(np.log(2 * stats.norm.sf(z)) for z in [8.5, 10.0, 12.0]), 6))},
    "z_two_sided_p": [{"z": z, "p": 2 * stats.norm.sf(abs(z))} for z in [4.125, 1.0, 2.5758293035489]],
}
with open("reference.json", "w") as f:
    json.dump(ref, f, indent=1)
    f.write("\n")
