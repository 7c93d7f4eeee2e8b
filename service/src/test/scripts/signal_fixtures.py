#!/usr/bin/env python3
"""Independent reference implementation of Winnow's signal recipes, in pandas/numpy/scipy.

Written from the recipe rules of the signals issue (not from the Java), on the seeded panel of
construction_fixtures.py (fixtures/construction_panel.csv, 40 invented securities x 80 business days, with row gaps
and missing cells) plus a seeded factor series `f` with a few missing dates (fixtures/signal_factor.csv).

What it writes
  1. fixtures/signal_recipes.json: the recipes, by id, as a client would send them (shorthand and defaults left out
     where the rules allow), with their canonical form.
  2. fixtures/signal_values.csv: `id,date,security,value` for every recipe at every (grid date, security) with a row,
     on every second grid date (k even) to keep the file small; value empty where missing.
  3. fixtures/signal_definitions.json and fixtures/signal_expected.csv: factor definitions whose signal is a recipe,
     built by the construction rules of construction_fixtures.py with the recipe's value in place of the column, and
     the sorts added with recipes: `within` (breakpoints inside label groups), `control` (dependent double sort) and
     method `rank_weighted` (weights from centred average ranks, scipy.stats.rankdata).
  4. fixtures/holdings_expected.csv: `id,date,formation_date,leg,security,weight,drifted_weight` for a few of those
     definitions and the construction fixtures' ones at several dates: the leg weights of the latest formation at or
     before the date, and those weights drifted through the end of the date.

References, by operation (names beside each use below):
  - rank: scipy.stats.rankdata(method='average'), then (rank - 1) / (n - 1); 0.5 when n = 1.
  - trailing_beta: numpy.polyfit(f, r, 1)[0] (least squares slope with intercept).
  - winsorize: numpy.quantile (default method 'linear', Hyndman and Fan 1996 definition 7) then numpy.clip.
  - trailing_stdev / zscore: numpy.std(ddof=1).
  - trailing_return: numpy.prod over the window.
Everything is vectorised over wide date x security frames, deliberately unlike the Java evaluator's per-date loop.

Libraries: Debian python3-numpy, python3-pandas, python3-scipy. Rerun from the repository root:
  /usr/bin/python3 service/src/test/scripts/signal_fixtures.py
"""
import json
import math
import os
import sys

import numpy as np
import pandas as pd
from scipy.stats import rankdata

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import construction_fixtures as cf  # noqa: E402  (the construction rules, reused for factor builds)

FIXTURES = cf.FIXTURES
NUMBER_FORMAT = cf.NUMBER_FORMAT

