#!/usr/bin/env python3
"""Reference values for the evidence tests (TrialTableTest, EvidenceStatisticsTest), computed with general-purpose
libraries independently of Winnow.

What it computes, on seeded generated data:
1. "trial_table": a library of nine trials. Seven are monthly series (different lengths, start dates, means and
   autocorrelation), one is a daily series and one a quarterly series. The daily series is compounded to calendar
   months with pandas (groupby calendar month, prod(1 + r) - 1, labelled with the month's last observed date); the
   quarterly one cannot be put on a monthly basis and is left out of the table. One monthly trial has only two
   returns, so its statistics are undefined and it is left out of N. For every other trial:
     - n, mean;
     - nw_t: statsmodels OLS of r on a constant, cov_type="HAC",
       cov_kwds={"maxlags": L, "use_correction": False}, L = floor(4 (n/100)^(2/9)) (statsmodels' own default
       for cov_hac with nlags=None is the same rule);
     - p = 2 * scipy.stats.norm.sf(|nw_t|);
     - p_bonferroni, p_holm, p_bh, p_by: statsmodels.stats.multitest.multipletests with methods "bonferroni",
       "holm", "fdr_bh", "fdr_by" across the N defined trials;
     - passes_t3 = |nw_t| > 3;
     - sharpe = mean / std(ddof=1); skew = scipy.stats.skew(bias=True); kurt = scipy.stats.kurtosis(fisher=False,
       bias=True) (population moment ratios, kurtosis not in excess);
     - V = numpy var(ddof=1) of the N Sharpe ratios; SR0 = sqrt(V) ((1-g) norm.ppf(1-1/N) + g norm.ppf(1-1/(N e)))
       with g = numpy.euler_gamma (Bailey and Lopez de Prado 2014);
     - psr = norm.cdf(sharpe sqrt(n-1) / sqrt(1 - skew sharpe + (kurt-1)/4 sharpe^2)) and deflated_sharpe the same
       with sharpe - SR0 in the numerator.
2. "bh_example": the 15 p-values of the worked example in Benjamini and Hochberg (1995, JRSS B 57(1), section 4),
   as quoted from memory in MultipleTestingTest, with multipletests' four adjustments.
3. "spanning": a monthly factor and three other monthly factors with gaps at different dates; on the dates all four
   have, statsmodels OLS with a constant: alpha, betas, R^2, and alpha's t with cov_type="HAC",
   cov_kwds={"maxlags": L, "use_correction": False}, L = floor(4 (n/100)^(2/9)) for that n.
4. "stability": one 150-month series: NW t (as in 1) of each half (the first half has the extra month when n is odd),
   of each calendar decade, the share of rolling 60-month windows with NW t > 2 (L for n = 60), and the split at a
   discovery date (up to and including it / after it) with the ratio of means.
5. "composite": three monthly series with gaps; their equal-weight mean on the dates all have (pandas inner join),
   and its NW t as in 1.

Libraries: Debian python3-numpy, python3-scipy, python3-pandas, python3-statsmodels.
Rerun from the repository root:
    /usr/bin/python3 service/src/test/scripts/evidence_fixture.py
Writes service/src/test/resources/fixtures/evidence.json
"""
import json
import math
from pathlib import Path

import numpy as np
import pandas as pd
import scipy.stats
import statsmodels.api as sm
from scipy.stats import norm
from statsmodels.stats.multitest import multipletests

OUT = Path(__file__).resolve().parent.parent / "resources" / "fixtures" / "evidence.json"
RNG = np.random.default_rng(20240917)


def auto_lags(n):
    return int(math.floor(4 * (n / 100.0) ** (2.0 / 9.0)))


def nw_t(values):
    y = np.asarray(values, dtype=float)
    fit = sm.OLS(y, np.ones(len(y))).fit(cov_type="HAC", cov_kwds={"maxlags": auto_lags(len(y)), "use_correction": False})
    return float(fit.tvalues[0])


def month_ends(start, n):
    return [d.date() for d in pd.date_range(start=start, periods=n, freq="M")]


def ar1(n, phi, mu, sigma):
    eps = RNG.normal(0.0, sigma, n)
    out = np.empty(n)
    prev = 0.0
    for t in range(n):
        prev = phi * prev + eps[t]
        out[t] = mu + prev
    return out


