#!/usr/bin/python3
"""Reference values for risk/stats and risk/returns from general-purpose libraries.

Run with Debian's python3 and its python3-numpy, python3-pandas and python3-scipy:

    /usr/bin/python3 testdata/reference/gen_stats.py [--out DIR]

It writes, under DIR (default: this script's folder):
  inputs/*.csv             deterministic fictional inputs (numpy default_rng, fixed seed)
  stats_reference.json     reference values computed by numpy / pandas / scipy

Output is stable: JSON floats are rounded to 12 significant digits and written
with Python's repr, keys sorted. The rounding hides last-bit differences
between BLAS kernels (numpy.cov and linregress go through OpenBLAS, whose
results differ by an ulp with OPENBLAS_CORETYPE); Go tests allow for it.
Input CSVs keep full precision (repr). check.sh regenerates into a temp dir
and diffs.

Every value below comes from a library routine, or from a formula evaluated
here with numpy independently of the Go code; each block says which.
"""

import argparse
import csv
import datetime as dt
import json
import os
import platform

import numpy as np
import pandas as pd
import scipy
from scipy import integrate, stats

SEED = 20240607
N_DAYS = 600


def business_days(start, n):
    """n weekdays from start (inclusive)."""
    out, d = [], start
    while len(out) < n:
        if d.weekday() < 5:
            out.append(d)
        d += dt.timedelta(days=1)
    return out


def write_csv(path, header, rows):
    with open(path, "w", newline="") as f:
        w = csv.writer(f, lineterminator="\n")
        w.writerow(header)
        for row in rows:
            w.writerow([repr(float(v)) if isinstance(v, (float, np.floating)) else v for v in row])


def fl(x):
    return [float(v) for v in np.asarray(x, dtype=float).ravel()]


def make_inputs(rng, out):
    days = business_days(dt.date(2021, 1, 4), N_DAYS)

    # Benchmark: Student t with 4 d.f. (fat tails). Asset: beta 1.15 on the
    # benchmark plus negatively skewed noise (a reflected gamma).
    bench = 0.008 * rng.standard_t(4, N_DAYS) / np.sqrt(2.0)
    noise = -(rng.standard_gamma(2.0, N_DAYS) - 2.0) / np.sqrt(2.0)
    asset = 0.0003 + 1.15 * bench + 0.009 * noise
    write_csv(os.path.join(out, "returns.csv"), ["date", "asset", "bench"],
              [(d.isoformat(), a, b) for d, a, b in zip(days, asset, bench)])

    # Eight holdings from a two-factor model, 400 days.
    t, k = 400, 8
    f = rng.standard_normal((t, 2)) * np.array([0.01, 0.006])
    load = rng.uniform(0.3, 1.4, (k, 2))
    eps = rng.standard_normal((t, k)) * rng.uniform(0.004, 0.012, k)
    # Elementwise (not f @ load.T) so the inputs do not depend on the BLAS kernel.
    R = f[:, :1] * load[:, 0] + f[:, 1:] * load[:, 1] + eps
    write_csv(os.path.join(out, "assets.csv"), ["date"] + [f"H{i + 1}" for i in range(k)],
              [[d.isoformat()] + list(row) for d, row in zip(days[:t], R)])

    # Four fictional securities, 80 days of prices with splits and dividends.
    m = 80
    secs = ["ALDER", "BIRCH", "CEDAR", "DAMSON"]
    start = np.array([42.0, 118.0, 9.5, 260.0])
    shares_now = np.array([5.0e8, 1.2e8, 2.0e9, 4.0e7])
    splits = {("BIRCH", 30): 2.0, ("DAMSON", 55): 3.0, ("CEDAR", 70): 1.5}
    divs = {("ALDER", 20): 0.35, ("ALDER", 61): 0.35, ("BIRCH", 45): 0.9,
            ("DAMSON", 10): 1.75, ("DAMSON", 55): 0.6}
    rows = []
    for j, s in enumerate(secs):
        p = start[j]
        for i in range(m):
            sr = splits.get((s, i), 1.0)
            dv = divs.get((s, i), 0.0)
            if i > 0:
                p = p / sr * np.exp(0.015 * rng.standard_normal()) - dv
            p = round(float(p), 2)
            rows.append((days[i].isoformat(), s, p, dv, sr))
    rows.sort(key=lambda r: (r[0], r[1]))
    write_csv(os.path.join(out, "prices.csv"), ["date", "security_id", "close", "dividend", "split_ratio"], rows)
    write_csv(os.path.join(out, "securities.csv"), ["security_id", "shares_outstanding"],
              list(zip(secs, shares_now)))

    # Holdings for a look-through P/E: one tiny, one zero and one negative EPS.
    pe = [("ALDER", 1.0e6, 42.0, 2.8), ("BIRCH", 2.0e5, 118.0, 5.9), ("CEDAR", 3.0e6, 9.5, 0.001),
          ("DAMSON", 5.0e4, 260.0, 0.0), ("ELM", 4.0e5, 31.0, -1.2), ("FIR", 8.0e5, 55.0, 3.1)]
    write_csv(os.path.join(out, "pe.csv"), ["security_id", "shares", "price", "eps"], pe)


