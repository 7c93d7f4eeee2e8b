#!/usr/bin/env python3
"""Moments of return samples, computed with scipy and numpy, for SummaryStatisticsTest.

What: for a few seeded samples (invented data), scipy.stats.skew(bias=True) and
scipy.stats.kurtosis(fisher=False, bias=True) (population moment ratios m3/m2^1.5 and m4/m2^2, not excess),
numpy mean and numpy std(ddof=1).

Library: Debian python3-scipy, python3-numpy.
Rerun from the repository root:  python3 service/src/test/scripts/moment_fixtures.py
Writes service/src/test/resources/fixtures/moments.json
"""
import json
import os

import numpy as np
import scipy.stats

OUT = os.path.join(os.path.dirname(__file__), "..", "resources", "fixtures", "moments.json")


def main():
    rng = np.random.default_rng(7)
    samples = {
        "normal_n500": rng.normal(0.0005, 0.01, 500),
        "right_skewed_n120": np.expm1(rng.normal(0.0, 0.05, 120)) + 0.002,
        "fat_tailed_n250": rng.standard_t(3, 250) * 0.008,
        "five_values": np.array([0.02, -0.01, 0.035, 0.0, -0.042]),
    }
    out = []
    for name, x in samples.items():
        out.append({
            "name": name,
            "values": [float(v) for v in x],
            "mean": float(np.mean(x)),
            "stdev": float(np.std(x, ddof=1)),
            "skewness": float(scipy.stats.skew(x, bias=True)),
            "kurtosis": float(scipy.stats.kurtosis(x, fisher=False, bias=True)),
        })
    with open(OUT, "w") as f:
        json.dump({"source": "scipy " + scipy.__version__ + " skew/kurtosis(fisher=False, bias=True), numpy std(ddof=1)",
                   "samples": out}, f, separators=(",", ":"))
        f.write("\n")


if __name__ == "__main__":
    main()
