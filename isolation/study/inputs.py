"""The validated inputs of a study: frozen dataclasses in internal units.

:func:`isolation.study.load_study` / :func:`isolation.study.parse_study` build
them from a study file and raise :class:`StudyError` listing every problem.
All names here are re-exported from :mod:`isolation.study`.
"""

from __future__ import annotations

from dataclasses import asdict, dataclass, field
from typing import Any

from isolation.errors import InputError
from isolation.plain import plain

__all__ = ["StudyError", "Project", "Site", "Building", "BearingSpec", "Alternative", "Analysis", "Study"]


class StudyError(InputError):
    """A study file with one or more problems; ``problems`` lists each one."""

    def __init__(self, problems: list[str], source: str = "") -> None:
        self.problems = list(problems)
        self.source = source
        where = f"{source}: " if source else ""
        if len(problems) == 1:
            message = f"{where}{problems[0]}"
        else:
            listed = "; ".join(f"({i}) {p}" for i, p in enumerate(problems, 1))
            message = f"{where}{len(problems)} problems: {listed}"
        super().__init__(message)


@dataclass(frozen=True)
class Project:
    """Names printed on the report's title page (invented in examples)."""

    name: str
    client: str
    prepared_by: str
    revision: str
    date: str  # ISO date, YYYY-MM-DD


@dataclass(frozen=True)
class Site:
    """Site hazard in g and s; which fields are set depends on the code basis.

    ``sms``, ``sm1`` [g], ``long_period`` [s], ``s1`` [g], ``site_class``
    for ASCE 7; ``ag`` [g], ``ground_type``, ``spectrum_type`` for Eurocode;
    ``spectrum_periods`` [s] / ``spectrum_values`` [g, 5 % damped] when a
    tabulated spectrum file was given (``spectrum_file`` is its resolved path).
    """

    near_fault: bool = False
    sms: float | None = None
    sm1: float | None = None
    long_period: float | None = None
    s1: float | None = None
    site_class: str | None = None
    ag: float | None = None
    ground_type: str | None = None
    spectrum_type: int | None = None
    spectrum_file: str | None = None
    spectrum_periods: tuple = ()
    spectrum_values: tuple = ()
    fault_distance: float | None = None  # [km] to the nearest active fault, None when not given


@dataclass(frozen=True)
class Building:
    """Superstructure above the isolation plane, internal units.

    ``floor_weights`` [kN] from level 1 to the roof, ``base_weight`` [kN] of
    the floor just above the isolators, ``storey_heights`` [m],
    ``fixed_base_period`` [s] or None (code estimate), ``plan_length`` and
    ``plan_width`` [m], ``eccentricity`` [m], ``damping`` [-]. ``importance``
    [-] is I_e (ASCE/SEI 7-16 Table 1.5-2) for an ASCE 7 basis and gamma_I
    (EN 1998-1 §4.2.5, 0.8/1.0/1.2/1.4 for classes I-IV, from memory) for a
    Eurocode basis; allowed ranges in
    :data:`isolation.study.sections.IMPORTANCE_RANGES`.

    The comparison building: ``fixed_base_model`` "yielding" (default; storey
    strengths from the code design, :mod:`isolation.performance.strength`) or "elastic";
    ``overstrength`` [-] and ``deflection_amplification`` [-] replace the code
    table's Omega_0 (or alpha_u/alpha_1) and C_d when given;
    ``storey_strengths`` / ``isolated_storey_strengths`` [kN] replace the
    designed yield shears of the fixed-base / isolated superstructure;
    ``hardening`` [-] is the post-yield storey stiffness ratio (default 0.03,
    common practice); ``p_delta`` includes gravity P-delta in yielding storeys;
    ``design_level`` ("high" or "moderate") picks the damage-state medians of
    :mod:`isolation.performance.damage`; ``storey_hysteresis`` is the storey law of the
    yielding buildings, "bilinear" (kinematic hardening) or "clough"
    (stiffness-degrading, Clough & Johnston 1966, for concrete frames).
    """

    storeys: int
    floor_weights: tuple
    base_weight: float
    storey_heights: tuple
    lateral_system: str
    response_modification: float
    importance: float
    plan_length: float
    plan_width: float
    fixed_base_period: float | None = None
    eccentricity: float = 0.0
    damping: float = 0.05
    fixed_base_model: str = "yielding"
    overstrength: float | None = None
    deflection_amplification: float | None = None
    storey_strengths: tuple = ()
    isolated_storey_strengths: tuple = ()
    hardening: float = 0.03
    p_delta: bool = True
    design_level: str = "high"
    storey_hysteresis: str = "bilinear"
    nonstructural: str = "brittle"  # EN 1998-1 §4.4.3.2: "brittle", "ductile" or "none"

    @property
    def total_weight(self) -> float:
        """Seismic weight above the isolators, base floor included. [kN]"""
        return self.base_weight + sum(self.floor_weights)

    @property
    def height(self) -> float:
        """Height of the roof above the isolation plane. [m]"""
        return float(sum(self.storey_heights))


