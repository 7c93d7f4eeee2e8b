"""Fixture for SecurityLoadingsFixtureTest: rolling security loadings by numpy.linalg.lstsq.

A generated panel (invented securities SEC01..SEC10, 60 business days) with missing returns, securities that enter
late or leave early, and three factor return series each missing one grid date (the third also has a return on a
Saturday, off the grid, which an exact-date join must ignore). For every grid date D and every security with a row at
D, over the last 40 grid dates up to and including D (fewer at the start), the usable dates are those where the
security's return and all three factor returns exist. With n usable dates: n >= 20 (min_obs) gives the OLS fit of
the return on [1, f1, f2, f3] by numpy.linalg.lstsq, R^2 = 1 - SSR/SST and residual vol = sqrt(SSR / (n - 4));
R^2 and residual vol are cross-checked against statsmodels OLS (rsquared, sqrt(scale)). Fewer usable dates give null.

Rerun from the repository root with Debian's python3-numpy and python3-statsmodels:
    /usr/bin/python3 service/src/test/scripts/loadings_fixture.py
"""
import datetime
import json
from pathlib import Path

import numpy as np
import statsmodels.api as sm

FIXTURES = Path(__file__).resolve().parent.parent / "resources" / "fixtures"
WINDOW, MIN_OBS, T, SECURITIES, K = 40, 20, 60, 10, 3


def business_days(start, count):
    days, d = [], start
    while len(days) < count:
        if d.weekday() < 5:
            days.append(d)
        d += datetime.timedelta(days=1)
    return days


def nullable(v):
    return None if v is None or np.isnan(v) else float(v)


def main():
    rng = np.random.default_rng(20240611)
    dates = business_days(datetime.date(2023, 1, 2), T)
    factors = rng.normal(scale=0.01, size=(T, K))
    factors[25, 0] = np.nan
    factors[50, 1] = np.nan
    factors[10, 2] = np.nan
    betas = rng.normal(loc=[1.0, 0.3, -0.2], scale=0.4, size=(SECURITIES, K))
    alphas = rng.normal(scale=0.0005, size=SECURITIES)
    clean = np.nan_to_num(factors)
    returns = alphas + clean @ betas.T + rng.normal(scale=0.012, size=(T, SECURITIES))
    has_row = np.ones((T, SECURITIES), dtype=bool)
    has_row[:30, 4] = False                       # SEC05 enters at date 30
    has_row[56:, 6] = False                       # SEC07 leaves after date 55
    has_row[rng.random(T) < 0.1, 2] = False       # SEC03 has gaps in its rows
    returns[rng.random(T) < 0.1, 2] = np.nan
    returns[rng.random(T) < 0.6, 8] = np.nan      # SEC09 mostly lacks returns: often below min_obs
    returns[T - 1, 9] = np.nan                    # SEC10 has a row but no return at the last date
    returns[~has_row] = np.nan

    codes = [f"SEC{i + 1:02d}" for i in range(SECURITIES)]
    expected = []
    for d in range(T):
        start = max(0, d - WINDOW + 1)
        f = factors[start:d + 1]
        for i in range(SECURITIES):
            if not has_row[d, i]:
                continue
            y = returns[start:d + 1, i]
            usable = ~np.isnan(y) & ~np.isnan(f).any(axis=1)
            n = int(usable.sum())
            row = {"date_index": d, "security": codes[i], "n": n,
                   "alpha": None, "betas": [None] * K, "r_squared": None, "residual_vol": None}
            if n >= MIN_OBS:
                x = np.column_stack([np.ones(n), f[usable]])
                coef = np.linalg.lstsq(x, y[usable], rcond=None)[0]
                resid = y[usable] - x @ coef
                ssr = float(resid @ resid)
                sst = float(((y[usable] - y[usable].mean()) ** 2).sum())
                r2, vol = 1 - ssr / sst, np.sqrt(ssr / (n - K - 1))
                ols = sm.OLS(y[usable], x).fit()
                assert abs(ols.rsquared - r2) < 1e-12 and abs(np.sqrt(ols.scale) - vol) < 1e-14
                row.update(alpha=float(coef[0]), betas=[float(b) for b in coef[1:]], r_squared=float(r2),
                           residual_vol=float(vol))
            expected.append(row)

    factor_series = []
    for j in range(K):
        present = [t for t in range(T) if not np.isnan(factors[t, j])]
        series_dates = [dates[t].isoformat() for t in present]
        values = [float(factors[t, j]) for t in present]
        if j == 2:
            saturday = dates[20] + datetime.timedelta(days=(5 - dates[20].weekday()))
            insert_at = sum(1 for d in series_dates if d < saturday.isoformat())
            series_dates.insert(insert_at, saturday.isoformat())
            values.insert(insert_at, 0.5)
        factor_series.append({"dates": series_dates, "values": values})

    payload = {
        "window": WINDOW,
        "min_obs": MIN_OBS,
        "dates": [d.isoformat() for d in dates],
        "securities": codes,
        "rows": [[t, i, nullable(returns[t, i])] for t in range(T) for i in range(SECURITIES) if has_row[t, i]],
        "factors": factor_series,
        "expected": expected,
    }
    out = FIXTURES / "loadings_rolling.json"
    out.write_text(json.dumps(payload, separators=(",", ":")) + "\n")
    print("wrote", out, len(expected), "expected rows")


main()
