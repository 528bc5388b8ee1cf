"""Reference values of the noncentral t from scipy.stats.nct (Debian's
python3-scipy), for checks/effects: the CDF at small and large df, and
the power of the two-sided t test at alpha, P(T' > c) + P(T' < -c) with
c = t.ppf(1 - alpha/2, df) and T' noncentral t with noncentrality ncp.
scipy's power carries the error of its t quantile, up to 1e-9 at df 3 and
5 (its power at ncp 0 is alpha + 5e-11 there), so each power is also
given as power_quadrature: the same formula at 30 digits by mpmath, c by
root-finding on mpmath's incomplete beta, the CDF by quadrature.

Run from this directory with Debian's /usr/bin/python3:

    /usr/bin/python3 nct_reference.py

It writes nct_reference.json. scipy's nct (Boost) warns of divisions by
zero inside its series at small df; every CDF at df <= 300 is checked
here against an independent evaluation, mpmath's quadrature at 30 digits
of P(T' <= t) = int_0^inf Phi(t s / sqrt(df) - ncp) chi_df(s) ds, and
the script stops if any differs by more than 1e-12."""
import json
import warnings

import mpmath
import scipy
from scipy import stats

warnings.simplefilter("ignore", RuntimeWarning)
mpmath.mp.dps = 30


def cdf_by_quadrature(t, df, ncp):
    df, t, ncp = mpmath.mpf(df), mpmath.mpf(t), mpmath.mpf(ncp)
    c = 1 / (2 ** (df / 2 - 1) * mpmath.gamma(df / 2))
    m = mpmath.sqrt(df)
    return mpmath.quad(lambda s: mpmath.ncdf(t * s / m - ncp) * c * s ** (df - 1) * mpmath.exp(-s * s / 2),
                       [0, max(m - 20, 0), m, m + 20, mpmath.inf])


DFS = [1, 2, 3, 5, 30, 300, 1e5, 1e6]
cdf = [{"t": t, "df": df, "ncp": ncp, "cdf": float(stats.nct.cdf(t, df, ncp))}
       for df in DFS
       for ncp in [0.0, 0.3, 1.0, 2.5, -1.5, 8.0, 36.0, 38.0, 45.0]
       for t in [-3.0, -0.5, 0.0, 0.7, 2.0, 6.0, 12.706, 40.0]]
for c in cdf:
    if c["df"] <= 300:
        assert abs(c["cdf"] - float(cdf_by_quadrature(c["t"], c["df"], c["ncp"]))) < 1e-12, c


def t_quantile(q, df):
    df = mpmath.mpf(df)
    return mpmath.findroot(lambda x: 1 - mpmath.betainc(df / 2, 0.5, 0, df / (df + x * x), regularized=True) / 2 - q,
                           2)


def power_by_quadrature(ncp, df, a):
    c = t_quantile(1 - mpmath.mpf(a) / 2, df)
    return float(1 - cdf_by_quadrature(c, df, ncp) + cdf_by_quadrature(-c, df, ncp))


power = [{"ncp": ncp, "df": df, "alpha": a,
          "power": float(stats.nct.sf(stats.t.ppf(1 - a / 2, df), df, ncp)
                         + stats.nct.cdf(-stats.t.ppf(1 - a / 2, df), df, ncp)),
          "power_quadrature": power_by_quadrature(ncp, df, a)}
         for df in DFS
         for ncp in [0.0, 0.1, 0.5, 1.0, 2.0, 2.8, 4.0, 10.0, 40.0]
         for a in [0.05, 0.01]]
with open("nct_reference.json", "w") as f:
    json.dump({"source": "scipy " + scipy.__version__ + " stats.nct", "cdf": cdf, "power": power}, f, indent=1)
    f.write("\n")