RECIPES = [
    ("column_string", "bm"),
    ("column_object", {"column": "bm"}),
    ("column_return", {"column": "return"}),
    ("lag_bm_3", {"lag": {"of": "bm", "periods": 3}}),
    ("change_bm_5", {"change": {"of": "bm", "periods": 5}}),
    ("growth_cap_10", {"growth": {"of": "market_cap", "periods": 10}}),
    ("growth_bm_3", {"growth": {"of": "bm", "periods": 3}}),
    ("trailing_return_20", {"trailing_return": {"periods": 20}}),
    ("trailing_return_10_skip_5", {"trailing_return": {"periods": 10, "skip": 5}}),
    ("trailing_mean_bm_7", {"trailing_mean": {"of": "bm", "periods": 7}}),
    ("trailing_stdev_return_15", {"trailing_stdev": {"of": "return", "periods": 15}}),
    ("trailing_beta_30", {"trailing_beta": {"against": "f", "periods": 30}}),
    ("trailing_beta_12_min_10", {"trailing_beta": {"against": "f", "periods": 12, "min_periods": 10}}),
    ("ratio_bm_cap", {"ratio": ["bm", {"column": "market_cap"}]}),
    ("ratio_score_change", {"ratio": ["score", {"change": {"of": "score", "periods": 1}}]}),
    ("log_cap", {"log": "market_cap"}),
    ("log_bm", {"log": "bm"}),
    ("combine_bm_score", {"combine": [{"weight": 0.5, "of": "bm"}, {"weight": -2, "of": "score"}]}),
    ("rank_bm", {"rank": "bm"}),
    ("rank_score_ties", {"rank": {"of": "score"}}),
    ("rank_bm_within_sector", {"rank": {"of": "bm", "within": "sector"}}),
    ("zscore_bm", {"zscore": "bm"}),
    ("zscore_score_within_listing", {"zscore": {"of": "score", "within": "listing"}}),
    ("winsorize_bm", {"winsorize": {"of": "bm"}}),
    ("winsorize_bm_within_sector", {"winsorize": {"of": "bm", "lower": 0.1, "upper": 0.8, "within": "sector"}}),
    ("demean_bm_sector", {"demean": {"of": "bm", "within": "sector"}}),
    ("trailing_mean_of_rank", {"trailing_mean": {"of": {"rank": "bm"}, "periods": 5}}),
    ("lag_of_growth", {"lag": {"of": {"growth": {"of": "bm", "periods": 2}}, "periods": 1}}),
    ("low_beta", {"zscore": {"trailing_beta": {"against": "f", "periods": 20, "min_periods": 8}}}),
    ("nested_value_momentum", {"combine": [
        {"weight": 1, "of": {"zscore": {"ratio": ["bm", {"log": "market_cap"}]}}},
        {"weight": 0.5, "of": {"rank": {"of": {"trailing_return": {"periods": 10, "skip": 2}}, "within": "sector"}}}]}),
    ("neutral_value", {"zscore": {"of": {"demean": {"of": {"winsorize": {"of": "bm", "lower": 0.05, "upper": 0.95}},
                                                    "within": "sector"}}}}),
    ("stdev_of_change", {"trailing_stdev": {"of": {"change": {"of": "bm", "periods": 1}}, "periods": 6}}),
]

# factor definitions on recipes (wire JSON, panel "fixture"); built with construction_fixtures.build
DEFINITIONS = [
    ("sort_momentum_monthly", {"method": "sort", "signal": {"trailing_return": {"periods": 10, "skip": 2}},
                               "buckets": 3, "weighting": "cap", "rebalance": "monthly"}),
    ("sort_low_beta_every_lmh", {"method": "sort", "signal": {"trailing_beta": {"against": "f", "periods": 20}},
                                 "buckets": 5, "direction": "low_minus_high"}),
    ("sort_neutral_value_lag2", {"method": "sort", "signal": {"demean": {"of": "bm", "within": "sector"}},
                                 "buckets": 3, "lag": 2, "rebalance": "monthly", "cost_bps": 10}),
    ("sort_rank_mean_every", {"method": "sort", "signal": {"trailing_mean": {"of": {"rank": "bm"}, "periods": 5}},
                              "buckets": 4}),
    ("size_sort_composite", {"method": "size_sort", "signal": {"combine": [
        {"weight": 1, "of": {"zscore": "bm"}}, {"weight": -1, "of": {"zscore": {"trailing_stdev": {"of": "return", "periods": 10}}}}]},
        "rebalance": "monthly"}),
    ("size_sort_growth_lag2", {"method": "size_sort", "signal": {"growth": {"of": "market_cap", "periods": 5}},
                               "lag": 2, "output": "size"}),
    ("within_sector_b3_eq_monthly", {"method": "sort", "signal": "bm", "within": "sector", "buckets": 3,
                                     "rebalance": "monthly"}),
    ("within_listing_b2_cap_every_lmh", {"method": "sort", "signal": {"rank": "score"}, "within": "listing",
                                         "buckets": 2, "weighting": "cap", "direction": "low_minus_high"}),
    ("within_sector_b5_small_groups", {"method": "sort", "signal": "bm", "within": "sector", "buckets": 8,
                                       "rebalance": "monthly", "cost_bps": 20}),
    ("control_cap_c3_b3_monthly", {"method": "sort", "signal": "bm", "control": {"signal": "market_cap", "buckets": 3},
                                   "buckets": 3, "weighting": "cap", "rebalance": "monthly"}),
    ("control_recipe_c2_b2_every", {"method": "sort", "signal": {"trailing_return": {"periods": 5}},
                                    "control": {"signal": {"trailing_beta": {"against": "f", "periods": 15}}, "buckets": 2},
                                    "buckets": 2, "lag": 2, "cost_bps": 5}),
    ("rank_weighted_bm_monthly", {"method": "rank_weighted", "signal": "bm", "rebalance": "monthly", "cost_bps": 10}),
    ("rank_weighted_score_every_lmh_universe", {"method": "rank_weighted", "signal": "score",
                                                "direction": "low_minus_high",
                                                "universe": {"labels": {"sector": {"exclude": ["D"]}}}}),
    ("rank_weighted_momentum_quarterly_lag2", {"method": "rank_weighted", "signal": {"trailing_return": {"periods": 8, "skip": 1}},
                                               "rebalance": "quarterly", "lag": 2}),
]

