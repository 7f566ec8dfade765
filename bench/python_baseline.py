#!/usr/bin/python3
"""Python baselines for the ridgecal batch benchmark (issue 6 workload).

Reads units from a synthetic batch CSV written by ridgecal_bench_gen
(columns unit,setpoint,reading,reference) and times, per unit:

  sklearn  GridSearchCV over Pipeline(MinMaxScaler(-1, 1), PolynomialFeatures,
           Ridge) with GroupKFold(5) on the training setpoints: degrees 1..8,
           alpha = n_train * lambda for lambda in {0} + 30 log-spaced values
           from 1e-12 to 10 (ridgecal's per-observation lambda), refit on the
           training setpoints, then the test RMSE.
  numpy    a vectorised SVD path: Chebyshev design of the largest degree; per
           degree one batched thin SVD of the centred training designs of all
           folds, all lambdas at once from the filter factors, min-CV
           selection, final fit. The split follows ridgecal's rules in spirit (end setpoints
           always train, 2 interior test setpoints, 5 grouped folds).

Prints one JSON object with the timings. Runs single-threaded (BLAS threads
pinned to 1 by bench/run_bench.sh) so the numbers are per core.
Usage: python_baseline.py UNITS.csv BIG.csv [--sklearn-units N] [--numpy-units N] [--big-reps N]
"""
import argparse
import json
import sys
import time
import warnings

import numpy as np


def read_units(path, limit):
    units, order = {}, []
    with open(path) as f:
        header = f.readline().strip().split(",")
        iu, isp, ix, iy = (header.index(c) for c in ("unit", "setpoint", "reading", "reference"))
        for line in f:
            if not line.strip() or line.startswith("#"):
                continue
            c = line.rstrip("\n").split(",")
            u = c[iu]
            if u not in units:
                if len(order) == limit:
                    break
                units[u] = ([], [], [])
                order.append(u)
            units[u][0].append(c[isp])
            units[u][1].append(float(c[ix]))
            units[u][2].append(float(c[iy]))
    return [(u, np.array(units[u][0]), np.array(units[u][1]), np.array(units[u][2])) for u in order]


LAMBDAS = np.concatenate([[0.0], 10.0 ** (-12.0 + 13.0 * np.arange(30) / 29.0)])
DEGREES = list(range(1, 9))


def split(sp, x, folds=5, n_test=2):
    """Groups by setpoint (sorted by mean reading); 2 interior test groups;
    the interior training groups dealt into `folds` folds; ends always train.
    Returns per row: fold 0..folds-1, -1 (train, never validated), -2 (test)."""
    labels, inv = np.unique(sp, return_inverse=True)
    means = np.bincount(inv, weights=x) / np.bincount(inv)
    order = np.argsort(means)
    interior = order[1:-1]
    test = interior[np.linspace(0, len(interior) - 1, n_test + 2)[1:-1].round().astype(int)]
    group_fold = np.full(len(labels), -1)
    group_fold[test] = -2
    train_interior = [g for g in interior if g not in test]
    group_fold[train_interior] = np.arange(len(train_interior)) % folds
    return group_fold[inv], inv


