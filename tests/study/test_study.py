"""Study files: loading, unit conversion and validation (isolation.study).

Expected values are the numbers written in the example files themselves
(inputs, not outputs of the code) converted with NIST SP 811 factors
(1 in = 0.0254 m, 1 ft = 0.3048 m, 1 kip = 4.4482216152605 kN,
1 psi = 6.894757 kPa). Every validation test checks that the message names
the key path, the value and what is allowed.
"""

import copy
import math
import tomllib
from pathlib import Path

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from isolation.errors import InputError
from isolation.study import StudyError, apply_overrides, load_study, parse_study

ROOT = Path(__file__).resolve().parents[2]
DEMO = ROOT / "examples" / "demo_study.toml"
US = ROOT / "examples" / "pendulum_vs_rubber_study.toml"
SOFT = ROOT / "examples" / "soft_site_study.toml"
INCH, FOOT, KIP, PSI = 0.0254, 0.3048, 4.4482216152605, 6.894757  # NIST SP 811


def demo_mapping() -> dict:
    with DEMO.open("rb") as handle:
        return tomllib.load(handle)


def problems_of(mapping, **kwargs) -> list[str]:
    with pytest.raises(StudyError) as caught:
        parse_study(mapping, source="test.toml", base_dir=ROOT / "examples", **kwargs)
    assert isinstance(caught.value, InputError)  # the CLI maps InputError to exit 2
    return caught.value.problems


def test_demo_study_loads_in_si():
    study = load_study(DEMO)
    assert study.project.name == "Venhollow Emergency Communications Centre"
    assert study.project.date == "2026-12-01"
    assert study.basis == "asce7" and study.units == "SI"
    assert (study.site.sms, study.site.sm1, study.site.long_period) == (1.5, 0.8, 8.0)
    assert study.building.storeys == 4
    assert study.building.floor_weights == (10500.0, 10500.0, 10500.0, 8200.0)
    assert study.building.height == pytest.approx(16.5)  # 4.5 + 3 x 4.0 m from the file
    assert study.building.fixed_base_period is None
    fp, lrb = study.alternatives
    assert fp.bearings[0].properties["radius"] == 3.0
    assert lrb.bearings[0].properties["layer_thickness"] == pytest.approx(0.008)   # "8 mm"
    assert lrb.bearings[0].properties["shear_modulus"] == pytest.approx(400.0)     # "0.4 MPa" in kPa
    # Equal share (arithmetic on the file's numbers): (12000 + 3 x 10500 + 8200) / 30 kN.
    assert fp.bearings[0].axial_load == pytest.approx(51700.0 / 30.0)
    assert study.wind_base_shear == 650.0
    assert study.analysis.suite_size == 7 and study.analysis.time_step == 0.005


def test_us_study_converts_every_quantity():
    study = load_study(US)
    assert study.units == "US"
    b = study.building
    assert b.floor_weights[0] == pytest.approx(2300 * KIP)
    assert b.storey_heights == pytest.approx((15 * FOOT, 13 * FOOT, 13 * FOOT))
    assert b.plan_length == pytest.approx(150 * FOOT)
    fp, lrb = study.alternatives
    assert fp.bearings[0].properties["radius"] == pytest.approx(88 * INCH)
    assert fp.moat == pytest.approx(30 * INCH)
    assert lrb.bearings[0].properties["shear_modulus"] == pytest.approx(60 * PSI)
    assert study.wind_base_shear == pytest.approx(180 * KIP)


def test_single_value_is_used_for_every_storey():
    study = load_study(SOFT)
    assert study.building.floor_weights == (5200.0,) * 6


def test_to_dict_is_plain_json():
    import json

    data = load_study(DEMO).to_dict()
    assert json.loads(json.dumps(data)) == data
    assert data["alternatives"][0]["bearings"][0]["properties"]["friction"] == 0.05


