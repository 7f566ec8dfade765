#!/usr/bin/env python3
"""Independent check of grouped CV scoring and the one-SE choice, with numpy.

usage: check_cv_selection.py RIDGECAL SAMPLES_DIR [--mutate NAME]

Fits two bundled samples with the default selection (grid degrees 1..7 x 31
penalties, seed 1): the load cell (9 training setpoints: leave-one-setpoint-out)
and the NTC (K-fold, 5 folds). From the raw CSV rows and the fold of every
setpoint as the record states it (split.setpoints[].fold), it recomputes each
grid cell as docs/fitting.md defines it:

  t = (x - center)/half_width over the training readings; columns T_1..T_d of t;
  ridge: minimise (1/n) sum (y - p)^2 + lambda sum_{k>=1} c_k^2, intercept not
  penalised (columns and y centred), solved here as an augmented least-squares
  problem [Xc; sqrt(n lambda) I] b = [yc; 0] with numpy.linalg.lstsq;
  fold RMSE over the held-out points of the fold, cv_rmse = mean over folds,
  cv_se = sample SD over folds / sqrt(K);
  one-SE rule: among cells with cv_rmse <= min cv_rmse + cv_se(min), the lowest
  degree, then the largest lambda.

The fold assignment itself is checked against its documented structure (the
random permutations cannot be recomputed): test setpoints and the two end
setpoints have no fold; leave-one-setpoint-out gives each interior training
setpoint its own fold; K-fold labels the interior training setpoints, sorted
by reading, in consecutive blocks of K that each hold every label once (the
last block: distinct labels).

Mutations (self-test: the check must fail with the named message):
  fold-swap     two setpoints exchange their fold labels in the record
  cv-scale      one grid cell's recorded cv_rmse is scaled by 1 + 1e-6
  chosen-min    the record's chosen cell is replaced by the min-cv cell
  fold-block    two setpoints of different blocks exchange their fold labels
"""
import csv
import json
import math
import sys

sys.dont_write_bytecode = True  # no __pycache__ in the source tree
from xcheck_common import Failures, require_numpy, run_check, run_cli, work_dir

np = require_numpy()

# Agreement of cv_rmse / cv_se: both sides are double precision; ridgecal
# solves by Householder QR + Givens (or SVD), this script by lstsq on the
# augmented system. Measured largest relative difference over the 434 cells:
# 4.8e-11 (cv_rmse) and 1.5e-10 (cv_se); the limits leave a margin of 20x and
# 30x. A fold assignment or a formula error changes them by far more.
RTOL_CV_RMSE = 1e-9
RTOL_CV_SE = 5e-9

MUTATIONS = {
    "fold-swap": "cv_rmse of degree",
    "cv-scale": "cv_rmse of degree",
    "chosen-min": "chosen cell",
    "fold-block": "fold structure",
}

SAMPLES = [
    ("loadcell-hopper", []),
    ("ntc-coldstore", []),
]


def read_rows(path, reading_col, reference_col, setpoint_col):
    with open(path, newline="") as f:
        lines = [l for l in f if not l.startswith("#")]
    rows = list(csv.DictReader(lines))
    return [(float(r[reading_col]), float(r[reference_col]), r[setpoint_col]) for r in rows]


def ridge_predict(xtr, ytr, xte, degree, lam, center, half):
    cheb = np.polynomial.chebyshev
    Xtr = cheb.chebvander((xtr - center) / half, degree)[:, 1:]
    Xte = cheb.chebvander((xte - center) / half, degree)[:, 1:]
    mx, my = Xtr.mean(axis=0), ytr.mean()
    Xc, yc = Xtr - mx, ytr - my
    n = len(ytr)
    if lam > 0:
        A = np.vstack([Xc, math.sqrt(n * lam) * np.eye(degree)])
        rhs = np.concatenate([yc, np.zeros(degree)])
    else:
        A, rhs = Xc, yc
    b = np.linalg.lstsq(A, rhs, rcond=None)[0]
    return my + (Xte - mx) @ b


def check_fold_structure(name, split, sel, fails):
    sps = sorted(split["setpoints"], key=lambda s: s["reading"])
    train = [s for s in sps if s["role"] == "train"]
    K, scheme = sel["folds"], sel["fold_scheme"]
    bad = []
    for s in sps:
        if s["role"] == "test" and s["fold"] != -1:
            bad.append(f"test setpoint {s['id']} has fold {s['fold']}")
    for s in (train[0], train[-1]):
        if s["fold"] != -1:
            bad.append(f"end setpoint {s['id']} has fold {s['fold']}")
    inner = [s["fold"] for s in train[1:-1]]
    if scheme == "leave-one-setpoint-out":
        if sorted(inner) != list(range(len(inner))) or K != len(inner):
            bad.append(f"leave-one-setpoint-out folds {inner} are not one per interior setpoint (K = {K})")
    elif scheme == "k-fold":
        for start in range(0, len(inner), K):
            block = inner[start:start + K]
            want = list(range(K)) if len(block) == K else None
            if (want and sorted(block) != want) or len(set(block)) != len(block) or min(block) < 0 or max(block) >= K:
                bad.append(f"block {start // K} of K = {K} consecutive setpoints has the folds {block}")
    else:
        bad.append(f"unknown fold scheme {scheme!r}")
    for b in bad:
        fails.add(f"{name}: fold structure: {b}")


