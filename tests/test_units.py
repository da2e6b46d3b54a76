"""Quantities with units at the input edge (isolation.units).

Conversion factors are checked against NIST Special Publication 811 (2008),
Appendix B (exact definitions: 1 in = 0.0254 m, 1 ft = 0.3048 m,
1 lbf = 4.4482216152605 N, 1 psi = 6.894757 kPa to 7 digits), and standard
gravity g = 9.80665 m/s2 (3rd CGPM, 1901).
"""

import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from isolation.errors import InputError
from isolation.units import format_quantity, parse_quantity, to_display

INCH = 0.0254          # m, NIST SP 811 (exact)
FOOT = 0.3048          # m, NIST SP 811 (exact)
LBF = 4.4482216152605  # N, NIST SP 811 (exact)
PSI = 6.894757         # kPa, NIST SP 811 (7 digits)
G = 9.80665            # m/s2, standard gravity (CGPM 1901)


@pytest.mark.parametrize("text, kind, expected", [
    ("12 in", "length", 12 * INCH),                  # NIST SP 811
    ("12in", "length", 12 * INCH),                   # NIST SP 811, no space
    ("2.5 ft", "length", 2.5 * FOOT),                # NIST SP 811
    ("8 mm", "length", 0.008),                       # SI prefix
    ("0.4 m", "length", 0.4),
    ("350 kN", "force", 350.0),
    ("100 kip", "force", 100 * 1000 * LBF / 1000),   # kip = 1000 lbf, NIST SP 811
    ("60 psi", "stress", 60 * PSI),                  # NIST SP 811
    ("0.4 MPa", "stress", 400.0),                    # SI prefix
    ("1.5 ksi", "stress", 1500 * PSI),               # ksi = 1000 psi
    ("30 s", "time", 30.0),
    ("7 kip/in", "stiffness", 7 * LBF / INCH),       # kN/m: 7000 lbf/in
    ("660 t", "weight", 660 * G),                    # weight of a mass: m g, CGPM 1901
    ("1500 kip*s**2/ft", "mass", 1500 * LBF / FOOT),  # t: 1000 lbf s2/0.3048 m = 14.594 t per kip s2/ft
    ("3.8 kip*s**2/in", "mass", 3.8 * LBF / INCH),   # t, NIST SP 811
])
def test_strings_with_units_convert_to_internal_units(text, kind, expected):
    assert parse_quantity(text, kind, field="x") == pytest.approx(expected, rel=1e-6)


@pytest.mark.parametrize("number, kind, system, expected", [
    (0.4, "length", "SI", 0.4),            # bare SI length is metres
    (12, "length", "US", 12 * INCH),       # bare US length is inches (NIST SP 811)
    (100, "force", "US", 100 * LBF),       # bare US force is kip: 100 kip = 100 000 lbf = 444.8 kN
    (60, "stress", "US", 60 * PSI),        # bare US stress is psi
    (350, "force", "SI", 350.0),
    (100, "weight", "US", 100 * LBF),      # bare US weight is kip, not lbf (NIST SP 811: kip = 1000 lbf)
    (660, "weight", "SI", 660.0),          # bare SI weight is kN
    (660, "mass", "SI", 660.0),            # bare SI mass is t
    (1, "mass", "US", LBF / INCH),         # kip s2/in = 1000 lbf s2/0.0254 m = 175.13 t (NIST SP 811)
])
def test_bare_numbers_take_the_systems_unit(number, kind, system, expected):
    assert parse_quantity(number, kind, field="x", system=system) == pytest.approx(expected, rel=1e-6)


@pytest.mark.parametrize("value, kind, words", [
    ("12 kN", "length", ["site.radius", "'12 kN'", "length", "force was given"]),
    ("3 m", "force", ["site.radius", "'3 m'", "force", "length was given"]),
    ("12 zorks", "length", ["site.radius", "not recognised"]),
    ("12 furlong/fortnight**2", "length", ["site.radius", "dimension"]),
    ("", "length", ["site.radius", "length"]),
    (float("nan"), "length", ["site.radius", "nan"]),
    (float("inf"), "time", ["site.radius", "inf"]),
    (True, "length", ["site.radius", "True"]),
    (["1 m"], "length", ["site.radius"]),
    ("nan m", "length", ["site.radius"]),
])
def test_wrong_kind_or_malformed_value_names_field_value_and_allowed(value, kind, words):
    with pytest.raises(InputError) as caught:
        parse_quantity(value, kind, field="site.radius")
    message = str(caught.value)
    for word in words:
        assert word in message
    assert "must be" in message


