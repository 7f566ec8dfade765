"""The Python module against the CLI: same records, same refusals, same messages."""
import math
import os
import subprocess

import numpy as np
import pytest

import ridgecal
from conftest import CLI, SAMPLES_DIR

# The golden timestamp (tests/golden/golden_cases.sh injects the same one).
TS = "2026-01-01T00:00:00Z"

# Each sample with its options from its README (calibration-samples/*/README.md).
SAMPLES = {
    "loadcell-hopper": dict(setpoint="setpoint", sensor="hopper scale LC-3",
                            reading_unit="counts", reference_unit="kg"),
    "ntc-coldstore": dict(setpoint="setpoint", sensor="cold-store NTC ch2",
                          reading_unit="counts", reference_unit="degC"),
    "pressure-tempco": dict(setpoint="setpoint", aux="temperature", aux_setpoint="chamber",
                            aux_degree="0..3", sensor="test rig PT-7", reading_unit="counts",
                            reference_unit="bar"),
}


def cli_args(options):
    args = []
    for k, v in options.items():
        args += ["--" + k.replace("_", "-"), str(v)]
    return args


def sample_path(name):
    return os.path.join(SAMPLES_DIR, name, name + ".csv")


def test_every_sample_is_covered():
    found = sorted(d for d in os.listdir(SAMPLES_DIR)
                   if os.path.isfile(sample_path(d)))
    assert found == sorted(SAMPLES)


@pytest.mark.parametrize("name", sorted(SAMPLES))
def test_record_byte_identical_to_cli(name, tmp_path):
    options = dict(SAMPLES[name], timestamp=TS, tol_offset="0.5")
    out = tmp_path / "record.json"
    subprocess.run([CLI, "fit", sample_path(name), "-o", str(out)] + cli_args(options),
                   check=False, capture_output=True)
    assert out.exists()
    rec = ridgecal.fit_csv(sample_path(name), **options)
    assert rec.to_json() == out.read_text()


def ntc_arrays():
    rec = ridgecal.fit_csv(sample_path("ntc-coldstore"), setpoint="setpoint", timestamp=TS)
    pts = rec.points
    return (np.array([p["reading"] for p in pts]), np.array([p["reference"] for p in pts]),
            [p["setpoint"] for p in pts])


def test_fit_from_arrays_matches_csv_but_provenance():
    x, y, sp = ntc_arrays()
    a = ridgecal.fit(x, y, setpoint=sp, timestamp=TS)
    c = ridgecal.fit_csv(sample_path("ntc-coldstore"), setpoint="setpoint", timestamp=TS)
    assert a.model == c.model
    assert a.metrics == c.metrics
    # sequences work as well as arrays
    b = ridgecal.fit(list(x), list(y), setpoint=sp, timestamp=TS)
    assert b.to_json() == a.to_json()


def test_predict_equals_points():
    rec = ridgecal.fit_csv(sample_path("ntc-coldstore"), setpoint="setpoint", timestamp=TS)
    readings = np.array([p["reading"] for p in rec.points])
    predicted = np.array([p["predicted"] for p in rec.points])
    assert np.array_equal(rec.predict(readings), predicted)


def test_wrong_dtype_refused():
    with pytest.raises(TypeError, match="reading: dtype"):
        ridgecal.fit(np.array(["a", "b", "c"]), np.array([1.0, 2.0, 3.0]))


def test_wrong_shape_refused():
    with pytest.raises(ValueError, match="1-D array, got 2 dimensions"):
        ridgecal.fit(np.ones((3, 2)), np.ones(3))


def test_wrong_length_refused():
    with pytest.raises(ValueError, match="reference: length 2 differs from reading's length 3"):
        ridgecal.fit([1.0, 2.0, 3.0], [1.0, 2.0])


def test_nan_refused_as_in_cli():
    x, y, sp = ntc_arrays()
    y[3] = math.nan
    with pytest.raises(ridgecal.InputError, match="<arrays>:5"):
        ridgecal.fit(x, y, setpoint=sp)


def test_usage_error_has_cli_message():
    x, y, sp = ntc_arrays()
    with pytest.raises(ridgecal.UsageError, match="--degree and --lambda go together"):
        ridgecal.fit(x, y, setpoint=sp, degree=2)
    with pytest.raises(ridgecal.UsageError, match="--rule"):
        ridgecal.fit(x, y, setpoint=sp, rule="best")


def test_from_json_integrity_checked():
    rec = ridgecal.fit_csv(sample_path("ntc-coldstore"), setpoint="setpoint", timestamp=TS)
    again = ridgecal.Record.from_json(rec.to_json())
    assert again.to_json() == rec.to_json()
    tampered = rec.to_json().replace('"sensor"', '"sensor" ', 1).replace(
        "cold", "warm", 1)
    with pytest.raises(ridgecal.InputError, match="modified|integrity"):
        ridgecal.Record.from_json(tampered)


def test_header_matches_cli_export_and_refuses_unpassed(tmp_path):
    path = sample_path("ntc-coldstore")
    rec_file = tmp_path / "r.json"
    subprocess.run([CLI, "fit", path, "--setpoint", "setpoint", "--timestamp", TS,
                    "-o", str(rec_file)], check=True, capture_output=True)
    rec = ridgecal.Record.from_json(rec_file.read_text())
    assert rec.verdict is None
    # not judged: refused as `ridgecal export` refuses it (exit 1), same words
    cli = subprocess.run([CLI, "export", str(rec_file), "--prefix", "NTC", "--numeric", "float",
                          "-o", str(tmp_path / "h.h")], capture_output=True, text=True)
    assert cli.returncode == 1
    with pytest.raises(ridgecal.RefusedError, match="no verdict") as e:
        rec.header("NTC", "float")
    assert str(e.value).split(": refused: ")[1] in cli.stderr
    header = rec.header("NTC", "float", allow_unpassed=True)
    subprocess.run([CLI, "export", str(rec_file), "--prefix", "NTC", "--numeric", "float",
                    "--allow-unpassed", "-o", str(tmp_path / "h.h")], check=True,
                   capture_output=True)
    assert header == (tmp_path / "h.h").read_text()


def test_report_and_verify():
    rec = ridgecal.fit_csv(sample_path("ntc-coldstore"), setpoint="setpoint", timestamp=TS)
    assert rec.report_html().startswith("<!DOCTYPE html>")
    x, y, sp = ntc_arrays()
    res = ridgecal.verify(rec, x, y, setpoint=sp, timestamp=TS)
    assert isinstance(res, dict)


def test_predict_needs_aux_for_an_aux_model():
    opts = dict(SAMPLES["pressure-tempco"], timestamp=TS)
    rec = ridgecal.fit_csv(sample_path("pressure-tempco"), **opts)
    pts = rec.points
    x = np.array([p["reading"] for p in pts])
    with pytest.raises(ValueError, match="aux"):
        rec.predict(x)
    a = np.array([p["aux"] for p in pts])
    assert np.array_equal(rec.predict(x, a), np.array([p["predicted"] for p in pts]))
