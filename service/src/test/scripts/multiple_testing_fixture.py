"""Fixture for MultipleTestingTest: adjusted p-values from statsmodels.

Computes Bonferroni, Holm, Benjamini-Hochberg and Benjamini-Yekutieli adjusted p-values with
statsmodels.stats.multitest.multipletests (methods "bonferroni", "holm", "fdr_bh", "fdr_by") on a
generated set of p-values that contains ties, exact zeros and ones, and missing tests (NaN).
multipletests does not accept NaN, so it runs on the present p-values only and NaN is written back
at the missing positions (Winnow's documented convention).

Rerun from the repository root with Debian's python3-statsmodels:
    /usr/bin/python3 service/src/test/scripts/multiple_testing_fixture.py
Writes service/src/test/resources/fixtures/multiple_testing.csv (empty cell = NaN).
"""
import csv
from pathlib import Path

import numpy as np
from statsmodels.stats.multitest import multipletests

OUT = Path(__file__).resolve().parent.parent / "resources" / "fixtures" / "multiple_testing.csv"

rng = np.random.default_rng(20240611)
p = np.concatenate([rng.uniform(0, 0.01, 8), rng.uniform(0, 1, 22), [0.0, 1.0, 0.02, 0.02, 0.02, np.nan, np.nan]])
p = rng.permutation(p)

present = ~np.isnan(p)
columns = {"p": p}
for name, method in [("bonferroni", "bonferroni"), ("holm", "holm"), ("bh", "fdr_bh"), ("by", "fdr_by")]:
    adjusted = np.full(p.shape, np.nan)
    adjusted[present] = multipletests(p[present], method=method)[1]
    columns[name] = adjusted

with OUT.open("w", newline="") as f:
    w = csv.writer(f)
    w.writerow(list(columns))
    for i in range(len(p)):
        w.writerow(["" if np.isnan(columns[c][i]) else repr(float(columns[c][i])) for c in columns])
print("wrote", OUT)
