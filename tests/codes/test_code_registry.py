"""Code bases as peers: the registry, the single report type, no basis names outside isolation/codes/,
and a third code added as one module (here: a toy basis defined in this test).

Scope: feasibility checks of the package's structure and of the single-mode design through a
registered basis, not construction design.
"""

from __future__ import annotations

import ast
import math
from dataclasses import dataclass
from pathlib import Path

import numpy as np
import pytest

from isolation import GRAVITY, codes
from isolation.codes.asce7 import ElfReport
from isolation.codes.asce7_basis import ASCE7, Asce7Basis
from isolation.codes.eurocode import EurocodeReport
from isolation.codes.eurocode_basis import EUROCODE
from isolation.study import apply_overrides, parse_study, read_study_mapping
from isolation.study.assembly import design_alternative, fixed_base_period, isolation_system, site_spectrum

ROOT = Path(__file__).resolve().parents[2]
PACKAGE = ROOT / "isolation"
DEMO = ROOT / "examples" / "demo_study.toml"

# Literals equal to a basis name that are allowed outside isolation/codes/: (file, name of the
# constant), each with its reason. Nothing else may spell a basis name.
ALLOWED = {
    # the "kind" tag of a serialised EN 1998-1 spectrum in results.json (a file format, not a basis)
    ("isolation/site/spectra.py", "EUROCODE_KIND"),
}


# --- the registry -----------------------------------------------------------------------


def test_registry_answers_the_two_built_in_bases_by_name():
    assert codes.names()[:2] == ("asce7", "eurocode")
    # found as the module-level basis objects of isolation/codes/*_basis.py
    assert {type(codes.get(n)).__module__ for n in codes.names()} == {
        f"isolation.codes.{p.stem}" for p in (PACKAGE / "codes").glob("*_basis.py")}
    assert codes.get("asce7") is ASCE7 and codes.get("eurocode") is EUROCODE
    assert codes.get(ASCE7) is ASCE7  # a basis object is answered as it is
    assert codes.get() is codes.get(codes.DEFAULT_BASIS) is ASCE7


def test_unknown_basis_is_one_named_error_naming_field_value_and_known_names():
    with pytest.raises(codes.UnknownBasisError) as error:
        codes.get("nz_1170", field="code.basis")
    assert isinstance(error.value, ValueError)
    assert str(error.value) == "code.basis = 'nz_1170' is not allowed: must be one of 'asce7', 'eurocode'"


def test_register_refuses_a_mismatched_name_a_non_basis_and_a_silent_replacement():
    with pytest.raises(ValueError, match="must equal the registry name"):
        codes.register("other_code", ASCE7)
    with pytest.raises(ValueError, match="must be a CodeBasis"):
        codes.register("other_code", object())
    with pytest.raises(ValueError, match="is registered"):
        codes.register("asce7", Asce7Basis())
    with pytest.raises(ValueError, match="lower-case"):
        codes.register("Other Code", ASCE7)


def test_a_study_with_an_unknown_basis_names_the_field_and_the_known_bases():
    from isolation.study import StudyError

    mapping = apply_overrides(read_study_mapping(DEMO), {"code.basis": "nz_1170"})
    with pytest.raises(StudyError) as error:
        parse_study(mapping, source=str(DEMO))
    assert any("code.basis" in p and "'nz_1170'" in p and "'asce7'" in p and "'eurocode'" in p
               for p in error.value.problems)


# --- one report type ----------------------------------------------------------------------


def test_both_code_reports_are_the_single_mode_report_with_their_old_names_kept():
    assert issubclass(ElfReport, codes.SingleModeReport) and issubclass(EurocodeReport, codes.SingleModeReport)
    study = parse_study(read_study_mapping(DEMO), source=str(DEMO))
    report = _design(study)
    assert isinstance(report, ElfReport)
    assert report.elf_permitted is report.permitted
    assert report.D_M == report.value("D_M") and report.D_TM == report.value("D_TM")
    assert report.V_st == report.value("V_st") and report.V_s == report.value("V_s")
    assert report.F_x == tuple(s.force for s in report.storey_forces)
    data = report.to_dict()  # the layout of results.json is kept
    assert data["elf_permitted"] == report.permitted and "permitted" not in data
    assert list(data) == ["bounds", "building", "quantities", "applicability", "checks", "storey_forces",
                          "fixed_base", "warnings", "elf_permitted", "scope"]


# --- no basis names outside isolation/codes/ --------------------------------------------------


def _basis_literals():
    """(file, line, enclosing assignment target or None) of every string constant equal to a basis name."""
    known = set(codes.names())
    found = []
    for path in sorted(PACKAGE.rglob("*.py")):
        relative = path.relative_to(ROOT).as_posix()
        if relative.startswith("isolation/codes/"):
            continue
        tree = ast.parse(path.read_text(encoding="utf-8"))
        targets = {}
        for node in ast.walk(tree):
            if isinstance(node, ast.Assign) and len(node.targets) == 1 and isinstance(node.targets[0], ast.Name):
                for inner in ast.walk(node.value):
                    targets[id(inner)] = node.targets[0].id
        for node in ast.walk(tree):
            if isinstance(node, ast.Constant) and isinstance(node.value, str) and node.value in known:
                found.append((relative, node.lineno, targets.get(id(node))))
    return found


