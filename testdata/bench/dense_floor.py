#!/usr/bin/python3
"""The numpy floor of a summary package's screening (Debian's python3-numpy):
the local regressions that its one-edit neighbours and its claims need,
each solved on the correlation matrix with numpy.linalg, one at a time.

  - every node of the declared graph regressed on its parents;
  - every DAG one edit from the declared graph (an arrow added, removed or
    reversed; acyclic; no arrow into an exogenous variable, fixed arrows
    kept), the equations it changes refitted, and its BIC difference
    (N - 1) ln(residual variance ratio) + ln N per arrow;
  - every claim under the declared graph: a direct effect as the outcome on
    its parents, a total effect as the outcome on the cause and the
    cause's parents, an association on the cause and adjust_for, each with
    its coefficient's standard error (the inverse of the regressors'
    correlation matrix).

This is far less than pathvet computes (no class counting, no search, no
claims across classes, no report), which is why it is a floor.

Usage: dense_floor.py PACKAGE.json   -- prints "floor SECONDS REGRESSIONS CPU_SECONDS"
"""
import json
import sys
import time

import numpy as np


def load(path):
    pkg = json.load(open(path))
    names = pkg["data"]["variables"]
    p = len(names)
    r = np.eye(p)
    for i, row in enumerate(pkg["data"]["correlations"]):
        r[i, :len(row)] = row
        r[:len(row), i] = row
    index = {nm: i for i, nm in enumerate(names)}
    parents = [[] for _ in range(p)]
    for e in pkg["graph"]["edges"]:
        parents[index[e["to"]]].append(index[e["from"]])
    exo = [bool(v.get("exogenous")) for v in pkg["variables"]]
    fixed = {(index[e["from"]], index[e["to"]]) for e in pkg["graph"].get("fixed_edges", [])}
    return pkg, r, index, [sorted(ps) for ps in parents], exo, fixed, pkg["data"]["n"]


def resid(r, y, xs):
    """Residual variance of y regressed on xs (correlation scale)."""
    if not xs:
        return 1.0
    b = np.linalg.solve(r[np.ix_(xs, xs)], r[xs, y])
    return r[y, y] - r[y, xs] @ b


def reach(parents):
    p = len(parents)
    a = np.zeros((p, p), dtype=bool)
    for v, ps in enumerate(parents):
        a[ps, v] = True
    c = a | np.eye(p, dtype=bool)
    for k in range(p):  # Warshall's transitive closure
        c |= np.outer(c[:, k], c[k, :])
    return a, c


def neighbours(r, n, parents, exo, fixed, base):
    """ΔBIC of every one-edit neighbour; returns the number of regressions."""
    a, c = reach(parents)
    p, ln, count = len(parents), np.log(n), 0
    for u in range(p):
        for v in range(p):
            if u == v or a[v, u]:
                continue
            if a[u, v]:
                if (u, v) in fixed:
                    continue
                without = [q for q in parents[v] if q != u]
                d = (n - 1) * np.log(resid(r, v, without) / base[v]) - ln  # removal
                count += 1
                kids = [w for w in range(p) if a[u, w] and w != v]
                if not exo[u] and not c[kids, v].any():  # reversal: no other path u to v
                    d += (n - 1) * np.log(resid(r, u, sorted(parents[u] + [v])) / base[u]) + ln
                    count += 1
            elif not exo[v] and not c[v, u]:  # addition
                d = (n - 1) * np.log(resid(r, v, sorted(parents[v] + [u])) / base[v]) + ln
                count += 1
    return count


def claim(r, index, parents, cl):
    x, y = index[cl["from"]], index[cl["to"]]
    if cl["kind"] == "direct_effect":
        xs = parents[y]
    elif cl["kind"] == "total_effect":
        xs = [x] + parents[x]
    else:
        xs = [x] + [index[v] for v in cl.get("adjust_for", [])]
    if x not in xs:
        return 0.0, 0.0
    inv = np.linalg.inv(r[np.ix_(xs, xs)])
    b = inv @ r[xs, y]
    k = xs.index(x)
    return b[k], np.sqrt((r[y, y] - r[y, xs] @ b) * inv[k, k])


def main(path):
    pkg, r, index, parents, exo, fixed, n = load(path)
    start, cpu = time.perf_counter(), time.process_time()
    base = [resid(r, v, ps) for v, ps in enumerate(parents)]
    count = len(parents) + neighbours(r, n, parents, exo, fixed, base)
    for cl in pkg["claims"]:
        claim(r, index, parents, cl)
        count += 1
    print(f"floor {time.perf_counter() - start:.4f} {count} {time.process_time() - cpu:.4f}")


if __name__ == "__main__":
    if len(sys.argv) != 2:
        raise SystemExit(__doc__)
    main(sys.argv[1])
