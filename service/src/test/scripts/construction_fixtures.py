#!/usr/bin/env python3
"""Independent reference implementation of Winnow's factor construction rules, in pandas/numpy.

What it computes
  1. A seeded synthetic panel (40 invented securities x 80 business days, January to May 2023, with row gaps,
     missing returns, caps and signals, zero caps, a tied integer signal and two label columns) written to
     fixtures/construction_panel.csv, plus a risk-free series with a few missing dates (construction_riskfree.csv).
  2. For every definition in DEFINITIONS (written to construction_definitions.csv as `id,spec`), the factor series
     built by the construction rules: one `obs` row per period with a return (spread, long leg, short leg, net),
     one `formation` row per formation (rebalance date, turnover) and one `summary` row (periods without a return),
     all in construction_expected.csv.
  3. numpy.quantile (default method 'linear', which is Hyndman and Fan 1996 definition 7) of a few small arrays,
     in quantiles_numpy.csv.

It is written from the written construction rules only, vectorised with pandas (wide date x security frames,
cumulative products for drift), deliberately unlike the Java engine's streaming loop.

Libraries: Debian python3-numpy and python3-pandas. Rerun from the repository root:
  /usr/bin/python3 service/src/test/scripts/construction_fixtures.py
"""
import os

import numpy as np
import pandas as pd

FIXTURES = os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "resources", "fixtures")
NUMBER_FORMAT = "%.17g"

# id -> spec. Keys: method signal direction buckets weighting lag rebalance rebalance_month output risk_free
# min_market_cap include exclude (column:v1|v2) size_half segment breakpoints (column:value) cost_bps.
DEFINITIONS = [
    ("sort_bm_b5_eq_every", "method=sort;signal=bm;buckets=5;weighting=equal;lag=1;rebalance=every_period"),
    ("sort_bm_b3_cap_monthly", "method=sort;signal=bm;buckets=3;weighting=cap;lag=1;rebalance=monthly"),
    ("sort_bm_b3_eq_lag2_monthly_cost", "method=sort;signal=bm;buckets=3;weighting=equal;lag=2;rebalance=monthly;cost_bps=15"),
    ("sort_bm_b5_cap_lag2_quarterly", "method=sort;signal=bm;buckets=5;weighting=cap;lag=2;rebalance=quarterly"),
    ("sort_bm_b5_eq_annual2", "method=sort;signal=bm;buckets=5;weighting=equal;lag=1;rebalance=annual;rebalance_month=2"),
    ("sort_bm_b3_cap_annual4", "method=sort;signal=bm;buckets=3;weighting=cap;lag=1;rebalance=annual;rebalance_month=4"),
    ("sort_score_b3_eq_every_lmh", "method=sort;signal=score;buckets=3;weighting=equal;lag=1;rebalance=every_period;direction=low_minus_high"),
    ("sort_score_b5_cap_lag2_monthly", "method=sort;signal=score;buckets=5;weighting=cap;lag=2;rebalance=monthly"),
    ("sort_bm_include_mincap_cost", "method=sort;signal=bm;buckets=3;weighting=equal;lag=1;rebalance=monthly;include=sector:A|B;min_market_cap=900;cost_bps=25"),
    ("sort_bm_exclude_bpmain", "method=sort;signal=bm;buckets=3;weighting=cap;lag=1;rebalance=every_period;exclude=sector:C;breakpoints=listing:main"),
    ("sort_bm_bp_pilot", "method=sort;signal=bm;buckets=3;weighting=equal;lag=1;rebalance=monthly;breakpoints=listing:pilot"),
    ("sort_bm_small_half", "method=sort;signal=bm;buckets=5;weighting=equal;lag=1;rebalance=every_period;size_half=small"),
    ("sort_bm_big_half_segment_cost", "method=sort;signal=bm;buckets=3;weighting=cap;lag=1;rebalance=monthly;size_half=big;segment=sector:B;cost_bps=10"),
    ("size_bm_signal_cap_monthly", "method=size_sort;signal=bm;weighting=cap;lag=1;rebalance=monthly;output=signal"),
    ("size_bm_size_eq_lag2_every_cost", "method=size_sort;signal=bm;weighting=equal;lag=2;rebalance=every_period;output=size;cost_bps=20"),
    ("size_bm_signal_lmh_quarterly_bp", "method=size_sort;signal=bm;weighting=cap;lag=1;rebalance=quarterly;output=signal;direction=low_minus_high;breakpoints=listing:main"),
    ("size_score_signal_every_include", "method=size_sort;signal=score;weighting=cap;lag=1;rebalance=every_period;output=signal;include=sector:A|B|C"),
    ("size_bm_size_cap_annual2", "method=size_sort;signal=bm;weighting=cap;lag=1;rebalance=annual;rebalance_month=2;output=size"),
    ("market_cap_monthly", "method=market;weighting=cap;lag=1;rebalance=monthly"),
    ("market_cap_every_rf_cost", "method=market;weighting=cap;lag=1;rebalance=every_period;risk_free=rf;cost_bps=10"),
    ("market_eq_quarterly_big", "method=market;weighting=equal;lag=1;rebalance=quarterly;size_half=big"),
    ("market_cap_annual3_lag2_rf_exclude", "method=market;weighting=cap;lag=2;rebalance=annual;rebalance_month=3;risk_free=rf;exclude=sector:D"),
]


