"""Reference answers for the cross-sectional endpoints over HTTP (CrossSectionEndToEndTest), written from the
endpoint rules in pandas/numpy/scipy/statsmodels, not from the Java.

1. xsection_panel.csv: a seeded invented monthly panel (60 securities x 40 month-ends, rows missing here and there,
   missing returns, caps and signals, a label column with gaps). Next month's return loads on the z-scored
   characteristic `value` (planted) and not on `noise`.
2. xsection_expected.json:
   - fama_macbeth: for each case the per-period slopes from numpy.linalg.lstsq on [1, X] over the period's sample
     (rows scaled by sqrt(market_cap) for cap weighting), r_squared = 1 - SSR/SST (weighted), and the slope
     summaries: numpy mean/std(ddof=1), statsmodels OLS on a constant with cov_type="HAC",
     maxlags=floor(4 (T/100)^(2/9)), use_correction=False for the Newey-West t, scipy.stats.norm for the p-value.
   - portfolios: for each definition, every bucket of a sort (the six of a size_sort) held by the construction rules
     (rebalance calendar, lag, eligibility, type-7 breakpoints with ties low, drift, members without a return leaving),
     using the functions of the independent construction script (construction_fixtures.py) for the shared rules;
   - ic: for each case, per grid index R and horizon h, scipy.stats.spearmanr / pearsonr between the signal at
     R-(lag-1) (finite, universe filters) and the return at R+h over the securities that have both, when at least
     min_securities do; and the summary (mean, std ddof=1, ic_ir, t, statsmodels HAC t, share positive).

Rerun from the repository root with Debian's python3-numpy, -scipy, -pandas and -statsmodels:
    /usr/bin/python3 service/src/test/scripts/cross_section_panel_fixtures.py
"""
import json
import math
from pathlib import Path

import numpy as np
import pandas as pd
from scipy import stats

import construction_fixtures as construction
from cross_sectional_fixtures import hac_mean_t as hac_t, nw_lags

FIXTURES = Path(__file__).resolve().parent.parent / "resources" / "fixtures"
NUMBER_FORMAT = "%.17g"

FAMA_MACBETH_CASES = [
    {"id": "plain", "signals": {"value": "value", "noise": "noise"}, "lag": 1, "standardize": False,
     "weighting": "equal", "exclude": None, "from": None, "to": None},
    {"id": "cap_std_lag2", "signals": {"value": "value", "mom": "momentum", "noise": "noise"}, "lag": 2,
     "standardize": True, "weighting": "cap", "exclude": ["C"], "from": "2011-06-01", "to": "2013-12-31"},
]
# bucket portfolios: definitions in the construction script's spec syntax, with their wire form for PUT
PORTFOLIO_CASES = [
    {"id": "value_q5", "spec": "method=sort;signal=value;buckets=5;weighting=equal;lag=1;rebalance=monthly",
     "definition": {"method": "sort", "signal": "value", "buckets": 5, "weighting": "equal", "rebalance": "monthly"}},
    {"id": "noise_t3", "spec": "method=sort;signal=noise;buckets=3;weighting=cap;lag=2;rebalance=quarterly;"
                               "direction=low_minus_high;exclude=sector:C",
     "definition": {"method": "sort", "signal": "noise", "buckets": 3, "weighting": "cap", "lag": 2,
                    "rebalance": "quarterly", "direction": "low_minus_high",
                    "universe": {"labels": {"sector": {"exclude": ["C"]}}}}},
    {"id": "value_within", "spec": "method=sort;signal=value;buckets=3;weighting=equal;lag=1;rebalance=monthly",
     "within": "sector",
     "definition": {"method": "sort", "signal": "value", "buckets": 3, "weighting": "equal", "rebalance": "monthly",
                    "within": "sector"}},
    {"id": "value_control", "spec": "method=sort;signal=value;buckets=3;weighting=cap;lag=1;rebalance=every_period",
     "control": ("momentum", 2),
     "definition": {"method": "sort", "signal": "value", "buckets": 3, "weighting": "cap",
                    "control": {"signal": "momentum", "buckets": 2}}},
    {"id": "value_2x3", "spec": "method=size_sort;signal=value;weighting=cap;lag=1;rebalance=every_period;output=signal",
     "definition": {"method": "size_sort", "signal": "value", "weighting": "cap", "output": "signal"}},
]
SIX = {"SL": "small_low", "SN": "small_mid", "SH": "small_high", "BL": "big_low", "BN": "big_mid", "BH": "big_high"}

