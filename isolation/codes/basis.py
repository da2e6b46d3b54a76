"""The code-basis interface: what the rest of the package asks of a design code.

A code basis (ASCE/SEI 7-16 in :mod:`isolation.codes.asce7_basis`, EN 1998-1 in
:mod:`isolation.codes.eurocode_basis`) is one frozen object that subclasses
:class:`CodeBasis`. It gives:

* site: the study keys of its site parameters (:meth:`CodeBasis.read_site`),
  the site spectrum (:meth:`CodeBasis.site_spectrum`), the damping coefficient
  (:meth:`CodeBasis.damping_coefficient`, formulas in :mod:`isolation.site.damping`);
* the approximate fixed-base period and the lateral-system row it used
  (:meth:`CodeBasis.fixed_base_period`);
* the single-mode report (:meth:`CodeBasis.design_report`), one
  :class:`SingleModeReport` with common names for the common quantities and one
  ``permitted`` flag;
* suite rules for single records and pairs (:class:`SuiteRules`), the history lower
  limit, drift limits, storey forces of the code design, clause sources per
  topic, the importance-factor range and the loss reference levels.

The rest of the package never compares a basis name: it calls
``isolation.codes.get(study.basis)`` and asks the object. A new code is one module
``isolation/codes/<name>_basis.py`` that defines a subclass and one instance of it, which
the registry finds (or :func:`isolation.codes.register` adds at run time); see the
contributor guide, "How to add a code basis".

Scope: concept-stage feasibility, not construction design.
"""

from __future__ import annotations

from abc import ABC, abstractmethod
from dataclasses import dataclass
from typing import Any, Mapping

from isolation.codes.report import COMMON_QUANTITIES, DesignAnswer, SingleModeReport

__all__ = ["CodeBasis", "SuiteRules", "SingleModeReport", "COMMON_QUANTITIES", "DesignAnswer"]


@dataclass(frozen=True)
class SuiteRules:
    """Matched-suite rules of one code basis.

    Attributes
    ----------
    mean_ratio : float
        Suite mean of the single-record spectra not below this times the target. [-]
    goal : float
        Level the single records are matched to, over the target. [-]
    period_range : (float, float)
        Suite-mean check range as factors on (shortest, longest) isolated period. [-]
    pair_spectrum : str
        Spectrum of a pair of components: "RotD100" or "SRSS". [-]
    pair_ratio : float
        Suite mean of the pair spectra not below this times the target. [-]
    pair_goal : float
        Level the pair spectra are matched to, over the target. [-]
    pair_period_range : (float, float)
        Pair check range as factors on the isolated periods. [-]
    pair_start : float
        Starting level of the single components of a pair, as a fraction of ``pair_goal``. [-]
    history_lower_limit : float
        Least history total displacement as a fraction of the single-mode D_TM (0: none). [-]
    source : str
        Clauses of these rules.
    """

    mean_ratio: float
    goal: float
    period_range: tuple
    pair_spectrum: str
    pair_ratio: float
    pair_goal: float
    pair_period_range: tuple
    pair_start: float
    history_lower_limit: float
    source: str = ""

    @property
    def pair_rule(self) -> dict:
        """The pair rule as the dictionary of :data:`isolation.motions.pair_suite.PAIR_RULES`."""
        return {"spectrum": self.pair_spectrum, "required": self.pair_ratio, "goal": self.pair_goal,
                "range": self.pair_period_range}


_STUDY_QUANTITIES = ("displacement", "total_displacement", "isolation_shear", "superstructure_shear",
                     "fixed_base_shear", "shear_ratio")