# ----------------------------------------------------------------------------------------------- synthetic data
def make_panel():
    rng = np.random.default_rng(20230123)
    dates = pd.bdate_range("2023-01-23", periods=80)
    ids = np.sort(rng.choice(np.arange(1, 400), size=40, replace=False))
    pilots = set(ids[[3, 17, 29]])
    rows = []
    for j, sid in enumerate(ids):
        start = 12 if j % 13 == 5 else 0
        end = 61 if j % 11 == 7 else 80
        cap = float(np.exp(rng.normal(7.0, 1.2)))
        bm = float(rng.normal(0.6, 0.3))
        sector = "ABCD"[rng.integers(4)]
        listing = "main" if rng.random() < 0.6 else "alt"
        for t in range(start, end):
            if rng.random() < 0.012:
                continue  # no row at this date
            r = float(rng.normal(0.0004, 0.02))
            cap *= 1.0 + r
            bm += float(rng.normal(0.0, 0.03))
            ret = r if rng.random() >= 0.012 else np.nan
            u = rng.random()
            mcap = np.nan if u < 0.03 else (0.0 if u < 0.04 else cap)
            sig = bm if rng.random() >= 0.04 else np.nan
            score = float(rng.integers(1, 7)) if rng.random() >= 0.03 else np.nan
            sec = sector if rng.random() >= 0.05 else None
            lst = "pilot" if (sid in pilots and t < 25) else listing
            rows.append((dates[t].date().isoformat(), int(sid), ret, mcap, sig, score, sec, lst))
    panel = pd.DataFrame(rows, columns=["date", "security", "return", "market_cap", "bm", "score", "sector", "listing"])
    rf_dates = [d for k, d in enumerate(dates) if k not in (5, 33, 34, 71)]
    rf = pd.DataFrame({"date": [d.date().isoformat() for d in rf_dates],
                       "return": rng.normal(0.00012, 0.00002, size=len(rf_dates))})
    return panel, rf


# --------------------------------------------------------------------------------------------- definitions
def parse_spec(spec):
    d = dict(item.split("=", 1) for item in spec.split(";"))
    out = {
        "method": d["method"],
        "signal": d.get("signal"),
        "direction": d.get("direction", "high_minus_low"),
        "buckets": int(d.get("buckets", 5)),
        "weighting": d.get("weighting", "equal" if d["method"] == "sort" else "cap"),
        "lag": int(d.get("lag", 1)),
        "rebalance": d.get("rebalance", "every_period"),
        "rebalance_month": int(d["rebalance_month"]) if "rebalance_month" in d else None,
        "output": d.get("output", "signal"),
        "risk_free": d.get("risk_free"),
        "min_market_cap": float(d["min_market_cap"]) if "min_market_cap" in d else None,
        "size_half": d.get("size_half"),
        "cost_bps": float(d.get("cost_bps", 0)),
        "labels": [],
        "segment": None,
        "breakpoints": None,
    }
    for mode in ("include", "exclude"):
        if mode in d:
            col, vals = d[mode].split(":")
            out["labels"].append((col, mode, vals.split("|")))
    for key in ("segment", "breakpoints"):
        if key in d:
            out[key] = tuple(d[key].split(":"))
    return out