IC_CASES = [
    {"id": "spearman", "signal": "value", "lag": 1, "method": "spearman", "horizons": [1, 2, 3], "min": 10,
     "exclude": None},
    {"id": "pearson_lag2_exclude", "signal": "noise", "lag": 2, "method": "pearson", "horizons": [1, 6], "min": 20,
     "exclude": ["A"]},
]


def make_panel():
    rng = np.random.default_rng(1973)
    dates = pd.date_range("2010-01-31", periods=40, freq="M")
    rows = []
    value = rng.normal(size=60)
    momentum = rng.normal(size=60)
    cap = np.exp(rng.normal(6.0, 1.0, size=60))
    sector = rng.choice(list("ABC"), size=60)
    previous = None
    for t, d in enumerate(dates):
        z = (value - value.mean()) / value.std(ddof=1)
        ret = 0.005 + (0.01 * previous if previous is not None else 0.0) + rng.normal(scale=0.04, size=60)
        previous = z
        for i in range(60):
            if rng.random() < 0.04 or (i % 17 == 3 and t < 6) or (i % 19 == 5 and t > 33):
                continue
            r = ret[i] if rng.random() > 0.02 else np.nan
            c = cap[i] if rng.random() > 0.03 else np.nan
            v = value[i] if rng.random() > 0.03 else np.nan
            m = momentum[i] if rng.random() > 0.03 else np.nan
            s = sector[i] if rng.random() > 0.05 else None
            rows.append((d.date().isoformat(), f"XS{i:03d}", r, c, v, m, float(rng.normal()), s))
        cap = cap * (1 + np.nan_to_num(ret))
        value = value + rng.normal(scale=0.2, size=60)
        momentum = 0.5 * momentum + rng.normal(scale=0.5, size=60)
    return pd.DataFrame(rows, columns=["date", "security", "return", "market_cap", "value", "momentum", "noise", "sector"])


def universe_ok(xs, exclude):
    if exclude is None:
        return pd.Series(True, index=xs.index)
    return ~xs["sector"].isin(exclude)  # a missing label is never inside an exclude list


def fama_macbeth(panel, dates, case):
    names = list(case["signals"].keys())
    columns = list(case["signals"].values())
    k = len(names)
    out_dates, slopes, r2s, counts, skipped = [], [], [], [], 0
    lo = pd.Timestamp(case["from"]) if case["from"] else None
    hi = pd.Timestamp(case["to"]) if case["to"] else None
    for r in range(len(dates) - 1):
        ret_date = dates[r + 1]
        if (lo is not None and ret_date < lo) or (hi is not None and ret_date > hi):
            continue
        s = r - (case["lag"] - 1)
        if s < 0:
            skipped += 1
            continue
        xs = panel[panel["date"] == dates[s]].set_index("security")
        nxt = panel[panel["date"] == ret_date].set_index("security")["return"]
        ok = universe_ok(xs, case["exclude"])
        for c in columns:
            ok &= np.isfinite(xs[c])
        if case["weighting"] == "cap":
            ok &= np.isfinite(xs["market_cap"]) & (xs["market_cap"] > 0)
        sample = xs[ok].join(nxt.rename("next"), how="inner")
        sample = sample[np.isfinite(sample["next"])]
        n = len(sample)
        if n <= k + 1:
            skipped += 1
            continue
        x = sample[columns].to_numpy(dtype=float)
        if case["standardize"]:
            x = (x - x.mean(axis=0)) / x.std(axis=0, ddof=1)
        y = sample["next"].to_numpy(dtype=float)
        w = sample["market_cap"].to_numpy(dtype=float) if case["weighting"] == "cap" else np.ones(n)
        design = np.column_stack([np.ones(n), x])
        coef, _, rank, _ = np.linalg.lstsq(design * np.sqrt(w)[:, None], y * np.sqrt(w), rcond=None)
        if rank < k + 1:
            skipped += 1
            continue
        u = y - design @ coef
        mean = np.sum(w * y) / np.sum(w)
        r2s.append(1 - np.sum(w * u * u) / np.sum(w * (y - mean) ** 2))
        out_dates.append(ret_date.date().isoformat())
        slopes.append(coef)
        counts.append(n)
    slopes = np.array(slopes)
    coefficients = []
    for j, name in enumerate(["intercept"] + names):
        v = slopes[:, j]
        t = hac_t(v)
        coefficients.append({"name": name, "mean": float(v.mean()), "stdev": float(v.std(ddof=1)),
                             "t_stat": float(v.mean() / (v.std(ddof=1) / math.sqrt(len(v)))),
                             "nw_t_stat": t, "nw_lags": nw_lags(len(v)), "p_value": float(2 * stats.norm.sf(abs(t)))})
    return {"periods": len(out_dates), "skipped": skipped, "dates": out_dates,
            "slopes": {name: slopes[:, j].tolist() for j, name in enumerate(["intercept"] + names)},
            "coefficients": coefficients, "mean_r_squared": float(np.mean(r2s)), "mean_securities": float(np.mean(counts))}