REQUIRED = [
    ("project", "name"), ("project", "client"), ("project", "prepared_by"), ("project", "revision"),
    ("project", "date"), ("code", "basis"), ("site", "sms"), ("site", "sm1"), ("site", "site_class"),
    ("building", "storeys"), ("building", "floor_weights"), ("building", "base_weight"),
    ("building", "storey_heights"), ("building", "lateral_system"), ("building", "response_modification"),
    ("building", "plan_length"), ("building", "plan_width"),
    ("alternative", 0, "name"), ("alternative", 0, "bearings"),
    ("alternative", 0, "bearings", 0, "type"), ("alternative", 0, "bearings", 0, "count"),
    ("alternative", 0, "bearings", 0, "radius"), ("alternative", 0, "bearings", 0, "friction"),
    ("alternative", 1, "bearings", 0, "outer_diameter"), ("alternative", 1, "bearings", 0, "lead_diameter"),
    ("alternative", 1, "bearings", 0, "layer_thickness"), ("alternative", 1, "bearings", 0, "layers"),
    ("alternative", 1, "bearings", 0, "shear_modulus"),
    ("project",), ("site",), ("building",), ("alternative",),
]


def _path_text(path) -> str:
    text = ""
    for part in path:
        text += f"[{part}]" if isinstance(part, int) else (f".{part}" if text else part)
    return text


@pytest.mark.parametrize("path", REQUIRED, ids=_path_text)
def test_every_required_key_missing_is_reported(path):
    mapping = demo_mapping()
    node = mapping
    for part in path[:-1]:
        node = node[part]
    del node[path[-1]]
    problems = problems_of(mapping)
    expected = f"{_path_text(path)} is missing: must be"
    assert any(p.startswith(expected) for p in problems), problems


@pytest.mark.parametrize("override, words", [
    ({"building.storeys": "four"}, ["building.storeys = 'four'", "whole number"]),
    ({"building.storeys": 4.0}, ["building.storeys = 4.0", "whole number"]),
    ({"alternative.0.bearings.0.friction": "0.05"}, ["friction = '0.05'", "a number"]),
    ({"site.near_fault": "no"}, ["site.near_fault = 'no'", "true or false"]),
    ({"project.revision": 1.5}, ["project.revision = 1.5", "text"]),
    ({"project.date": "1st of December"}, ["project.date = '1st of December'", "date"]),
    ({"site": 3}, ["site = 3", "table"]),
    ({"alternative": {"name": "x"}}, ["alternative = ", "tables"]),
    ({"building.floor_weights": ["1000 kN"] * 3}, ["building.floor_weights", "list of 4", "3 values"]),
    ({"analysis.seed": -3}, ["analysis.seed = -3", "whole number"]),
])
def test_wrong_types_are_reported(override, words):
    problems = problems_of(apply_overrides(demo_mapping(), override))
    text = " | ".join(problems)
    for word in words:
        assert word in text, text


@pytest.mark.parametrize("key, value, found", [
    ("alternative[0].bearings[0].radius", "12 kN", "force"),
    ("alternative[1].bearings[0].shear_modulus", "0.4 m", "length"),
    ("building.base_weight", "12 m", "length"),
    ("building.storey_heights", "4 kN", "force"),
    ("analysis.duration", "30 m", "length"),
    ("alternative[0].moat", "0.75 s", "time"),
])
def test_wrong_units_name_the_key_path(key, value, found):
    problems = problems_of(apply_overrides(demo_mapping(), {key: value}))
    assert len(problems) == 1
    assert problems[0].startswith(key) and repr(value) in problems[0]
    assert f"a {found} was given" in problems[0]


@pytest.mark.parametrize("key", [
    "colour", "project.budget", "code.edition", "site.vs30", "building.roof_type",
    "alternative.0.cost", "alternative.0.bearings.0.colour", "alternative.0.property_factors.middle",
    "analysis.solver", "wind.direction",
])
def test_unknown_keys_are_errors(key):
    problems = problems_of(apply_overrides(demo_mapping(), {key: 1}))
    shown = key.replace(".0.", "[0].").replace(".0", "[0]")
    assert any(p.startswith(f"{shown} is not a known key") for p in problems), problems