@dataclass(frozen=True)
class BearingSpec:
    """One group of identical bearings: ``type``, ``count``, ``axial_load``
    per bearing [kN] (equal share when not given) and the type's
    ``properties`` in internal units (see ``BEARING_KEYS``)."""

    type: str
    count: int
    axial_load: float
    properties: dict = field(default_factory=dict)
    axial_load_given: bool = False


@dataclass(frozen=True)
class Alternative:
    """One isolation alternative: bearing groups, bounds and moat.

    ``moat`` [m] is the clear gap provided around the isolated building (None
    when not yet fixed); ``lower_factor`` / ``upper_factor`` [-] are the
    property modification factors applied to the bearings' nominal properties.
    ``grid`` (bearings along the plan length, along the width) lays the
    bearings out for the plan model; None chooses the grid closest to the plan
    proportions (:func:`isolation.study.plan.default_grid`).
    """

    name: str
    bearings: tuple
    lower_factor: float
    upper_factor: float
    moat: float | None = None
    grid: tuple | None = None

    @property
    def count(self) -> int:
        """Number of bearings in all groups. [-]"""
        return sum(group.count for group in self.bearings)


@dataclass(frozen=True)
class Analysis:
    """Analysis options: ``suite_size`` (7 or 11), ``seed``, ``duration`` [s],
    ``time_step`` [s], ``damping`` [-] of the matched spectra; ``bidirectional``:
    also run the plan model under matched component pairs (bearings at plan
    positions, torsion from the layout, axial loads from overturning)."""

    suite_size: int = 7
    seed: int = 0
    duration: float = 30.0
    time_step: float = 0.005
    damping: float = 0.05
    bidirectional: bool = False


@dataclass(frozen=True)
class Study:
    """A validated study in internal units (kN, m, s, kPa, g).

    ``units`` is the system used for input and display; ``wind_base_shear``
    [kN] is None when the study gives no wind load; ``source`` names the file;
    ``loss`` holds the loss-study inputs (:class:`isolation.loss.LossInputs`,
    from the optional ``[cost]``, ``[hazard]`` and ``[loss]`` tables; None
    when the study was built without them).
    """

    project: Project
    basis: str
    units: str
    site: Site
    building: Building
    alternatives: tuple
    analysis: Analysis
    wind_base_shear: float | None = None
    source: str = ""
    loss: Any = None

    def alternative(self, name: str) -> Alternative:
        """The alternative called ``name``."""
        for alternative in self.alternatives:
            if alternative.name == name:
                return alternative
        names = ", ".join(repr(a.name) for a in self.alternatives)
        raise InputError(f"alternative = {name!r} is not allowed: must be one of {names}")

    def to_dict(self) -> dict:
        """Plain JSON types (lists, not tuples), internal units."""
        return plain(asdict(self), keep_nonfinite=True)
