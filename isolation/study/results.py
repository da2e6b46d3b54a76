"""What a study run found: :class:`StudyResults` and :class:`AlternativeResults`, and ``results.json``.

``StudyResults.to_dict()`` is ``results.json``: plain JSON whose layout is
:data:`isolation.study.stages.SCHEMA_VERSION` (key ``schema_version``) and is
described by the JSON Schema shipped beside this module
(:data:`RESULTS_SCHEMA`, ``isolation/study/results.schema.json``). Reports,
workbooks and batch summaries read it; the typed stages of the run
(:class:`isolation.study.stages.DesignQuantities`,
:class:`isolation.study.stages.HistorySummary`) read back from it through
:attr:`AlternativeResults.design_quantities` and
:attr:`AlternativeResults.history_summary`. Re-exported from
:mod:`isolation.study.runner`.

Scope: a feasibility study, not construction design; a licensed engineer
checks every value against the governing local code.
"""

from __future__ import annotations

import json
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any, Mapping

from isolation import verdict as _verdict
from isolation.files import write_text_atomic
from isolation.plain import plain
from isolation.study.stages import SCHEMA_VERSION, DesignQuantities, HistorySummary

__all__ = ["StudyResults", "AlternativeResults", "load_results", "SCOPE", "RESULTS_SCHEMA", "results_schema"]

SCOPE = ("Feasibility study of seismic base isolation, not construction design. Results rest on "
         "simplified models and code procedures quoted partly from memory; verify against the "
         "governing local code with a licensed structural engineer.")

RESULTS_SCHEMA = Path(__file__).with_name("results.schema.json")
"""JSON Schema (draft 2020-12) of ``results.json``, shipped in the package."""


def results_schema() -> dict:
    """The JSON Schema of ``results.json`` (:data:`RESULTS_SCHEMA`) as a mapping."""
    return json.loads(RESULTS_SCHEMA.read_text(encoding="utf-8"))


@dataclass(frozen=True)
class AlternativeResults:
    """Results of one alternative, as plain mappings.

    ``quantities`` holds the key numbers by name (SI: m, s, kN, -): displacement
    (D_M or d_dc), total_displacement (D_TM or d_d), period_lower,
    period_upper, damping_lower, damping_upper, isolation_shear (V_b),
    superstructure_shear (V_s), fixed_base_shear, shear_ratio,
    characteristic_strength, displacement_capacity, moat (typed:
    :attr:`design_quantities`). ``bounds`` maps
    lower/nominal/upper to the equivalent-linear results; ``report`` is the
    code report; ``checks`` the bearing checks at the total displacement;
    ``history`` the suite statistics per case and a summary (typed:
    :attr:`history_summary`); ``figures`` and
    ``verdict`` the verdict's inputs and outcome; ``loss`` the loss study
    (:func:`isolation.loss.run_loss`: ``expected_annual_loss``,
    ``expected_loss_mce``, ... in the study's currency, and ``economics``),
    empty when the loss study did not run.
    """

    name: str
    system: dict
    bounds: dict
    report: dict
    quantities: dict
    checks: list
    history: dict
    figures: dict
    verdict: dict
    loss: dict = field(default_factory=dict)

    @property
    def outcome(self) -> str:
        """"feasible", "feasible with conditions" or "not recommended"."""
        return self.verdict["outcome"]

    @property
    def design_quantities(self) -> DesignQuantities:
        """``quantities`` as :class:`isolation.study.stages.DesignQuantities` (m, s, kN, -)."""
        return DesignQuantities.from_dict(self.quantities)

    @property
    def history_summary(self) -> HistorySummary:
        """``history["summary"]`` as :class:`isolation.study.stages.HistorySummary` (m, g, kN, -)."""
        return HistorySummary.from_dict((self.history or {}).get("summary") or {}, strict=False)

    @property
    def plan_storey_strength(self):
        """Storey shear of the plan model against storey strength
        (:class:`isolation.study.plan_strength.StoreyStrength`, kN); None without a bidirectional run."""
        from isolation.study.plan_strength import StoreyStrength

        storeys = ((self.history or {}).get("bidirectional") or {}).get("storeys") or {}
        found = storeys.get("storey_strength")
        return None if found is None else StoreyStrength.from_dict(found)

    def to_dict(self) -> dict:
        return plain({k: getattr(self, k) for k in self.__dataclass_fields__})