@pytest.mark.parametrize("key, value, allowed", [
    ("site.sms", -1.0, "(0, 5]"),
    ("site.sms", 0.0, "(0, 5]"),
    ("site.sm1", float("nan"), "(0, 5]"),
    ("site.site_class", "G", "'A'"),
    ("alternative.0.bearings.0.friction", 0.5, "(0, 0.3]"),
    ("alternative.0.bearings.0.radius", "-2 m", "[0.3, 20]"),
    ("alternative.0.bearings.0.count", 0, "[1, 2000]"),
    ("alternative.1.bearings.0.layers", 0, "[1, 200]"),
    ("alternative.0.property_factors.lower", 1.2, "[0.3, 1]"),
    ("alternative.0.property_factors.upper", 0.9, "[1, 3]"),
    ("analysis.suite_size", 9, "7, 11"),
    ("analysis.time_step", "0.1 s", "[0.001, 0.02]"),
    ("building.response_modification", 0.5, "[1, 8]"),
    ("code.basis", "nzs", "'asce7', 'eurocode'"),
    ("units", "metric", "'SI', 'US'"),
])
def test_out_of_range_values_name_value_and_range(key, value, allowed):
    problems = problems_of(apply_overrides(demo_mapping(), {key: value}))
    assert len(problems) == 1, problems
    shown = key.replace(".0.", "[0].").replace(".1.", "[1].")
    assert problems[0].startswith(f"{shown} = ")
    assert "is not allowed: must be" in problems[0] and allowed in problems[0]


def test_cross_checks_between_keys():
    problems = problems_of(apply_overrides(demo_mapping(), {
        "alternative.1.bearings.0.lead_diameter": "0.9 m",    # larger than the 0.8 m outer diameter
        "alternative.0.bearings.0.slider_height": "1.5 m",   # more than... within range but < radius 3 m: fine
        "building.plan_width": "50 m",                      # wider than the 42 m length
        "alternative.1.name": "Friction pendulum",          # duplicate name
    }))
    text = " | ".join(problems)
    assert "lead_diameter = 0.9 m is not allowed: must be < outer_diameter = 0.8 m" in text
    assert "plan_width = 50 m is not allowed" in text
    assert "must be unique" in text
    assert "slider_height" not in text
    assert len(problems) == 3


def test_all_problems_are_reported_at_once():
    mapping = apply_overrides(demo_mapping(), {
        "site.sms": -1, "building.storeys": "four", "alternative.0.bearings.0.radius": "12 kN",
        "wind.base_shear": "650 m", "colour": "red",
    })
    problems = problems_of(mapping)
    assert len(problems) == 5
    with pytest.raises(StudyError, match="5 problems"):
        parse_study(mapping, source="x.toml")


def test_axial_loads_must_be_given_for_all_groups_or_none():
    mapping = demo_mapping()
    group = copy.deepcopy(mapping["alternative"][0]["bearings"][0])
    group["axial_load"] = "1700 kN"
    mapping["alternative"][0]["bearings"].append(group)
    problems = problems_of(mapping)
    assert any("axial_load is given for some bearing groups" in p for p in problems)


def test_axial_loads_far_from_the_weight_are_refused():
    # 30 bearings x 1700 kip = 227 000 kN against a 51 700 kN building: a unit slip.
    problems = problems_of(apply_overrides(demo_mapping(), {"alternative.0.bearings.0.axial_load": "1700 kip"}))
    assert any("add up to" in p and "check the units" in p for p in problems)


