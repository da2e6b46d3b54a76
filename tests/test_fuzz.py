"""Fuzzing the input edge: study files, accelerograms and batch files (issue 15).

Generated mutations of the example studies (>= 1,000 variants), of a text
and a CSV accelerogram (>= 100 files) and of a batch file (>= 100 files) go
through the command line in this process. For each, the outcome must be
either exit 2 with one line naming the key (or the file and line) and no
traceback, or exit 0 with the values read exactly; nothing may hang (a timer
stops any case after a few seconds). What counts as correct comes from the
project's rules on errors; exact conversion factors from NIST SP 811 (2008)
Appendix B (1 in = 0.0254 m, 1 ft = 0.3048 m, 1 lbf = 4.4482216152605 N,
exact) and SI prefixes (BIPM SI Brochure, 9th edition, Table 7).
"""

import io
import math
import re
import signal
import tomllib
from contextlib import contextmanager, redirect_stderr, redirect_stdout
from pathlib import Path

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from isolation.app.calc_records import to_toml
from isolation.app.cli import main as cli
from isolation.errors import InputError
from isolation.motions.records_io import read_csv_accelerogram, read_text_accelerogram
from isolation.study import load_study
from isolation.units import parse_quantity

ROOT = Path(__file__).resolve().parent.parent
EXAMPLES = [ROOT / "examples" / name for name in ("demo_study.toml", "soft_site_study.toml",
                                                  "pendulum_vs_rubber_study.toml")]
G = 9.80665  # m/s2, standard gravity (3rd CGPM, 1901)


class Hang(Exception):
    pass


@contextmanager
def deadline(seconds: float):
    """Fail a case that runs longer than ``seconds`` (a hang), instead of waiting for it."""
    def stop(signum, frame):  # noqa: ARG001
        raise Hang()

    previous = signal.signal(signal.SIGALRM, stop)
    signal.setitimer(signal.ITIMER_REAL, seconds)
    try:
        yield
    finally:
        signal.setitimer(signal.ITIMER_REAL, 0)
        signal.signal(signal.SIGALRM, previous)


def run_cli(argv: list[str], seconds: float = 20.0) -> tuple[int, str, str]:
    out, err = io.StringIO(), io.StringIO()
    with deadline(seconds), redirect_stdout(out), redirect_stderr(err):
        code = cli(argv)
    return code, out.getvalue(), err.getvalue()


def one_line_error(code: int, err: str) -> str:
    lines = [line for line in err.splitlines() if line.strip() and not line.startswith("note:")]
    assert code == 2, f"exit {code}: {err[-1500:]}"
    assert len(lines) == 1, err[-3000:]
    assert "Traceback" not in err and "Error:" not in lines[0].split(" ")[0]
    return lines[0]


# ---------------------------------------------------------------- study files
def leaves(value, path=()):
    """(path, value) of every leaf of a parsed study; list items of scalars are leaves too."""
    if isinstance(value, dict):
        for key, item in value.items():
            yield from leaves(item, path + (key,))
    elif isinstance(value, list) and value and all(isinstance(v, dict) for v in value):
        for index, item in enumerate(value):
            yield from leaves(item, path + (index,))
    else:
        yield path, value
        if isinstance(value, list):
            for index, item in enumerate(value):
                yield path + (index,), item


def message_forms(path: tuple) -> list[str]:
    """How an error message may name the key: the full path in bracket form, the path
    without a final list index, or the key's own name."""
    text = ""
    for part in path:
        text += f"[{part}]" if isinstance(part, int) else (f".{part}" if text else part)
    names = [p for p in path if isinstance(p, str)]
    return [text, re.sub(r"\[\d+\]$", "", text), names[-1]]


def put(mapping, path, value):
    node = mapping
    for part in path[:-1]:
        node = node[part]
    if value is DELETE:
        del node[path[-1]]
    else:
        node[path[-1]] = value


DELETE = object()