def iso(dates):
    return [d.isoformat() for d in dates]


def compound_monthly(dates, values):
    s = pd.Series(values, index=pd.to_datetime(dates))
    grouped = s.groupby([s.index.year, s.index.month])
    compounded = grouped.apply(lambda g: float(np.prod(1.0 + g.values) - 1.0) if len(g) > 1 else float(g.values[0]))
    labels = grouped.apply(lambda g: g.index[-1].date())
    return list(labels.values), list(compounded.values)


def trial_table():
    trials = []
    monthly_specs = [
        ("planted_strong", "2001-01-31", 240, 0.2, 0.008, 0.03),
        ("planted_weak", "2003-06-30", 180, 0.1, 0.003, 0.03),
        ("noise_a", "2000-01-31", 300, 0.0, 0.0, 0.04),
        ("noise_b", "2005-03-31", 150, 0.3, 0.0, 0.02),
        ("negative", "2010-01-31", 120, 0.0, -0.006, 0.025),
        ("fat_tailed", "2002-01-31", 200, 0.1, 0.004, None),
        ("too_short", "2020-01-31", 2, 0.0, 0.01, 0.02),
    ]
    for name, start, n, phi, mu, sigma in monthly_specs:
        dates = month_ends(start, n)
        if sigma is None:
            values = mu + 0.02 * RNG.standard_t(4, n)
        else:
            values = ar1(n, phi, mu, sigma)
        trials.append({"name": name, "dates": iso(dates), "returns": [float(v) for v in values]})
    daily_dates = [d.date() for d in pd.bdate_range("2015-01-01", "2019-12-31")]
    daily_values = ar1(len(daily_dates), 0.05, 0.0004, 0.008)
    trials.append({"name": "daily", "dates": iso(daily_dates), "returns": [float(v) for v in daily_values]})
    quarter_dates = [d.date() for d in pd.date_range("2000-03-31", periods=60, freq="Q")]
    trials.append({"name": "quarterly", "dates": iso(quarter_dates),
                   "returns": [float(v) for v in RNG.normal(0.01, 0.05, 60)], "excluded": True})

    rows = []
    for trial in trials:
        if trial.get("excluded"):
            continue
        dates = [pd.Timestamp(d).date() for d in trial["dates"]]
        monthly_dates, monthly = compound_monthly(dates, trial["returns"])
        trial["monthly_n"] = len(monthly)
        row = {"name": trial["name"], "n": len(monthly)}
        if len(monthly) >= 3:
            m = np.asarray(monthly)
            row.update({
                "mean": float(m.mean()),
                "nw_t": nw_t(m),
                "sharpe": float(m.mean() / m.std(ddof=1)),
                "skew": float(scipy.stats.skew(m, bias=True)),
                "kurt": float(scipy.stats.kurtosis(m, fisher=False, bias=True)),
            })
            row["p"] = float(2 * norm.sf(abs(row["nw_t"])))
        rows.append(row)

    defined = [r for r in rows if "p" in r]
    p = np.array([r["p"] for r in defined])
    for key, method in [("p_bonferroni", "bonferroni"), ("p_holm", "holm"), ("p_bh", "fdr_bh"), ("p_by", "fdr_by")]:
        adjusted = multipletests(p, method=method)[1]
        for r, a in zip(defined, adjusted):
            r[key] = float(a)
    big_n = len(defined)
    v = float(np.var([r["sharpe"] for r in defined], ddof=1))
    g = float(np.euler_gamma)
    sr0 = math.sqrt(v) * ((1 - g) * norm.ppf(1 - 1 / big_n) + g * norm.ppf(1 - 1 / (big_n * math.e)))
    for r in defined:
        sr, n, skew, kurt = r["sharpe"], r["n"], r["skew"], r["kurt"]
        denominator = math.sqrt(1 - skew * sr + (kurt - 1) / 4 * sr * sr)
        r["passes_t3"] = abs(r["nw_t"]) > 3.0
        r["psr"] = float(norm.cdf(sr * math.sqrt(n - 1) / denominator))
        r["deflated_sharpe"] = float(norm.cdf((sr - sr0) * math.sqrt(n - 1) / denominator))
    return {"trials": trials, "rows": rows, "N": big_n, "V": v, "SR0": float(sr0)}


