"""The explorer's trade-off: displacement against base shear while one bearing parameter is swept.

:func:`trade_off` answers :func:`isolation.app.explorer.answers.explore` at values
spread over the control's range. Re-exported from :mod:`isolation.app.explorer.answers`.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import TYPE_CHECKING

import numpy as np

from isolation import validate

if TYPE_CHECKING:
    from isolation.app.explorer.answers import ExplorerSettings

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
    from isolation.app.explorer.answers import _CONTROL

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
    """
    from isolation.app.explorer.answers import TRADE_OFF_PARAMETERS, explore
    from isolation.errors import RunError

    allowed = TRADE_OFF_PARAMETERS[settings.bearing_type]
    parameter = parameter or allowed[0]
    validate.one_of("parameter", parameter, allowed)
    if isinstance(count, bool) or int(count) != count or count < 2:
        raise ValueError(f"count = {count!r} is not allowed: must be a whole number >= 2")
    from isolation.app.explorer.answers import _CONTROL

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
    for i, value in enumerate(values):
        try:
            answer = explore(settings, **_swept(settings, parameter, float(value)))
        except (ValueError, RunError):
            continue
        displacement[i] = answer.quantities["total_displacement"]
        shear[i] = answer.results["upper"].base_shear / settings.weight
    return TradeOff(parameter, values, displacement, shear)
