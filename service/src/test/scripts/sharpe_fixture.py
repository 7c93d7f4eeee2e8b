"""Fixture for SharpeRatiosTest: probabilistic and deflated Sharpe ratios computed with scipy.stats.norm.

Formulas (Bailey and Lopez de Prado 2012, Journal of Risk 15(2); 2014, Journal of Portfolio Management 40(5)):
    PSR = norm.cdf((sr - sr_star) * sqrt(n - 1) / sqrt(1 - skew * sr + (kurt - 1) / 4 * sr**2))
    SR0 = sqrt(V) * ((1 - g) * norm.ppf(1 - 1/N) + g * norm.ppf(1 - 1/(N e))), g = Euler-Mascheroni
    DSR = PSR with sr_star = SR0
Inputs are per-period Sharpe ratios and non-excess kurtosis.

Rerun from the repository root with Debian's python3-scipy:
    /usr/bin/python3 service/src/test/scripts/sharpe_fixture.py
Writes service/src/test/resources/fixtures/sharpe_ratios.csv.
"""
import csv
import math
from pathlib import Path

import numpy as np
from scipy.stats import norm

OUT = Path(__file__).resolve().parent.parent / "resources" / "fixtures" / "sharpe_ratios.csv"
EULER_GAMMA = float(np.euler_gamma)

def psr(sr, sr_star, n, skew, kurt):
    return norm.cdf((sr - sr_star) * math.sqrt(n - 1) / math.sqrt(1 - skew * sr + (kurt - 1) / 4 * sr * sr))

def sr0(v, trials):
    if trials == 1:
        return 0.0
    return math.sqrt(v) * ((1 - EULER_GAMMA) * norm.ppf(1 - 1 / trials) + EULER_GAMMA * norm.ppf(1 - 1 / (trials * math.e)))

rng = np.random.default_rng(7)
rows = []
fixed = [
    # Bailey and Lopez de Prado (2014) example in daily units: annualised SR 2.5 and V 0.5 with 250 days a year
    (2.5 / math.sqrt(250), 0.0, 1250, -3.0, 10.0, 0.5 / 250, 100),
    (0.05, 0.02, 120, 0.0, 3.0, 0.0004, 10),
    (-0.1, 0.0, 60, 0.5, 4.0, 0.01, 2),
    (0.3, 0.1, 36, -1.0, 6.0, 0.02, 1),
    (0.08, 0.08, 500, 0.2, 3.5, 0.001, 1000),
]
for _ in range(15):
    fixed.append((float(rng.uniform(-0.2, 0.4)), float(rng.uniform(-0.05, 0.1)), int(rng.integers(24, 3000)),
                  float(rng.uniform(-2, 1)), float(rng.uniform(2.5, 12)), float(rng.uniform(1e-4, 0.05)),
                  int(rng.integers(1, 5000))))
for sr, bench, n, skew, kurt, v, trials in fixed:
    e_max = sr0(v, trials)
    rows.append([sr, bench, n, skew, kurt, v, trials, psr(sr, bench, n, skew, kurt), e_max, psr(sr, e_max, n, skew, kurt)])

with OUT.open("w", newline="") as f:
    w = csv.writer(f)
    w.writerow(["sr", "benchmark_sr", "n", "skew", "kurtosis", "variance_of_trials", "trials", "psr", "expected_max_sr", "dsr"])
    for r in rows:
        w.writerow([repr(float(x)) if isinstance(x, float) or isinstance(x, np.floating) else x for x in r])
print("wrote", OUT)