def read_inputs(out):
    r = pd.read_csv(os.path.join(out, "returns.csv"))
    a = pd.read_csv(os.path.join(out, "assets.csv"))
    p = pd.read_csv(os.path.join(out, "prices.csv"))
    s = pd.read_csv(os.path.join(out, "securities.csv"))
    pe = pd.read_csv(os.path.join(out, "pe.csv"))
    return r, a, p, s, pe


def historical(r, c):
    """VaR: numpy.quantile of losses, method='inverted_cdf' (H&F type 1).
    ES: Acerbi-Tasche tail mean of the empirical quantile function."""
    loss = -np.asarray(r)
    n = len(loss)
    var = float(np.quantile(loss, c, method="inverted_cdf"))
    srt = np.sort(loss)[::-1]
    m = n * (1 - c)
    k = int(np.floor(m + 1e-9))
    es = srt[:k].sum()
    if m - k > 1e-9:
        es += (m - k) * srt[k]
    return {"n": n, "var": var, "es": float(es / m)}


def cornish_fisher(r, c):
    mu, sd = float(np.mean(r)), float(np.std(r, ddof=1))
    S = float(stats.skew(r, bias=False))
    K = float(stats.kurtosis(r, fisher=True, bias=False))
    a = 1 - c

    def zcf(u):
        z = stats.norm.ppf(u)
        return z + (z**2 - 1) * S / 6 + (z**3 - 3 * z) * K / 24 - (2 * z**3 - 5 * z) * S**2 / 36

    # ES: tail average of the expanded quantile function by numerical
    # quadrature (scipy.integrate.quad), independent of the closed form.
    tail, _ = integrate.quad(zcf, 0, a, epsabs=1e-14, epsrel=1e-13, limit=200)
    return {"var": float(-(mu + zcf(a) * sd)), "es": float(-(mu + sd * tail / a)),
            "zcf": float(zcf(a))}


def drawdown(v):
    v = pd.Series(v)
    dd = v / v.cummax() - 1
    trough = int(dd.values.argmin())
    peak = int(v.values[: trough + 1].argmax())
    rec = -1
    after = np.nonzero(v.values[trough + 1:] >= v.values[peak])[0]
    if len(after) and dd.values[trough] < 0:
        rec = int(trough + 1 + after[0])
    return {"max": float(dd.min()), "peak": peak, "trough": trough, "recovery": rec,
            "current": float(dd.values[-1]), "series": fl(dd.values)}