# Always wrong, whatever the key: each must give exit 2 naming the key.
ALWAYS_BAD = [
    "9**9**9 m", "10**10**6 m", "2*3 m", "1e400 m", "kN", "m", "50 %", "1,5 m", "(2) m", "0x10 m",
    "1 m + 2 m", "nan m", "inf kN", "", "   ", "\x00", "医院", True, [], {"a": 1}, 1e300, -1e300,
    float("nan"), float("inf"), "1e99999", "12 zorks",
]
# Units with exact factors to the internal unit: (text unit, kind, factor).
EXACT_UNITS = {"length": [("m", 1.0), ("mm", 1e-3), ("cm", 1e-2), ("in", 0.0254), ("ft", 0.3048)],
               "force": [("kN", 1.0), ("N", 1e-3), ("MN", 1e3)],
               "weight": [("kN", 1.0), ("MN", 1e3)],
               "stress": [("kPa", 1.0), ("MPa", 1e3), ("Pa", 1e-3)],
               "time": [("s", 1.0), ("ms", 1e-3)]}
KIND_OF = {"radius": "length", "radius_1": "length", "radius_2": "length", "slider_height": "length",
           "displacement_capacity": "length", "outer_diameter": "length", "lead_diameter": "length",
           "layer_thickness": "length", "moat": "length", "plan_length": "length", "plan_width": "length",
           "eccentricity": "length", "storey_heights": "length", "floor_weights": "weight",
           "base_weight": "weight", "base_shear": "force", "axial_load": "force", "shear_modulus": "stress",
           "lead_yield_stress": "stress", "duration": "time", "time_step": "time", "long_period": "time",
           "fixed_base_period": "time"}


def study_cases():
    cases = []
    for example in EXAMPLES:
        base = tomllib.loads(example.read_text(encoding="utf-8"))
        for path, value in leaves(base):
            name = [p for p in path if isinstance(p, str)][-1]
            for bad in ALWAYS_BAD:
                if isinstance(value, str) and name in ("name", "client", "prepared_by", "revision",
                                                       "basis", "lateral_system", "site_class", "ground_type",
                                                       "type", "units", "currency") and isinstance(bad, str) \
                        and bad.strip() and "\x00" not in bad:
                    continue  # free text (and choices) accept many strings; choices are covered below
                if isinstance(value, bool) and isinstance(bad, bool):
                    continue  # true is a valid boolean
                cases.append((example, path, bad, "bad"))
            kind = KIND_OF.get(name)
            if kind and isinstance(value, (int, float, str)) and not isinstance(value, bool):
                number = value if not isinstance(value, str) else parse_quantity(
                    value, kind, field=name, system=base.get("units", "SI"))
                for unit, factor in EXACT_UNITS[kind]:
                    written = number / factor
                    cases.append((example, path, f"{written!r} {unit}", ("exact", number)))
            if name in ("friction", "friction_1", "friction_2", "damping"):
                cases.append((example, path, f"{100 * value!r} %", ("exact", value)))
            cases.append((example, path, DELETE, "maybe"))
        cases.append((example, ("unknown_root_key",), 1, "bad"))
    return cases


CASES = study_cases()


def test_there_are_enough_study_variants():
    assert len(CASES) >= 1000


def _value_at(study, path):
    """The validated value of a mutated key in internal units (None when not a stored number)."""
    name = [p for p in path if isinstance(p, str)][-1]
    if path[0] == "alternative":
        alternative = study.alternatives[path[1]]
        if path[2] == "bearings":
            group = alternative.bearings[path[3]]
            return group.axial_load if name == "axial_load" else group.properties.get(name)
        return getattr(alternative, {"moat": "moat"}.get(name, name), None)
    if path[0] == "wind":
        return study.wind_base_shear
    section = getattr(study, path[0], None)
    value = getattr(section, name, None)
    if isinstance(value, tuple):
        value = value[path[-1]] if isinstance(path[-1], int) else value[0]
    return value


@pytest.mark.parametrize("chunk", range(8))
def test_mutated_studies_give_one_line_or_exact_values(tmp_path, chunk):
    exact = 0
    for number, (example, path, value, expect) in enumerate(CASES):
        if number % 8 != chunk:
            continue
        mapping = tomllib.loads(example.read_text(encoding="utf-8"))
        put(mapping, path, value)
        study_file = tmp_path / "study.toml"
        try:
            text = to_toml(mapping)
        except ValueError:
            continue  # a value TOML cannot hold (never a case of the grammar)
        study_file.write_text(text, encoding="utf-8")
        # a spectrum file a study names is read relative to the study file
        for extra in example.parent.glob("*.csv"):
            (tmp_path / extra.name).write_bytes(extra.read_bytes())
        try:
            code, _, err = run_cli(["check", str(study_file)])
        except Hang:
            pytest.fail(f"check hung on {path} = {value!r}")
        if expect == "bad":
            assert code == 2, (example.name, path, value, err[-500:])
            line = one_line_error(code, err)
            assert any(form in line for form in message_forms(path)), (path, value, line)
        elif code == 2:
            line = one_line_error(code, err)
            assert any(form in line for form in message_forms(path)) or "alternative[" in line, (path, value, line)
        else:
            assert code == 0, err[-2000:]
            if isinstance(expect, tuple):
                got = _value_at(load_study(study_file), path)
                assert got == pytest.approx(expect[1], rel=1e-12), (path, value, got)
                exact += 1
    assert exact > 0  # some mutations are valid and read exactly


