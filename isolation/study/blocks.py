"""The model objects and code report of a validated study, below the checks and the run.

:func:`site_spectrum`, :func:`isolation_system`, :func:`fixed_base_period`,
:func:`superstructure` and :func:`design_alternative`, re-exported from
:mod:`isolation.study.assembly` (and :mod:`isolation.study.runner`); used by the
checks of a study (:mod:`isolation.study.checks`) before anything runs.

Scope: a feasibility study, not construction design; a licensed engineer
checks every value against the governing local code.
"""

from __future__ import annotations

from isolation import GRAVITY
from isolation import codes as _codes
from isolation.study import Alternative, Study

__all__ = ["site_spectrum", "isolation_system", "fixed_base_period", "superstructure", "design_alternative"]


def site_spectrum(study: Study):
    """The study's MCE_R (ASCE 7) or elastic (Eurocode) site spectrum object.

    A Eurocode spectrum answers up to :data:`EUROCODE_MAX_PERIOD` (its 1/T^2
    branch extended beyond 4 s, see :class:`isolation.site.spectra.EurocodeSpectrum`)
    so that motion matching reaches twice the isolated period.
    """
    from isolation.site.spectra import TabulatedSpectrum

    site = study.site
    code = _codes.get(study.basis)
    if site.spectrum_periods:
        return TabulatedSpectrum(site.spectrum_periods, site.spectrum_values, rule=code.damping_rule)
    return code.site_spectrum(site, study.building.importance)


def isolation_system(alternative: Alternative):
    """Bearing groups and property factors of one alternative (each bearing built by its registered type)."""
    from isolation.bearings import BearingGroup, IsolationSystem, PropertyBound, PropertyFactors
    from isolation.bearings.registry import bearing_type

    groups = []
    for i, spec in enumerate(alternative.bearings):
        bearing = bearing_type(spec.type).create(spec.properties)
        groups.append(BearingGroup(bearing, spec.count, spec.axial_load,
                                   name=f"group {i + 1} ({spec.type.replace('_', ' ')})"))
    bound = PropertyBound(alternative.lower_factor, alternative.upper_factor)
    return IsolationSystem(tuple(groups), PropertyFactors(stiffness=bound, strength=bound, friction=bound))


def fixed_base_period(study: Study) -> tuple[float, str]:
    """Fixed-base period [s] and where it came from (given or the code's estimate)."""
    building = study.building
    if building.fixed_base_period is not None:
        return building.fixed_base_period, "given in the study"
    return _codes.get(study.basis).fixed_base_period(building.height, building.lateral_system)


def superstructure(study: Study):
    """Shear building above the isolators: floor masses [t], storey heights [m],
    storey stiffnesses falling linearly with height, scaled to the fixed-base period."""
    from isolation.dynamics.structure import ShearBuilding

    building = study.building
    masses = [w / GRAVITY for w in building.floor_weights]
    period, _ = fixed_base_period(study)
    return ShearBuilding.from_period(period, masses, building.storey_heights, profile="linear",
                                     damping=building.damping)


def design_alternative(study: Study, sets: dict, system, spectrum, t_fb: float, bounds=None):
    """Code report for all property sets; returns (report, quantities, elf_permitted, elf_reasons).

    ``bounds`` (a :class:`isolation.design.BoundsResult` of ``sets`` under ``spectrum`` with the
    basis's damping rule) skips the equivalent-linear iteration (array sweeps compute it for many
    alternatives at once)."""
    return _codes.get(study.basis).design_answer(study, sets, system, spectrum, t_fb, bounds).as_tuple()