# (definition id, source) pairs whose holdings are written; source "signal" = DEFINITIONS, "construction" = cf.DEFINITIONS
HOLDINGS = [("sort_momentum_monthly", "signal"), ("control_cap_c3_b3_monthly", "signal"),
            ("within_sector_b3_eq_monthly", "signal"), ("rank_weighted_bm_monthly", "signal"),
            ("rank_weighted_score_every_lmh_universe", "signal"),
            ("sort_bm_b3_cap_monthly", "construction"), ("size_bm_signal_cap_monthly", "construction"),
            ("size_bm_size_eq_lag2_every_cost", "construction"), ("market_cap_monthly", "construction")]
HOLDING_DATE_INDICES = [10, 21, 22, 23, 45, 62, 79]


# ----------------------------------------------------------------------------------------------- data
def make_factor(dates):
    rng = np.random.default_rng(4242)
    keep = [d for k, d in enumerate(dates) if k not in (2, 17, 18, 40, 66)]
    return pd.DataFrame({"date": [d.date().isoformat() for d in keep],
                         "return": rng.normal(0.0003, 0.011, size=len(keep))})


class Panel:
    """Wide frames of the panel on its grid: a column is NaN where the security has no row or an empty cell."""

    def __init__(self, panel, factors):
        frame = panel.assign(date=pd.to_datetime(panel["date"]))
        self.grid = [pd.Timestamp(d) for d in sorted(frame["date"].unique())]
        self.securities = sorted(frame["security"].unique())
        self.frame = frame
        self.has_row = (frame.assign(one=1.0).pivot(index="date", columns="security", values="one")
                        .reindex(index=self.grid, columns=self.securities).notna())
        self.factors = {name: dict(zip(pd.to_datetime(f["date"]), f["return"])) for name, f in factors.items()}

    def column(self, name):
        wide = self.frame.pivot(index="date", columns="security", values=name)
        return wide.reindex(index=self.grid, columns=self.securities).astype(object if name in ("sector", "listing") else float)

    def labels(self, name):
        wide = self.frame.pivot(index="date", columns="security", values=name)
        return wide.reindex(index=self.grid, columns=self.securities)


def arg(recipe):
    return recipe if isinstance(recipe, str) else None


def evaluate(recipe, p):
    """The recipe as a wide frame, NaN where missing; every value masked to the (date, security) rows that exist."""
    return _eval(recipe, p).where(p.has_row)