# ------------------------------------------------------------------------------------------- the rules
def rebalance_points(dates, rebalance, month):
    """Rule 2: grid indices that are rebalance points (never the last one)."""
    points = []
    for k in range(len(dates) - 1):
        d, nxt = dates[k], dates[k + 1]
        if rebalance == "every_period":
            points.append(k)
            continue
        month_turns = (nxt.year, nxt.month) > (d.year, d.month)
        in_calendar = (rebalance == "monthly"
                       or (rebalance == "quarterly" and d.month in (3, 6, 9, 12))
                       or (rebalance == "annual" and d.month == month))
        if month_turns and in_calendar:
            points.append(k)
    return points


def eligible_mask(xs, spec):
    """Rule 4 plus the universe options, in the order: base, min cap, label lists, segment, size half."""
    cap = xs["market_cap"]
    cap_ok = cap.notna() & np.isfinite(cap) & (cap > 0)
    if spec["method"] in ("sort", "size_sort"):
        ok = xs[spec["signal"]].notna() & np.isfinite(xs[spec["signal"]])
    else:
        ok = pd.Series(True, index=xs.index)
    if spec["method"] in ("size_sort", "market") or spec["weighting"] == "cap":
        ok &= cap_ok
    if spec["min_market_cap"] is not None:
        ok &= np.isfinite(cap) & (cap >= spec["min_market_cap"])
    for col, mode, vals in spec["labels"]:
        inside = xs[col].isin(vals)  # a missing label is never inside
        ok &= inside if mode == "include" else ~inside
    if spec["segment"] is not None:
        col, val = spec["segment"]
        ok &= xs[col] == val
    if spec["size_half"] is not None:
        base = ok & cap_ok
        if not base.any():
            return base
        median = np.quantile(cap[base].to_numpy(), 0.5)
        ok = base & ((cap <= median) if spec["size_half"] == "small" else (cap > median))
    return ok


def normalised(weights):
    return weights / weights.sum()


def weights_of(members, spec):
    if spec["weighting"] == "cap":
        return normalised(members["market_cap"].astype(float))
    return normalised(pd.Series(1.0, index=members.index))


def breakpoint_set(elig, spec):
    if spec["breakpoints"] is None:
        return elig
    col, val = spec["breakpoints"]
    return elig[elig[col] == val]


def form(xs, spec):
    """Rules 5, 6, 8, 9: the sub-portfolios (name -> normalised weights) of one formation."""
    elig = xs[eligible_mask(xs, spec)]
    empty = pd.Series(dtype=float)
    method = spec["method"]
    if method == "market":
        return {"all": weights_of(elig, spec) if len(elig) else empty}
    bp = breakpoint_set(elig, spec)
    if method == "sort":
        if len(bp) == 0:
            return {"low": empty, "high": empty}
        b = spec["buckets"]
        cuts = np.quantile(bp[spec["signal"]].to_numpy(), np.arange(1, b) / b)
        bucket = 1 + (elig[spec["signal"]].to_numpy()[:, None] > cuts[None, :]).sum(axis=1)
        low, high = elig[bucket == 1], elig[bucket == b]
        return {"low": weights_of(low, spec) if len(low) else empty,
                "high": weights_of(high, spec) if len(high) else empty}
    # size_sort, Fama and French (1993) 2x3
    names = ["SL", "SN", "SH", "BL", "BN", "BH"]
    if len(bp) == 0:
        return {n: empty for n in names}
    size_cut = np.quantile(bp["market_cap"].to_numpy(), 0.5)
    p30, p70 = np.quantile(bp[spec["signal"]].to_numpy(), [0.3, 0.7])
    sig = elig[spec["signal"]]
    small = elig["market_cap"] <= size_cut
    groups = {"L": sig <= p30, "N": (sig > p30) & (sig <= p70), "H": sig > p70}
    out = {}
    for size_name, size_mask in (("S", small), ("B", ~small)):
        for g, g_mask in groups.items():
            members = elig[size_mask & g_mask]
            out[size_name + g] = weights_of(members, spec) if len(members) else empty
    return out


