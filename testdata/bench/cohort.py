#!/usr/bin/python3
"""The cohort-scale missing-data benchmark: an invented cohort of 100,000
rows and 30 variables from a linear path model, and a straightforward numpy
EM to time beside pathvet's (Debian's python3-numpy).

Usage: cohort.py write DIR CASE [ROWS]  -- DIR/package.json, DIR/rows.csv
           CASE "patterns": 20% of the values missing completely at random
           in 5 columns (32 patterns); "cells": 10% of all cells missing
           completely at random (nearly every row its own pattern);
           "patterns-binary", "cells-binary": the same, with 10% of the
           binary x01 missing too, so that the imputations keep their rows;
           "cells-binary-outcome": cells-binary with x30 dichotomized at 0,
           so that claim C1 is an odds ratio fitted by logistic regression
           in every imputation (the costliest case for memory)
       cohort.py em DIR                 -- prints "numpy_em SECONDS ITERATIONS"
"""
import io
import json
import re
import sys
import time

import numpy as np

from numpy_em import em

P = 30
MISSING_COLUMNS = (5, 11, 17, 23, 29)


def model(rng):
    """A DAG over x01..x30: each variable has up to two earlier parents."""
    parents = [[] for _ in range(P)]
    for j in range(1, P):
        k = min(j, 1 + int(rng.integers(0, 2)))
        parents[j] = sorted(int(i) for i in rng.choice(j, size=k, replace=False))
    return parents


def simulate(n, parents, rng):
    x = np.empty((n, P))
    x[:, 0] = rng.uniform(size=n) < 0.4  # a binary exogenous variable
    for j in range(1, P):
        x[:, j] = rng.normal(size=n)
        for i in parents[j]:
            x[:, j] += 0.35 * (x[:, i] - x[:, i].mean()) / x[:, i].std()
    return x


def hide(x, case, rng):
    if case.endswith("-outcome"):
        case = case.removesuffix("-outcome")
        x[:, P - 1] = x[:, P - 1] > 0
    if case.endswith("-binary"):
        case = case.removesuffix("-binary")
        x[rng.uniform(size=len(x)) < 0.1, 0] = np.nan
    if case == "patterns":
        for j in MISSING_COLUMNS:
            x[rng.uniform(size=len(x)) < 0.2, j] = np.nan
    elif case == "cells":
        x[:, 1:][rng.uniform(size=(len(x), P - 1)) < 0.1] = np.nan
    else:
        raise SystemExit(f"unknown case {case}")


def std_coef(x, y, parents):
    ok = ~np.isnan(x[:, [y] + parents]).any(axis=1)
    d = x[ok][:, [y] + parents]
    d = (d - d.mean(axis=0)) / d.std(axis=0, ddof=1)
    b, *_ = np.linalg.lstsq(d[:, 1:], d[:, 0], rcond=None)
    resid = d[:, 0] - d[:, 1:] @ b
    s2 = resid @ resid / (len(d) - len(parents) - 1)
    se = np.sqrt(np.diag(s2 * np.linalg.inv(d[:, 1:].T @ d[:, 1:])))
    return float(b[0]), float(se[0])


def write(out, case, n):
    rng = np.random.default_rng(20260)
    parents = model(rng)
    x = simulate(n, parents, rng)
    hide(x, case, rng)
    names = [f"x{j + 1:02d}" for j in range(P)]
    with open(f"{out}/rows.csv", "w") as f:
        f.write(",".join(names) + "\n")
        for start in range(0, n, 100_000):  # in chunks, to keep memory down at 2,000,000 rows
            buf = io.StringIO()
            np.savetxt(buf, x[start:start + 100_000], delimiter=",", fmt="%.6g")
            f.write(re.sub(r"\bnan\b", "", buf.getvalue()))  # a missing value is an empty cell
    claims = []
    for k, y in enumerate((29, 23, 17)):
        focal = parents[y][0]
        others = [focal] + [i for i in parents[y] if i != focal]
        b, se = std_coef(x, y, others)
        claims.append({"id": f"C{k + 1}", "text": f"{names[focal]} raises {names[y]}", "kind": "direct_effect",
                       "from": names[focal], "to": names[y], "estimate": round(b, 3),
                       "estimate_scale": "standardized", "std_error": round(se, 4),
                       "ci": [round(b - 1.96 * se, 3), round(b + 1.96 * se, 3)], "p_value": 0.001,
                       "p_relation": "<", "headline": k == 0})
        if case.endswith("-outcome") and y == P - 1:  # an odds ratio, its figures only roughly reported
            claims[-1].update(estimate=1.5, estimate_scale="odds_ratio", ci=[1.3, 1.7])
            del claims[-1]["std_error"]
    pkg = {
        "format_version": 1,
        "title": "Benchmark cohort: 30 invented measures on 100,000 people (not a study)",
        "design": "observational",
        "variables": [{"name": nm, "label": f"Invented measure {nm}",
                       "scale": "binary" if j == 0 or j == P - 1 and case.endswith("-outcome") else "continuous",
                       **({"exogenous": True} if j == 0 else {})} for j, nm in enumerate(names)],
        "graph": {"edges": [{"from": names[i], "to": names[j]} for j in range(P) for i in parents[j]],
                  "justification": "Invented for the benchmark: each measure follows its parents in time."},
        "claims": claims,
        "missing_data": {"method": "complete_cases"},
        "data": {"kind": "rows", "file": "rows.csv"},
    }
    with open(f"{out}/package.json", "w") as f:
        json.dump(pkg, f, indent=1)


def time_em(out):
    x = np.genfromtxt(f"{out}/rows.csv", delimiter=",", skip_header=1)  # empty cells read as nan
    start = time.perf_counter()
    _, _, it = em(x, tol=1e-10)
    print(f"numpy_em {time.perf_counter() - start:.4f} {it}")


if __name__ == "__main__":
    if sys.argv[1] == "write":
        write(sys.argv[2], sys.argv[3], int(sys.argv[4]) if len(sys.argv) > 4 else 100_000)
    elif sys.argv[1] == "em":
        time_em(sys.argv[2])
    else:
        raise SystemExit(__doc__)