def _eval(recipe, p):
    if isinstance(recipe, str):
        return p.column(recipe).where(p.has_row)
    (op, a), = recipe.items()
    if op == "column":
        return p.column(a).where(p.has_row)
    if op == "lag":
        return evaluate(a["of"], p).shift(a["periods"])
    if op == "change":
        x = evaluate(a["of"], p)
        return x - x.shift(a["periods"])
    if op == "growth":
        x = evaluate(a["of"], p)
        before = x.shift(a["periods"])
        return (x / before - 1.0).where(before > 0)
    if op == "trailing_return":
        periods, skip = a["periods"], a.get("skip", 0)
        gross = 1.0 + evaluate("return", p)
        # numpy.prod over each full window of p returns; any missing return (NaN) makes the window missing
        prod = gross.rolling(periods, min_periods=periods).apply(np.prod, raw=True)
        return prod.shift(skip) - 1.0
    if op == "trailing_mean":
        x = evaluate(a["of"], p)
        return x.rolling(a["periods"], min_periods=a["periods"]).apply(np.mean, raw=True)
    if op == "trailing_stdev":
        x = evaluate(a["of"], p)
        return x.rolling(a["periods"], min_periods=a["periods"]).apply(lambda w: np.std(w, ddof=1), raw=True)
    if op == "trailing_beta":
        return trailing_beta(p, a["against"], a["periods"], a.get("min_periods", max(3, math.ceil(a["periods"] / 2))))
    if op == "ratio":
        x, y = evaluate(a[0], p), evaluate(a[1], p)
        return (x / y).where(y != 0)
    if op == "log":
        x = evaluate(a, p)
        return np.log(x.where(x > 0))
    if op == "combine":
        total = None
        for term in a:
            part = term["weight"] * evaluate(term["of"], p)
            total = part if total is None else total + part
        return total
    if op in ("rank", "zscore", "winsorize", "demean"):
        long_form = isinstance(a, dict) and "of" in a
        of = a["of"] if long_form else a
        within = a.get("within") if long_form else None
        x = evaluate(of, p)
        groups = p.labels(within) if within else None
        return cross_sectional(op, a if long_form else {}, x, groups)
    raise ValueError(op)


def trailing_beta(p, against, periods, min_periods):
    """numpy.polyfit(f, r, 1)[0] over grid dates k-p+1..k where both the security's and the factor's returns exist."""
    r = evaluate("return", p)
    f = pd.Series([p.factors[against].get(d, np.nan) for d in p.grid], index=p.grid)
    out = pd.DataFrame(np.nan, index=p.grid, columns=p.securities)
    for k in range(len(p.grid)):
        lo = max(0, k - periods + 1)
        fw = f.iloc[lo:k + 1].to_numpy()
        for s in p.securities:
            rw = r[s].iloc[lo:k + 1].to_numpy()
            both = np.isfinite(fw) & np.isfinite(rw)
            if both.sum() < min_periods or np.var(fw[both]) == 0:
                continue
            out.iat[k, p.securities.index(s)] = np.polyfit(fw[both], rw[both], 1)[0]
    return out


def cross_sectional(op, a, x, groups):
    out = pd.DataFrame(np.nan, index=x.index, columns=x.columns)
    for d in x.index:
        row = x.loc[d]
        finite = row[np.isfinite(row.astype(float))]
        if groups is None:
            parts = [finite]
        else:
            g = groups.loc[d, finite.index]
            parts = [finite[g == label] for label in g.dropna().unique()]
        for values in parts:
            if len(values) == 0:
                continue
            v = values.to_numpy(dtype=float)
            if op == "rank":  # scipy.stats.rankdata, average method for ties
                res = np.full(len(v), 0.5) if len(v) == 1 else (rankdata(v, method="average") - 1.0) / (len(v) - 1)
            elif op == "zscore":  # numpy.std with ddof=1
                sd = np.std(v, ddof=1) if len(v) >= 2 else 0.0
                res = (v - v.mean()) / sd if sd > 0 else np.full(len(v), np.nan)
            elif op == "winsorize":  # numpy.quantile, method 'linear' (Hyndman and Fan type 7)
                lo, hi = np.quantile(v, [a.get("lower", 0.01), a.get("upper", 0.99)])
                res = np.clip(v, lo, hi)
            else:  # demean within the label group
                res = v - v.mean()
            out.loc[d, values.index] = res
    return out


