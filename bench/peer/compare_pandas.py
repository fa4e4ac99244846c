"""The comparison a tester would write in a pandas notebook, for timing against Cogbook.

Same steps and the same rules as Cogbook's compare command on the same CSV files:
read both files, find the clock offset by cross-correlating power (Pearson per lag over
the seconds both have, through the FFT), put both on a 1 s grid over the overlap, means
and ratio per chainring, steady blocks, Bland-Altman, OLS of test on reference, drift.
Prints one JSON document. Usage: compare_pandas.py REFERENCE.csv TEST.csv
"""

import json
import sys

import numpy as np
import pandas as pd

MAX_LAG_S = 600
MAX_GAP_S = 3
STEADY = dict(tolerance_pct=5, min_duration_s=60, smooth_s=6, trim_s=3, min_power_w=50, grace_s=10, max_gap_s=20)


def on_grid(frame, column, start, count, bin_mean=True):
    """Column on the 1 s grid start, start+1, ...: bin means [t-0.5, t+0.5) when the file is
    denser than 1 s (and bin_mean), else the samples that fall on the grid (NaN where
    missing), with gaps of at most MAX_GAP_S between finite samples interpolated."""
    t = frame["time (s)"].to_numpy()
    v = frame[column].to_numpy(dtype=float)
    step = np.median(np.diff(t)) if len(t) > 1 else 1.0
    if bin_mean and step < 0.75:
        bins = np.floor(t + 0.5 + 1e-9).astype(np.int64) - start
        keep = (bins >= 0) & (bins < count) & np.isfinite(v)
        sums = np.bincount(bins[keep], weights=v[keep], minlength=count)
        counts = np.bincount(bins[keep], minlength=count)
        with np.errstate(invalid="ignore", divide="ignore"):
            return np.where(counts > 0, sums / counts, np.nan)
    grid = np.arange(start, start + count, dtype=float)
    # Rows present in the file keep their value (NaN stays NaN); rows absent from the file
    # are interpolated when the neighbours are finite and close enough.
    s = pd.Series(v, index=t)
    out = s.reindex(grid).to_numpy()
    absent = ~np.isin(grid, t)
    if absent.any():
        i = np.searchsorted(t, grid[absent]) - 1
        ok = (i >= 0) & (i + 1 < len(t))
        i0, i1 = i[ok], i[ok] + 1
        t0, t1, v0, v1 = t[i0], t[i1], v[i0], v[i1]
        g = grid[absent][ok]
        fill = np.where((t1 - t0 <= MAX_GAP_S) & np.isfinite(v0) & np.isfinite(v1), v0 + (v1 - v0) * (g - t0) / (t1 - t0), np.nan)
        idx = np.flatnonzero(absent)[ok]
        out[idx] = fill
    return out


def lagged_pearson(a, v):
    """Pearson correlation of a[n + k] with v[n] for every lag k (numpy 'full' order), over
    the pairs where both are finite, from six masked correlations through the FFT."""
    la, lv = len(a), len(v)
    n_out = la + lv - 1
    size = 1 << int(np.ceil(np.log2(n_out)))
    ma, mv = np.isfinite(a), np.isfinite(v)
    ca = np.where(ma, a - np.nanmean(a), 0.0)
    cv = np.where(mv, v - np.nanmean(v), 0.0)
    fa = [np.fft.rfft(x, size) for x in (ca, ma.astype(float), ca * ca)]
    fv = [np.fft.rfft(x, size) for x in (cv, mv.astype(float), cv * cv)]

    def corr(x, y):
        full = np.fft.irfft(x * np.conj(y), size)
        return np.concatenate([full[size - (lv - 1):], full[:la]])

    m = np.round(corr(fa[1], fv[1]))
    s_av, s_a, s_v = corr(fa[0], fv[0]), corr(fa[0], fv[1]), corr(fa[1], fv[0])
    s_aa, s_vv = corr(fa[2], fv[1]), corr(fa[1], fv[2])
    with np.errstate(invalid="ignore", divide="ignore"):
        cov = s_av - s_a * s_v / m
        var_a = s_aa - s_a * s_a / m
        var_v = s_vv - s_v * s_v / m
        r = cov / np.sqrt(var_a * var_v)
    min_overlap = max(10, int(0.5 * min(ma.sum(), mv.sum())))
    r[(m < min_overlap) | (var_a <= 1e-9 * m) | (var_v <= 1e-9 * m)] = np.nan
    return np.clip(r, -1, 1)


def clock_offset(ref, test):
    """Test clock minus reference clock, whole seconds, and the correlation there."""
    r0, r1 = int(np.ceil(ref["time (s)"].iloc[0] - 1e-9)), int(np.floor(ref["time (s)"].iloc[-1] + 1e-9))
    s0, s1 = int(np.ceil(test["time (s)"].iloc[0] - 1e-9)), int(np.floor(test["time (s)"].iloc[-1] + 1e-9))
    # Point readings, not bin means, as Cogbook aligns: a bin mean sits half a step away
    # from a point sample.
    r = on_grid(ref, "power (W)", r0, r1 - r0 + 1, bin_mean=False)
    s = on_grid(test, "power (W)", s0, s1 - s0 + 1, bin_mean=False)
    c = lagged_pearson(s, r)
    q = s0 - r0
    lags = np.arange(-(len(r) - 1), len(s)) + q
    window = np.abs(lags) <= MAX_LAG_S
    best = np.nanargmax(np.where(window, c, np.nan))
    return int(lags[best]), float(c[best])