@settings(max_examples=50, deadline=None)
@given(st.floats(min_value=1e-6, max_value=1e6), st.sampled_from(EXACT_UNITS["length"]))
def test_quantities_read_exactly(number, unit):
    # NIST SP 811 Appendix B factors (exact): the value is the number times the factor.
    name, factor = unit
    assert parse_quantity(f"{number!r} {name}", "length", field="x") == pytest.approx(number * factor, rel=1e-12)


@settings(max_examples=50, deadline=None)
@given(st.text(alphabet="0123456789.eE+-*/^()% mkNsin,", max_size=30))
def test_any_text_is_read_or_refused_quickly(text):
    with deadline(2.0):
        try:
            value = parse_quantity(text, "length", field="site.x")
        except InputError as error:
            assert "site.x" in str(error)
        else:
            assert math.isfinite(value)
            assert not re.search(r"\*\*|[()%,]|\d\s*[*/^]\s*\d", text)   # no arithmetic was evaluated


# ---------------------------------------------------------------- accelerograms
VALUES = [0.0123, -0.0456, 0.5, -1.25, 0.0, 3.0e-4, 2.5]   # in g, invented


def accelerogram_cases():
    body = " ".join(f"{v!r}" for v in VALUES)
    good = f"invented record\nunits = g\ndt = 0.01\n{body}\n"
    cases = [("good", good, ("exact", VALUES, 0.01))]
    for sep in (" ", "\t", ", ", ";", "  "):
        cases.append((f"sep{sep!r}", good.replace(body, sep.join(f"{v!r}" for v in VALUES)), ("exact", VALUES, 0.01)))
    for split in range(1, len(VALUES)):
        lines = " ".join(f"{v!r}" for v in VALUES[:split]) + "\n" + " ".join(f"{v!r}" for v in VALUES[split:])
        cases.append((f"lines{split}", good.replace(body, lines), ("exact", VALUES, 0.01)))
    for dt_text, dt in (("0.01", 0.01), ("10 ms", 0.01), ("0.01 s", 0.01), ("0.01 sec", 0.01), ("1.0D-02", 0.01),
                        ("5 msec", 0.005), (".02 SEC", 0.02), ("2.0E-02 s", 0.02)):
        cases.append((f"dt {dt_text}", good.replace("dt = 0.01", f"dt = {dt_text}"), ("exact", VALUES, dt)))
    fortran = " ".join(f"{v:.6E}".replace("E", "D") for v in VALUES)
    cases.append(("fortran D", good.replace(body, fortran), ("exact", VALUES, 0.01)))
    cases.append(("fortran d", good.replace(body, fortran.lower()), ("exact", VALUES, 0.01)))
    # wrong: each must be refused naming the file (and the line where there is one)
    bad = {
        "decimal commas": good.replace(body, " ".join(f"{v}".replace(".", ",") for v in VALUES if v != 0.0)),
        "date line": good.replace(body, "1999 05 12\n" + body),
        "date line 2": good.replace(body, "1999 5 12 10 30 00\n" + body),
        "huge": good.replace(body, body + " 1e300"),
        "11 g": good.replace(body, body + " 11.0"),
        "nan": good.replace(body, body + " nan"),
        "inf": good.replace(body, body + " inf"),
        "word": good.replace(body, body + "\nend of record"),
        "dt minutes": good.replace("dt = 0.01", "dt = 0.01 min"),
        "dt hz": good.replace("dt = 0.01", "dt = 100 Hz"),
        "dt 5 s": good.replace("dt = 0.01", "dt = 5"),
        "dt tiny": good.replace("dt = 0.01", "dt = 1e-9"),
        "dt negative": good.replace("dt = 0.01", "dt = -0.01"),
        "no dt": good.replace("dt = 0.01\n", ""),
        "count": good.replace("dt = 0.01", "dt = 0.01\nnpts = 99"),
        "one value": "units = g\ndt = 0.01\n0.1\n",
        "hex": good.replace(body, body + " 0x10"),
        "underscore": good.replace(body, body + " 1_000"),
        "units feet": good.replace("units = g", "units = feet"),
        "mixed D": good.replace(body, body + " 1.0Q-02"),
    }
    for name, text in bad.items():
        cases.append((name, text, "bad"))
    # each wrong value at each position of the data
    for position in range(len(VALUES)):
        for token in ("1e300", "0,5", "abc", "-20", "1..2", "--1", "nan", "1e-3.5", "1e400", "\u0661\u0662"):
            values = [f"{v!r}" for v in VALUES]
            values[position] = token
            cases.append((f"{token}@{position}", good.replace(body, " ".join(values)), "bad"))
    return cases


