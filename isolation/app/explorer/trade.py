"""The explorer's trade-off: displacement against base shear while one bearing parameter is swept.

:func:`trade_off` answers :func:`isolation.app.explorer.answers.explore` at values
spread over the control's range. Re-exported from :mod:`isolation.app.explorer.answers`.
"""

from __future__ import annotations

from dataclasses import dataclass, replace
from typing import TYPE_CHECKING

import numpy as np

from isolation import validate
from isolation.app.explorer.controls import _CONTROL, TRADE_OFF_PARAMETERS

if TYPE_CHECKING:
    from isolation.app.explorer.calculation import ExplorerSettings

__all__ = ["TradeOff", "trade_off"]


@dataclass(frozen=True)
class TradeOff:
    """Displacement against base shear while one bearing parameter is swept.

    Attributes
    ----------
    parameter : str
        The swept setting (see :data:`TRADE_OFF_PARAMETERS`).
    values : ndarray
        Its values, increasing, the current one among them. [SI unit of the setting]
    total_displacement : ndarray
        D_TM at each value (NaN where no answer). [m]
    base_shear_coefficient : ndarray
        Upper-bound V_b/W at each value (NaN where no answer). [-]
    """

    parameter: str
    values: np.ndarray
    total_displacement: np.ndarray
    base_shear_coefficient: np.ndarray


def _swept(settings: ExplorerSettings, parameter: str, value: float) -> dict:
    if settings.bearing_type == "double concave" and parameter in ("friction", "radius"):
        return {f"{parameter}_1": value, f"{parameter}_2": value}
    return {parameter: int(round(value)) if _CONTROL[parameter].integer else value}


def trade_off(settings: ExplorerSettings, parameter: str | None = None, count: int = 9) -> TradeOff:
    """Sweep one bearing parameter over its control's range and answer at each value.

    Parameters
    ----------
    settings : ExplorerSettings
        Everything else stays as set.
    parameter : str, optional
        One of ``TRADE_OFF_PARAMETERS[settings.bearing_type]``; default the first.
    count : int
        Number of values spread over the range, >= 2; the current value is added. [-]

    Notes
    -----
    All points run through the array kernel at once
    (:func:`isolation.design.array_kernel.design_bounds_many`), then each point's code report takes
    its bounds; the numbers equal :func:`isolation.app.explorer.answers.explore` at each value to
    round-off.
    """
    from isolation.errors import RunError

    allowed = TRADE_OFF_PARAMETERS[settings.bearing_type]
    parameter = parameter or allowed[0]
    validate.one_of("parameter", parameter, allowed)
    if isinstance(count, bool) or int(count) != count or count < 2:
        raise ValueError(f"count = {count!r} is not allowed: must be a whole number >= 2")
    key = f"{parameter}_1" if settings.bearing_type == "double concave" and parameter != "layers" else parameter
    control = _CONTROL[key]
    high = control.high
    if parameter == "lead_diameter":  # a core wider than half the bearing is not made (common practice)
        high = min(high, 0.5 * settings.outer_diameter)
    current = float(getattr(settings, key))
    values = np.unique(np.append(np.linspace(control.low, high, int(count)), current))
    if control.integer:
        values = np.unique(np.round(values))
    displacement = np.full(values.shape, np.nan)
    shear = np.full(values.shape, np.nan)
    # Every point's bearing through the array kernel at once (isolation.design.array_kernel, equal to the
    # scalar iteration of explore() to round-off), then each point's code report from its bounds.
    from isolation.design.array_kernel import design_bounds_many
    from isolation.study.assembly import design_alternative, isolation_system, site_spectrum

    points = []  # (index, study, system, property sets)
    for i, value in enumerate(values):
        try:
            study = replace(settings, **_swept(settings, parameter, float(value))).study()
            system = isolation_system(study.alternatives[0])
            points.append((i, study, system, system.property_sets(study.building.total_weight)))
        except (ValueError, RunError):
            continue
    if not points:
        return TradeOff(parameter, values, displacement, shear)
    study = points[0][1]  # the swept bearing changes neither the site nor the building
    spectrum, weight = site_spectrum(study), study.building.total_weight
    rule = spectrum.rule  # the damping rule of the study's code basis, as the scalar path takes it
    bounds: list = []
    try:
        bounds = list(design_bounds_many([sets for *_, sets in points], weight, spectrum, rule))
    except (ValueError, RunError):  # a point without an answer: each alone, so the others still count
        bounds = []
        for *_, sets in points:
            try:
                bounds.append(design_bounds_many([sets], weight, spectrum, rule)[0])
            except (ValueError, RunError):
                bounds.append(None)
    for (i, study, system, sets), found in zip(points, bounds, strict=True):
        if found is None:
            continue
        try:
            report, quantities, _, _ = design_alternative(study, sets, system, spectrum,
                                                          settings.fixed_base_period, bounds=found)
        except (ValueError, RunError):
            continue
        displacement[i] = quantities["total_displacement"]
        shear[i] = report.bounds.results["upper"].base_shear / settings.weight
    return TradeOff(parameter, values, displacement, shear)
