"""Old import paths of modules that moved into folders by concern.

Until the package was arranged in folders (site/, codes/, design/, dynamics/,
performance/, study/, verdict/, output/, app/), its modules sat side by side
(``isolation.spectra``, ``isolation.runner``, ``isolation.plots`` ...). Those
names stay importable: a finder on ``sys.meta_path`` answers an old name with
the module at its new place (the same module object, so attributes set
through either name are one). New code imports the new names.
"""

from __future__ import annotations

import importlib
import importlib.abc
import importlib.machinery
import sys

#: old name (below ``isolation.``) -> new name; a moved package carries its submodules along
MOVED = {
    "spectra": "site.spectra",
    "damping": "site.damping",
    "design_asce7": "codes.asce7",
    "design_eurocode": "codes.eurocode",
    "fixed_base": "codes.asce7_fixed_base",
    "design_array": "design.array_kernel",
    "overturning": "design.overturning",
    "structure": "dynamics.structure",
    "plan_structure": "dynamics.plan_structure",
    "history": "dynamics.history",
    "plan_history": "dynamics.plan_history",
    "kernel": "dynamics.kernel",
    "plan_kernel": "dynamics.plan_kernel",
    "newmark": "dynamics.newmark",
    "oscillator": "dynamics.oscillator",
    "isolators": "dynamics.isolators",
    "plan_bearings": "dynamics.plan_bearings",
    "energy": "dynamics.energy",
    "response": "dynamics.response",
    "strength": "performance.strength",
    "damage": "performance.damage",
    "comparison": "performance.comparison",
    "study_inputs": "study.inputs",
    "study_keys": "study.keys",
    "study_sections": "study.sections",
    "study_model": "study.assembly",
    "plan_study": "study.plan",
    "runner": "study.runner",
    "verdict_rules": "verdict.rules",
    "verdict_site": "verdict.site",
    "verdict_sources": "verdict.sources",
    "verdict_yielding": "verdict.yielding",
    "plots": "output.plots",
    "tables": "output.tables",
    "typeset": "output.typeset",
    "report": "output.report",
    "cli": "app.cli",
    "records": "app.calc_records",
    "batch": "app.batch",
    "explorer": "app.explorer",
    "explore": "app.explorer.answers",
    "workbook_saving": "app.workbook_saving",
}


def new_name(fullname: str) -> str | None:
    """The current name of an old module name, or None when it did not move."""
    if not fullname.startswith("isolation."):
        return None
    rest = fullname[len("isolation."):]
    head, dot, tail = rest.partition(".")
    if head not in MOVED:
        return None
    return "isolation." + MOVED[head] + dot + tail


class _AliasLoader(importlib.abc.Loader):
    def __init__(self, target: str):
        self.target = target
        self.real_spec: importlib.machinery.ModuleSpec | None = None

    def create_module(self, spec):
        module = importlib.import_module(self.target)
        self.real_spec = module.__spec__
        return module

    def exec_module(self, module):
        # the import system stamped the alias spec on the real module; give it back its own
        module.__spec__ = self.real_spec


class _MovedFinder(importlib.abc.MetaPathFinder):
    def find_spec(self, fullname, path=None, target=None):
        target_name = new_name(fullname)
        if target_name is None:
            return None
        return importlib.machinery.ModuleSpec(fullname, _AliasLoader(target_name))


def install() -> None:
    """Put the finder on ``sys.meta_path`` once."""
    if not any(isinstance(finder, _MovedFinder) for finder in sys.meta_path):
        sys.meta_path.insert(0, _MovedFinder())