# --------------------------------------------------------------------------------------------- canonical form
def canonical(recipe):
    """String shorthand expanded, defaults filled, keys sorted, short forms written long (what Winnow stores)."""
    if isinstance(recipe, str):
        return {"column": recipe}
    (op, a), = recipe.items()
    if op == "column":
        return {"column": a}
    if op in ("lag", "change", "growth", "trailing_mean", "trailing_stdev"):
        return {op: {"of": canonical(a["of"]), "periods": a["periods"]}}
    if op == "trailing_return":
        return {op: {"periods": a["periods"], "skip": a.get("skip", 0)}}
    if op == "trailing_beta":
        return {op: {"against": a["against"], "min_periods": a.get("min_periods", max(3, math.ceil(a["periods"] / 2))),
                     "periods": a["periods"]}}
    if op == "ratio":
        return {op: [canonical(a[0]), canonical(a[1])]}
    if op == "log":
        return {op: canonical(a)}
    if op == "combine":
        return {op: [{"of": canonical(t["of"]), "weight": float(t["weight"])} for t in a]}
    long_form = isinstance(a, dict) and "of" in a
    body = {"of": canonical(a["of"] if long_form else a)}
    if op == "winsorize":
        body["lower"] = float(a.get("lower", 0.01))
        body["upper"] = float(a.get("upper", 0.99))
    if long_form and "within" in a:
        body["within"] = a["within"]
    return {op: dict(sorted(body.items()))}


# --------------------------------------------------------------------------------------------- factor builds
def spec_of(definition):
    d = {"method": definition["method"], "signal": "__signal"}
    for key in ("direction", "buckets", "weighting", "lag", "rebalance", "rebalance_month", "output", "cost_bps"):
        if key in definition:
            d[key] = str(definition[key])
    if definition["method"] == "rank_weighted":
        d.setdefault("weighting", "equal")
    for label, rule in definition.get("universe", {}).get("labels", {}).items():
        (mode, values), = rule.items()
        d[mode] = label + ":" + "|".join(values)
    spec = cf.parse_spec(";".join(f"{k}={v}" for k, v in d.items()))
    spec["within"] = definition.get("within")
    spec["control_buckets"] = definition["control"]["buckets"] if "control" in definition else None
    return spec


def with_signal(panel, p, recipe, name="__signal"):
    """The long panel with the recipe's value in a column (construction rules 1-8 then apply unchanged)."""
    wide = evaluate(recipe, p)
    long = wide.stack(dropna=False).rename(name).reset_index()
    long.columns = ["date", "security", name]
    long["date"] = long["date"].dt.date.astype(str)
    return panel.merge(long, on=["date", "security"], how="left")


def built_panel(panel, p, definition):
    built = with_signal(panel, p, definition["signal"])
    if "control" in definition:
        built = with_signal(built, p, definition["control"]["signal"], "__control")
    return built


# ------------------------------------------------------------------- within, control and rank_weighted, from the rules
ORIGINAL_FORM = cf.form
ORIGINAL_LEGS = cf.legs