def numpy_fit(sp, x, y, folds=5):
    """Vectorised SVD path: per degree, one batched SVD over the folds and the
    full training set (rows zero-padded to a common count after centring,
    which leaves the thin SVD unchanged), every lambda at once."""
    row_fold, inv = split(sp, x, folds)
    train = row_fold != -2
    xt = x[train]
    lo, hi = xt.min(), xt.max()
    t = (x - (lo + hi) / 2) / ((hi - lo) / 2)
    Dmax = max(DEGREES)
    V = np.polynomial.chebyshev.chebvander(t, Dmax)[:, 1:]
    L = LAMBDAS
    ks = np.arange(folds)[:, None]
    tr_masks = train[None, :] & (row_fold[None, :] != ks)                 # K x n
    va_masks = row_fold[None, :] == ks                                    # K x n
    n_tr = tr_masks.sum(axis=1)
    n_va = va_masks.sum(axis=1)
    groups_tr = np.array([len(np.unique(inv[m])) for m in tr_masks])
    ym = (tr_masks * y).sum(axis=1) / n_tr                                  # K
    yc = np.where(tr_masks, y[None, :] - ym[:, None], 0.0)                  # K x n (zero = padding)
    best = (np.inf, None, None)
    for d in DEGREES:
        if d + 1 > groups_tr.min():
            continue
        X = V[:, :d]
        xm = (tr_masks @ X) / n_tr[:, None]                                 # K x d
        Xc = np.where(tr_masks[:, :, None], X[None] - xm[:, None, :], 0.0)  # K x n x d
        U, s, Vt = np.linalg.svd(Xc, full_matrices=False)
        z = (U.transpose(0, 2, 1) @ yc[:, :, None])[:, :, 0]               # K x d
        F = s[:, :, None] / (s[:, :, None] ** 2 + n_tr[:, None, None] * L[None, None, :])  # K x d x L
        W = (X[None] - xm[:, None, :]) @ Vt.transpose(0, 2, 1)             # K x n x d (all rows)
        P = W @ (F * z[:, :, None]) + ym[:, None, None]                     # K x n x L
        err2 = np.where(va_masks[:, :, None], (P - y[None, :, None]) ** 2, 0.0)
        rmse = np.sqrt(err2.sum(axis=1) / n_va[:, None])                    # K x L
        cv = rmse.mean(axis=0)
        li = int(np.argmin(cv))
        if cv[li] < best[0]:
            best = (cv[li], d, L[li])
    _, d, lam = best
    X = V[train, :d]
    xm, ymt = X.mean(axis=0), y[train].mean()
    U, s, Vt = np.linalg.svd(X - xm, full_matrices=False)
    b = Vt.T @ (s / (s ** 2 + train.sum() * lam) * (U.T @ (y[train] - ymt)))
    pred = (V[:, :d] - xm) @ b + ymt
    test_rmse = np.sqrt(((pred[~train] - y[~train]) ** 2).mean()) if (~train).any() else np.nan
    return d, lam, test_rmse


def sklearn_fit(sp, x, y, folds=5):
    from sklearn.linear_model import Ridge
    from sklearn.model_selection import GridSearchCV, GroupKFold
    from sklearn.pipeline import Pipeline
    from sklearn.preprocessing import MinMaxScaler, PolynomialFeatures

    row_fold, _ = split(sp, x, folds)
    train = row_fold != -2
    n = train.sum()
    pipe = Pipeline([("scale", MinMaxScaler(feature_range=(-1, 1))),
                     ("poly", PolynomialFeatures(include_bias=False)),
                     ("ridge", Ridge())])
    grid = {"poly__degree": DEGREES, "ridge__alpha": list(n * LAMBDAS)}
    gs = GridSearchCV(pipe, grid, cv=GroupKFold(n_splits=folds), scoring="neg_root_mean_squared_error",
                      n_jobs=1, error_score=np.nan)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        gs.fit(x[train, None], y[train], groups=sp[train])
    pred = gs.predict(x[~train, None])
    return gs.best_params_["poly__degree"], np.sqrt(((pred - y[~train]) ** 2).mean())


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("units_csv")
    ap.add_argument("big_csv")
    ap.add_argument("--sklearn-units", type=int, default=3)
    ap.add_argument("--numpy-units", type=int, default=300)
    ap.add_argument("--big-reps", type=int, default=10)
    a = ap.parse_args()
    out = {}
    units = read_units(a.units_csv, max(a.sklearn_units, a.numpy_units))
    numpy_units = units[: a.numpy_units]
    numpy_fit(*numpy_units[0][1:])  # warm-up
    t0, c0 = time.perf_counter(), time.process_time()
    for _, sp, x, y in numpy_units:
        numpy_fit(sp, x, y)
    dt, dc = time.perf_counter() - t0, time.process_time() - c0
    out["numpy_units"] = len(numpy_units)
    out["numpy_s_per_unit"] = dt / len(numpy_units)
    out["numpy_cpu_s_per_unit"] = dc / len(numpy_units)
    big = read_units(a.big_csv, 1)[0]
    numpy_fit(*big[1:])
    t0, c0 = time.perf_counter(), time.process_time()
    for _ in range(a.big_reps):
        numpy_fit(*big[1:])
    out["numpy_big_rows"] = len(big[2])
    out["numpy_big_s"] = (time.perf_counter() - t0) / a.big_reps
    out["numpy_big_cpu_s"] = (time.process_time() - c0) / a.big_reps
    if a.sklearn_units > 0:
        sk_units = units[: a.sklearn_units]
        t0, c0 = time.perf_counter(), time.process_time()
        for _, sp, x, y in sk_units:
            sklearn_fit(sp, x, y)
        out["sklearn_units"] = len(sk_units)
        out["sklearn_s_per_unit"] = (time.perf_counter() - t0) / len(sk_units)
        out["sklearn_cpu_s_per_unit"] = (time.process_time() - c0) / len(sk_units)
    json.dump(out, sys.stdout)
    print()


if __name__ == "__main__":
    main()