@dataclass(frozen=True)
class StudyResults:
    """Everything a study run found; ``to_dict()`` is plain JSON.

    ``study`` is the validated study (:meth:`Study.to_dict`), ``spectrum`` the
    site spectrum with a sampled curve and a ``note`` stating any assumption on
    it (empty when none), ``fixed_base`` the fixed-base model
    and shear, ``suite`` the matched suite's settings and tolerance report,
    ``alternatives`` one :class:`AlternativeResults` each, ``run`` version,
    quick flag and timings [s]. ``loss`` holds the loss study's levels,
    hazard, currency, inputs, settings and cautions (the per-case figures are
    in ``fixed_base["loss"]`` and each alternative's ``loss``; empty when the
    loss study did not run). ``live`` keeps the run's objects (spectrum,
    suite, history results, systems, reports, and ``design``: the
    :class:`isolation.study.stages.StudyDesign`) for figures; it is None after
    :func:`load_results`. ``schema_version`` is the layout of ``to_dict()``
    (:data:`isolation.study.stages.SCHEMA_VERSION`; 1 for results written
    before the key existed).
    """

    study: dict
    spectrum: dict
    fixed_base: dict
    suite: dict
    alternatives: tuple
    run: dict
    scope: str = SCOPE
    loss: dict = field(default_factory=dict)
    live: Any = field(default=None, compare=False, repr=False)
    schema_version: int = SCHEMA_VERSION

    @property
    def verdicts(self) -> list:
        """One :class:`isolation.verdict.Verdict` per alternative."""
        return [_verdict.Verdict.from_dict(a.verdict) for a in self.alternatives]

    def alternative(self, name: str) -> AlternativeResults:
        """Results of the alternative called ``name``."""
        for result in self.alternatives:
            if result.name == name:
                return result
        raise KeyError(f"alternative = {name!r} is not in the results")

    def to_dict(self) -> dict:
        data: dict[str, Any] = {"schema_version": self.schema_version}
        data.update({k: getattr(self, k) for k in ("study", "spectrum", "fixed_base", "suite", "run", "scope",
                                                   "loss")})
        data["alternatives"] = [a.to_dict() for a in self.alternatives]
        return plain(data)

    @classmethod
    def from_dict(cls, mapping: Mapping[str, Any]) -> "StudyResults":
        """Read :meth:`to_dict` back (layout 1, without ``schema_version``, too).

        Raises
        ------
        ValueError
            A ``schema_version`` this package does not know.
        """
        version = mapping.get("schema_version", 1)
        if isinstance(version, bool) or not isinstance(version, int) or not 1 <= version <= SCHEMA_VERSION:
            raise ValueError(f"schema_version = {version!r} is not allowed: this package reads results.json "
                             f"layouts 1 to {SCHEMA_VERSION}; results from a newer version need that version")
        alternatives = tuple(AlternativeResults(**a) for a in mapping["alternatives"])
        return cls(study=mapping["study"], spectrum=mapping["spectrum"], fixed_base=mapping["fixed_base"],
                   suite=mapping["suite"], alternatives=alternatives, run=mapping["run"],
                   scope=mapping.get("scope", SCOPE), loss=mapping.get("loss", {}), schema_version=version)

    def save(self, path: str | Path) -> Path:
        """Write ``to_dict()`` as JSON (via a temporary file and a rename)."""
        path = Path(path)
        return write_text_atomic(path, json.dumps(self.to_dict(), indent=1, allow_nan=False))


def load_results(path: str | Path) -> StudyResults:
    """Read results written by :meth:`StudyResults.save`."""
    return StudyResults.from_dict(json.loads(Path(path).read_text(encoding="utf-8")))