def test_tabulated_spectrum_file_is_read_relative_to_the_study(tmp_path):
    (tmp_path / "data").mkdir()
    (tmp_path / "data" / "site.csv").write_text("period_s,sa_g\n0.0,0.6\n0.2,1.5\n1.0,0.8\n6.0,0.12\n")
    mapping = demo_mapping()
    for key in ("sms", "sm1", "long_period"):
        del mapping["site"][key]
    mapping["site"]["spectrum_file"] = "data/site.csv"
    study = parse_study(mapping, source=str(tmp_path / "study.toml"))
    assert study.site.spectrum_periods == (0.0, 0.2, 1.0, 6.0)
    assert study.site.spectrum_values == (0.6, 1.5, 0.8, 0.12)
    assert Path(study.site.spectrum_file) == tmp_path / "data" / "site.csv"


@pytest.mark.parametrize("content, words", [
    (None, ["must name an existing CSV file"]),
    ("period,sa\n0.1,0.5\n0.2,abc\n", ["line 3", "two numbers"]),
    ("0.5,1.0\n0.2,0.8\n", ["strictly increasing"]),
    ("0.5,1.0\n", ["at least 2 rows"]),
])
def test_bad_spectrum_files(tmp_path, content, words):
    if content is not None:
        (tmp_path / "site.csv").write_text(content)
    mapping = demo_mapping()
    for key in ("sms", "sm1", "long_period"):
        del mapping["site"][key]
    mapping["site"]["spectrum_file"] = "site.csv"
    with pytest.raises(StudyError) as caught:
        parse_study(mapping, source=str(tmp_path / "study.toml"))
    text = str(caught.value)
    assert "site.spectrum_file" in text
    for word in words:
        assert word in text


def test_spectrum_file_and_code_parameters_together_are_refused(tmp_path):
    (tmp_path / "site.csv").write_text("0.1,1.0\n2.0,0.4\n")
    mapping = apply_overrides(demo_mapping(), {"site.spectrum_file": "site.csv"})
    with pytest.raises(StudyError) as caught:
        parse_study(mapping, source=str(tmp_path / "study.toml"))
    assert "site.sms = 1.5 is not allowed together with site.spectrum_file" in str(caught.value)


def test_eurocode_site_keys():
    # gamma_I = 1.2: importance class III, EN 1998-1 §4.2.5 (from memory); the demo's 1.5 is an ASCE 7 I_e.
    mapping = apply_overrides(demo_mapping(), {"code.basis": "eurocode", "building.importance": 1.2})
    site = mapping["site"]
    for key in ("sms", "sm1", "long_period", "s1", "site_class"):
        del site[key]
    site.update(ag=0.3, ground_type="B", spectrum_type=1)
    study = parse_study(mapping, source="ec.toml")
    assert (study.site.ag, study.site.ground_type, study.site.spectrum_type) == (0.3, "B", 1)
    site["ground_type"] = "F"   # EN 1998-1 Table 3.1 has A-E (and S1, S2 for special studies)
    problems = problems_of(mapping)
    assert problems == ["site.ground_type = 'F' is not allowed: must be one of 'A', 'B', 'C', 'D', 'E'"]


def eurocode_mapping(importance):
    mapping = apply_overrides(demo_mapping(), {"code.basis": "eurocode", "building.importance": importance})
    for key in ("sms", "sm1", "long_period", "s1", "site_class"):
        del mapping["site"][key]
    mapping["site"].update(ag=0.3, ground_type="B", spectrum_type=1)
    return mapping


@pytest.mark.parametrize("importance", [0.8, 1.0, 1.2, 1.4])
def test_eurocode_importance_classes_are_accepted(importance):
    # EN 1998-1 §4.2.5 (from memory): recommended gamma_I 0.8, 1.0, 1.2, 1.4 for classes I-IV.
    assert parse_study(eurocode_mapping(importance), source="ec.toml").building.importance == importance


@pytest.mark.parametrize("importance", [1.5, 0.7])
def test_eurocode_importance_outside_gamma_i_range_is_bad_input(importance):
    # building.importance is gamma_I for a Eurocode basis: 0.8-1.4 (EN 1998-1 §4.2.5, from memory),
    # so the ASCE 7 I_e = 1.5 of an essential facility (ASCE/SEI 7-16 Table 1.5-2) is not allowed.
    problems = problems_of(eurocode_mapping(importance))
    assert len(problems) == 1, problems
    assert problems[0].startswith(f"building.importance = {importance:g} is not allowed: must be")
    assert "[0.8, 1.4]" in problems[0] and "gamma_I" in problems[0] and "EN 1998-1" in problems[0]


