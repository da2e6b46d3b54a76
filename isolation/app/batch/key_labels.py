"""Varied keys of a batch as an engineer reads them: :func:`key_label` (re-exported by
:mod:`isolation.app.batch.maps`), used by the design-space maps and the history maps."""

from __future__ import annotations

__all__ = ["key_label"]

_KEY_NAMES = {  # last part of a key path -> (readable name, unit kind or unit)
    "radius": ("curvature radius R", "length"), "friction": ("friction coefficient μ", "-"),
    "radius_1": ("radius of dish 1 R1", "length"), "radius_2": ("radius of dish 2 R2", "length"),
    "friction_1": ("friction of dish 1 μ1", "-"), "friction_2": ("friction of dish 2 μ2", "-"),
    "outer_diameter": ("rubber diameter D_o", "length"), "lead_diameter": ("lead core diameter D_L", "length"),
    "inner_diameter": ("inner hole diameter", "length"), "layer_thickness": ("rubber layer thickness t", "length"),
    "layers": ("rubber layers N", "-"), "shear_modulus": ("rubber shear modulus G", "stress"),
    "count": ("number of bearings", "-"), "axial_load": ("axial load per bearing", "force"),
    "displacement_capacity": ("displacement capacity", "length"), "slider_height": ("slider height", "length"),
    "lower": ("lower-bound property factor", "-"), "upper": ("upper-bound property factor", "-"),
    "moat": ("moat width", "length"), "sms": ("S_MS", "g"), "sm1": ("S_M1", "g"), "s1": ("S_1", "g"),
    "ag": ("a_g", "g"), "long_period": ("long-period transition T_L", "time"),
    "fixed_base_period": ("fixed-base period T_fb", "time"), "plan_length": ("plan length", "length"),
    "plan_width": ("plan width", "length"), "eccentricity": ("eccentricity", "length"),
    "importance": ("importance factor", "-"), "response_modification": ("R of the fixed base", "-"),
    "base_weight": ("base floor weight", "weight"), "storeys": ("storeys", "-"),
    "base_shear": ("wind base shear", "force"),
}


def key_label(key: str, units: str = "SI") -> str:
    """A varied key path as an engineer reads it, with its unit.

    ``"alternative.0.bearings.0.radius"`` -> ``"curvature radius R [m] (alternative 1, bearings 1)"``.

    Parameters
    ----------
    key : str
        Dotted key path of a batch's ``[grid]`` or ``[[variant]]``.
    units : str
        "SI" or "US": the study's system, in which bare numbers are read.
    """
    from isolation.units import BARE_UNITS

    parts = str(key).split(".")
    name, kind = _KEY_NAMES.get(parts[-1], (parts[-1].replace("_", " "), "-"))
    unit = BARE_UNITS.get(units, BARE_UNITS["SI"]).get(kind, kind)
    where = []
    if parts[0] == "alternative" and len(parts) > 2 and parts[1].isdigit():
        where.append(f"alternative {int(parts[1]) + 1}")
        if "bearings" in parts:
            index = parts[parts.index("bearings") + 1]
            if index.isdigit():
                where.append(f"bearings {int(index) + 1}")
    elif parts[0] in ("site", "building", "analysis", "wind") and len(parts) > 1:
        where.append(parts[0])
    return f"{name} [{unit}]" + (f" ({', '.join(where)})" if where else "")