def information_coefficients(panel, dates, case):
    returns = panel.pivot(index="date", columns="security", values="return").reindex(dates)
    ic = {str(h): [] for h in case["horizons"]}
    for r in range(len(dates)):
        s = r - (case["lag"] - 1)
        for h in case["horizons"]:
            value = None
            if s >= 0 and r + h < len(dates):
                xs = panel[panel["date"] == dates[s]].set_index("security")
                ok = universe_ok(xs, case["exclude"]) & np.isfinite(xs[case["signal"]])
                sig = xs.loc[ok, case["signal"]]
                ret = returns.iloc[r + h]
                both = pd.concat([sig, ret], axis=1, join="inner").dropna()
                if len(both) >= case["min"]:
                    f = stats.spearmanr if case["method"] == "spearman" else stats.pearsonr
                    value = float(f(both.iloc[:, 0], both.iloc[:, 1])[0])
            ic[str(h)].append(value)
    summary = []
    for h in case["horizons"]:
        v = np.array([x for x in ic[str(h)] if x is not None])
        t = hac_t(v)
        sd = float(v.std(ddof=1))
        summary.append({"horizon": h, "n": len(v), "mean": float(v.mean()), "stdev": sd, "ic_ir": float(v.mean() / sd),
                        "t_stat": float(v.mean() / (sd / math.sqrt(len(v)))), "nw_t_stat": t, "nw_lags": nw_lags(len(v)),
                        "share_positive": float((v > 0).mean())})
    return {"dates": [d.date().isoformat() for d in dates], "ic": ic, "summary": summary}


def sort_into(frame, signal, b):
    """Rows of frame by bucket 1..b: type-7 breakpoints (numpy 'linear') at j/b of frame's signal, ties low."""
    cuts = np.quantile(frame[signal].to_numpy(), np.arange(1, b) / b)
    bucket = 1 + (frame[signal].to_numpy()[:, None] > cuts[None, :]).sum(axis=1)
    return {j: frame[bucket == j] for j in range(1, b + 1)}


def within_buckets(xs, spec, column, names):
    """Breakpoints inside each label group with at least b eligible members; bucket j pools every group's bucket j."""
    elig = xs[construction.eligible_mask(xs, spec) & xs[column].notna()]
    pooled = {j: [] for j in range(1, spec["buckets"] + 1)}
    for _, group in elig.groupby(column):
        if len(group) < spec["buckets"]:
            continue
        for j, members in sort_into(group, spec["signal"], spec["buckets"]).items():
            pooled[j].append(members)
    out = {}
    for j, name in zip(range(1, spec["buckets"] + 1), names):
        members = pd.concat(pooled[j]) if pooled[j] else elig.iloc[0:0]
        out[name] = construction.weights_of(members, spec) if len(members) else pd.Series(dtype=float)
    return out