def test_asce7_importance_keeps_its_range():
    # ASCE/SEI 7-16 Table 1.5-2: I_e is 1.0, 1.25 or 1.5 (risk categories I-IV); 1.6 and 0.9 are not.
    for allowed in (1.0, 1.25, 1.5):
        assert parse_study(apply_overrides(demo_mapping(), {"building.importance": allowed}),
                           source="t.toml").building.importance == allowed
    for value in (1.6, 0.9):
        problems = problems_of(apply_overrides(demo_mapping(), {"building.importance": value}))
        assert problems == [f"building.importance = {value:g} is not allowed: must be a number in [1, 1.5] [-] "
                            "for code.basis = 'asce7' (I_e of ASCE/SEI 7-16 Table 1.5-2)"]


def test_long_period_must_exceed_ts():
    # ASCE/SEI 7-16 §11.4.6: T_S = S_D1/S_DS < T_L for the two-period shape.
    problems = problems_of(apply_overrides(demo_mapping(), {"site.sm1": 4.0, "site.sms": 1.0, "site.long_period": 2.0}))
    assert any(p.startswith("site.long_period = 2 s is not allowed: must exceed T_S") for p in problems)


def test_overrides_use_dotted_or_bracketed_paths_and_copy():
    original = demo_mapping()
    changed = apply_overrides(original, {"site.sms": 1.2, "alternative[1].bearings[0].layers": 30,
                                         "alternative.0.bearings.0.radius": "3.5 m"})
    assert changed["site"]["sms"] == 1.2
    assert changed["alternative"][1]["bearings"][0]["layers"] == 30
    assert changed["alternative"][0]["bearings"][0]["radius"] == "3.5 m"
    assert original["site"]["sms"] == 1.5 and original["alternative"][1]["bearings"][0]["layers"] == 32


@pytest.mark.parametrize("override, words", [
    ({"alternative.5.name": "x"}, ["alternative.5", "from 0 to 1"]),
    ({"site.sms.value": 1}, ["'site.sms' is a value"]),
    ({"site..sms": 1}, ["dotted key path"]),
    ({"alternative.first.name": "x"}, ["whole number"]),
])
def test_bad_override_paths(override, words):
    with pytest.raises(InputError) as caught:
        apply_overrides(demo_mapping(), override)
    for word in words:
        assert word in str(caught.value)


def test_missing_and_malformed_files(tmp_path):
    with pytest.raises(StudyError, match="does not exist"):
        load_study(tmp_path / "nothing.toml")
    bad = tmp_path / "bad.toml"
    bad.write_text("[site\nsms = 1\n")
    with pytest.raises(StudyError, match="not valid TOML"):
        load_study(bad)


@settings(max_examples=50, deadline=None)
@given(st.floats(allow_nan=True, allow_infinity=True, width=64))
def test_any_friction_is_either_kept_or_refused_by_name(value):
    # Allowed band (0, 0.3] for the design coefficient of friction: the
    # 0.03-0.12 of common practice with room for high-friction materials.
    mapping = apply_overrides(demo_mapping(), {"alternative.0.bearings.0.friction": value})
    if math.isfinite(value) and 0.0 < value <= 0.3:
        study = parse_study(mapping, source="x.toml")
        assert study.alternatives[0].bearings[0].properties["friction"] == value
    else:
        problems = problems_of(mapping)
        assert len(problems) == 1
        assert problems[0].startswith("alternative[0].bearings[0].friction = ")