def legs(spec):
    """Rules 7 and 8: (long sub-portfolios, short sub-portfolios)."""
    hml = spec["direction"] == "high_minus_low"
    if spec["method"] == "market":
        return ["all"], []
    if spec["method"] == "sort":
        return (["high"], ["low"]) if hml else (["low"], ["high"])
    if spec["output"] == "size":
        return ["SL", "SN", "SH"], ["BL", "BN", "BH"]
    high, low = ["SH", "BH"], ["SL", "BL"]
    return (high, low) if hml else (low, high)


def hold(weights, returns, periods):
    """Rule 3 for one sub-portfolio: per-period returns and the weights drifted to the end of the holding."""
    if len(weights) == 0:
        return pd.Series(np.nan, index=periods), pd.Series(dtype=float)
    r = returns.loc[periods, weights.index]
    alive = r.notna().cumprod().astype(bool)           # leaves for good at its first missing return
    growth = (1.0 + r.fillna(0.0)).cumprod()
    before = growth.shift(1).fillna(1.0).mul(weights, axis=1).where(alive)
    port = (before * r).sum(axis=1, min_count=1) / before.sum(axis=1, min_count=1)
    last = alive.iloc[-1]
    end = (growth.iloc[-1] * weights)[last]
    return port, (normalised(end) if len(end) else end)


def leg_weights(subs, names):
    """Rule 11: a leg's weights, equal coefficients renormalised over the non-empty sub-portfolios."""
    parts = [subs[n] for n in names if len(subs[n])]
    if not parts:
        return pd.Series(dtype=float)
    return pd.concat([p / len(parts) for p in parts])


def turnover(new, old):
    total = 0.0
    for a, b in zip(new, old):
        union = a.index.union(b.index)
        total += (a.reindex(union, fill_value=0.0) - b.reindex(union, fill_value=0.0)).abs().sum()
    return total


def build(panel, rf, spec):
    dates = sorted(pd.to_datetime(panel["date"]).unique())
    dates = [pd.Timestamp(d) for d in dates]
    frame = panel.assign(date=pd.to_datetime(panel["date"]))
    returns = frame.pivot(index="date", columns="security", values="return").reindex(dates)
    rf_by_date = dict(zip(pd.to_datetime(rf["date"]), rf["return"])) if spec["risk_free"] else None
    long_names, short_names = legs(spec)
    points = rebalance_points(dates, spec["rebalance"], spec["rebalance_month"])
    observations, formations = [], []
    previous_legs = [pd.Series(dtype=float), pd.Series(dtype=float)]
    first_period = None
    for i, point in enumerate(points):
        row_index = point - (spec["lag"] - 1)
        if row_index < 0:
            continue
        xs = frame[frame["date"] == dates[row_index]].set_index("security")
        subs = form(xs, spec)
        end = points[i + 1] if i + 1 < len(points) else len(dates) - 1
        periods = dates[point + 1:end + 1]
        first_period = periods[0] if first_period is None else first_period
        new_legs = [leg_weights(subs, long_names), leg_weights(subs, short_names)]
        to = turnover(new_legs, previous_legs)
        formations.append((dates[point], to))
        held = {name: hold(w, returns, periods) for name, w in subs.items()}
        drifted = {name: h[1] for name, h in held.items()}
        previous_legs = [leg_weights(drifted, long_names), leg_weights(drifted, short_names)]
        long_ret = pd.concat([held[n][0] for n in long_names], axis=1).mean(axis=1, skipna=False)
        if short_names:
            short_ret = pd.concat([held[n][0] for n in short_names], axis=1).mean(axis=1, skipna=False)
            spread = long_ret - short_ret
        else:
            short_ret = pd.Series(np.nan, index=periods)
            if rf_by_date is not None:
                spread = long_ret - pd.Series([rf_by_date.get(d, np.nan) for d in periods], index=periods)
            else:
                spread = long_ret.copy()
        for k, d in enumerate(periods):
            s = spread[d]
            if np.isnan(s):
                continue
            net = s - spec["cost_bps"] / 10000.0 * to if k == 0 else s
            observations.append((d, s, long_ret[d], short_ret[d], net))
    held_periods = [d for d in dates if first_period is not None and d >= first_period]
    missing = len(held_periods) - len(observations)
    return observations, formations, missing


