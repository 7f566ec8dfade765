#!/usr/bin/env python3
"""Independent check of the 1-D uncertainty budget of a ridge fit (lambda > 0), with numpy.

usage: check_budget_1d.py RIDGECAL SAMPLES_DIR [--mutate NAME]

Fits the NTC sample with a fixed model (degree 4, lambda 1e-4, no test set),
a reference uncertainty 0.01 at k = 2 and a resolution of 1 count. From the
raw CSV alone (not from the record's components) it recomputes, by the
formulas of docs/decision-and-uncertainty.md section 3:

  the fit: ridge in the Chebyshev basis of t = (x - center)/half_width, solved
    here by the normal equations (Xc'Xc + n lambda I) b = Xc'yc (numpy.linalg.solve),
    checked against the record's predicted values;
  s = sqrt(RSS/(n - df)), df = 1 + trace(Xc (Xc'Xc + n lambda I)^-1 Xc');
  u_fit(x) = s sqrt(1/n + r' A^-1 Xc'Xc A^-1 r), r = row(x) - mean row,
    A = Xc'Xc + n lambda I (the sandwich form), at the 21 band readings;
    the component is the largest of them;
  u_ref = U_ref / k_ref;
  u_res = max |dp/dx| r / (2 sqrt 3), the slope from the derivative of the
    Chebyshev series, largest over the 21 band readings and a 1001-point grid;
  u_c = sqrt(s^2 + max u_fit^2 + u_ref^2 + u_res^2), U = 2 u_c, and the band's
    u_fit, combined and expanded at each of the 21 readings.

Mutations (self-test: the check must fail with the named message):
  residual-sd   the record's fit-residual component is scaled by 1 + 1e-6
  band-ufit     one band point's u_fit is scaled by 1.001
  coverage-k    the record's expanded U uses k = 1.96 instead of 2
"""
import csv
import json
import math
import sys

sys.dont_write_bytecode = True  # no __pycache__ in the source tree
from xcheck_common import Failures, require_numpy, run_check, run_cli, work_dir

np = require_numpy()

DEGREE, LAMBDA = 4, 1e-3
U_REF, K_REF, RESOLUTION = 0.01, 2.0, 1.0
# Agreement. Both sides are double precision on a well-conditioned scaled
# design (condition number ~ 6); ridgecal uses the SVD filter factors, this
# script the normal equations. Measured largest relative differences:
# predictions 8.2e-14 of the reference span; budget components, band values,
# combined and expanded 1.1e-13. The limits leave a margin of about 100x.
RTOL_PRED = 1e-11
RTOL_BUDGET = 1e-11
# The check must be able to tell the ridge sandwich covariance from the
# least-squares one: with this lambda their largest u_fit differ by 0.23 %
# (measured); require at least 100 x RTOL_BUDGET.
MIN_RIDGE_EFFECT = 100 * RTOL_BUDGET
MUTATIONS = {
    "residual-sd": "fit-residual",
    "band-ufit": "band u_fit",
    "coverage-k": "expanded",
}