def test_unknown_system_is_refused():
    with pytest.raises(InputError, match="units = 'metric'"):
        parse_quantity(1.0, "length", field="x", system="metric")


def test_display_in_us_units():
    # 0.3048 m is exactly 12 in (NIST SP 811).
    assert to_display(0.3048, "length", "US") == pytest.approx((12.0, "in"))
    assert format_quantity(0.3048, "length", "US") == "12 in"
    assert format_quantity(400.0, "stress", "SI") == "0.4 MPa"
    magnitude, unit = to_display(LBF * 1000 / 1000, "force", "US")  # 1 kip in kN
    assert unit == "kip" and magnitude == pytest.approx(1.0)


@settings(max_examples=50, deadline=None)
@given(st.floats(min_value=1e-3, max_value=1e4, allow_nan=False))
def test_round_trip_through_display_units(value):
    # Any length shown in inches and read back gives the same metres.
    magnitude, unit = to_display(value, "length", "US")
    assert math.isclose(parse_quantity(f"{magnitude!r} {unit}", "length", field="x"), value, rel_tol=1e-9)


# Strict grammar (issue 15): one number and one unit; nothing evaluated.
@pytest.mark.parametrize("text, words", [
    ("9**9**9 m", ["no arithmetic"]),
    ("10**10**6 m", ["no arithmetic"]),
    ("2*3 m", ["no arithmetic"]),
    ("1e400 m", ["finite"]),
    ("50 %", ["percent", "ratio"]),
    ("kN", ["needs a number"]),
    ("m", ["needs a number"]),
    ("1,5 m", ["no arithmetic"]),
])
def test_quantities_follow_a_strict_grammar(text, words):
    import time

    started = time.monotonic()
    with pytest.raises(InputError) as caught:
        parse_quantity(text, "length", field="site.radius")
    assert time.monotonic() - started < 1.0       # refused at once, never evaluated
    message = str(caught.value)
    assert "site.radius" in message and repr(text) in message
    for word in words:
        assert word in message


def test_compound_units_and_exponents_still_read():
    # NIST SP 811: 1 kip = 4448.2216152605 N, 1 in = 0.0254 m (exact).
    assert parse_quantity("7 kip/in", "stiffness", field="x") == pytest.approx(7 * LBF / INCH, rel=1e-12)
    assert parse_quantity("2.5e3 mm", "length", field="x") == pytest.approx(2.5, rel=1e-12)
    assert parse_quantity("-0.5E-1 m", "length", field="x") == pytest.approx(-0.05, rel=1e-12)


def test_an_amount_per_unit_reads_with_a_leading_slash():
    # "3500 / m**2" is 3500 per square metre; 1 ft = 0.3048 m exactly (NIST SP 811, Appendix B).
    from isolation.units import parse_quantity, split_quantity

    assert split_quantity("3500 / m**2") == (3500.0, "1/ m**2")
    assert parse_quantity("325 / ft**2", "per_area", field="cost") == pytest.approx(325 / 0.3048**2, rel=1e-12)
    with pytest.raises(ValueError, match="cost"):
        parse_quantity("/ m**2", "per_area", field="cost")


def test_mass_message_example_uses_the_us_mass_unit():
    # The allowed-input example names the bare US mass unit (kip s2/in), not another one.
    with pytest.raises(InputError) as caught:
        parse_quantity("3 m", "mass", field="building.mass")
    assert "kip*s**2/in" in str(caught.value) and "kip*s**2/ft" not in str(caught.value)


def test_pint_definitions_cache_is_one_folder_per_pint_installation(monkeypatch, tmp_path):
    # Two virtual environments must not share pint's parsed-definitions cache: an entry written
    # by one names files of its own installation (common practice: a cache per installation).
    from types import SimpleNamespace

    from isolation import units

    monkeypatch.setenv("XDG_CACHE_HOME", str(tmp_path))
    first = units._pint_cache(SimpleNamespace(__file__="/env-a/pint/__init__.py", __version__="0.25"))
    second = units._pint_cache(SimpleNamespace(__file__="/env-b/pint/__init__.py", __version__="0.25"))
    assert first != second
    assert first.startswith(str(tmp_path / "isolation")) and second.startswith(str(tmp_path / "isolation"))
    assert units._pint_cache(SimpleNamespace(__file__="/env-a/pint/__init__.py", __version__="0.25")) == first