ACCELEROGRAMS = accelerogram_cases()


def test_accelerograms_are_read_exactly_or_refused_with_file_and_line(tmp_path):
    assert len(ACCELEROGRAMS) >= 100
    for number, (name, text, expect) in enumerate(ACCELEROGRAMS):
        path = tmp_path / f"record{number:03d}.txt"
        path.write_text(text, encoding="utf-8")
        try:
            with deadline(5.0):
                record = read_text_accelerogram(path)
        except Hang:
            pytest.fail(f"{name}: the reader hung")
        except ValueError as error:
            assert expect == "bad", f"{name}: {error}"
            message = str(error)
            assert f"record{number:03d}.txt" in message or "units" in message, (name, message)
            if name.split("@")[0] in ("1e300", "0,5", "abc", "-20", "1..2", "--1", "huge", "11 g", "word", "1e400",
                                      "decimal commas", "date line", "date line 2", "hex", "underscore"):
                assert re.search(r"line \d+", message), (name, message)
            continue
        assert expect != "bad", f"{name}: accepted {record.acceleration.tolist()}"
        np.testing.assert_array_equal(record.acceleration, np.array(expect[1]))   # read exactly
        assert record.dt == pytest.approx(expect[2], rel=1e-12)


def test_csv_accelerograms_fuzzed(tmp_path):
    rows = "\n".join(f"{0.01 * i:.2f},{v!r}" for i, v in enumerate(VALUES))
    good = f"time_s,accel_g\n{rows}\n"
    cases = [("good", good, True), ("bom", "\ufeff" + good, True), ("semicolons", good.replace(",", ";"), True)]
    cases += [("decimal comma", good.replace(",", ";").replace(".", ","), False),
              ("date first", "2026-12-01\n" + good, False), ("huge", good + "0.07,1e300\n", False),
              ("text row", good + "0.07,abc\n", False), ("gap", good + "0.09,0.1\n", False),
              ("dt 1 s", "t,a\n0,0.1\n1,0.2\n2,0.3\n", False)]
    for i in range(len(VALUES)):
        lines = good.splitlines()
        lines[i + 1] = lines[i + 1].split(",")[0] + ",12.5"      # 12.5 g: beyond the plausibility limit
        cases.append((f"12.5g@{i}", "\n".join(lines) + "\n", False))
    for number, (_name, text, ok) in enumerate(cases):
        path = tmp_path / f"record{number:03d}.csv"
        path.write_text(text, encoding="utf-8")
        with deadline(5.0):
            if ok:
                record = read_csv_accelerogram(path, "g")
                np.testing.assert_array_equal(record.acceleration, np.array(VALUES))
            else:
                with pytest.raises(ValueError, match=rf"record{number:03d}.csv"):
                    read_csv_accelerogram(path, "g")