def test_lead_core_convention_is_read_and_checked():
    # lead_rubber.lead_core: "hole" (default, Constantinou, Kartoum & Kelly 1992 hole factor) or "filled".
    mapping = demo_mapping()
    group = next(g for a in mapping["alternative"] for g in a["bearings"] if g["type"] == "lead_rubber")
    study = parse_study(mapping, source="test.toml", base_dir=ROOT / "examples")
    spec = next(g for a in study.alternatives for g in a.bearings if g.type == "lead_rubber")
    assert "lead_core" not in spec.properties  # default left to the bearing: "hole"
    group["lead_core"] = "filled"
    study = parse_study(mapping, source="test.toml", base_dir=ROOT / "examples")
    spec = next(g for a in study.alternatives for g in a.bearings if g.type == "lead_rubber")
    assert spec.properties["lead_core"] == "filled"
    group["lead_core"] = "solid"
    assert any("lead_core" in p and "'hole'" in p for p in problems_of(mapping))


def test_yielding_building_keys_default_and_checks():
    # Older study files stay valid: the comparison building yields at its code-design strengths.
    study = parse_study(demo_mapping(), source="test.toml", base_dir=ROOT / "examples")
    b = study.building
    assert (b.fixed_base_model, b.overstrength, b.storey_strengths, b.p_delta) == ("yielding", None, (), True)
    assert b.hardening == 0.03 and b.design_level == "high"
    mapping = demo_mapping()
    n = mapping["building"]["storeys"]
    mapping["building"].update(fixed_base_model="elastic", overstrength=2.0, storey_strengths=["5000 kN"] * n,
                               hardening=0.05, p_delta=False)
    b = parse_study(mapping, source="test.toml", base_dir=ROOT / "examples").building
    assert (b.fixed_base_model, b.overstrength, b.hardening, b.p_delta) == ("elastic", 2.0, 0.05, False)
    assert b.storey_strengths == (5000.0,) * n
    mapping["building"].update(fixed_base_model="plastic", overstrength=0.5, storey_strengths=["5000 kN"] * (n + 1))
    problems = problems_of(mapping)
    assert any("building.fixed_base_model" in p and "'yielding'" in p for p in problems)
    assert any("building.overstrength = 0.5" in p for p in problems)
    assert any("building.storey_strengths" in p for p in problems)


# Issue 15: percent only for ratios; text without control characters; plausible ranges.
def _demo_with(overrides):
    from isolation.study import apply_overrides, parse_study, read_study_mapping

    demo = Path(__file__).resolve().parents[2] / "examples" / "demo_study.toml"
    return parse_study(apply_overrides(read_study_mapping(demo), overrides), source=str(demo))


def test_a_percent_is_a_ratio_only():
    study = _demo_with({"analysis.damping": "5 %", "alternative.0.bearings.0.friction": "6 %"})
    assert study.analysis.damping == pytest.approx(0.05, rel=1e-12)       # 5 % = 5/100 (definition)
    assert study.alternatives[0].bearings[0].properties["friction"] == pytest.approx(0.06, rel=1e-12)
    with pytest.raises(StudyError, match=r"alternative\[0\].bearings\[0\].radius = '50 %'.*ratio"):
        _demo_with({"alternative.0.bearings.0.radius": "50 %"})
    with pytest.raises(StudyError, match=r"analysis.damping = '50 %'.*percent is divided by 100"):
        _demo_with({"analysis.damping": "50 %"})


@pytest.mark.parametrize("key, value, words", [
    ("building.floor_weights", 1e300, ["building.floor_weights", "2e+06"]),
    ("building.base_weight", "1e300 kN", ["building.base_weight", "2e+06"]),
    ("wind.base_shear", 1e300, ["wind.base_shear", "1e+06"]),
    ("alternative.0.bearings.0.axial_load", "1e300 kN", ["axial_load", "200000"]),
    ("project.name", "a\x00b", ["project.name", "control"]),
    ("project.client", "x" * 500, ["project.client", "200 characters"]),
])
def test_values_far_outside_physics_are_refused_naming_the_range(key, value, words):
    with pytest.raises(StudyError) as caught:
        _demo_with({key: value})
    for word in words:
        assert word in str(caught.value)