def check_sample(ridgecal, samples, name, extra, mutation, fails, work):
    csv_path = f"{samples}/{name}/{name}.csv"
    rec_path = f"{work}/{name}.json"
    run_cli([ridgecal, "fit", csv_path, "--setpoint", "setpoint", "--timestamp", "none", "-o", rec_path] + extra)
    rec = json.load(open(rec_path))
    sel, split = rec["selection"], rec["split"]
    if mutation == "fold-swap":
        sps = [s for s in split["setpoints"] if s["fold"] >= 0]
        a = sps[1]
        b = next(s for s in sps[2:] if s["fold"] != a["fold"])
        a["fold"], b["fold"] = b["fold"], a["fold"]
    if mutation == "fold-block" and sel["fold_scheme"] == "k-fold":
        sps = sorted((s for s in split["setpoints"] if s["fold"] >= 0), key=lambda s: s["reading"])
        K = sel["folds"]
        a = sps[0]
        b = next(s for s in sps[K:] if s["fold"] != a["fold"])
        a["fold"], b["fold"] = b["fold"], a["fold"]
    if mutation == "cv-scale":
        sel["grid"][len(sel["grid"]) // 2]["cv_rmse"] *= 1 + 1e-6
    cols = rec["input"]["columns"]
    rows = read_rows(csv_path, cols["reading"], cols["reference"], cols["setpoint"])
    role = {s["id"]: s["role"] for s in split["setpoints"]}
    fold = {s["id"]: s["fold"] for s in split["setpoints"]}
    train = [(x, y, sp) for x, y, sp in rows if role[sp] == "train"]
    x = np.array([r[0] for r in train])
    y = np.array([r[1] for r in train])
    f = np.array([fold[r[2]] for r in train])
    K = sel["folds"]
    if sorted(set(f[f >= 0])) != list(range(K)):
        fails.add(f"{name}: the record's folds {sorted(set(f[f >= 0]))} are not 0..{K - 1}")
        return None
    check_fold_structure(name, split, sel, fails)
    center, half = (x.min() + x.max()) / 2, (x.max() - x.min()) / 2
    sc = rec["model"]["scaling"]
    fails.close(f"{name}: scaling center", sc["center"], center, 1e-15, key="scaling")
    fails.close(f"{name}: scaling half_width", sc["half_width"], half, 1e-15, key="scaling")
    ncells = 0
    mine = []
    for cell in sel["grid"]:
        d, lam = cell["degree"], cell["lambda"]
        rmses = []
        for k in range(K):
            tr, te = f != k, f == k
            pred = ridge_predict(x[tr], y[tr], x[te], d, lam, center, half)
            rmses.append(math.sqrt(float(np.mean((pred - y[te]) ** 2))))
        cv = float(np.mean(rmses))
        se = float(np.std(rmses, ddof=1)) / math.sqrt(K)
        what = f"{name}: cv_rmse of degree {d} lambda {lam:.6g}"
        fails.close(what, cell["cv_rmse"], cv, RTOL_CV_RMSE, key="cv_rmse")
        fails.close(f"{name}: cv_se of degree {d} lambda {lam:.6g}", cell["cv_se"], se, RTOL_CV_SE, key="cv_se")
        mine.append((d, lam, cv, se))
        ncells += 1
    best = min(mine, key=lambda c: c[2])
    limit = best[2] + best[3]
    inside = [c for c in mine if c[2] <= limit]
    pick = min(inside, key=lambda c: (c[0], -c[1]))
    if sel["rule"] != "one-se":
        fails.add(f"{name}: the record's rule is {sel['rule']!r}, expected one-se")
    chosen = dict(sel["chosen"])
    if mutation == "chosen-min":
        chosen = {"degree": best[0], "lambda": best[1]}
        if (best[0], best[1]) == (pick[0], pick[1]):
            fails.add(f"{name}: chosen cell: mutation chosen-min is vacuous here (min-cv equals one-SE)")
    if (chosen["degree"], chosen["lambda"]) != (pick[0], pick[1]):
        fails.add(f"{name}: chosen cell: ridgecal degree {chosen['degree']} lambda {chosen['lambda']!r}, "
                  f"numpy one-SE rule degree {pick[0]} lambda {pick[1]!r} (min cv {best[2]:.6g} at degree "
                  f"{best[0]}, limit {limit:.6g})")
    m = rec["model"]
    if (m["degree"], m["lambda"]) != (pick[0], pick[1]):
        fails.add(f"{name}: chosen cell: the model is degree {m['degree']} lambda {m['lambda']!r}, not the chosen cell")
    return (f"{name}: {ncells} cells, {sel['fold_scheme']} K={K}, one-SE picks degree {pick[0]} "
            f"lambda {pick[1]:.3g} (min-cv: degree {best[0]} lambda {best[1]:.3g})")


def check(argv, mutation):
    ridgecal, samples = argv
    fails = Failures()
    work = work_dir("cv")
    parts = [check_sample(ridgecal, samples, n, e, mutation, fails, work) for n, e in SAMPLES]
    return fails, "; ".join(p for p in parts if p)


if __name__ == "__main__":
    sys.exit(run_check(check, MUTATIONS, sys.argv[1:]))
