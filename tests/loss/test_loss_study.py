"""Loss study in a study file and in a run: [cost], [hazard], [loss]; results.json loss figures.

Outside checks: unit conversion 1 ft = 0.3048 m (exact by definition), so 325 per ft2 is
325 / 0.09290304 per m2; the hazard curve's Sa points are divided by the site spectrum's
Sa(1 s) = S_M1 (ASCE/SEI 7-16 §11.4.6, 1/T branch at T = 1 s when T_S < 1 s).
"""

from pathlib import Path

import numpy as np
import pytest

from isolation.app.cli import main
from isolation.study import StudyError, apply_overrides, parse_study, read_study_mapping
from isolation.study.runner import StudyResults, run_study

ROOT = Path(__file__).resolve().parents[2]
DEMO = ROOT / "examples" / "demo_study.toml"


def _study(overrides=None, drop=()):
    mapping = read_study_mapping(DEMO)
    for key in drop:
        mapping.pop(key, None)
    if overrides:
        mapping = apply_overrides(mapping, overrides)
    return parse_study(mapping, source=str(DEMO))


def test_no_loss_tables_gives_marked_demo_defaults():
    study = _study(drop=("cost", "hazard", "loss"))
    cost = study.loss.cost
    assert "replacement_cost_per_area" in cost.defaults and "discount_rate" in cost.defaults
    assert study.loss.options.enabled and study.loss.hazard.points == ()


def test_units_of_cost_inputs():
    study = _study({"units": "SI", "cost.replacement_cost_per_area": "325 / ft**2", "cost.moat_per_length": "760 / ft",
                    "cost.storey_areas": ["1176 m**2", "12000 ft**2", 1176, 1176]})
    cost = study.loss.cost
    assert cost.replacement_cost_per_area == pytest.approx(325 / 0.3048**2)
    assert cost.moat_per_length == pytest.approx(760 / 0.3048)
    assert cost.storey_areas[1] == pytest.approx(12000 * 0.3048**2)
    assert "replacement_cost_per_area" not in cost.defaults


@pytest.mark.parametrize("overrides, words", [
    ({"cost.discount_rate": 0.5}, "cost.discount_rate = 0.5 is not allowed"),
    ({"cost.replacement_cost_per_area": "3 m"}, "cost.replacement_cost_per_area"),
    ({"cost.utilities": -5}, "cost.utilities = -5 is not allowed"),
    ({"cost.bearing_cost.lead_rubber": [1, 2]}, "cost.bearing_cost.lead_rubber"),
    ({"cost.tip": 3}, "cost.tip is not a known key"),
    ({"hazard.points": [[0.2, 0.01], [0.1, 0.001]]}, "hazard.points"),
    ({"hazard.points": [[0.2, 0.01], [0.4, "x"]]}, "hazard.points[1]"),
    ({"hazard.points": [[0.2, 0.01]]}, "hazard.points"),
    ({"hazard.mce_rate": 4e-4}, "not allowed together with hazard.points"),
    ({"loss.levels": [0.5, 1.0]}, "loss.levels"),
    ({"loss.levels": [1.0, 0.5, 0.25, 1.5]}, "loss.levels"),
    ({"loss.occupancy": "castle"}, "loss.occupancy"),
])
def test_bad_loss_inputs_name_key_value_and_what_is_allowed(overrides, words):
    with pytest.raises(StudyError) as error:
        _study(overrides)
    assert words in str(error.value)


def test_rates_must_fall_with_intensity():
    with pytest.raises(StudyError, match="hazard.design_rate"):
        _study({"hazard.mce_rate": 1e-3, "hazard.design_rate": 5e-4}, drop=("hazard",))


def test_cli_check_exits_2_on_bad_costs(tmp_path, capsys):
    text = DEMO.read_text(encoding="utf-8").replace("discount_rate = 0.03", "discount_rate = 3")
    path = tmp_path / "study.toml"
    path.write_text(text, encoding="utf-8")
    assert main(["check", str(path)]) == 2
    err = capsys.readouterr().err
    assert "cost.discount_rate" in err and "Traceback" not in err and len(err.strip().splitlines()) == 1


