#!/usr/bin/env python3
"""Factor covariance (equal and exponential weights, with and without Newey-West lags) and portfolio risk, for
FactorCovarianceTest and PortfolioRiskTest.

What: invented factor returns (seeded, with some serial correlation so the lag terms matter). For each case the
script computes, with numpy, independently of the Java code:
  w_t = 1/n, or 0.5 ** (age / H) normalised (age 0 for the latest observation)
  m = sum_t w_t x_t;  c = 1 / (1 - sum_t w_t^2)
  C_l = c * sum_{t=l+1..n} w_t (x_t - m)(x_{t-l} - m)'
  V = C_0 + sum_{l=1..L} (1 - l/(L+1)) (C_l + C_l')       (Newey and West 1987, Bartlett weights)
written as matrix products (D' diag(w) D) rather than the loops of the Java code. With equal weights and L = 0 the
script also checks V against numpy.cov (divisor n-1) and against numpy.cov(aweights=w) for the exponential case with
L = 0, and writes numpy.cov's matrix as its own expected value.

Portfolio risk: a generated portfolio and benchmark over securities with betas and residual volatilities, the
exposures x = sum_i (h_i - b_i) beta_i, F = V annualised (x 12), factor variance x'Fx, specific variance
12 sum_i w_i^2 s_i^2, and the Euler decomposition: marginal = F x / sigma, contribution = x * marginal,
specific contribution = specific variance / sigma.

Library: Debian python3-numpy.
Rerun from the repository root:  /usr/bin/python3 service/src/test/scripts/covariance_risk_fixture.py
Writes service/src/test/resources/fixtures/covariance_risk.json
"""
import json
import os

import numpy as np

OUT = os.path.join(os.path.dirname(__file__), "..", "resources", "fixtures", "covariance_risk.json")


def weights(n, half_life):
    if half_life is None:
        return np.full(n, 1.0 / n)
    age = np.arange(n - 1, -1, -1, dtype=float)
    raw = 0.5 ** (age / half_life)
    return raw / raw.sum()


def covariance(x, half_life, lags):
    n = x.shape[0]
    w = weights(n, half_life)
    m = w @ x
    d = x - m
    c = 1.0 / (1.0 - np.sum(w ** 2))
    v = c * (d.T * w) @ d
    for l in range(1, lags + 1):
        cl = c * (d[l:].T * w[l:]) @ d[:-l]
        v = v + (1.0 - l / (lags + 1.0)) * (cl + cl.T)
    return v


def main():
    rng = np.random.default_rng(20261202)
    n, k = 150, 4
    shocks = rng.normal(0.0, 1.0, (n + 1, k))
    mix = np.array([[0.040, 0.000, 0.000, 0.000],
                    [0.012, 0.030, 0.000, 0.000],
                    [-0.008, 0.006, 0.025, 0.000],
                    [0.004, -0.010, 0.007, 0.020]])
    base = shocks @ mix.T
    x = base[1:] + 0.35 * base[:-1] + np.array([0.006, 0.002, 0.003, -0.001])  # MA(1): serially correlated
    x = np.round(x, 8)

    cases = []
    for half_life, lags in ((None, 0), (None, 3), (24.0, 0), (24.0, 2), (6.5, 5)):
        v = covariance(x, half_life, lags)
        if half_life is None and lags == 0:
            reference = np.cov(x, rowvar=False)  # divisor n-1
            assert np.allclose(v, reference, rtol=1e-13, atol=0), "formula disagrees with numpy.cov"
            v = reference
            source = "numpy.cov(x, rowvar=False)"
        elif lags == 0:
            reference = np.cov(x, rowvar=False, aweights=weights(n, half_life))
            assert np.allclose(v, reference, rtol=1e-12, atol=0), "formula disagrees with numpy.cov(aweights)"
            source = "numpy formula of the script (agrees with numpy.cov(aweights) to 1e-12)"
        else:
            source = "numpy formula of the script"
        cases.append({"half_life": half_life, "nw_lags": lags, "source": source,
                      "weights": weights(n, half_life).tolist(), "covariance": v.tolist()})

    # portfolio risk on three of the factors, F annualised from the exponential case with lags
    factors = 3
    f_annual = 12.0 * covariance(x[:, :factors], 24.0, 2)
    securities = 12
    betas = np.round(rng.normal([1.0, 0.2, -0.1], [0.3, 0.5, 0.5], (securities, factors)), 6)
    residual_vol = np.round(rng.uniform(0.02, 0.09, securities), 6)
    holdings = np.round(rng.dirichlet(np.ones(securities)), 6)
    benchmark = np.round(rng.dirichlet(np.ones(securities)), 6)
    active = holdings - benchmark
    exposures = active @ betas
    factor_var = exposures @ f_annual @ exposures
    specific_var = 12.0 * np.sum(active ** 2 * residual_vol ** 2)
    sigma = np.sqrt(factor_var + specific_var)
    marginal = f_annual @ exposures / sigma
    contributions = exposures * marginal
    specific_contribution = specific_var / sigma
    assert abs(contributions.sum() + specific_contribution - sigma) < 1e-14
    risk = {"covariance": f_annual.tolist(), "betas": betas.tolist(), "residual_vol": residual_vol.tolist(),
            "holdings": holdings.tolist(), "benchmark": benchmark.tolist(), "exposures": exposures.tolist(),
            "factor_variance": factor_var, "specific_variance": specific_var, "total_volatility": sigma,
            "marginal": marginal.tolist(), "contributions": contributions.tolist(),
            "specific_contribution": specific_contribution}

    with open(OUT, "w") as f:
        json.dump({"source": "numpy " + np.__version__, "returns": x.tolist(), "cases": cases, "risk": risk}, f, indent=1)
        f.write("\n")


if __name__ == "__main__":
    main()
