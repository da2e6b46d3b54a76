"""Typed stages of a study run (isolation.study.stages) and the results.json schema.

Outside checks:
* Friction pendulum, single concave: K_eff = W/R_eff + mu W/D, T = 2 pi sqrt(W/(K_eff g)),
  beta = (2/pi) mu/(mu + D/R_eff), R_eff = R - h (Zayas, Low & Mahin 1990; Naeim & Kelly 1999).
* D = g S_M1 T/(4 pi^2 B_M) on the 1/T branch, B_M by linear interpolation in ASCE/SEI 7-16
  Table 17.5-1 (tests/data/asce7_16_table_17_5_1.csv, from memory).
* results.json is validated with the general-purpose ``jsonschema`` library (PyPI) against
  the schema the package ships.
Other checks are derived arithmetic (ratios of given numbers), marked where they stand.
"""

import json
import math
from pathlib import Path

import jsonschema
import numpy as np
import pytest
from check_values import read

from isolation import GRAVITY
from isolation.errors import RunError
from isolation.study import load_study
from isolation.study.results import RESULTS_SCHEMA, StudyResults, results_schema
from isolation.study.runner import run_study
from isolation.study.stages import (
    NO_HISTORY,
    SCHEMA_VERSION,
    AlternativeDesign,
    DesignQuantities,
    HistorySummary,
    StudyDesign,
    design_study,
)

ROOT = Path(__file__).resolve().parents[2]
DEMO = ROOT / "examples" / "demo_study.toml"
_B_M = read("asce7_16_table_17_5_1.csv")  # ASCE/SEI 7-16 Table 17.5-1 (from memory), tests/data
B_TABLE = (_B_M.column("effective_damping"), _B_M.column("B_M"))


@pytest.fixture(scope="module")
def study():
    return load_study(DEMO)


@pytest.fixture(scope="module")
def design(study):
    return design_study(study)


@pytest.fixture(scope="module")
def demo(study):
    return run_study(study, quick=True, loss=False)


def _pendulum(weight, radius, friction, sm1):
    """Fixed point of the closed forms in the module docstring (independent of the package)."""
    d = 0.3
    for _ in range(500):
        k = weight / radius + friction * weight / d
        period = 2 * math.pi * math.sqrt(weight / (GRAVITY * k))
        beta = 2 / math.pi * friction / (friction + d / radius)
        d_new = GRAVITY * sm1 * period / (4 * math.pi**2 * float(np.interp(beta, *B_TABLE)))
        if abs(d_new - d) < 1e-10:
            break
        d = 0.5 * (d + d_new)
    return d, period, beta


def test_design_study_is_typed_and_matches_the_closed_form(design):
    assert isinstance(design, StudyDesign)
    assert [d.name for d in design.alternatives] == ["Friction pendulum", "Lead-rubber"]
    fp = design.alternatives[0]
    assert isinstance(fp, AlternativeDesign) and isinstance(fp.quantities, DesignQuantities)
    weight = 12000 + 3 * 10500 + 8200            # kN, from the study file
    d, period, beta = _pendulum(weight, 3.0 - 0.15, 0.05 * 0.85, 0.80)   # lower bound: mu x 0.85
    q = fp.quantities
    assert q.period_lower == pytest.approx(period, rel=0.01)
    assert q.damping_lower == pytest.approx(beta, rel=0.02)
    assert fp.bounds["lower"].displacement == pytest.approx(d, rel=0.01)
    assert q.characteristic_strength == pytest.approx(0.05 * 0.85 * weight, rel=1e-6)   # Q_d = mu W
    # Derived arithmetic: the torsion factor is D_TM / D_M, the fixed-base period that of the design.
    assert q.torsion_factor == pytest.approx(q.total_displacement / q.displacement)
    assert q.fixed_base_period == design.fixed_base_period
    # The suite's check range: shortest upper-bound and longest lower-bound period.
    upper = min(a.bounds["upper"].period for a in design.alternatives)
    lower = max(a.bounds["lower"].period for a in design.alternatives)
    assert design.period_range == (upper, lower) and upper < lower


def test_run_and_sweep_share_the_design(study, design, demo):
    from isolation.app.batch.sweep import design_rows

    for typed, result in zip(design.alternatives, demo.alternatives, strict=True):
        assert result.quantities == typed.quantities.to_dict()
        assert result.design_quantities == DesignQuantities.from_dict(typed.quantities.to_dict())
    rows = design_rows(study)
    for row, typed in zip(rows, design.alternatives, strict=True):
        assert row["D_TM_m"] == typed.quantities.total_displacement
        assert row["T_M_lower_s"] == typed.bounds["lower"].period


