#!/usr/bin/python3
"""Key figures of the demo reports, recomputed outside pathvet.

For each demo package in testdata/demo this script recomputes, with Debian's
python3-statsmodels, python3-scipy and numpy and none of pathvet's code:

- the complete cases of raw rows (blank cells, NA in any case and missing_codes are missing);
- every claim under the declared graph by statsmodels OLS on z-scored
  complete cases (standardized coefficients; SEs, t-based p-values and
  intervals on n - k - 1 df), or, for a correlation claim, the partial
  correlation from OLS residuals with a Fisher-z interval and p (scipy's
  normal);
- an indirect-effect claim as the sum, over the directed paths of the
  declared graph from its from to its to through all its mediators (listed
  one by one), of the products of the standardized OLS coefficients of
  each path's arrows, with its first-order delta-method SE from the
  gradient of that sum and each equation's statsmodels covariance (n - k - 1
  divisor; equations independent); its intervals are random draws and are
  not recomputed;
- the ML fit of the declared graph: the implied covariance of the
  recursive model built by matrix algebra, F_ML, chi-square = (N - 1) F_ML
  on p(p + 1)/2 - q df, its p (scipy's chi2.sf), RMSEA, CFI against the
  independence model, and the chi-square-based AIC = T + 2q and
  BIC = T + q ln N.

pathvet's conventions, which general-purpose SEM libraries may not share:
exogenous roots are independent (no covariances among them are free), no
residual covariances, the DAG's df is its number of non-adjacent pairs,
and AIC/BIC are chi-square based (they differ from log-likelihood based ones
by a constant per data set, so differences between graphs agree).

Summary-statistics demos are turned into a data set whose sample
correlation matrix is exactly the printed one (random rows, whitened, then
coloured by the Cholesky factor), so statsmodels fits the same moments.

Run with Debian's interpreter (apt-get install python3-statsmodels
python3-scipy), from this directory:

    /usr/bin/python3 make_figures.py

It writes figures.json, which checks/reference_test.go compares with the
golden reports.
"""
import csv
import json
import math
import os

import numpy as np
import scipy
import statsmodels
import statsmodels.api as sm
from scipy import stats

DEMOS = "../../demo"


def load_rows(pkg, folder):
    names = [v["name"] for v in pkg["variables"]]
    codes = set(pkg["data"].get("missing_codes", []))
    with open(os.path.join(folder, pkg["data"]["file"]), newline="") as f:
        rows = list(csv.DictReader(f))
    def value(s):
        s = s.strip()
        return math.nan if s == "" or s.upper() == "NA" or s in codes else float(s)
    x = np.array([[value(r[n]) for n in names] for r in rows])
    complete = x[~np.isnan(x).any(axis=1)]
    return names, complete, len(rows)


def exact_rows(pkg):
    """Rows whose sample correlation matrix is the printed one exactly."""
    d = pkg["data"]
    p, n = len(d["variables"]), d["n"]
    r = np.zeros((p, p))
    for i, row in enumerate(d["correlations"]):
        r[i, : len(row)] = row
    r = r + np.tril(r, -1).T
    z = np.random.default_rng(1).normal(size=(n, p))
    z -= z.mean(axis=0)
    z = z @ np.linalg.inv(np.linalg.cholesky(np.cov(z, rowvar=False)).T)
    x = z @ np.linalg.cholesky(r).T
    order = [d["variables"].index(v["name"]) for v in pkg["variables"]]
    return [v["name"] for v in pkg["variables"]], x[:, order]


def parents(pkg, node):
    return [e["from"] for e in pkg["graph"]["edges"] if e["to"] == node]


def regressors(pkg, c):
    if c["kind"] == "direct_effect":
        return [c["from"]] + [v for v in parents(pkg, c["to"]) if v != c["from"]]
    if c["kind"] == "total_effect":
        return [c["from"]] + [v for v in parents(pkg, c["from"]) if v != c["to"]]
    return [c["from"]] + c.get("adjust_for", [])


def paths(pkg, a, b):
    """Every directed path from a to b of the declared graph, as node lists."""
    if a == b:
        return [[b]]
    out = []
    for e in pkg["graph"]["edges"]:
        if e["from"] == a:
            out += [[a] + rest for rest in paths(pkg, e["to"], b)]
    return out


