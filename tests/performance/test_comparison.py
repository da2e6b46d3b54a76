"""The yielding comparison building in a study run, its tables and figure.

Outside checks:
* ASCE/SEI 7-16 §12.8.1 / §12.8.3 (V = C_s W distributed by C_vx) and Table 12.2-1 (Omega_0 of the
  system), from memory: the storey strengths of the fixed-base model are Omega_0 times the design
  storey shears, whose first-storey value is V.
* ASCE/SEI 7-16 §17.5.4.2 / §17.5.5: the isolated superstructure is designed for V_s; its first-storey
  design shear is V_s.
* Strength caps force (elastoplastic systems, e.g. Chopra, Dynamics of Structures, Ch. 7): a storey
  that yields carries at most its yield shear plus the hardening share, so the yielding building's
  first-storey shear and floor accelerations stay below those of the same building kept elastic when
  the elastic demand exceeds the strength several times.
"""

import json
from pathlib import Path

import numpy as np
import pytest

from isolation.output import plots, tables
from isolation.performance.comparison import fixed_base_comparison, isolated_superstructure
from isolation.study import load_study, parse_study, read_study_mapping
from isolation.study.runner import fixed_base_period, run_study, site_spectrum, superstructure

ROOT = Path(__file__).resolve().parents[2]
DEMO = ROOT / "examples" / "demo_study.toml"


@pytest.fixture(scope="module")
def demo():
    return run_study(load_study(DEMO), quick=True)


def test_fixed_base_model_yields_at_omega_times_design_shear():
    study = load_study(DEMO)
    spectrum = site_spectrum(study)
    t_fb, _ = fixed_base_period(study)
    comparison = fixed_base_comparison(study, spectrum, superstructure(study), t_fb)
    design = comparison.design
    # Demo: braced frame with R = 6 -> special steel concentrically braced frame, Omega_0 = 2, C_d = 5.
    assert comparison.factors.overstrength == 2.0
    assert comparison.factors.deflection_amplification == 5.0
    assert design.storey_shears[0] == pytest.approx(design.base_shear)
    assert design.base_shear == pytest.approx(design.coefficient * sum(study.building.floor_weights))
    assert comparison.yielding
    assert comparison.building.yield_shears == pytest.approx(tuple(2.0 * v for v in design.storey_shears))
    assert comparison.building.p_delta and comparison.building.hardening == 0.03
    assert comparison.elastic.yield_shears is None


def test_elastic_option_and_given_strengths():
    mapping = read_study_mapping(DEMO)
    n = mapping["building"]["storeys"]
    mapping["building"]["fixed_base_model"] = "elastic"
    study = parse_study(mapping, source="demo", base_dir=DEMO.parent)
    spectrum, (t_fb, _) = site_spectrum(study), fixed_base_period(study)
    comparison = fixed_base_comparison(study, spectrum, superstructure(study), t_fb)
    assert not comparison.yielding and comparison.building.yield_shears is None
    mapping["building"].update(fixed_base_model="yielding", storey_strengths=["9000 kN"] * n)
    study = parse_study(mapping, source="demo", base_dir=DEMO.parent)
    comparison = fixed_base_comparison(study, spectrum, superstructure(study), t_fb)
    assert comparison.building.yield_shears == (9000.0,) * n and comparison.design.given


def test_isolated_superstructure_from_v_s(demo):
    study = load_study(DEMO)
    system, sets, report = demo.live["designs"][demo.alternatives[0].name]
    building, design = isolated_superstructure(study, report, superstructure(study))
    assert design.storey_shears[0] == pytest.approx(report.value("V_s"))
    assert building.yield_shears == pytest.approx(tuple(2.0 * v for v in design.storey_shears))