def bh_example():
    p = np.array([0.0001, 0.0004, 0.0019, 0.0095, 0.0201, 0.0278, 0.0298, 0.0344, 0.0459,
                  0.3240, 0.4262, 0.5719, 0.6528, 0.7590, 1.0000])
    out = {"p": p.tolist()}
    for key, method in [("p_bonferroni", "bonferroni"), ("p_holm", "holm"), ("p_bh", "fdr_bh"), ("p_by", "fdr_by")]:
        out[key] = [float(a) for a in multipletests(p, method=method)[1]]
    return out


def spanning():
    n = 160
    dates = month_ends("2004-01-31", n)
    others = [ar1(n, 0.1, mu, 0.03) for mu in (0.004, 0.002, -0.001)]
    noise = ar1(n, 0.4, 0.0, 0.012)
    target = 0.0025 + 0.7 * others[0] - 0.3 * others[1] + 0.2 * others[2] + noise
    frames = []
    gaps = [[5, 17, 88], [0, 1, 40, 159], [77], []]
    series = [target] + others
    out_series = []
    for values, missing in zip(series, gaps):
        keep = [i for i in range(n) if i not in missing]
        frames.append(pd.Series([values[i] for i in keep], index=pd.to_datetime([dates[i] for i in keep])))
        out_series.append({"dates": iso([dates[i] for i in keep]), "returns": [float(values[i]) for i in keep]})
    joined = pd.concat(frames, axis=1, join="inner").dropna()
    y = joined.iloc[:, 0].values
    x = sm.add_constant(joined.iloc[:, 1:].values)
    lags = auto_lags(len(y))
    plain = sm.OLS(y, x).fit()
    hac = sm.OLS(y, x).fit(cov_type="HAC", cov_kwds={"maxlags": lags, "use_correction": False})
    return {"factor": out_series[0], "others": out_series[1:], "n": int(len(y)), "nw_lags": lags,
            "alpha": float(plain.params[0]), "betas": [float(b) for b in plain.params[1:]],
            "r_squared": float(plain.rsquared), "alpha_nw_t": float(hac.tvalues[0])}


def stability():
    n = 151
    dates = month_ends("1995-07-31", n)
    values = ar1(n, 0.15, 0.006, 0.025)
    s = pd.Series(values, index=pd.to_datetime(dates))
    first = (n + 1) // 2
    halves = [s.iloc[:first], s.iloc[first:]]
    decades = [g for _, g in s.groupby(s.index.year // 10)]
    window = 60
    rolling = [nw_t(s.iloc[i:i + window].values) for i in range(n - window + 1)]
    found_on = pd.Timestamp("2001-03-15")
    before, after = s[s.index <= found_on], s[s.index > found_on]

    def stats(part):
        return {"from": part.index[0].date().isoformat(), "to": part.index[-1].date().isoformat(), "n": int(len(part)),
                "mean": float(part.mean()), "nw_t": nw_t(part.values)}

    return {"dates": iso(dates), "returns": [float(v) for v in values],
            "halves": [stats(h) for h in halves], "decades": [stats(d) for d in decades],
            "share_above_2": float(np.mean([t > 2.0 for t in rolling])),
            "found_on": found_on.date().isoformat(), "before": stats(before), "after": stats(after),
            "ratio": float(after.mean() / before.mean())}


def composite():
    n = 90
    dates = month_ends("2008-01-31", n)
    frames = []
    out = []
    for mu, missing in [(0.004, [3, 50]), (0.002, [0, 89]), (0.003, [50, 60, 61])]:
        values = ar1(n, 0.2, mu, 0.02)
        keep = [i for i in range(n) if i not in missing]
        frames.append(pd.Series([values[i] for i in keep], index=pd.to_datetime([dates[i] for i in keep])))
        out.append({"dates": iso([dates[i] for i in keep]), "returns": [float(values[i]) for i in keep]})
    joined = pd.concat(frames, axis=1, join="inner")
    mean = joined.mean(axis=1)
    return {"series": out, "dates": [d.date().isoformat() for d in mean.index], "returns": [float(v) for v in mean.values],
            "nw_t": nw_t(mean.values)}


fixture = {"trial_table": trial_table(), "bh_example": bh_example(), "spanning": spanning(),
           "stability": stability(), "composite": composite()}
OUT.write_text(json.dumps(fixture, indent=1) + "\n")
print("wrote", OUT)