class CodeBasis(ABC):
    """One code basis: every code-specific rule the package uses, behind one interface.

    Subclasses are frozen dataclasses (one instance per code) registered by name
    with :func:`isolation.codes.register`. Attributes (data):

    name : str
        Registry name, the value of a study's ``code.basis``.
    title : str
        Name of the code in reports ("ASCE/SEI 7-16").
    damping_rule : str
        Name of the damping rule of its spectra (:func:`isolation.site.damping.damping_coefficient`).
    site_keys : tuple of str
        Study keys of the site parameters that define the code spectrum.
    site_class_key, site_class_word : str
        Study key and plain name of the site classification ("site_class", "site class").
    site_classes : tuple of str
        Allowed site classes.
    importance_range : (float, float)
        Allowed ``building.importance``. [-]
    importance_meaning : str
        What ``building.importance`` is in this code.
    suite : SuiteRules
    symbols : mapping
        Common quantity name -> the code's symbol.
    procedure, procedure_full : str
        Short and full name of the single-mode procedure ("the ELF procedure",
        "the equivalent lateral force procedure").
    site_level : str
        What the site spectrum is ("MCE_R", "design action").
    reference_levels : (float, float)
        Design and maximum level as fractions of the site spectrum (loss analysis). [-]
    level_names, level_marks : (str, str)
        Names of those two levels in tables, and their short marks on plots.
    near_fault_distance : float
        Distance within which a site counts as near an active fault. [km]
    drift_formula : str
        The checked drift quantity of the code drift check.
    sources : mapping
        Verdict topic -> source text (see :mod:`isolation.verdict.sources`).
    yielding_source : str
        Source of the superstructure-yielding limits of the verdict.
    extends_spectrum : bool
        True when the code spectrum is continued beyond its own period range (see
        :meth:`spectrum_note`).
    long_period_bars_procedure : bool
        True when an isolated period above 5 s bars the single-mode procedure.
    report_title, answer_source : str
        Name of the single-mode procedure with its clause, and the source of the
        equivalent-linear answer (for tables).
    site_inputs : tuple of str
        Every site key the code reads (``site_keys``, the site class and the rest).
    quantity_labels : mapping
        Label of each reported quantity in tables (common name -> text).
    """

    name: str
    title: str
    damping_rule: str
    site_keys: tuple
    site_class_key: str
    site_class_word: str
    site_classes: tuple
    importance_range: tuple
    importance_meaning: str
    suite: SuiteRules
    symbols: Mapping[str, str]
    procedure: str
    site_level: str
    reference_levels: tuple
    level_names: tuple
    level_marks: tuple
    near_fault_distance: float
    drift_formula: str
    sources: Mapping[str, str]
    yielding_source: str
    extends_spectrum: bool = False
    long_period_bars_procedure: bool = False
    procedure_full: str = ""
    report_title: str = ""
    answer_source: str = ""
    site_inputs: tuple = ()
    quantity_labels: Mapping[str, str] = {}

    # --- site ---------------------------------------------------------------------
    @abstractmethod
    def damping_coefficient(self, beta):
        """Damping coefficient B [-] of the code at effective damping ``beta`` [-] (Sa(beta) = Sa(5 %)/B)."""

    @abstractmethod
    def read_site(self, reader, values: dict, tabulated: bool) -> None:
        """Read the code's site parameters of a study's ``[site]`` into ``values``.

        ``reader`` is the study reader (``number``, ``choice``, ``quantity``, ``problems``);
        ``tabulated`` is True when the spectrum comes from a file (then only the site class
        and the parameters the code's checks need are read).
        """

    @abstractmethod
    def site_spectrum(self, site, importance: float = 1.0):
        """The code's site spectrum from a study's site inputs (not tabulated). [g]"""

    def spectrum_note(self, site) -> str:
        """Assumption about the site spectrum stated in the results ("" for none)."""
        return ""

    def site_advice(self, site) -> list:
        """Plain warnings about implausible site parameters of this code (``site`` has the
        attributes named in :attr:`site_inputs`)."""
        return []

    def site_suitability(self, site_class: str) -> tuple[str, str]:
        """("against" | "condition" | "ok", text) for a site class of this code."""
        return "ok", f"{self.site_class_word} {site_class}"

    # --- fixed base -----------------------------------------------------------------
    @abstractmethod
    def fixed_base_period(self, height: float, lateral_system: str) -> tuple[float, str]:
        """Approximate fixed-base period [s] of a study's ``lateral_system`` and its source row."""

    def period_note(self, spectrum, t_fb: float, t_m: float) -> str:
        """How the estimated T_fb [s] came about, for the verdict."""
        return f"T_fb estimated by {self.title}"

    # --- single-mode report -----------------------------------------------------------
    @abstractmethod
    def design_report(self, study, sets: Mapping[str, Any], system, spectrum, t_fb: float,
                      bounds=None) -> SingleModeReport:
        """The single-mode report of one alternative of a study (all property sets)."""

    def design_answer(self, study, sets, system, spectrum, t_fb: float, bounds=None) -> DesignAnswer:
        """The report and the common quantities a study takes from it."""
        report = self.design_report(study, sets, system, spectrum, t_fb, bounds)
        quantities = {key: report.common(key) for key in _STUDY_QUANTITIES}
        reasons = tuple(c.name for c in report.applicability if not c.passed)
        return DesignAnswer(report, quantities, report.permitted, reasons)

    @abstractmethod
    def uplift_action(self, study, report, spectrum, plateau) -> tuple:
        """(shear [kN], height [m], gravity factor [-], vertical fraction [-], source) for the uplift check;
        ``plateau(spectrum)`` is the spectrum's plateau [g] when the code needs it."""

    @abstractmethod
    def torsion_action(self, report) -> tuple[float, float]:
        """(displacement of the centre of rigidity [m], eccentricity with its accidental part [m]) of the
        report's torsion formula, for the displacement of each bearing of a layout."""

    # --- suite and histories ---------------------------------------------------------------
    def matching_rule(self) -> str:
        """Name of the suite rule for :func:`isolation.motions.matched_suite` (the basis name)."""
        return self.name

    # --- drift and strength ---------------------------------------------------------------
    @abstractmethod
    def history_drift_limit(self, nonstructural: str | None = None, importance: float = 1.0) -> tuple[float, str]:
        """Storey drift ratio limit [-] of the response histories and its source."""

    @abstractmethod
    def report_drift_limit(self) -> tuple[float, str]:
        """Drift ratio limit [-] of the single-mode drift estimate and its source."""

    @abstractmethod
    def allowable_drift(self, importance: float = 1.0) -> tuple[float, float, str]:
        """(limit [-], factor nu [-], source) of the code drift check of the fixed-base design."""

    @abstractmethod
    def system_factors(self, lateral_system: str, response_modification: float) -> tuple[float, float, str]:
        """(overstrength [-], deflection amplification [-], source) of the fixed-base design."""

    @abstractmethod
    def fixed_base_forces(self, spectrum, weights, elevations, response_modification: float, *, period: float,
                          importance: float, frame: str, s1: float) -> tuple:
        """(base shear [kN], force shares [-], period [s], source) of the fixed-base code design."""

    @abstractmethod
    def isolated_forces(self, report, weights, total_weight: float | None) -> tuple:
        """(forces per level [kN], source) of the isolated superstructure from the report's V_s."""

    @abstractmethod
    def drift_ratios(self, elastic, shears, heights, gravity, amplification: float, importance: float,
                     nu: float) -> tuple:
        """(checked drift ratios [-], stability coefficients [-], stability limit [-], note) of the code drift check."""

    # --- loss ---------------------------------------------------------------------------
    @abstractmethod
    def risk_category(self, importance: float) -> str:
        """Risk category ("II", "III", "IV") the importance factor stands for."""

    def default_hazard(self, hazard_inputs):
        """(hazard, description) when the study gives no hazard points; None: the MCE_R-based default."""
        return None

    # --- sources --------------------------------------------------------------------------
    def source(self, topic: str) -> str:
        """Source of one verdict limit (a key of :attr:`sources`)."""
        try:
            return self.sources[topic]
        except KeyError:
            raise ValueError(f"topic = {topic!r} is not allowed: must be one of "
                             f"{', '.join(repr(t) for t in self.sources)}") from None