def form(xs, spec):
    """The sub-portfolios of one formation, for the sorts added with recipes; the others as construction_fixtures."""
    empty = pd.Series(dtype=float)
    if spec["method"] == "rank_weighted":
        # eligible: finite signal and the universe (no market cap needed: weighting does not apply)
        elig = xs[cf.eligible_mask(xs, dict(spec, method="sort", weighting="equal"))]
        if len(elig) < 2:
            return {"high": empty, "low": empty}
        a = rankdata(elig[spec["signal"]].to_numpy(), method="average")  # scipy average ranks
        d = pd.Series(a - (len(elig) + 1) / 2.0, index=elig.index)
        high, low = d[d > 0], -d[d < 0]
        return {"high": high / high.sum() if len(high) else empty, "low": low / low.sum() if len(low) else empty}
    if spec.get("within"):
        elig = xs[cf.eligible_mask(xs, spec)]
        elig = elig[elig[spec["within"]].notna()]
        b = spec["buckets"]
        lows, highs = [], []
        for _, group in elig.groupby(spec["within"]):
            if len(group) < b:
                continue  # the group sits out this formation
            cuts = np.quantile(group[spec["signal"]].to_numpy(), np.arange(1, b) / b)  # numpy linear = type 7
            bucket = 1 + (group[spec["signal"]].to_numpy()[:, None] > cuts[None, :]).sum(axis=1)
            lows.append(group[bucket == 1])
            highs.append(group[bucket == b])
        low = pd.concat(lows) if lows else elig.iloc[0:0]
        high = pd.concat(highs) if highs else elig.iloc[0:0]
        return {"low": cf.weights_of(low, spec) if len(low) else empty,
                "high": cf.weights_of(high, spec) if len(high) else empty}
    if spec.get("control_buckets"):
        c, b = spec["control_buckets"], spec["buckets"]
        elig = xs[cf.eligible_mask(xs, spec) & np.isfinite(xs["__control"].astype(float))]
        out = {f"{side}{i}": empty for i in range(c) for side in "LH"}
        if len(elig) == 0:
            return out
        ccuts = np.quantile(elig["__control"].to_numpy(), np.arange(1, c) / c)
        cbucket = (elig["__control"].to_numpy()[:, None] > ccuts[None, :]).sum(axis=1)
        for i in range(c):
            inside = elig[cbucket == i]
            if len(inside) == 0:
                continue
            cuts = np.quantile(inside[spec["signal"]].to_numpy(), np.arange(1, b) / b)
            bucket = 1 + (inside[spec["signal"]].to_numpy()[:, None] > cuts[None, :]).sum(axis=1)
            low, high = inside[bucket == 1], inside[bucket == b]
            out[f"L{i}"] = cf.weights_of(low, spec) if len(low) else empty
            out[f"H{i}"] = cf.weights_of(high, spec) if len(high) else empty
        return out
    return ORIGINAL_FORM(xs, spec)


def legs(spec):
    hml = spec["direction"] == "high_minus_low"
    if spec.get("control_buckets"):
        high = [f"H{i}" for i in range(spec["control_buckets"])]
        low = [f"L{i}" for i in range(spec["control_buckets"])]
        return (high, low) if hml else (low, high)
    if spec["method"] == "rank_weighted":
        return (["high"], ["low"]) if hml else (["low"], ["high"])
    return ORIGINAL_LEGS(spec)


cf.form = form
cf.legs = legs


# ------------------------------------------------------------------------------------------------- holdings
def holdings(panel, spec, indices):
    """For each grid index D: the latest formation R <= D, its leg weights and those drifted through the end of D."""
    frame = panel.assign(date=pd.to_datetime(panel["date"]))
    dates = [pd.Timestamp(d) for d in sorted(frame["date"].unique())]
    returns = frame.pivot(index="date", columns="security", values="return").reindex(dates)
    points = [pt for pt in cf.rebalance_points(dates, spec["rebalance"], spec["rebalance_month"])
              if pt - (spec["lag"] - 1) >= 0]
    long_names, short_names = legs(spec)
    out = []
    for index in indices:
        formed = [pt for pt in points if pt <= index]
        if not formed:
            continue
        point = formed[-1]
        xs = frame[frame["date"] == dates[point - (spec["lag"] - 1)]].set_index("security")
        subs = form(xs, spec)
        periods = dates[point + 1:index + 1]
        drifted = subs if not periods else {n: cf.hold(w, returns, periods)[1] for n, w in subs.items()}
        for leg, names in (("long", long_names), ("short", short_names)):
            if not names:
                continue
            w = cf.leg_weights(subs, names)
            dw = cf.leg_weights(drifted, names)
            for sec in sorted(set(w.index) | set(dw.index)):
                out.append((dates[index], dates[point], leg, int(sec), float(w.get(sec, 0.0)), float(dw.get(sec, 0.0))))
    return out