def steady_blocks(time, power):
    """Runs where the centred 6 s mean stays within +/-tolerance of the run's mean (short
    excursions and dropouts forgiven), neighbouring runs at the same level joined across a
    surge, kept when at least the minimum duration after trimming, with a mean above the
    floor and a linear trend under twice the tolerance. The run mean depends on the run so
    far, so the scan is sequential; it runs on plain floats, the rest is vectorised."""
    p = STEADY
    tol = p["tolerance_pct"] / 100
    win, grace, gap, trim = p["smooth_s"], p["grace_s"], p["max_gap_s"], p["trim_s"]
    # Centred window [i - before, i + after], as Cogbook centres an even window: a trailing
    # window over NaN-padded power, moved back by `after`.
    before = (win - 1) // 2
    after = win - 1 - before
    padded = np.concatenate([power, np.full(after, np.nan)])
    smooth = pd.Series(padded).rolling(win, min_periods=int(np.ceil(win / 2))).mean().to_numpy()[after:]
    s = smooth.tolist()
    n = len(s)

    runs = []
    i = 0
    while i < n:
        first = s[i]
        if not first >= p["min_power_w"]:
            i += 1
            continue
        total, count, last_good = first, 1, i
        for k in range(i + 1, n):
            v = s[k]
            if v != v:
                if k - last_good > gap:
                    break
                continue
            m = total / count
            if abs(v - m) > tol * m:
                if k - last_good > grace:
                    break
                continue
            total += v
            count += 1
            last_good = k
        mean = total / count
        if runs and i - runs[-1][1] <= 2 * grace + 1 and abs(mean - runs[-1][2]) <= tol * runs[-1][2]:
            f, t, m = runs[-1]
            a, b = t - f + 1, last_good - i + 1
            runs[-1] = [f, last_good, (m * a + mean * b) / (a + b)]
        else:
            runs.append([i, last_good, mean])
        i = last_good + 1

    blocks = []
    for f, t, _ in runs:
        start, end = time[f] + trim, time[t] + 1 - trim
        if end - start < p["min_duration_s"] - 1e-9:
            continue
        x, y, w = time[f + trim:t - trim + 1], smooth[f + trim:t - trim + 1], power[f + trim:t - trim + 1]
        mean_w = np.nanmean(w)
        ok = np.isfinite(x) & np.isfinite(y)
        slope = np.polyfit(x[ok], y[ok], 1)[0] if ok.sum() >= 2 else np.nan
        if mean_w >= p["min_power_w"] and not abs(slope * (end - start)) > 2 * tol * mean_w:
            blocks.append((start, end, mean_w))
    return blocks


def main(ref_path, test_path):
    ref = pd.read_csv(ref_path)
    test = pd.read_csv(test_path)
    offset, correlation = clock_offset(ref, test)

    # Reference grid over the span both cover; the test is read at reference time + offset.
    start = int(np.ceil(max(ref["time (s)"].iloc[0], test["time (s)"].iloc[0] - offset) - 1e-9))
    end = int(np.floor(min(ref["time (s)"].iloc[-1], test["time (s)"].iloc[-1] - offset) + 1e-9))
    count = end - start + 1
    paired = pd.DataFrame({
        "time": np.arange(start, end + 1, dtype=float),
        "ref": on_grid(ref, "power (W)", start, count),
        "test": on_grid(test, "power (W)", start + offset, count),
    })
    gears = ref if "front gear teeth" in ref else test
    gear_shift = 0 if gears is ref else offset
    teeth = gears.set_index("time (s)")["front gear teeth"]
    teeth = teeth[~teeth.index.duplicated()].sort_index()
    paired["front_teeth"] = teeth.reindex(paired["time"] + gear_shift, method="ffill").to_numpy()
    both = paired.dropna(subset=["ref", "test"])

    by_ring = both.groupby("front_teeth")[["ref", "test"]].mean().sort_index(ascending=False)
    blocks = steady_blocks(paired["time"].to_numpy(), paired["ref"].to_numpy())

    diff = both["test"] - both["ref"]
    bias, sd = diff.mean(), diff.std(ddof=1)
    slope, intercept = np.polyfit(both["ref"], both["test"], 1)
    r = np.corrcoef(both["ref"], both["test"])[0, 1]
    drift = np.polyfit(both["time"], diff, 1)[0] * 3600

    print(json.dumps({
        "offsetSeconds": offset,
        "correlation": correlation,
        "overlapSeconds": count,
        "pairedSeconds": len(both),
        "meanRef": both["ref"].mean(),
        "meanTest": both["test"].mean(),
        "byFrontGear": [{"teeth": float(t), "ratio": row.test / row.ref} for t, row in by_ring.iterrows()],
        "segments": [{"startS": float(a), "endS": float(b), "meanW": float(m)} for a, b, m in blocks],
        "biasW": bias,
        "sdW": sd,
        "loaLowW": bias - 1.96 * sd,
        "loaHighW": bias + 1.96 * sd,
        "slope": slope,
        "intercept": intercept,
        "r": r,
        "driftWPerHour": drift,
    }))


if __name__ == "__main__":
    main(sys.argv[1], sys.argv[2])
