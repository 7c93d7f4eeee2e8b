"""Fixtures for the cross-sectional statistics (CrossSectionalStatisticsTest), written from the formulas, not from
the Java:

1. fama_macbeth.json: 48 generated periods of cross-sections (8 to 40 securities, 3 characteristics, positive
   weights). Per period the slopes come from numpy.linalg.lstsq on [1, X] (ordinary least squares) and on the rows
   scaled by sqrt(w) (weighted least squares), r_squared = 1 - SSR/SST with SST about the (weighted) mean, and the
   z-scored regressors (mean, standard deviation with ddof=1). The time series of slopes is summarised with numpy
   (mean, std ddof=1, t = mean/(std/sqrt(T))) and statsmodels: OLS of the slope series on a constant with
   cov_type="HAC", maxlags=floor(4 (T/100)^(2/9)), use_correction=False gives the Newey-West t; scipy.stats.norm
   the two-sided p-value. A period with n <= k + 1 and one with a duplicated column are there to be skipped.
2. grs.json: 144 generated months of 6 test assets on 3 factors with small alphas. Per asset statsmodels OLS gives
   alpha, its OLS t, betas and R^2; statsmodels OLS with cov_type="HAC", maxlags=floor(4 (T/100)^(2/9)),
   use_correction=False gives the Newey-West t of alpha; residual_vol = sqrt(SSR/(T-L-1)). The GRS statistic is
   numpy arithmetic on the formula of Gibbons, Ross and Shanken (1989) as Campbell, Lo and MacKinlay (1997, ch. 6)
   write it, GRS = (T-N-L)/N * a' S^-1 a / (1 + mu' O^-1 mu) with S and O the maximum-likelihood (divide by T)
   residual and factor covariances, and its p-value is scipy.stats.f.sf(GRS, N, T-N-L).
3. monotonicity.json: 5 generated bucket series (monthly, some months missing in two buckets); per step the series
   s*(r_{j+1}-r_j) on common months with mean and statsmodels HAC t, per bucket mean and HAC t, and
   scipy.stats.spearmanr(s*j, bucket means) for both directions.

Rerun from the repository root with Debian's python3-numpy, python3-scipy, python3-pandas and python3-statsmodels:
    /usr/bin/python3 service/src/test/scripts/cross_sectional_fixtures.py
"""
import json
import math
from pathlib import Path

import numpy as np
import pandas as pd
import statsmodels.api as sm
from scipy import stats

FIXTURES = Path(__file__).resolve().parent.parent / "resources" / "fixtures"


def nw_lags(n):
    return int(math.floor(4 * (n / 100.0) ** (2.0 / 9.0)))


def hac_mean_t(values):
    values = np.asarray(values, dtype=float)
    fit = sm.OLS(values, np.ones(len(values))).fit(
        cov_type="HAC", cov_kwds={"maxlags": nw_lags(len(values)), "use_correction": False})
    return float(fit.tvalues[0])


def summary(values):
    values = np.asarray(values, dtype=float)
    n = len(values)
    mean = float(values.mean())
    sd = float(values.std(ddof=1))
    nw_t = hac_mean_t(values)
    return {"n": n, "mean": mean, "stdev": sd, "t_stat": mean / (sd / math.sqrt(n)), "nw_t_stat": nw_t,
            "nw_lags": nw_lags(n), "p_value": float(2 * stats.norm.sf(abs(nw_t))),
            "share_positive": float((values > 0).mean())}


def wls(y, x, w):
    s = np.sqrt(w)
    design = np.column_stack([np.ones(len(y)), x])
    coef, _, rank, _ = np.linalg.lstsq(design * s[:, None], y * s, rcond=None)
    if rank < design.shape[1]:
        return None
    u = y - design @ coef
    mean = np.sum(w * y) / np.sum(w)
    return coef, 1 - np.sum(w * u * u) / np.sum(w * (y - mean) ** 2)


def zscore(x):
    return (x - x.mean(axis=0)) / x.std(axis=0, ddof=1)