def test_no_module_outside_codes_spells_a_basis_name():
    offending = [(f, line) for f, line, target in _basis_literals() if (f, target) not in ALLOWED]
    assert offending == [], f"basis names outside isolation/codes/ (ask isolation.codes.get(name)): {offending}"


def test_the_grep_finds_a_basis_name_where_there_is_one(tmp_path):
    # The check itself can fail: a comparison written the old way is caught.
    source = 'def f(study):\n    return 1.25 if study.basis == "asce7" else 2.0\n'
    tree = ast.parse(source)
    hits = [n for n in ast.walk(tree) if isinstance(n, ast.Constant) and n.value in set(codes.names())]
    assert len(hits) == 1


# --- a third code is one module: a toy basis defined here -------------------------------------

B_CAP = 1.2
"""The toy code's one changed factor: the damping coefficient B_M is capped at 1.2 (an invented rule)."""


@dataclass(frozen=True)
class ToyBasis(Asce7Basis):
    """ASCE/SEI 7-16 formulas under another name, with B_M capped at :data:`B_CAP`."""

    name: str = "toy_code"
    title: str = "Toy national code"
    damping_rule: str = "toy_code"

    def damping_coefficient(self, beta):
        return np.minimum(super().damping_coefficient(beta), B_CAP)


def _table_17_5_1(beta: float) -> float:
    """B_M of ASCE/SEI 7-16 Table 17.5-1 (from memory): 2 % 0.8, 5 % 1.0, 10 % 1.2, 20 % 1.5, 30 % 1.7,
    40 % 1.9, 50 % 2.0, linear between rows."""
    return float(np.interp(beta, [0.02, 0.05, 0.10, 0.20, 0.30, 0.40, 0.50], [0.8, 1.0, 1.2, 1.5, 1.7, 1.9, 2.0]))


def _design(study):
    alternative = study.alternatives[0]
    system = isolation_system(alternative)
    sets = system.property_sets(study.building.total_weight)
    t_fb, _ = fixed_base_period(study)
    return design_alternative(study, sets, system, site_spectrum(study), t_fb)[0]


@pytest.fixture
def toy():
    basis = codes.register("toy_code", ToyBasis())
    try:
        yield basis
    finally:
        codes.unregister("toy_code")


def test_a_registered_toy_basis_runs_the_demo_single_mode_design(toy):
    asce = _design(parse_study(read_study_mapping(DEMO), source=str(DEMO)))
    mapping = apply_overrides(read_study_mapping(DEMO), {"code.basis": "toy_code"})
    study = parse_study(mapping, source=str(DEMO))
    assert study.basis == "toy_code"
    report = _design(study)
    beta, t_m, b = report.value("beta_M"), report.value("T_M"), report.value("B_M")
    # The one changed factor: B = min(B_M of Table 17.5-1, 1.2).
    assert b == pytest.approx(min(_table_17_5_1(beta), B_CAP), rel=1e-9)
    assert _table_17_5_1(beta) > B_CAP, "the demo's damping must reach the cap for this test to mean anything"
    # ASCE/SEI 7-16 Eq. 17.5-1: D_M = g S_M1 T_M / (4 pi^2 B_M) on the 1/T branch (T_S < T_M < T_L = 8 s).
    sm1 = study.site.sm1
    assert study.site.sm1 / study.site.sms < t_m < study.site.long_period
    assert report.value("D_M") == pytest.approx(GRAVITY * sm1 * t_m / (4.0 * math.pi**2 * b), rel=1e-4)
    # A smaller B gives a larger displacement than the ASCE 7 design of the same alternative.
    assert report.value("D_M") > asce.value("D_M")
    # The ASCE 7 basis is untouched by the registration.
    again = _design(parse_study(read_study_mapping(DEMO), source=str(DEMO)))
    assert again.value("D_M") == asce.value("D_M")


def test_the_toy_basis_is_asked_for_its_rules_everywhere(toy):
    from isolation.motions.suite import MEAN_RULES
    from isolation.site.damping import damping_coefficient, rules
    from isolation.verdict.sources import source

    assert "toy_code" in rules() and MEAN_RULES["toy_code"] == pytest.approx(1.10)
    assert damping_coefficient(0.3, "toy_code") == pytest.approx(B_CAP)  # Table 17.5-1 gives 1.7 at 30 %
    assert damping_coefficient(0.3, "asce7") == pytest.approx(1.7)
    assert source("moat", "toy_code") == source("moat", "asce7")


def test_an_outside_package_offers_a_basis_through_the_entry_point_group(monkeypatch):
    from isolation.codes import registry

    class Point:  # what importlib.metadata answers for an entry point of the group
        name = "toy_code"

        @staticmethod
        def load():
            return ToyBasis()

    asked = []

    def entry_points(group):
        asked.append(group)
        return [Point()]

    monkeypatch.setattr(registry, "_REGISTRY", {})
    monkeypatch.setattr(registry, "_LOADED", False)
    monkeypatch.setattr(registry.metadata, "entry_points", entry_points)
    assert registry.names() == ("asce7", "eurocode", "toy_code")
    assert asked == [codes.ENTRY_POINT_GROUP] == ["isolation.code_bases"]
    assert isinstance(codes.get("toy_code"), ToyBasis)