def index_levels(p, s, total):
    """Index levels by the level formulas (divisor recursion, market value
    ratios), a different route from the Go code's weighted returns."""
    close = p.pivot(index="date", columns="security_id", values="close")
    div = p.pivot(index="date", columns="security_id", values="dividend").fillna(0.0)
    spl = p.pivot(index="date", columns="security_id", values="split_ratio").fillna(1.0)
    ids = list(close.columns)
    P, D, S = close.values, div.values, spl.values
    num = P + D if total else P
    T, n = P.shape
    out = {}

    # Value weighted: shares on day t = current shares / product of splits after t.
    now = s.set_index("security_id").loc[ids, "shares_outstanding"].values
    later = np.ones_like(S)
    for t in range(T - 2, -1, -1):
        later[t] = later[t + 1] * S[t + 1]
    N = now / later
    lv = [100.0]
    for t in range(1, T):
        lv.append(lv[-1] * (N[t] * num[t]).sum() / (N[t - 1] * P[t - 1]).sum())
    out["value"] = lv

    # Price weighted: divisor adjusted at each split so the pre-split level holds.
    dvs = P[0].sum() / 100.0
    lv = [100.0]
    for t in range(1, T):
        adj = (P[t - 1] / S[t]).sum()
        if total:
            lv.append(lv[-1] * num[t].sum() / adj)
        else:
            dvs = dvs * adj / P[t - 1].sum()
            lv.append(P[t].sum() / dvs)
    out["price"] = lv

    g = S[1:] * num[1:] / P[:-1]
    out["equal"] = list(100.0 * np.concatenate([[1.0], np.cumprod(g.mean(axis=1))]))
    out["equal_geometric"] = list(100.0 * np.concatenate([[1.0], np.cumprod(stats.gmean(g, axis=1))]))
    return {k: fl(v) for k, v in out.items()}