def fama_macbeth_fixture():
    rng = np.random.default_rng(1973)
    periods = []
    results = {"equal": [], "weighted": [], "standardized": []}
    k = 3
    for p in range(48):
        n = int(rng.integers(8, 41))
        if p == 7:
            n = k + 1  # too few securities: skipped
        x = rng.normal(size=(n, k)) * [1.0, 0.5, 2.0] + [0.2, 0.0, -1.0]
        if p == 19:
            x[:, 2] = 2.0 * x[:, 0]  # rank deficient: skipped
        w = np.exp(rng.normal(size=n))
        y = 0.01 + x @ np.array([0.004, -0.002, 0.001]) + rng.normal(scale=0.03, size=n)
        periods.append({"y": y.tolist(), "x": [x[:, j].tolist() for j in range(k)], "weights": w.tolist()})
        for name, xx, ww in [("equal", x, np.ones(n)), ("weighted", x, w), ("standardized", None, np.ones(n))]:
            if name == "standardized":
                xx = zscore(x) if n > 1 else x
            fit = None if n <= k + 1 else wls(y, xx, ww)
            results[name].append(None if fit is None else {"coefficients": fit[0].tolist(), "r_squared": float(fit[1])})
    out = {"periods": periods}
    for name, fits in results.items():
        used = [f for f in fits if f is not None]
        slopes = np.array([f["coefficients"] for f in used])
        out[name] = {
            "fits": fits,
            "summary": [summary(slopes[:, j]) for j in range(k + 1)],
            "mean_r_squared": float(np.mean([f["r_squared"] for f in used])),
        }
    return out


def grs_fixture():
    rng = np.random.default_rng(1989)
    t, n, l = 144, 6, 3
    f = rng.normal(size=(t, l)) * [0.045, 0.03, 0.025] + [0.006, 0.002, 0.003]
    betas = rng.normal(size=(l, n)) * 0.4 + [[1.0], [0.2], [0.1]]
    alphas = rng.normal(size=n) * 0.002
    e = rng.normal(size=(t, n)) * 0.02
    for s in range(1, t):
        e[s] += 0.3 * e[s - 1]
    r = alphas + f @ betas + e
    design = sm.add_constant(f)
    regressions = []
    residuals = np.zeros((t, n))
    for i in range(n):
        ols = sm.OLS(r[:, i], design).fit()
        hac = sm.OLS(r[:, i], design).fit(cov_type="HAC", cov_kwds={"maxlags": nw_lags(t), "use_correction": False})
        residuals[:, i] = ols.resid
        regressions.append({"alpha": float(ols.params[0]), "alpha_t": float(ols.tvalues[0]),
                            "alpha_nw_t": float(hac.tvalues[0]), "betas": ols.params[1:].tolist(),
                            "r_squared": float(ols.rsquared),
                            "residual_vol": float(np.sqrt(np.sum(ols.resid ** 2) / (t - l - 1)))})
    a = np.array([reg["alpha"] for reg in regressions])
    sigma = residuals.T @ residuals / t
    mu = f.mean(axis=0)
    omega = (f - mu).T @ (f - mu) / t
    grs = (t - n - l) / n * (a @ np.linalg.solve(sigma, a)) / (1 + mu @ np.linalg.solve(omega, mu))
    return {"assets": [r[:, i].tolist() for i in range(n)], "factors": [f[:, j].tolist() for j in range(l)],
            "grs": float(grs), "p_value": float(stats.f.sf(grs, n, t - n - l)), "nw_lags": nw_lags(t),
            "mean_abs_alpha": float(np.abs(a).mean()),
            "mean_r_squared": float(np.mean([reg["r_squared"] for reg in regressions])),
            "regressions": regressions}


def monotonicity_fixture():
    rng = np.random.default_rng(2010)
    months = pd.date_range("2001-01-31", periods=96, freq="M")
    buckets = []
    for j in range(5):
        s = pd.Series(0.004 + 0.002 * j + rng.normal(scale=0.03, size=len(months)), index=months)
        if j == 1:
            s = s.drop(months[[3, 4, 50]])
        if j == 3:
            s = s.drop(months[[10, 90]])
        buckets.append(s)
    out = {"buckets": [{"dates": [d.strftime("%Y-%m-%d") for d in b.index], "values": b.tolist()} for b in buckets]}
    for name, sign in [("high_minus_low", 1.0), ("low_minus_high", -1.0)]:
        steps = []
        for j in range(4):
            both = pd.concat([buckets[j + 1], buckets[j]], axis=1, join="inner")
            diff = sign * (both.iloc[:, 0] - both.iloc[:, 1])
            steps.append({"n": len(diff), "mean": float(diff.mean()), "nw_t_stat": hac_mean_t(diff.values)})
        means = [float(b.mean()) for b in buckets]
        rho = stats.spearmanr([sign * (j + 1) for j in range(5)], means).correlation
        out[name] = {"steps": steps, "rank_correlation": float(rho),
                     "bucket_means": means, "bucket_nw_t": [hac_mean_t(b.values) for b in buckets]}
    return out


def main():
    for name, payload in [("fama_macbeth.json", fama_macbeth_fixture()), ("grs.json", grs_fixture()),
                          ("monotonicity.json", monotonicity_fixture())]:
        (FIXTURES / name).write_text(json.dumps(payload, indent=1) + "\n")
        print("wrote", FIXTURES / name)


if __name__ == "__main__":
    main()