def test_run_compares_with_the_yielding_fixed_base(demo):
    fixed, elastic = demo.live["histories"]["fixed"], demo.live["histories"]["fixed_elastic"]
    strengths = np.asarray(demo.live["comparison"].design.yield_shears)
    hardening = 0.03
    k = np.asarray(demo.live["comparison"].building.stiffnesses)
    for alternative in demo.alternatives:
        s, ind = alternative.history["summary"], alternative.history["indicators"]
        # Summary ratios use the yielding fixed base; the elastic one is kept as a second view.
        assert s["floor_acceleration_fixed"] == pytest.approx(ind["fixed"]["floor_acceleration_max"])
        assert s["floor_acceleration_fixed_elastic"] == pytest.approx(ind["fixed_elastic"]["floor_acceleration_max"])
        assert s["floor_acceleration_ratio"] > s["floor_acceleration_ratio_elastic"]
        assert ind["fixed"]["ductility_max"] > 1.0  # the code-designed building yields under MCE_R motions
        assert ind["fixed"]["residual_drift_max"] >= 0.0
        assert s["design_shear_isolated"] == pytest.approx(alternative.quantities["superstructure_shear"])
    # Strength caps the yielding building's response (see module notes): first-storey spring force
    # at most V_y + alpha k (u - u_y) with the peak drift; floor acceleration below the elastic one.
    peak_elastic = elastic.peaks()["storey_shear"].mean(axis=0)
    assert np.all(peak_elastic[0] > 2.0 * strengths[0])
    peak_yielding = fixed.peaks()["storey_shear"].mean(axis=0)
    assert peak_yielding[0] < 0.6 * peak_elastic[0]
    assert (fixed.peaks()["floor_acceleration"].mean(axis=0).max()
            < elastic.peaks()["floor_acceleration"].mean(axis=0).max())
    drift = fixed.peaks()["drift"].mean(axis=0)
    assert np.all(peak_yielding < strengths + hardening * k * drift + 0.35 * strengths)  # damping forces on top
    json.dumps(demo.to_dict(), allow_nan=False)


def test_report_tables_and_figure(demo):
    design = tables.fixed_base_design_table(demo)
    assert len(design.rows) == 4 and "Table 12.2-1" in design.notes
    for alternative in demo.alternatives:
        response = tables.yielding_response_table(alternative)
        assert response.columns[1] == "Fixed base, code design" and "elastic" in response.columns[-1]
        damage = tables.damage_table(demo, alternative)
        assert {row[2] for row in damage.rows} <= {"none", "slight", "moderate", "extensive", "complete"}
        assert "S2M" in damage.notes or "S2L" in damage.notes  # braced frame, 4 storeys
        assert "\\begin{table}" in response._repr_latex_() or "tabular" in response._repr_latex_()
    cases = {"fixed": demo.live["histories"]["fixed"], **demo.live["histories"][demo.alternatives[0].name]}
    fig = plots.yielding_profiles(cases, {"fixed": demo.live["comparison"].design.yield_shears})
    assert len(fig.axes) == 3 and fig.axes[0].lines
    assert "code-designed" in tables.fixed_base_label(demo)
    assert "code-designed" in tables.summary_table(demo).notes


def test_study_results_json_carry_the_design_and_drift_check(demo):
    data = json.loads(json.dumps(demo.to_dict()))
    comparison = data["fixed_base"]["comparison"]
    assert comparison["yielding"] is True
    assert comparison["drift_check"]["limit"] == pytest.approx(0.010)  # demo I_e = 1.5: risk category IV
    assert len(comparison["design"]["yield_shears"]) == data["study"]["building"]["storeys"]
    assert data["fixed_base"]["damage_thresholds"]["building_type"] == "S2M"


def test_elastic_fixed_base_model_restores_the_elastic_comparison():
    mapping = read_study_mapping(DEMO)
    mapping["building"]["fixed_base_model"] = "elastic"
    mapping["alternative"] = mapping["alternative"][:1]
    results = run_study(parse_study(mapping, source="demo", base_dir=DEMO.parent), quick=True)
    s = results.alternatives[0].history["summary"]
    assert s["floor_acceleration_ratio"] == pytest.approx(s["floor_acceleration_ratio_elastic"])
    assert s["superstructure_shear_ratio"] == pytest.approx(s["superstructure_shear_ratio_elastic"])
    assert s["ductility_fixed"] is None and s["shear_over_strength_fixed"] is None
    assert results.fixed_base["comparison"]["yielding"] is False
    assert "elastic" in tables.fixed_base_label(results)
    columns = tables.yielding_response_table(results.alternatives[0]).columns
    assert columns[1:] == ("Fixed base, elastic", "Isolated, lower", "Isolated, upper")


def test_degrading_storey_law_is_passed_to_the_model():
    mapping = read_study_mapping(DEMO)
    mapping["building"]["storey_hysteresis"] = "clough"
    study = parse_study(mapping, source="demo", base_dir=DEMO.parent)
    comparison = fixed_base_comparison(study, site_spectrum(study), superstructure(study), fixed_base_period(study)[0])
    assert comparison.building.hysteresis == "clough"
    mapping["building"]["storey_hysteresis"] = "takeda"
    with pytest.raises(ValueError, match="storey_hysteresis"):
        parse_study(mapping, source="demo", base_dir=DEMO.parent)
