"""Reading accelerograms and writing suites (isolation.motions.records_io).

Sources named beside each check: unit factors from the SI definition of the
standard gravity (9.80665 m/s2, CGPM 1901) and 1 cm = 0.01 m; file contents
are invented test data written in each test.
"""

import json
import os

import numpy as np
import pytest

from isolation.motions import (
    FORMAT_NAME,
    matched_suite,
    read_accelerogram,
    read_csv_accelerogram,
    read_suite_records,
    read_text_accelerogram,
    suite_io,
    write_suite,
)
from isolation.site.spectra import CodeSpectrum

STANDARD_GRAVITY = 9.80665  # m/s2, CGPM 1901 definition (outside source)


def _write(path, text):
    path.write_text(text, encoding="utf-8")
    return path


def test_text_with_header_and_several_values_per_line(tmp_path):
    # Source: unit definition, 1 cm/s2 = 0.01 m/s2 and g = 9.80665 m/s2.
    file = _write(
        tmp_path / "quake.txt",
        "Invented station, horizontal component\nACCELERATION IN CM/S2\nNPTS=   7, DT=  .0100 SEC\n"
        "  1.0  2.0  -3.0\n 4.5e1 0.0\n-98.0665 10\n",
    )
    record = read_text_accelerogram(file, "cm/s2")
    expected = np.array([1.0, 2.0, -3.0, 45.0, 0.0, -98.0665, 10.0]) * 0.01 / STANDARD_GRAVITY
    np.testing.assert_allclose(record.acceleration, expected, rtol=1e-12)
    assert record.dt == pytest.approx(0.01)
    assert record.acceleration.size == 7
    assert record.time[-1] == pytest.approx(0.06)


def test_text_units_in_m_per_s2_and_dt_argument(tmp_path):
    # Source: g = 9.80665 m/s2 (definition).
    file = _write(tmp_path / "plain.txt", "invented record without a time step in its header\n9.80665\n-19.6133\n0\n")
    record = read_text_accelerogram(file, "m/s2", dt=0.02)
    np.testing.assert_allclose(record.acceleration, [1.0, -2.0, 0.0], rtol=1e-12)
    assert record.dt == 0.02


def test_csv_time_and_acceleration(tmp_path):
    # Source: invented two-column data in g; dt is the spacing of the time column.
    file = _write(tmp_path / "quake.csv", "time_s,accel_g\n0.00,0.0\n0.01,0.1\n0.02,-0.2\n0.03,0.05\n")
    record = read_accelerogram(file, "g")
    np.testing.assert_allclose(record.acceleration, [0.0, 0.1, -0.2, 0.05])
    assert record.dt == pytest.approx(0.01)


@pytest.mark.parametrize(
    "text, units, pattern",
    [
        ("NPTS= 4, DT= 0.01\n1 2 3\n", "g", r"count = 4 \(header line 1\).*holds 3 values"),
        ("NPTS= 3, DT= 0.01\n1 2\n3 x7\n", "g", r"line 3, value 2 = 'x7'.*must be a number"),
        ("some header\nNPTS= 3\n1 2 3\n", "g", r"time step missing"),
        ("DT= 0.01\n1 2 3\n", "feet", r"units = 'feet'.*'g', 'm/s2', 'cm/s2'"),
        ("DT= 0.01\n1 2 3\n", None, r"units = None"),
        ("DT= -0.01\n1 2 3\n", "g", r"time step = -0.01"),
        ("only a header\n", "g", r"no line of numeric"),
    ],
)
def test_malformed_text_gives_clear_errors(tmp_path, text, units, pattern):
    # Source: issue 3 (wrong count, non-numeric value, missing time step) and the project rule on errors.
    file = _write(tmp_path / "bad.txt", text)
    with pytest.raises(ValueError, match=pattern):
        read_text_accelerogram(file, units)


@pytest.mark.parametrize(
    "text, pattern",
    [
        ("t,a\n0.0,0.1\n0.01,0.2\n0.025,0.3\n0.035,0.1\n", r"line 4, time = 0.025.*uniform"),
        ("t,a\n0.0,0.1\n0.01,abc\n", r"line 3, acceleration = 'abc'"),
        ("t,a\n0.0,0.1\n0.01\n", r"line 3 has 1 field"),
        ("t,a\n0.0,0.1\n0.0,0.2\n", r"time must increase"),
    ],
)
def test_malformed_csv_gives_clear_errors(tmp_path, text, pattern):
    # Source: issue 3 (non-uniform time, non-numeric value) and the project rule on errors.
    file = _write(tmp_path / "bad.csv", text)
    with pytest.raises(ValueError, match=pattern):
        read_csv_accelerogram(file, "g")


def test_missing_file_and_conflicting_time_step(tmp_path):
    # Source: project rule on errors (field, value, allowed).
    with pytest.raises(ValueError, match="path"):
        read_accelerogram(tmp_path / "none.txt", "g")
    file = _write(tmp_path / "a.txt", "dt = 0.01\n1 2 3\n")
    with pytest.raises(ValueError, match=r"dt = 0.02.*states dt = 0.01"):
        read_text_accelerogram(file, "g", dt=0.02)


@pytest.fixture(scope="module")
def tiny_suite():
    spectrum = CodeSpectrum(sms=0.9, sm1=0.45)  # invented site values [g]
    return matched_suite(spectrum, count=2, duration=10.0, dt=0.02, seed=3, period_range=(0.1, 2.0),
                         significant_duration=3.0, progress=False)


def test_write_then_read_back(tmp_path, tiny_suite):
    # Source: round trip through our documented format; 8 significant digits written.
    folder = tmp_path / "records" / "motions"
    paths = write_suite(tiny_suite, folder, name="demo")
    assert [p.name for p in paths] == ["demo_01.txt", "demo_02.txt", "demo.json"]
    records = read_suite_records(folder / "demo.json")
    for index, record in enumerate(records):
        np.testing.assert_allclose(record.acceleration, tiny_suite.acceleration[index], rtol=1e-7, atol=1e-12)
        assert record.dt == tiny_suite.dt
    metadata = json.loads((folder / "demo.json").read_text())
    assert metadata["format"] == FORMAT_NAME
    assert metadata["seeds"] == list(tiny_suite.seeds)
    assert metadata["files"] == ["demo_01.txt", "demo_02.txt"]
    assert "acceleration_g" not in metadata
    first_lines = (folder / "demo_01.txt").read_text().splitlines()[:6]
    assert first_lines[0] == f"# {FORMAT_NAME}" and first_lines[5] == f"# seed = {tiny_suite.seeds[0]}"
    assert not [p for p in os.listdir(folder) if p.endswith(".tmp")]


def test_failed_write_leaves_nothing_behind(tmp_path, tiny_suite, monkeypatch):
    # Source: project rule ("nothing half-written left behind").
    calls = {"n": 0}
    real = suite_io.os.fdopen

    def failing(*args, **kwargs):
        calls["n"] += 1
        if calls["n"] == 2:
            raise OSError("disk full (simulated)")
        return real(*args, **kwargs)

    monkeypatch.setattr(suite_io.os, "fdopen", failing)
    with pytest.raises(OSError):
        write_suite(tiny_suite, tmp_path, name="broken")
    assert os.listdir(tmp_path) == []


def test_bad_suite_name(tmp_path, tiny_suite):
    # Source: project rule on errors.
    with pytest.raises(ValueError, match="name"):
        write_suite(tiny_suite, tmp_path, name="../escape")