def fmt(x):
    return "" if x is None or (isinstance(x, float) and np.isnan(x)) else NUMBER_FORMAT % x


def main():
    os.makedirs(FIXTURES, exist_ok=True)
    panel, rf = make_panel()
    panel.to_csv(os.path.join(FIXTURES, "construction_panel.csv"), index=False, float_format=NUMBER_FORMAT)
    rf.to_csv(os.path.join(FIXTURES, "construction_riskfree.csv"), index=False, float_format=NUMBER_FORMAT)
    # compute from the files as written, so the Java side reads exactly the same numbers
    panel = pd.read_csv(os.path.join(FIXTURES, "construction_panel.csv"))
    rf = pd.read_csv(os.path.join(FIXTURES, "construction_riskfree.csv"))
    pd.DataFrame(DEFINITIONS, columns=["id", "spec"]).to_csv(
        os.path.join(FIXTURES, "construction_definitions.csv"), index=False)
    lines = ["id,kind,date,spread,long,short,net,turnover,count"]
    for def_id, text in DEFINITIONS:
        spec = parse_spec(text)
        observations, formations, missing = build(panel, rf, spec)
        for d, s, lo, sh, net in observations:
            lines.append(",".join([def_id, "obs", d.date().isoformat(), fmt(s), fmt(lo), fmt(sh), fmt(net), "", ""]))
        for d, to in formations:
            lines.append(",".join([def_id, "formation", d.date().isoformat(), "", "", "", "", fmt(to), ""]))
        lines.append(",".join([def_id, "summary", "", "", "", "", "", "", str(missing)]))
        print(f"{def_id}: {len(observations)} returns, {len(formations)} formations, {missing} periods without")
    with open(os.path.join(FIXTURES, "construction_expected.csv"), "w") as out:
        out.write("\n".join(lines) + "\n")
    write_quantiles()


def write_quantiles():
    rng = np.random.default_rng(1996)
    cases = [
        [3.0],
        [2.0, 7.0],
        [1.0, 2.0, 3.0, 4.0, 5.0, 6.0, 7.0, 8.0, 9.0, 10.0],
        [5.0, 1.0, 5.0, 5.0, 2.0, 9.0, 1.0],
        list(rng.normal(0.0, 1.0, size=13)),
        list(rng.lognormal(7.0, 1.5, size=40)),
    ]
    probabilities = [0.0, 0.1, 0.2, 0.25, 0.3, 1 / 3, 0.4, 0.5, 0.6, 2 / 3, 0.7, 0.75, 0.8, 0.9, 1.0]
    lines = ["case,values,p,quantile"]
    for c, values in enumerate(cases):
        text = ";".join(NUMBER_FORMAT % v for v in values)
        for p in probabilities:
            lines.append(f"{c},{text},{NUMBER_FORMAT % p},{NUMBER_FORMAT % np.quantile(values, p)}")
    with open(os.path.join(FIXTURES, "quantiles_numpy.csv"), "w") as out:
        out.write("\n".join(lines) + "\n")


if __name__ == "__main__":
    main()