def build(out):
    r, a, p, s, pe = read_inputs(out)
    asset, bench = r["asset"].values, r["bench"].values
    ref = {"versions": {"numpy": np.__version__, "pandas": pd.__version__, "scipy": scipy.__version__,
                        "python": platform.python_version()}}

    # Rolling mean / sample std: pandas Series.rolling(w).mean() / .std() (ddof=1).
    price_path = 100.0 * np.cumprod(1 + asset)
    series = {"discrete": asset, "log": np.log1p(asset), "dollar": np.diff(np.concatenate([[100.0], price_path]))}
    roll = {}
    for name, x in series.items():
        for w in (21, 63, 252):
            rs = pd.Series(x).rolling(w)
            roll[f"{name}_{w}"] = {"mean": fl(rs.mean().values[w - 1:]), "std": fl(rs.std().values[w - 1:])}
    ref["rolling"] = roll

    # EWMA variance: pandas ewm(alpha=1-lambda, adjust=False).mean() of r^2.
    ref["ewma"] = {str(lam): fl(pd.Series(asset**2).ewm(alpha=1 - lam, adjust=False).mean().values)
                   for lam in (0.94, 0.97)}

    # Covariance: numpy.cov (ddof=1); EWMA covariance: pandas ewm on products.
    R = a.drop(columns="date").values
    ref["cov_sample"] = [fl(row) for row in np.cov(R, rowvar=False)]
    k = R.shape[1]
    ew = np.empty((k, k))
    for i in range(k):
        for j in range(k):
            ew[i, j] = pd.Series(R[:, i] * R[:, j]).ewm(alpha=0.06, adjust=False).mean().values[-1]
    ref["cov_ewma_094"] = [fl(row) for row in ew]

    # Risk contributions (numpy linear algebra) for fixed weights.
    w = np.array([0.18, 0.12, 0.15, 0.05, 0.2, 0.1, 0.08, 0.07])
    C = np.cov(R, rowvar=False)
    sig = float(np.sqrt(w @ C @ w))
    mcr = C @ w / sig
    ref["contrib"] = {"weights": fl(w), "vol": sig, "marginal": fl(mcr), "component": fl(w * mcr)}

    # Moments: scipy.stats.skew / kurtosis, bias-corrected.
    ref["moments"] = {"mean": float(np.mean(asset)), "std": float(np.std(asset, ddof=1)),
                      "skew": float(stats.skew(asset, bias=False)),
                      "kurt": float(stats.kurtosis(asset, fisher=True, bias=False))}

    # Normal quantiles: scipy.stats.norm.ppf.
    ref["norm_ppf"] = {"0.95": float(stats.norm.ppf(0.95)), "0.99": float(stats.norm.ppf(0.99))}

    var = {}
    five = pd.Series(1 + asset).rolling(5).apply(np.prod, raw=True).values[4:] - 1
    for c in (0.95, 0.99):
        key = str(c)
        z = stats.norm.ppf(c)
        mu, sd = float(np.mean(asset)), float(np.std(asset, ddof=1))
        var[key] = {
            "hist_n600": historical(asset, c),
            "hist_n250": historical(asset[:250], c),
            "hist_5d_overlap": historical(five, c),
            "normal": {"var": float(z * sd - mu), "es": float(sd * stats.norm.pdf(z) / (1 - c) - mu)},
            "cornish_fisher": cornish_fisher(asset, c),
        }
    ref["var"] = var

    # Kupiec POF: LR by its formula, p-value from scipy.stats.chi2.sf(LR, 1).
    kup = []
    for n, x, pp in [(250, 0, 0.01), (250, 2, 0.01), (250, 4, 0.01), (250, 5, 0.01), (250, 9, 0.01),
                     (250, 10, 0.01), (250, 17, 0.01), (500, 31, 0.05), (1000, 3, 0.01), (20, 20, 0.05)]:
        ph = x / n
        l0 = stats.binom.logpmf(x, n, pp)
        l1 = stats.binom.logpmf(x, n, ph)
        lr = float(-2 * (l0 - l1))
        kup.append({"n": n, "x": x, "p": pp, "lr": lr, "pvalue": float(stats.chi2.sf(lr, 1))})
    ref["kupiec"] = kup
    ref["chi2_ppf_095_df1"] = float(stats.chi2.ppf(0.95, 1))
    ref["binom_cdf_250_001"] = fl(stats.binom.cdf(np.arange(0, 13), 250, 0.01))

    # Regression: scipy.stats.linregress(bench, asset); tracking error: numpy std ddof=1.
    lr = stats.linregress(bench, asset)
    ref["regression"] = {"beta": float(lr.slope), "alpha": float(lr.intercept), "r2": float(lr.rvalue**2),
                         "tracking_error": float(np.std(asset - bench, ddof=1))}

    # Drawdowns of the price path (with its starting 100) via pandas cummax.
    ref["drawdown"] = drawdown(np.concatenate([[100.0], price_path]))

    # Means: scipy.stats.gmean / hmean.
    ratios = (pe["price"] / pe["eps"]).values
    pos = pe["eps"].values > 0
    mv = (pe["shares"] * pe["price"]).values
    ref["means"] = {
        "arith": float(np.mean(asset)),
        "geo_return": float(stats.gmean(1 + asset) - 1),
        "hmean_pe_positive": float(stats.hmean(ratios[pos])),
        "whmean_pe_positive": float(stats.hmean(ratios[pos], weights=mv[pos])),
        # Look-through P/E from totals: market value held / earnings owned.
        "pe_lookthrough": float(mv.sum() / (pe["shares"] * pe["eps"]).sum()),
    }

    # Security returns and total-return index: pandas shift arithmetic.
    sec = {}
    for sid, g in p.groupby("security_id"):
        g = g.sort_values("date")
        tr = g["split_ratio"] * (g["close"] + g["dividend"]) / g["close"].shift(1) - 1
        tr = tr.values[1:]
        sec[sid] = {"discrete": fl(tr), "log": fl(np.log1p(tr)),
                    "tri": fl(100.0 * np.concatenate([[1.0], np.cumprod(1 + tr)]))}
    ref["security"] = sec

    ref["index_price"] = index_levels(p, s, total=False)
    ref["index_total"] = index_levels(p, s, total=True)
    return ref


def rounded(obj):
    """Round every float in obj to 12 significant digits (see module doc)."""
    if isinstance(obj, float):
        return float(f"{obj:.12g}")
    if isinstance(obj, dict):
        return {k: rounded(v) for k, v in obj.items()}
    if isinstance(obj, list):
        return [rounded(v) for v in obj]
    return obj


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--out", default=os.path.dirname(os.path.abspath(__file__)))
    args = ap.parse_args()
    inputs = os.path.join(args.out, "inputs")
    os.makedirs(inputs, exist_ok=True)
    make_inputs(np.random.default_rng(SEED), inputs)
    ref = build(inputs)
    with open(os.path.join(args.out, "stats_reference.json"), "w") as f:
        json.dump(rounded(ref), f, sort_keys=True, indent=1)
        f.write("\n")


if __name__ == "__main__":
    main()
