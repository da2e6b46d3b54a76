"""Old import paths keep working after the move into folders by concern (issue 9: names that
must keep working). Every old module name must answer with the very module at its new place."""

import importlib
import pickle

import pytest

from isolation._moved import MOVED, new_name


@pytest.mark.parametrize("old", sorted(MOVED))
def test_old_module_name_is_the_new_module(old):
    before = importlib.import_module(f"isolation.{old}")
    after = importlib.import_module(new_name(f"isolation.{old}"))
    assert before is after
    assert before.__spec__.name == after.__name__  # the alias does not overwrite the module's own spec


@pytest.mark.parametrize("dotted", [
    "isolation.spectra.CodeSpectrum", "isolation.bearings.FrictionPendulum", "isolation.design.equivalent_linear",
    "isolation.design.design_bounds", "isolation.structure.ShearBuilding", "isolation.history.run",
    "isolation.motions.matched_suite", "isolation.runner.run_study", "isolation.study.load_study",
    "isolation.verdict.assess", "isolation.records.run_record", "isolation.plots.COLOURS",
    "isolation.tables.Table", "isolation.structure.PlanShearBuilding", "isolation.structure.PlanIsolatedBuilding",
    "isolation.motions.matched_pairs", "isolation.design_array.design_bounds_many",
    "isolation.batch.plan.load_batch", "isolation.explore.explore", "isolation.study_model.design_alternative",
])
def test_names_from_earlier_issues_import_from_their_old_place(dotted):
    module, _, name = dotted.rpartition(".")
    assert getattr(importlib.import_module(module), name) is not None


def test_submodules_of_a_moved_package_and_patching_through_the_old_name(monkeypatch):
    import isolation.output.plots.common as common
    import isolation.plots.common as old_common
    assert old_common is common
    monkeypatch.setattr("isolation.runner.run_study", "patched")
    from isolation.study import runner
    assert runner.run_study == "patched"


def test_objects_pickle_under_their_new_module_name():
    from isolation.spectra import CodeSpectrum
    spectrum = CodeSpectrum(sms=1.5, sm1=0.6)
    assert type(spectrum).__module__ == "isolation.site.spectra"
    assert pickle.loads(pickle.dumps(spectrum)) == spectrum


def test_names_that_never_existed_still_fail():
    with pytest.raises(ModuleNotFoundError):
        importlib.import_module("isolation.no_such_module")
    assert new_name("isolation.units") is None