def fmt(x):
    return cf.fmt(x)


def main():
    panel = pd.read_csv(os.path.join(FIXTURES, "construction_panel.csv"))
    grid = [pd.Timestamp(d) for d in sorted(pd.to_datetime(panel["date"]).unique())]
    make_factor(grid).to_csv(os.path.join(FIXTURES, "signal_factor.csv"), index=False, float_format=NUMBER_FORMAT)
    factor = pd.read_csv(os.path.join(FIXTURES, "signal_factor.csv"))
    p = Panel(panel, {"f": factor})

    with open(os.path.join(FIXTURES, "signal_recipes.json"), "w") as out:
        json.dump([{"id": rid, "signal": r, "canonical": canonical(r)} for rid, r in RECIPES], out, indent=1)
        out.write("\n")
    lines = ["id,date,security,value"]
    for rid, recipe in RECIPES:
        wide = evaluate(recipe, p)
        count = 0
        for d in p.grid[::2]:
            for s in p.securities:
                if p.has_row.at[d, s]:
                    v = wide.at[d, s]
                    lines.append(f"{rid},{d.date().isoformat()},{s},{fmt(float(v))}")
                    count += int(np.isfinite(v))
        print(f"{rid}: {count} values")
    with open(os.path.join(FIXTURES, "signal_values.csv"), "w") as out:
        out.write("\n".join(lines) + "\n")

    with open(os.path.join(FIXTURES, "signal_definitions.json"), "w") as out:
        json.dump([{"id": did, "definition": dict(d, panel="fixture")} for did, d in DEFINITIONS], out, indent=1)
        out.write("\n")
    rf = pd.read_csv(os.path.join(FIXTURES, "construction_riskfree.csv"))
    lines = ["id,kind,date,spread,long,short,net,turnover,count"]
    for did, definition in DEFINITIONS:
        built = built_panel(panel, p, definition)
        observations, formations, missing = cf.build(built, rf, spec_of(definition))
        for d, s, lo, sh, net in observations:
            lines.append(",".join([did, "obs", d.date().isoformat(), fmt(s), fmt(lo), fmt(sh), fmt(net), "", ""]))
        for d, to in formations:
            lines.append(",".join([did, "formation", d.date().isoformat(), "", "", "", "", fmt(to), ""]))
        lines.append(",".join([did, "summary", "", "", "", "", "", "", str(missing)]))
        print(f"{did}: {len(observations)} returns, {len(formations)} formations, {missing} periods without")
    with open(os.path.join(FIXTURES, "signal_expected.csv"), "w") as out:
        out.write("\n".join(lines) + "\n")

    lines = ["id,date,formation_date,leg,security,weight,drifted_weight"]
    by_id = dict(DEFINITIONS)
    construction = dict(cf.DEFINITIONS)
    for hid, source in HOLDINGS:
        if source == "signal":
            spec, data = spec_of(by_id[hid]), built_panel(panel, p, by_id[hid])
        else:
            spec, data = cf.parse_spec(construction[hid]), panel
            spec["within"], spec["control_buckets"] = None, None
        for d, formed, leg, sec, w, dw in holdings(data, spec, HOLDING_DATE_INDICES):
            lines.append(",".join([hid, d.date().isoformat(), formed.date().isoformat(), leg, str(sec), fmt(w), fmt(dw)]))
    with open(os.path.join(FIXTURES, "holdings_expected.csv"), "w") as out:
        out.write("\n".join(lines) + "\n")


if __name__ == "__main__":
    main()
