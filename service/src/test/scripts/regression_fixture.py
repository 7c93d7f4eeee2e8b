"""Fixtures for LinearRegressionTest: OLS by numpy.linalg.lstsq and Newey-West intercept errors by statsmodels.

1. regression_missing_rows.json: a generated dataset (80 rows, 3 regressors) in which some rows miss
   y or a regressor (null = NaN). Reference coefficients come from numpy.linalg.lstsq on [1, X] over
   the complete rows; classical standard errors, R^2 and residual standard deviation from
   statsmodels OLS(missing="drop").
2. regression_hac.json: a generated spanning regression (150 periods, one return series on 3 factor
   series, autocorrelated errors). Reference intercept standard errors from statsmodels
   OLS(...).fit(cov_type="HAC", cov_kwds={"maxlags": L, "use_correction": False}) for several L; in
   statsmodels 0.13 this is the Bartlett kernel (weights 1 - l/(L+1), sandwich_covariance.weights_bartlett)
   with no nobs/(nobs-k) factor (cov_hac_simple applies it only when use_correction is true).

Rerun from the repository root with Debian's python3-numpy and python3-statsmodels:
    /usr/bin/python3 service/src/test/scripts/regression_fixture.py
"""
import json
from pathlib import Path

import numpy as np
import statsmodels.api as sm

FIXTURES = Path(__file__).resolve().parent.parent / "resources" / "fixtures"


def nullable(values):
    return [None if np.isnan(v) else float(v) for v in values]


def missing_rows_fixture():
    rng = np.random.default_rng(101)
    n, k = 80, 3
    x = rng.normal(size=(n, k)) * [0.04, 0.02, 0.05] + [0.01, 0.0, -0.005]
    y = 0.002 + x @ np.array([1.1, -0.4, 0.25]) + rng.normal(scale=0.01, size=n)
    x[[3, 17, 40], [0, 2, 1]] = np.nan
    y[[5, 17, 61, 79]] = np.nan
    complete = ~np.isnan(y) & ~np.isnan(x).any(axis=1)
    design = np.column_stack([np.ones(complete.sum()), x[complete]])
    coefficients = np.linalg.lstsq(design, y[complete], rcond=None)[0]
    ols = sm.OLS(y, sm.add_constant(x), missing="drop").fit()
    return {
        "x_columns": [nullable(x[:, j]) for j in range(k)],
        "y": nullable(y),
        "n_used": int(complete.sum()),
        "lstsq_coefficients": coefficients.tolist(),
        "statsmodels_bse": ols.bse.tolist(),
        "statsmodels_rsquared": float(ols.rsquared),
        "statsmodels_resid_sd": float(np.sqrt(ols.scale)),
    }


def hac_fixture():
    rng = np.random.default_rng(202)
    n, k = 150, 3
    factors = rng.normal(size=(n, k)) * 0.03
    errors = np.zeros(n)
    shocks = rng.normal(scale=0.01, size=n)
    for t in range(n):
        errors[t] = shocks[t] + (0.5 * errors[t - 1] if t else 0.0)
    errors *= 1 + 0.5 * np.abs(factors[:, 0]) / 0.03
    y = 0.003 + factors @ np.array([0.6, 0.3, -0.2]) + errors
    design = sm.add_constant(factors)
    plain = sm.OLS(y, design).fit()
    hac = {}
    for lags in [0, 1, 4, 12]:
        fit = sm.OLS(y, design).fit(cov_type="HAC", cov_kwds={"maxlags": lags, "use_correction": False})
        hac[str(lags)] = {"alpha_se": float(fit.bse[0]), "alpha_t": float(fit.tvalues[0])}
    return {
        "x_columns": [factors[:, j].tolist() for j in range(k)],
        "y": y.tolist(),
        "alpha": float(plain.params[0]),
        "hac_by_lags": hac,
    }


for name, payload in [("regression_missing_rows.json", missing_rows_fixture()), ("regression_hac.json", hac_fixture())]:
    (FIXTURES / name).write_text(json.dumps(payload, indent=1) + "\n")
    print("wrote", FIXTURES / name)