def check(argv, mutation):
    ridgecal, samples = argv
    work = work_dir("budget1d")
    csv_path = f"{samples}/ntc-coldstore/ntc-coldstore.csv"
    rec_path = f"{work}/ntc-ridge.json"
    run_cli([ridgecal, "fit", csv_path, "--setpoint", "setpoint", "--degree", str(DEGREE), "--lambda",
             str(LAMBDA), "--test-fraction", "0", "--ref-uncertainty", str(U_REF), "--ref-k", str(K_REF),
             "--resolution", str(RESOLUTION), "--timestamp", "none", "-o", rec_path,
             # The model-inadequacy term is checked by fitter.inadequacy; this
             # check recomputes the other four components independently.
             "--inadequacy-alpha", "0"])
    rec = json.load(open(rec_path))
    u = rec["uncertainty"]
    comps = {c["name"]: c for c in u["components"]}
    if mutation == "residual-sd":
        comps["fit-residual"]["standard"] *= 1 + 1e-6
    if mutation == "band-ufit":
        u["band"][7]["u_fit"] *= 1.001
    if mutation == "coverage-k":
        u["expanded"] = 1.96 * u["combined"]
    fails = Failures()
    if rec["model"]["degree"] != DEGREE or rec["model"]["lambda"] != LAMBDA:
        fails.add(f"model: degree {rec['model']['degree']} lambda {rec['model']['lambda']}, expected {DEGREE}, {LAMBDA}")
        return fails, ""

    with open(csv_path, newline="") as f:
        rows = list(csv.DictReader(l for l in f if not l.startswith("#")))
    x = np.array([float(r["reading"]) for r in rows])
    y = np.array([float(r["reference"]) for r in rows])
    n = len(y)
    center, half = (x.min() + x.max()) / 2, (x.max() - x.min()) / 2
    cheb = np.polynomial.chebyshev

    def rows_of(xv):
        return cheb.chebvander((np.atleast_1d(xv) - center) / half, DEGREE)[:, 1:]

    X = rows_of(x)
    mx, my = X.mean(axis=0), y.mean()
    Xc, yc = X - mx, y - my
    G = Xc.T @ Xc
    A = G + n * LAMBDA * np.eye(DEGREE)
    b = np.linalg.solve(A, Xc.T @ yc)
    c = np.concatenate([[my - mx @ b], b])  # Chebyshev coefficients c_0..c_d

    def p(xv):
        return cheb.chebval((np.asarray(xv) - center) / half, c)

    span = float(y.max() - y.min())
    pts = rec["points"]
    if len(pts) != n:
        fails.add(f"points: the record has {len(pts)} points, the CSV {n}")
        return fails, ""
    for pt in pts:
        fails.close(f"predicted at line {pt['line']}", pt["predicted"], float(p(pt["reading"])), 0.0,
                    RTOL_PRED * span, key="predicted/span")
    H = Xc @ np.linalg.solve(A, Xc.T)
    df = 1.0 + float(np.trace(H))
    rss = float(np.sum((p(x) - y) ** 2))
    s = math.sqrt(rss / (n - df))
    Ainv = np.linalg.inv(A)
    cov_factor = Ainv @ G @ Ainv

    def u_fit(xv):
        r = rows_of(xv)[0] - mx
        return s * math.sqrt(1.0 / n + float(r @ cov_factor @ r))

    band_x = [x.min() + (x.max() - x.min()) * i / 20 for i in range(21)]
    band_x[-1] = x.max()
    ufits = [u_fit(v) for v in band_x]
    Ginv = np.linalg.inv(G)
    ufit_ols = max(s * math.sqrt(1.0 / n + float((rows_of(v)[0] - mx) @ Ginv @ (rows_of(v)[0] - mx))) for v in band_x)
    ridge_effect = abs(ufit_ols - max(ufits)) / max(ufits)
    if ridge_effect < MIN_RIDGE_EFFECT:
        fails.add(f"fit-coefficients: lambda {LAMBDA} changes u_fit by only {ridge_effect:.2g}: the check cannot "
                  "tell the ridge covariance from least squares")
    dc = cheb.chebder(c) / half
    grid = np.concatenate([band_x, [x.min() + (x.max() - x.min()) * i / 1000 for i in range(1001)]])
    slope = float(np.max(np.abs(cheb.chebval((grid - center) / half, dc))))
    u_res = slope * RESOLUTION / (2 * math.sqrt(3))
    u_ref = U_REF / K_REF
    combined = math.sqrt(s * s + max(ufits) ** 2 + u_ref ** 2 + u_res ** 2)

    fails.close("degrees_of_freedom", u["degrees_of_freedom"], n - df, RTOL_BUDGET, key="budget")
    fails.close("fit-residual", comps["fit-residual"]["standard"], s, RTOL_BUDGET, key="budget")
    fails.close("fit-coefficients", comps["fit-coefficients"]["standard"], max(ufits), RTOL_BUDGET, key="budget")
    fails.close("reference-standard", comps["reference-standard"]["standard"], u_ref, 1e-15, key="budget")
    fails.close("reading-resolution", comps["reading-resolution"]["standard"], u_res, RTOL_BUDGET, key="budget")
    fails.close("combined", u["combined"], combined, RTOL_BUDGET, key="budget")
    fails.close("expanded", u["expanded"], 2 * combined, RTOL_BUDGET, key="budget")
    if u["k"] != 2:
        fails.add(f"expanded: coverage factor k = {u['k']}, documented 2")
    if len(u["band"]) != 21:
        fails.add(f"band: {len(u['band'])} points, documented 21")
    for bp, bx, uf in zip(u["band"], band_x, ufits):
        fails.close(f"band reading {bx}", bp["reading"], bx, 1e-15, key="band")
        fails.close(f"band predicted at {bx:.6g}", bp["predicted"], float(p(bx)), 0.0, RTOL_PRED * span,
                    key="predicted/span")
        sl = abs(float(cheb.chebval((bx - center) / half, dc)))
        ur = sl * RESOLUTION / (2 * math.sqrt(3))
        comb = math.sqrt(s * s + uf * uf + u_ref ** 2 + ur * ur)
        fails.close(f"band u_fit at {bx:.6g}", bp["u_fit"], uf, RTOL_BUDGET, key="band")
        fails.close(f"band combined at {bx:.6g}", bp["combined"], comb, RTOL_BUDGET, key="band")
        fails.close(f"band expanded at {bx:.6g}", bp["expanded"], 2 * comb, RTOL_BUDGET, key="band")
    return fails, (f"n = {n}, df = {df:.6g}, s = {s:.6g}, max u_fit = {max(ufits):.6g}, u_ref = {u_ref:.3g}, "
                   f"u_res = {u_res:.6g}, U = {2 * combined:.6g}; 21 band points agree; the sandwich form moves "
                   f"max u_fit by {ridge_effect:.2g} from least squares")


if __name__ == "__main__":
    sys.exit(run_check(check, MUTATIONS, sys.argv[1:]))
