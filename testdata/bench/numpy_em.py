"""A straightforward numpy EM for the multivariate normal, timed beside
pathvet's by testdata/bench/cohort.py and reference_bench.py (Debian's
python3-numpy)."""
import numpy as np


def em(x, tol, max_iter=1000):
    """EM for the multivariate normal, rows grouped by pattern, the E-step
    through the precision matrix and matrix products per pattern; stops
    when no mean or covariance changes by tol relative to the SDs (the
    rule pathvet uses), from the observed means and variances."""
    n, p = x.shape
    miss = np.isnan(x)
    keys, inverse = np.unique(miss, axis=0, return_inverse=True)
    groups = [(keys[k], x[inverse.ravel() == k]) for k in range(len(keys))]
    mu = np.nanmean(x, axis=0)
    sigma = np.diag(np.nanvar(x, axis=0))
    for it in range(1, max_iter + 1):
        prec = np.linalg.inv(sigma)
        t1, t2 = np.zeros(p), np.zeros((p, p))
        for m, rows in groups:
            o = ~m
            filled = rows.copy()
            if m.any():
                c = np.linalg.inv(prec[np.ix_(m, m)])
                b = -c @ prec[np.ix_(m, o)]
                filled[:, m] = mu[m] + (rows[:, o] - mu[o]) @ b.T
                t2[np.ix_(m, m)] += len(rows) * c
            t1 += filled.sum(axis=0)
            t2 += filled.T @ filled
        mu2 = t1 / n
        sigma2 = t2 / n - np.outer(mu2, mu2)
        sd = np.sqrt(np.diag(sigma))
        change = max(np.max(np.abs(mu2 - mu) / sd), np.max(np.abs(sigma2 - sigma) / np.outer(sd, sd)))
        mu, sigma = mu2, sigma2
        if change < tol:
            return mu, sigma, it
    return mu, sigma, max_iter
