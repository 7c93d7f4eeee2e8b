"""Fixture for CrossSectionalZScoreTest: winsorised cross-sectional z-scores computed with numpy.

For each generated cross-section (fat-tailed values with a few NaN):
    m, s = nanmean(x), nanstd(x, ddof=1);  c = clip(x, m - 3 s, m + 3 s);  z = (c - nanmean(c)) / nanstd(c, ddof=1)
NaN stays NaN (numpy propagates it through clip and the arithmetic).

Rerun from the repository root with Debian's python3-numpy:
    /usr/bin/python3 service/src/test/scripts/zscore_fixture.py
Writes service/src/test/resources/fixtures/zscore.json (null = NaN).
"""
import json
from pathlib import Path

import numpy as np

OUT = Path(__file__).resolve().parent.parent / "resources" / "fixtures" / "zscore.json"


def winsorised_z(x):
    m, s = np.nanmean(x), np.nanstd(x, ddof=1)
    c = np.clip(x, m - 3 * s, m + 3 * s)
    return (c - np.nanmean(c)) / np.nanstd(c, ddof=1)


def nullable(values):
    return [None if np.isnan(v) else float(v) for v in values]


rng = np.random.default_rng(55)
cases = []
for size, nan_count in [(40, 3), (200, 10), (15, 0)]:
    x = rng.standard_t(df=3, size=size) * 2.0 + 5.0
    x[rng.choice(size, nan_count, replace=False)] = np.nan
    x[rng.integers(size)] = 60.0
    cases.append({"values": nullable(x), "expected": nullable(winsorised_z(x))})
OUT.write_text(json.dumps({"cases": cases}) + "\n")
print("wrote", OUT)
