#!/usr/bin/env python3
"""Newey-West t-statistics of a mean, computed with statsmodels, for NeweyWestTest.

What: for seeded AR(1) series (n = 60, 250, 1000) and lags 0, 1, 5 and the automatic choice, the t-statistic
of the constant in an OLS of r on a constant with cov_type="HAC", cov_kwds={"maxlags": L, "use_correction": False},
use_t=False (normal inference), and its two-sided p-value.

Why this matches our formula (checked in statsmodels 0.13.5, stats/sandwich_covariance.py):
  weights_bartlett(L) = 1 - arange(L+1)/(L+1)               -> Bartlett weights 1 - l/(L+1)
  S_hac_simple(x, L)  = x'x + sum_l w_l (x[l:]'x[:-l] + transpose) with x = exog * resid = e_t
  cov_hac_simple      = (X'X)^-1 S (X'X)^-1 = S / n^2, times n/(n-k) only when use_correction is true
so var(mean) = [sum e^2 + 2 sum_l (1 - l/(L+1)) sum_t e_t e_{t-l}] / n^2, the formula in NeweyWest.java.
The automatic case calls sandwich_covariance.cov_hac(res, nlags=None, use_correction=False), whose default lag
count is statsmodels' own floor(4 (T/100)^(2/9)).
Also: 2 * scipy.stats.norm.sf(|t|) for a few t, to check that small p-values keep their precision.

Library: Debian python3-statsmodels, python3-scipy, python3-numpy.
Rerun from the repository root:  python3 service/src/test/scripts/newey_west_fixtures.py
Writes service/src/test/resources/fixtures/newey_west.json
"""
import json
import os

import numpy as np
import scipy.stats
import statsmodels.api as sm
from statsmodels.stats import sandwich_covariance

OUT = os.path.join(os.path.dirname(__file__), "..", "resources", "fixtures", "newey_west.json")


def ar1(n, phi, mu, sigma, seed):
    rng = np.random.default_rng(seed)
    eps = rng.normal(0.0, sigma, n)
    r = np.empty(n)
    prev = 0.0
    for t in range(n):
        prev = phi * prev + eps[t]
        r[t] = mu + prev
    return r


def hac_t(r, lags):
    X = np.ones((len(r), 1))
    if lags is None:
        res = sm.OLS(r, X).fit()
        cov = sandwich_covariance.cov_hac(res, nlags=None, use_correction=False)
        t = res.params[0] / np.sqrt(cov[0, 0])
        return float(t), float(2 * scipy.stats.norm.sf(abs(t)))
    res = sm.OLS(r, X).fit(cov_type="HAC", cov_kwds={"maxlags": lags, "use_correction": False}, use_t=False)
    return float(res.tvalues[0]), float(res.pvalues[0])


def main():
    specs = [
        ("ar1_n60", 60, 0.30, 0.004, 0.02, 11),
        ("ar1_n250", 250, 0.15, 0.0008, 0.01, 22),
        ("ar1_n1000", 1000, -0.20, 0.0003, 0.01, 33),
    ]
    series, cases = [], []
    for name, n, phi, mu, sigma, seed in specs:
        r = ar1(n, phi, mu, sigma, seed)
        series.append({"name": name, "values": [float(v) for v in r]})
        for lags in (0, 1, 5, None):
            t, p = hac_t(r, lags)
            cases.append({
                "series": name,
                "lags": lags,
                "statsmodels_default_lags": int(np.floor(4 * (n / 100.0) ** (2.0 / 9.0))) if lags is None else None,
                "mean": float(np.mean(r)),
                "t": t,
                "p": p,
            })
    p_values = [{"t": t, "p": float(2 * scipy.stats.norm.sf(abs(t)))} for t in (0.0, 0.5, -1.96, 3.0, 10.0, -20.0, 37.0)]
    with open(OUT, "w") as f:
        json.dump({"source": "statsmodels " + sm.__version__ + " OLS HAC, scipy " + scipy.__version__,
                   "series": series, "cases": cases, "p_values": p_values}, f, separators=(",", ":"))
        f.write("\n")


if __name__ == "__main__":
    main()
