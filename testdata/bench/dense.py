#!/usr/bin/python3
"""The dense summary package: a complete DAG on 100 invented variables
(every earlier variable a parent of every later one, 4,950 arrows), 200
claims, and the correlation matrix of 2,000 cases drawn from a linear path
model on that graph, printed to four decimals and positive definite
(checked). Invented for the benchmark; no study's data. Needs Debian's
python3-numpy.

Usage: dense.py DIR [P [CLAIMS]]   -- writes DIR/package.json
"""
import json
import sys

import numpy as np

N = 2000


def correlations(p, rng):
    """Sample correlations of a linear path model on the complete DAG: each
    variable a sum of small random effects of every earlier one plus noise."""
    b = np.tril(rng.normal(0, 0.6 / np.sqrt(p), size=(p, p)), -1)
    x = rng.normal(size=(N, p)) @ np.linalg.inv(np.eye(p) - b).T
    r = np.round(np.corrcoef(x, rowvar=False), 4)
    np.linalg.cholesky(r)  # raises unless the printed matrix is positive definite
    return r


def claims(p, k, names, rng):
    kinds = ("direct_effect", "total_effect", "association")
    out = []
    pairs = set()
    while len(out) < k:
        i, j = sorted(int(v) for v in rng.choice(p, size=2, replace=False))
        if (i, j) in pairs:
            continue
        pairs.add((i, j))
        kind = kinds[len(out) % 3]
        c = {"id": f"C{len(out) + 1}", "text": f"{names[i]} changes {names[j]}", "kind": kind,
             "from": names[i], "to": names[j], "estimate": round(float(rng.normal(0, 0.1)), 3),
             "estimate_scale": "standardized", "std_error": 0.022, "p_value": 0.05, "p_relation": "<",
             "headline": len(out) == 0}
        if kind == "association":
            c["adjust_for"] = [names[m] for m in sorted(rng.choice([m for m in range(p) if m not in (i, j)],
                                                                   size=3, replace=False))]
        out.append(c)
    return out


def main(out, p=100, k=200):
    rng = np.random.default_rng(20261)
    names = [f"v{j + 1:03d}" for j in range(p)]
    r = correlations(p, rng)
    pkg = {
        "format_version": 1,
        "title": "Benchmark: a complete graph on 100 invented measures (not a study)",
        "design": "observational",
        "variables": [{"name": nm, "label": f"Invented measure {nm}", "scale": "continuous"} for nm in names],
        "graph": {"edges": [{"from": names[i], "to": names[j]} for j in range(p) for i in range(j)],
                  "justification": "Invented for the benchmark: every measure may affect every later one."},
        "claims": claims(p, k, names, rng),
        "missing_data": {"method": "none"},
        "data": {"kind": "summary", "n": N, "variables": names,
                 "correlations": [[float(v) for v in r[i, :i + 1]] for i in range(p)]},
    }
    with open(f"{out}/package.json", "w") as f:
        json.dump(pkg, f, indent=0)


if __name__ == "__main__":
    if len(sys.argv) < 2:
        raise SystemExit(__doc__)
    main(sys.argv[1], *(int(a) for a in sys.argv[2:]))