# ---------------------------------------------------------------- batch files
def batch_cases(study_name: str):
    radius = "alternative.0.bearings.0.radius"
    friction = "alternative.0.bearings.0.friction"
    head = f'[batch]\nstudy = "{study_name}"\n'
    ok = [
        (head + f'[grid]\n"{radius}" = [2.0, 3.0]\n', 2),
        (head + f'[grid]\n"{radius}" = ["2 m", "3000 mm"]\n"{friction}" = [0.04, "5 %"]\n', 4),
        (head + f'[[variant]]\nid = "a"\n"{radius}" = 2.5\n[[variant]]\nid = "b"\n"{friction}" = 0.05\n', 2),
        (head + f'[common]\n"analysis.duration" = 20.0\n[grid]\n"{radius}" = [2.0]\n', 1),
        ("\ufeff" + head + f'[grid]\n"{radius}" = [2.0]\n', 1),
    ]
    named = "alternative[0].bearings[0].radius"   # how a study message names the key
    bad = [
        (head + f'[grid]\n"{radius}" = ["9**9**9 m"]\n', named),
        (head + f'[grid]\n"{radius}" = ["50 %"]\n', named),
        (head + f'[grid]\n"{radius}" = ["m"]\n', named),
        (head + f'[grid]\n"{radius}" = [1e300]\n', named),
        (head + f'[grid]\n"{radius}" = 2.0\n', radius),
        (head + f'[grid]\n"{radius}" = []\n', radius),
        (head + '[grid]\n"site.nonsense" = [1.0]\n', "nonsense"),
        (head + '[grid]\n"alternative.9.bearings.0.radius" = [1.0]\n', "alternative.9"),
        (head + f'[grid]\n"{radius}" = {list(range(1, 2000))}\n', "variants"),
        ('[batch]\nstudy = "missing.toml"\n[grid]\n"site.sms" = [1.0]\n', "missing.toml"),
        ('[batch]\nstudy = "."\n[grid]\n"site.sms" = [1.0]\n', "batch.study"),
        ("[batch]\n", "batch.study"),
        (head + "[nonsense]\n", "nonsense"),
        (head + f'[[variant]]\nid = "A B"\n"{radius}" = 2.0\n', "id"),
        (head + f'[[variant]]\nid = "a"\n"{radius}" = 2.0\n[[variant]]\nid = "a"\n"{radius}" = 3.0\n', "id"),
        (head + "a = " + "[" * 500 + "]" * 500 + "\n", "nest"),
        (head + '[grid\n', "TOML"),
        (head + 'table = "missing.csv"\n', "missing.csv"),
    ]
    return ok, bad


def test_batch_files_fuzzed(tmp_path):
    study = tmp_path / "study.toml"
    study.write_bytes(EXAMPLES[0].read_bytes())
    ok, bad = batch_cases("study.toml")
    csv_cases = [("\ufeffid,alternative.0.bearings.0.radius\nv1,2.0\nv2,2.5\n", 2, None),
                 ("id,alternative.0.bearings.0.radius\r\nv1,2.0\r\n".encode("utf-8"), 1, None),
                 ("id,alternative.0.bearings.0.radius\nv1,2\u00e9\n".encode("latin-1"), 0, "table.csv"),
                 ("id,alternative.0.bearings.0.radius\nv1,9**9**9 m\n", 0, "bearings[0].radius"),
                 ("id,alternative.0.bearings.0.nonsense\nv1,1\n", 0, "nonsense"),
                 ("id,alternative.0.bearings.0.radius\nv1,1,5 m\n", 0, "table.csv")]
    files = []
    for number in range(120):   # the cases, repeated with different line ends and comments
        kind = number % 3
        decorate = (lambda t: t) if kind == 0 else (lambda t: t.replace("\n", "\r\n")) if kind == 1 else \
            (lambda t: t[:1] + "# invented batch\n" + t[1:] if t.startswith("\ufeff") else "# invented batch\n" + t)
        for text, count in ok:
            files.append((decorate(text), count, None))
        for text, named in bad:
            files.append((decorate(text), 0, named))
        if len(files) >= 150:
            break
    assert len(files) >= 100
    for table, count, named in csv_cases:
        files.append((table, count, named))
    for number, (text, count, named) in enumerate(files):
        path = tmp_path / f"batch{number:03d}.toml"
        if isinstance(text, bytes) or text.lstrip("\ufeff").startswith("id,"):  # a CSV table
            data = text if isinstance(text, bytes) else text.encode("utf-8")
            (tmp_path / "table.csv").write_bytes(data)
            text = '[batch]\nstudy = "study.toml"\ntable = "table.csv"\n'
        path.write_text(text, encoding="utf-8", newline="")
        try:
            code, out, err = run_cli(["batch", str(path), "--check", "--direct"], seconds=30)
        except Hang:
            pytest.fail(f"batch --check hung on {text[:200]!r}")
        if named is None:
            assert code == 0, (text[:300], err[-1500:])
            assert f"{count} variants valid" in out
        else:
            lines = [line for line in err.splitlines() if line.strip()]
            assert code == 2 and len(lines) == 1, (text[:300], code, err[-1500:])
            assert named in lines[0] and "Traceback" not in err, (named, lines[0])
