#!/usr/bin/env python3
"""Pearson and Spearman correlations on pairwise complete observations, computed with scipy, for CorrelationsTest.

What: several dated series with gaps (invented data, seeded); for each pair, the dates both have (an inner join)
and scipy.stats.pearsonr / scipy.stats.spearmanr (average ranks for ties) on those observations, with the count.
Pairs with fewer than 3 common observations are written as null (our rule); scipy returns nan for a constant side,
also written as null.
Cross-check inside the script: pandas DataFrame.corr(method, min_periods=3), which also uses pairwise complete
observations, must agree with the scipy values to 1e-12.

Library: Debian python3-scipy, python3-pandas, python3-numpy.
Rerun from the repository root:  python3 service/src/test/scripts/correlation_fixtures.py
Writes service/src/test/resources/fixtures/correlations.json
"""
import json
import os
import warnings

import numpy as np
import pandas as pd
import scipy.stats

OUT = os.path.join(os.path.dirname(__file__), "..", "resources", "fixtures", "correlations.json")


def make_series(rng):
    dates = pd.bdate_range("2019-01-01", periods=320)
    common = rng.normal(0.0, 0.01, len(dates))
    frame = {}
    frame["alpha"] = 0.0004 + 0.8 * common + rng.normal(0.0, 0.006, len(dates))
    frame["beta"] = -0.0002 - 0.5 * common + rng.normal(0.0, 0.008, len(dates))
    # rounded to half a percent: many ties, for Spearman's average ranks
    frame["gamma"] = np.round((0.3 * common + rng.standard_t(4, len(dates)) * 0.006) / 0.005) * 0.005
    frame["delta"] = rng.normal(0.0, 0.01, len(dates))
    df = pd.DataFrame(frame, index=dates)
    # gaps: each series misses its own random dates; delta only exists on the first 6 dates, epsilon from date 4 on
    for name, share in (("alpha", 0.10), ("beta", 0.15), ("gamma", 0.05)):
        df.loc[rng.random(len(dates)) < share, name] = np.nan
    df.loc[df.index[6:], "delta"] = np.nan
    df["epsilon"] = np.nan
    df.loc[df.index[4:60], "epsilon"] = rng.normal(0.0, 0.01, 56)
    df["flat"] = 0.001  # no variation: undefined correlation
    df.loc[df.index[::7], "flat"] = np.nan
    return df


def pair_value(x, y, method):
    if len(x) < 3:
        return None
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")  # scipy warns and returns nan for constant input
        if method == "pearson":
            value = scipy.stats.pearsonr(x, y)[0]
        else:
            value = scipy.stats.spearmanr(x, y)[0]
    return None if np.isnan(value) else float(value)


def main():
    rng = np.random.default_rng(20240517)
    df = make_series(rng)
    names = list(df.columns)
    series = []
    for name in names:
        s = df[name].dropna()
        series.append({"name": name, "dates": [d.strftime("%Y-%m-%d") for d in s.index],
                       "values": [float(v) for v in s.values]})
    pairs = []
    for i, a in enumerate(names):
        for b in names[i + 1:]:
            both = df[[a, b]].dropna()
            x, y = both[a].to_numpy(), both[b].to_numpy()
            entry = {"a": a, "b": b, "n": int(len(both)),
                     "pearson": pair_value(x, y, "pearson"), "spearman": pair_value(x, y, "spearman")}
            pairs.append(entry)
            for method in ("pearson", "spearman"):
                check = df[[a, b]].corr(method=method, min_periods=3).iloc[0, 1]
                if entry[method] is None:
                    assert np.isnan(check), (a, b, method, check)
                else:
                    assert abs(check - entry[method]) < 1e-12, (a, b, method, check, entry[method])
    with open(OUT, "w") as f:
        json.dump({"source": "scipy " + scipy.__version__ + " pearsonr/spearmanr on inner-joined dates",
                   "series": series, "pairs": pairs}, f, separators=(",", ":"))
        f.write("\n")


if __name__ == "__main__":
    main()
