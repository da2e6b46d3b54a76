"""Verdict rule on the yielding of the isolated superstructure.

Limits: ductility 2 (common practice for an essentially elastic isolated superstructure designed with
R_I <= 2, ASCE/SEI 7-16 §17.5.4.2, from memory) and residual drift ratio 0.5 % (FEMA P-58-1, 2012,
residual drift damage state needing realignment, from memory).
"""

import pytest

from isolation.verdict import Figures, assess, superstructure_yielding


def test_levels_at_the_limits():
    assert superstructure_yielding(None, None) is None
    ok = superstructure_yielding(1.5, 0.001, 4.2, 0.007)
    assert ok.level == "ok" and "4.20" in ok.message and "0.70 %" in ok.message
    assert superstructure_yielding(2.0, 0.001).level == "ok"
    assert superstructure_yielding(2.01, 0.001).level == "condition"
    residual = superstructure_yielding(1.2, 0.005)
    assert residual.level == "condition" and residual.limit == pytest.approx(0.005)


def test_assess_includes_the_rule_only_with_numbers():
    base = dict(alternative="a", fixed_base_period=0.6, isolated_period=3.0, total_displacement=0.4)
    topics = {r.topic for r in assess(Figures(**base)).reasons}
    assert "superstructure yielding" not in topics
    verdict = assess(Figures(**base, ductility_isolated=3.0, residual_drift_isolated=0.001))
    found = [r for r in verdict.reasons if r.topic == "superstructure yielding"]
    assert found and found[0].level == "condition"


def test_source_follows_the_code_basis():
    assert "ASCE/SEI 7-16" in superstructure_yielding(1.0, 0.0).source
    ec = superstructure_yielding(1.0, 0.0, basis="eurocode").source
    assert "EN 1998-1" in ec and "ASCE" not in ec
    with pytest.raises(ValueError, match="basis"):
        superstructure_yielding(1.0, 0.0, basis="other")