def indirect_figures(pkg, col, c):
    through = set(c.get("through", []))
    keep = [p for p in paths(pkg, c["from"], c["to"])
            if (through and through <= set(p[1:-1])) or (not through and len(p) > 2)]
    fits, coef, cov = {}, {}, {}
    for p in keep:
        for u, v in zip(p, p[1:]):
            if v not in fits:
                pa = parents(pkg, v)
                fits[v] = (pa, sm.OLS(col[v], sm.add_constant(np.column_stack([col[w] for w in pa]))).fit())
            pa, fit = fits[v]
            coef[(u, v)] = float(fit.params[1 + pa.index(u)])
    value, grad = 0.0, {}
    for p in keep:
        arcs = list(zip(p, p[1:]))
        value += math.prod(coef[a] for a in arcs)
        for k, a in enumerate(arcs):
            grad[a] = grad.get(a, 0.0) + math.prod(coef[o] for j, o in enumerate(arcs) if j != k)
    var = 0.0
    for v, (pa, fit) in fits.items():
        g = np.array([grad.get((u, v), 0.0) for u in pa])
        var += float(g @ fit.cov_params()[1:, 1:] @ g)
    return {"estimate": value, "std_error": math.sqrt(var), "p_value": None, "ci": None, "indirect": True,
            "paths": len(keep)}


def claim_figures(pkg, names, x, c):
    z = (x - x.mean(axis=0)) / x.std(axis=0, ddof=1)
    col = {n: z[:, i] for i, n in enumerate(names)}
    if c["kind"] == "indirect_effect":
        return indirect_figures(pkg, col, c)
    level = c.get("ci_level", 0.95)
    preds = regressors(pkg, c)
    if c.get("estimate_scale") == "correlation":
        others = sm.add_constant(np.column_stack([col[v] for v in preds[1:]])) if preds[1:] else np.ones((len(z), 1))
        ra = sm.OLS(col[c["from"]], others).fit().resid
        rb = sm.OLS(col[c["to"]], others).fit().resid
        r = float(np.corrcoef(ra, rb)[0, 1])
        se = 1 / math.sqrt(len(z) - (len(preds) - 1) - 3)
        q = stats.norm.ppf(0.5 + level / 2)
        return {"estimate": r, "std_error": None, "p_value": float(2 * stats.norm.sf(abs(math.atanh(r)) / se)),
                "ci": [math.tanh(math.atanh(r) - q * se), math.tanh(math.atanh(r) + q * se)]}
    fit = sm.OLS(col[c["to"]], sm.add_constant(np.column_stack([col[v] for v in preds]))).fit()
    lo, hi = fit.conf_int(alpha=1 - level)[1]
    return {"estimate": float(fit.params[1]), "std_error": float(fit.bse[1]), "p_value": float(fit.pvalues[1]),
            "ci": [float(lo), float(hi)], "df_resid": float(fit.df_resid)}


def dag_fit(pkg, names, x):
    nodes = [v for v in names if any(v in (e["from"], e["to"]) for e in pkg["graph"]["edges"])]
    idx = [names.index(v) for v in nodes]
    s = np.corrcoef(x[:, idx], rowvar=False)
    n, p = len(x), len(nodes)
    b, psi = np.zeros((p, p)), np.zeros(p)
    arrows = 0
    for i, v in enumerate(nodes):
        pa = [nodes.index(u) for u in parents(pkg, v)]
        arrows += len(pa)
        if pa:
            coef = np.linalg.solve(s[np.ix_(pa, pa)], s[pa, i])
            b[i, pa] = coef
            psi[i] = s[i, i] - s[i, pa] @ coef
        else:
            psi[i] = s[i, i]
    a = np.linalg.inv(np.eye(p) - b)
    sigma = a @ np.diag(psi) @ a.T
    fml = np.linalg.slogdet(sigma)[1] - np.linalg.slogdet(s)[1] + np.trace(s @ np.linalg.inv(sigma)) - p
    q = arrows + p
    t, df = max((n - 1) * fml, 0.0), p * (p + 1) // 2 - q
    out = {"n": n, "chi_square": t, "df": df, "free_parameters": q, "aic": t + 2 * q, "bic": t + q * math.log(n)}
    if df > 0:
        tb = (n - 1) * (-np.linalg.slogdet(s)[1])
        dfb = p * (p - 1) // 2
        out.update(p_value=float(stats.chi2.sf(t, df)), rmsea=math.sqrt(max(t - df, 0) / (df * (n - 1))),
                   cfi=1 - max(t - df, 0) / max(t - df, tb - dfb, 0))
    return out


def main():
    result = {"sources": {"numpy": np.__version__, "scipy": scipy.__version__, "statsmodels": statsmodels.__version__}}
    for demo in sorted(os.listdir(DEMOS)):
        folder = os.path.join(DEMOS, demo)
        with open(os.path.join(folder, "package.json")) as f:
            pkg = json.load(f)
        entry = {}
        if pkg["data"]["kind"] == "rows":
            names, x, rows = load_rows(pkg, folder)
            entry.update(rows=rows, complete_cases=len(x))
        else:
            names, x = exact_rows(pkg)
        entry["claims"] = {c["id"]: claim_figures(pkg, names, x, c) for c in pkg["claims"]}
        entry["fit"] = dag_fit(pkg, names, x)
        result[demo] = entry
    with open("figures.json", "w") as f:
        json.dump(result, f, indent=1, sort_keys=True)
        f.write("\n")


main()
