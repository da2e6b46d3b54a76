"""Checks of a valid study against its own models, before anything runs (:func:`check_study`).

Every failure a run would meet because of its input is an
:class:`isolation.errors.InputError` here, naming the keys: a time step the
engine would need too many sub-steps for, a bearing that cannot be built, a
code design that fails, isolated periods the motion suite cannot cover.
Re-exported from :mod:`isolation.study.assembly`.

Scope: a feasibility study, not construction design; a licensed engineer
checks every value against the governing local code.
"""

from __future__ import annotations

import numpy as np

from isolation.study import Study
from isolation.study.blocks import (
    design_alternative,
    fixed_base_period,
    isolation_system,
    site_spectrum,
    superstructure,
)
from isolation.study.suite_settings import suite_options

__all__ = ["check_study", "MAX_SUBSTEPS"]


def check_study(study: Study, *, design: bool = True) -> None:
    """Checks of a valid study against its own models, before anything runs.

    Raises :class:`isolation.errors.InputError` naming the key when the time
    step cannot resolve the superstructure, a bearing cannot be built, or
    (``design=True``) an alternative's code design cannot be done or gives
    isolated periods the study's motion suite cannot cover: every failure a
    run would meet because of its input is found here.
    """
    from isolation.errors import InputError

    _remembered(("time step", study.basis, study.building, study.analysis),
                lambda: _check_time_step(study, superstructure(study)))
    systems = []
    for i, alternative in enumerate(study.alternatives):
        try:
            systems.append(isolation_system(alternative))
        except ValueError as error:
            raise InputError(f"alternative[{i}] ({alternative.name!r}): {' '.join(str(error).split())}") from None
    if design:
        _check_design(study, systems)


_WHICH_KEYS = ("check building.floor_weights, building.base_weight and the bearing keys of "
               "alternative[{i}] (units?)")


_REMEMBERED: dict = {}
_REMEMBER_LIMIT = 2048


def _remembered(key: tuple, work):
    """``work()``'s result (or the InputError it raised) for inputs seen before: a batch's
    variants share most of their study, so each distinct part is checked once."""
    from isolation.errors import InputError

    text = repr(key)  # frozen dataclasses of plain values: the repr is exact
    if text in _REMEMBERED:
        kind, value = _REMEMBERED[text]
        if kind == "error":
            raise InputError(value)
        return value
    try:
        value = work()
    except InputError as error:
        _store(text, ("error", str(error)))
        raise
    _store(text, ("value", value))
    return value


def _store(text: str, entry: tuple) -> None:
    if len(_REMEMBERED) >= _REMEMBER_LIMIT:
        _REMEMBERED.pop(next(iter(_REMEMBERED)))
    _REMEMBERED[text] = entry


def _check_design(study: Study, systems: list) -> None:
    """Each alternative's code design, and its isolated periods against the motion suite."""
    from isolation.errors import InputError, RunError

    spectrum = site_spectrum(study)
    t_fb, source = fixed_base_period(study)
    low, high = spectrum.period_range
    if not low <= t_fb <= high:
        given = study.building.fixed_base_period is not None
        raise InputError(
            f"building.fixed_base_period = {t_fb:.4g} s ({source}) is not allowed: must lie in the site "
            f"spectrum's period range [{low:g}, {high:g}] s; "
            + ("give a shorter fixed_base_period" if given else
               f"the building is {study.building.height:g} m tall: check building.storeys and "
               "building.storey_heights, or give building.fixed_base_period"))
    weight = study.building.total_weight
    periods = []
    for i, (alternative, system) in enumerate(zip(study.alternatives, systems, strict=True)):
        def design(i=i, alternative=alternative, system=system):
            try:
                sets = system.property_sets(weight)
                report = design_alternative(study, sets, system, spectrum, t_fb)[0]
                bounds = report.bounds.results
                return (float(bounds["upper"].period), float(bounds["lower"].period))
            except (ValueError, RunError, ArithmeticError) as error:
                tabulated = (f"; or site.spectrum_file, whose periods end at {high:g} s"
                             if study.site.spectrum_periods else "")
                raise InputError(f"alternative[{i}] ({alternative.name!r}) is not allowed with these inputs: its "
                                 f"code design fails ({' '.join(str(error).split())}); "
                                 + _WHICH_KEYS.format(i=i) + tabulated) from None

        pair = _remembered(("design", i, study.basis, study.site, study.building, study.analysis,
                            study.wind_base_shear, alternative), design)
        quick = _uncovered(study, spectrum, pair)
        if quick is not None:
            raise InputError(
                f"alternative[{i}] ({alternative.name!r}) is not allowed with these inputs: its isolated "
                f"period T_M = {pair[0]:.3g}-{pair[1]:.3g} s (upper-lower bound) lies outside what the "
                f"study's motion suite can cover (analysis.time_step = {study.analysis.time_step:g} s, "
                f"analysis.duration = {study.analysis.duration:g} s{', quick runs' if quick else ''}; "
                f"an isolated building has T_M of about 1.5-6 s); "
                + _WHICH_KEYS.format(i=i)) from None
        periods.append(pair)
    if len(periods) > 1:
        pair = (min(p[0] for p in periods), max(p[1] for p in periods))
        if _uncovered(study, spectrum, pair) is not None:
            raise InputError(
                f"alternative = the alternatives together are not allowed: their isolated periods "
                f"T_M = {pair[0]:.3g}-{pair[1]:.3g} s span more than one motion suite can cover "
                f"(analysis.time_step = {study.analysis.time_step:g} s, analysis.duration = "
                f"{study.analysis.duration:g} s); study them in separate files") from None


def _uncovered(study: Study, spectrum, pair: tuple) -> bool | None:
    """The first suite setting (quick False, then True) whose matched band cannot hold the check range
    around the isolated periods ``pair`` (T_M upper, T_M lower) [s]; None when both can."""
    from isolation.motions.matching import _band

    for quick in (False, True):
        options, _ = suite_options(study, spectrum, pair, quick)
        try:
            _band(spectrum, options["dt"], options["duration"], options.get("period_range"),
                  options["isolated_period"], options["rule"])
        except ValueError:
            return quick
    return None


MAX_SUBSTEPS = 50
"""Most sub-steps per motion sample the engine is asked to take (a stiffer building is implausible). [-]"""


def _check_time_step(study: Study, structure) -> None:
    """The engine sub-steps a motion whose step exceeds T_min/10 (ground motion interpolated inside the
    step); only a building so stiff that it would need more than :data:`MAX_SUBSTEPS` sub-steps per
    sample of analysis.time_step is refused, naming the building keys."""
    from isolation.dynamics.history import DT_FRACTION
    from isolation.dynamics.newmark import substeps
    from isolation.errors import InputError

    shortest = float(np.min(structure.modal().periods))
    needed = substeps(study.analysis.time_step, shortest, DT_FRACTION)
    if needed > MAX_SUBSTEPS:
        raise InputError(f"building: its shortest fixed-base period T_min = {shortest:.4g} s would need "
                         f"{needed} sub-steps of <= T_min/{DT_FRACTION:g} = {shortest / DT_FRACTION:.3g} s per "
                         f"analysis.time_step = {study.analysis.time_step:g} s (at most {MAX_SUBSTEPS} allowed); "
                         "not allowed: check "
                         "building.fixed_base_period, building.storeys, building.floor_weights and "
                         "building.storey_heights")