def control_buckets(xs, spec, control, names):
    """Dependent double sort: c control buckets, then b signal buckets inside each; bucket j lists its c portfolios."""
    column, c = control
    elig = xs[construction.eligible_mask(xs, spec) & np.isfinite(xs[column])]
    out = {name: [pd.Series(dtype=float)] * c for name in names}
    if len(elig) == 0:
        return out
    for i, inside in sort_into(elig, column, c).items():
        if len(inside) == 0:
            continue
        for j, members in sort_into(inside, spec["signal"], spec["buckets"]).items():
            out[names[j - 1]][i - 1] = construction.weights_of(members, spec) if len(members) else pd.Series(dtype=float)
    return out


def bucket_portfolios(panel, dates, case):
    """Every bucket (sort) or each of the six (size_sort), held by the construction rules (drift, members leaving)."""
    spec = construction.parse_spec(case["spec"])
    returns = panel.pivot(index="date", columns="security", values="return").reindex(dates)
    points = construction.rebalance_points(dates, spec["rebalance"], spec["rebalance_month"])
    names = [str(j) for j in range(1, spec["buckets"] + 1)] if spec["method"] == "sort" else list(SIX.values())
    out = {name: {} for name in names}
    for i, point in enumerate(points):
        row_index = point - (spec["lag"] - 1)
        if row_index < 0:
            continue
        xs = panel[panel["date"] == dates[row_index]].set_index("security")
        if "within" in case:
            subs = within_buckets(xs, spec, case["within"], names)
        elif "control" in case:
            subs = control_buckets(xs, spec, case["control"], names)
        elif spec["method"] == "sort":
            elig = xs[construction.eligible_mask(xs, spec)]
            bp = construction.breakpoint_set(elig, spec)
            subs = {name: pd.Series(dtype=float) for name in names}
            if len(bp):
                b = spec["buckets"]
                cuts = np.quantile(bp[spec["signal"]].to_numpy(), np.arange(1, b) / b)
                bucket = 1 + (elig[spec["signal"]].to_numpy()[:, None] > cuts[None, :]).sum(axis=1)
                for j in range(1, b + 1):
                    members = elig[bucket == j]
                    if len(members):
                        subs[str(j)] = construction.weights_of(members, spec)
        else:
            subs = {SIX[k]: w for k, w in construction.form(xs, spec).items()}
        end = points[i + 1] if i + 1 < len(points) else len(dates) - 1
        periods = dates[point + 1:end + 1]
        for name, weights in subs.items():
            if isinstance(weights, list):  # a control sort's bucket: the mean of its c portfolios, none if any has none
                port = pd.concat([construction.hold(w, returns, periods)[0] for w in weights], axis=1).mean(axis=1, skipna=False)
            else:
                port, _ = construction.hold(weights, returns, periods)
            for d in periods:
                if not np.isnan(port[d]):
                    out[name][d.date().isoformat()] = float(port[d])
    return {"definition": case["definition"], "portfolios": out}


def main():
    panel = make_panel()
    path = FIXTURES / "xsection_panel.csv"
    panel.to_csv(path, index=False, float_format=NUMBER_FORMAT)
    panel = pd.read_csv(path, keep_default_na=False, na_values=[""])
    panel["sector"] = panel["sector"].replace("", None)
    panel["date"] = pd.to_datetime(panel["date"])
    dates = sorted(panel["date"].unique())
    dates = [pd.Timestamp(d) for d in dates]
    expected = {"fama_macbeth": {c["id"]: fama_macbeth(panel, dates, c) for c in FAMA_MACBETH_CASES},
                "portfolios": {c["id"]: bucket_portfolios(panel, dates, c) for c in PORTFOLIO_CASES},
                "ic": {c["id"]: information_coefficients(panel, dates, c) for c in IC_CASES}}
    (FIXTURES / "xsection_expected.json").write_text(json.dumps(expected, indent=1) + "\n")
    for cid, r in expected["fama_macbeth"].items():
        print(cid, r["periods"], "periods", r["skipped"], "skipped", [round(c["nw_t_stat"], 2) for c in r["coefficients"]])
    for cid, r in expected["portfolios"].items():
        print(cid, {k: len(v) for k, v in r["portfolios"].items()})
    for cid, r in expected["ic"].items():
        print(cid, [(s["horizon"], s["n"], round(s["mean"], 3)) for s in r["summary"]])


if __name__ == "__main__":
    main()