@pytest.fixture(scope="module")
def demo_run():
    return run_study(_study(), quick=True)


def test_results_hold_expected_annual_loss_for_fixed_base_and_alternatives(demo_run, tmp_path):
    path = demo_run.save(tmp_path / "results.json")
    data = StudyResults.from_dict(__import__("json").loads(path.read_text())).to_dict()
    cases = [data["fixed_base"]["loss"]] + [a["loss"] for a in data["alternatives"]]
    for loss in cases:
        assert loss["expected_annual_loss"] > 0 and loss["expected_loss_mce"] > 0
        assert loss["expected_annual_downtime"] >= 0
        bands = loss["loss_mce"]
        assert bands["p10"] <= bands["p50"] <= bands["p90"]
        means = [lv["loss"]["mean"] for lv in loss["levels"]]
        assert means[-1] > means[0]
    assert data["loss"]["currency"] == "USD"
    assert len(data["loss"]["levels"]) == 5
    for alternative in data["alternatives"]:
        econ = alternative["loss"]["economics"]
        assert econ["net_premium"] == pytest.approx(econ["isolation_cost"] - econ["superstructure_saving"])


def test_points_become_mce_fractions_of_the_site_spectrum(demo_run):
    model = demo_run.loss["hazard"]["model"]
    # Sa(1 s) of the site spectrum is S_M1 = 0.80 g for the demo (T_S = 0.53 s < 1 s).
    assert np.allclose(model["intensities"], np.array([0.1, 0.2, 0.4, 0.533, 0.8, 1.2]) / 0.80)


def test_loss_can_be_switched_off():
    study = _study({"loss.enabled": False})
    result = run_study(study, quick=True)
    assert result.alternatives[0].loss == {} and result.fixed_base["loss"] == {}
    assert "loss" not in result.run["timings"]


def test_eurocode_basis_uses_the_design_action_and_k_3():
    # EN 1998-1 §2.1: reference return period 475 years (10 % in 50 years) for the design action;
    # §2.1(4) note: exponent k of the order of 3.
    mapping = apply_overrides(read_study_mapping(DEMO), {"code.basis": "eurocode", "building.importance": 1.4})
    for key in ("sms", "sm1", "long_period", "s1", "site_class"):
        del mapping["site"][key]
    mapping["site"].update(ag=0.3, ground_type="B", spectrum_type=1)
    del mapping["hazard"]
    mapping["alternative"] = mapping["alternative"][:1]
    result = run_study(parse_study(mapping, source="eurocode"), quick=True)
    model = result.loss["hazard"]["model"]
    assert model["k"] == 3.0 and model["k0"] == pytest.approx(-np.log(0.9) / 50)
    fixed = result.fixed_base["loss"]
    assert (fixed["design_level"], fixed["mce_level"]) == (1.0, 1.5)
    assert result.alternatives[0].loss["expected_annual_loss"] > 0


def test_levels_must_span_design_level_and_mce():
    with pytest.raises(StudyError, match=r"loss.levels = \[0.8, 1.0, 1.2, 1.5\] is not allowed: must reach from"):
        _study({"loss.levels": [0.8, 1.0, 1.2, 1.5]})
    with pytest.raises(StudyError, match="at least 1 x the site spectrum"):
        _study({"loss.levels": [0.2, 0.4, 0.6, 0.8]})


def test_bearing_cost_accepts_every_bearing_type_and_other():
    study = _study({"cost.bearing_cost.high_damping_rubber": [1, 2, 3], "cost.bearing_cost.other": [4, 5, 6]})
    assert study.loss.cost.bearing_cost["high_damping_rubber"] == (1.0, 2.0, 3.0)
    assert study.loss.cost.bearing_cost["other"] == (4.0, 5.0, 6.0)
    with pytest.raises(StudyError, match="cost.bearing_cost.castle is not a known key"):
        _study({"cost.bearing_cost.castle": [1, 2, 3]})