def test_design_failure_names_the_alternative(study, monkeypatch):
    from isolation.study import assembly

    def refuse(*args, **kwargs):
        raise ValueError("no convergence\n  after 50 trials")

    monkeypatch.setattr(assembly, "design_alternative", refuse)
    with pytest.raises(RunError, match=r"^alternative 'Friction pendulum': design failed: no convergence after 50"):
        design_study(study)


def test_quantities_round_trip_and_keep_none():
    q = DesignQuantities(displacement=0.4, total_displacement=0.5, isolation_shear=None, superstructure_shear=900.0,
                         fixed_base_shear=3000.0, shear_ratio=0.3, moat=0.6)
    data = json.loads(json.dumps(q.to_dict()))
    assert data["isolation_shear"] is None and data["period_lower"] is None
    assert DesignQuantities.from_dict(data) == q


def test_history_summary_from_statistics():
    # Hand-made suite statistics; the expected values are derived arithmetic on them.
    def stats(disp, acc, shear, drift):
        return {"isolator_displacement": {"mean": [disp], "max": [1.2 * disp]},
                "floor_acceleration": {"mean": [acc, 0.9 * acc]}, "storey_shear": {"mean": [shear, shear / 2]},
                "reaction": {"mean": [1.1 * shear]}, "drift_ratio": {"mean": [drift, drift / 2]},
                "residual_displacement": {"mean": [0.01]}, "base_shear": {"mean": [shear]}}
    cases = {"lower": stats(0.40, 0.20, 2000.0, 0.002), "upper": stats(0.30, 0.25, 2500.0, 0.003)}
    fixed = stats(0.0, 0.80, 8000.0, 0.010)
    summary = HistorySummary.from_statistics(cases, fixed, 1.15)
    assert summary.floor_acceleration_ratio == pytest.approx(0.25 / 0.80)
    assert summary.superstructure_shear_ratio == pytest.approx(2500.0 / 8000.0)
    assert summary.isolator_displacement_with_torsion == pytest.approx(0.40 * 1.15)
    assert summary.isolator_displacement_max_record == pytest.approx(0.48)
    assert summary.drift_ratio_isolated == pytest.approx(0.003)
    assert summary.ductility_isolated is None                 # no comparison given
    assert HistorySummary.from_dict(summary.to_dict()) == summary
    assert "ductility_isolated" not in summary.to_dict(computed_only=True)
    assert NO_HISTORY.to_dict(computed_only=True) == {}
    with pytest.raises(ValueError, match="history summary"):
        HistorySummary.from_dict({"isolator_displacement": 1.0})
    assert HistorySummary.from_dict({"isolator_displacement": 1.0, "torsion_factor": 1.1}, strict=False) == \
        HistorySummary(torsion_factor=1.1)


def test_results_json_follows_the_shipped_schema(demo):
    schema = results_schema()
    jsonschema.Draft202012Validator.check_schema(schema)
    data = json.loads(json.dumps(demo.to_dict(), allow_nan=False))
    assert data["schema_version"] == SCHEMA_VERSION
    jsonschema.validate(data, schema, cls=jsonschema.Draft202012Validator)
    # The schema is strict enough to refuse a damaged file.
    for damage in (lambda d: d.pop("schema_version"), lambda d: d["alternatives"][0]["quantities"].pop("moat"),
                   lambda d: d["alternatives"][0]["verdict"].update(outcome="fine"),
                   lambda d: d["alternatives"][0]["history"]["summary"].update(floor_acceleration_ratio="low")):
        broken = json.loads(json.dumps(data))
        damage(broken)
        with pytest.raises(jsonschema.ValidationError):
            jsonschema.validate(broken, schema, cls=jsonschema.Draft202012Validator)


def test_schema_ships_with_the_package():
    import isolation

    assert RESULTS_SCHEMA.parent == Path(isolation.__file__).parent / "study"
    assert "study/results.schema.json" in (ROOT / "pyproject.toml").read_text()


def test_results_of_layout_1_still_read(demo):
    data = demo.to_dict()
    data.pop("schema_version")
    old = StudyResults.from_dict(data)
    assert old.schema_version == 1 and old.alternatives == demo.alternatives
    summary = old.alternatives[0].history_summary
    assert summary.floor_acceleration_ratio == data["alternatives"][0]["history"]["summary"]["floor_acceleration_ratio"]
    for version in (SCHEMA_VERSION + 1, "2", True):
        with pytest.raises(ValueError, match="schema_version"):
            StudyResults.from_dict({**data, "schema_version": version})
