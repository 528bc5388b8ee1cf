#!/usr/bin/python3
"""Outside reference for checks/nearby: likelihood-ratio statistics of nested
OLS regressions from statsmodels, for every arrow removed from and every arrow
added to a small declared DAG, on invented data drawn here (seeded).

Run with Debian's /usr/bin/python3 (apt-get install python3-statsmodels); it
writes data.csv and reference.json beside itself. The Go test
TestNeighbours_AgainstStatsmodels compares each ΔBIC with
-(N-1)/N * LR - ln N (removal) and -(N-1)/N * LR + ln N (addition): pathvet's T
is (N-1) F_ML on the n-1 covariance scale, statsmodels' LR is N ln(RSS0/RSS1).
"""
import json
import os

import numpy as np
import statsmodels.api as sm

here = os.path.dirname(os.path.abspath(__file__))
rng = np.random.default_rng(20261202)
n, p = 400, 6
# The data come from one DAG, the declared graph is another (some arrows
# wrong, some missing), so the statistics are not all near zero.
true = {1: [0], 2: [0, 1], 3: [1], 4: [2, 3], 5: [4, 0]}
x = np.zeros((n, p))
x[:, 0] = rng.normal(size=n)
for v in range(1, p):
    x[:, v] = rng.normal(size=n)
    for u in true.get(v, []):
        x[:, v] += rng.uniform(0.15, 0.45) * x[:, u]
declared = [[], [0], [1], [1, 2], [3], [4]]


def llf(v, parents):
    design = sm.add_constant(x[:, parents]) if parents else np.ones((n, 1))
    return sm.OLS(x[:, v], design).fit().llf


def reachable(parents, a, b):
    """a directed path a -> ... -> b in the DAG given by parents"""
    children = {u: [v for v in range(p) if u in parents[v]] for u in range(p)}
    stack, seen = [a], set()
    while stack:
        u = stack.pop()
        for c in children[u]:
            if c == b:
                return True
            if c not in seen:
                seen.add(c)
                stack.append(c)
    return False


edits = []
for v in range(p):
    for u in declared[v]:
        rest = [w for w in declared[v] if w != u]
        edits.append({"op": "remove", "from": u, "to": v, "lr": 2 * (llf(v, declared[v]) - llf(v, rest))})
for u in range(p):
    for v in range(p):
        adjacent = u == v or u in declared[v] or v in declared[u]
        if adjacent or reachable(declared, v, u):
            continue
        edits.append({"op": "add", "from": u, "to": v,
                      "lr": 2 * (llf(v, sorted(declared[v] + [u])) - llf(v, declared[v]))})

np.savetxt(os.path.join(here, "data.csv"), x, delimiter=",", fmt="%.17g")
with open(os.path.join(here, "reference.json"), "w") as f:
    json.dump({"source": "statsmodels %s OLS log-likelihoods" % sm.__version__ if hasattr(sm, "__version__")
               else "statsmodels OLS log-likelihoods",
               "n": n, "parents": declared, "edits": edits}, f, indent=1)
