"""Shared helpers of the independent numpy cross-checks (tests/crosscheck/).

Every check runs the ridgecal CLI, reads the files it writes and recomputes
the quantity from the raw data and the documented formulas with numpy (never
through the fitter's library). A check returns a list of failure messages;
`run_check` turns that into an exit code and implements the self-test mode:

    check_x.py ARGS...                 exit 0 when everything agrees, 1 otherwise
    check_x.py ARGS... --mutate NAME   apply the named fault, then require that
                                       the check fails with the message expected
                                       for that fault (exit 0 if it does, 1 if
                                       the check passed or failed differently)

numpy missing is a failure (exit 1, message naming numpy), never a skip.
"""
import math
import shutil
import subprocess
import sys
import tempfile


def require_numpy():
    try:
        import numpy  # noqa: F401
    except ImportError as e:
        print(f"FAIL: numpy is required by this cross-check but cannot be imported by {sys.executable} ({e}); "
              "install python3-numpy (setup.sh test does) or point RIDGECAL_NUMPY_PYTHON at a python3 with numpy")
        sys.exit(1)
    return numpy


_WORK_DIRS = []


def work_dir(prefix):
    """A unique temporary directory (never the working directory); removed when the check passes."""
    d = tempfile.mkdtemp(prefix=f"ridgecal-{prefix}-")
    _WORK_DIRS.append(d)
    return d


def _cleanup():
    for d in _WORK_DIRS:
        shutil.rmtree(d, ignore_errors=True)


def run_cli(args, expect_rc=0):
    run = subprocess.run(args, capture_output=True, text=True)
    if expect_rc is not None and run.returncode != expect_rc:
        raise RuntimeError(f"{' '.join(args[:2])} exited {run.returncode}, expected {expect_rc}:\n"
                           f"{run.stdout}{run.stderr}")
    return run


class Failures:
    def __init__(self):
        self.items = []
        self.max_rel = {}

    def add(self, msg):
        self.items.append(msg)

    def close(self, what, got, want, rtol, atol=0.0, key=None):
        """|got - want| <= atol + rtol*|want|; records the largest relative difference per key."""
        diff = abs(got - want)
        rel = diff / abs(want) if want != 0 else diff
        k = key or what.split(" ")[0]
        self.max_rel[k] = max(self.max_rel.get(k, 0.0), rel)
        if not (diff <= atol + rtol * abs(want)) or math.isnan(got) or math.isnan(want):
            self.add(f"{what}: ridgecal {got!r}, numpy {want!r} (difference {diff:.3g}, allowed {atol + rtol * abs(want):.3g})")


def run_check(check, mutations, argv):
    """check(args, mutation) -> (Failures, summary). mutations: name -> expected message fragment."""
    mutation = None
    if "--mutate" in argv:
        i = argv.index("--mutate")
        mutation = argv[i + 1]
        argv = argv[:i] + argv[i + 2:]
        if mutation not in mutations:
            print(f"FAIL: unknown mutation {mutation!r}; known: {', '.join(sorted(mutations))}")
            return 1
    try:
        failures, summary = check(argv, mutation)
    except RuntimeError as e:
        print(f"FAIL: {e} (files kept in {', '.join(_WORK_DIRS)})")
        return 1
    if mutation is None:
        if failures.items:
            print("FAIL: ridgecal disagrees with the independent numpy computation:")
            for f in failures.items[:25]:
                print("  " + f)
            if len(failures.items) > 25:
                print(f"  ... and {len(failures.items) - 25} more")
            return 1
        _cleanup()
        print("ok: " + summary)
        if failures.max_rel:
            print("largest relative differences: " +
                  ", ".join(f"{k} {v:.2g}" for k, v in sorted(failures.max_rel.items())))
        return 0
    expected = mutations[mutation]
    hits = [f for f in failures.items if expected in f]
    if hits:
        _cleanup()
        print(f"ok: mutation {mutation!r} detected ({len(failures.items)} disagreements), e.g.: {hits[0]}")
        return 0
    if failures.items:
        print(f"FAIL: mutation {mutation!r} failed the check, but not with the expected message {expected!r}:")
        for f in failures.items[:10]:
            print("  " + f)
    else:
        print(f"FAIL: mutation {mutation!r} was not detected: the check passed with a deliberate fault")
    return 1
