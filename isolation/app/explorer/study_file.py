"""The explorer's current alternative as a study file.

:func:`study_mapping` gives the study as a plain mapping (the layout of a
study TOML, see ``examples/demo_study.toml``); the explorer computes through
:func:`isolation.study.parse_study` of that mapping, so the exported file
and the explorer's numbers come from one definition. :func:`study_toml`
writes it as TOML text in the chosen unit system and :func:`write_study`
saves it atomically. The project names are placeholders to be filled in.

Assumptions of the explorer's building, stated in the file: the seismic
weight W is shared equally by the base floor and every storey; storeys are of
equal height; importance factor 1.0; lateral system "other" (the fixed-base
period is given, so the code's estimate is not used).
"""

from __future__ import annotations

import datetime as _dt
from pathlib import Path
from typing import Any

import tomli_w

from isolation.app.explorer.controls import CONTROLS, STUDY_TYPES, to_display, unit_name
from isolation.codes import registry as _codes
from isolation.files import write_text_atomic

__all__ = ["study_mapping", "study_toml", "write_study"]

_BEARING_FIELDS = {  # explorer field -> (study key, kind)
    "friction pendulum": {"radius": ("radius", "length"), "friction": ("friction", "-")},
    "double concave": {"radius_1": ("radius_1", "length"), "friction_1": ("friction_1", "-"),
                       "radius_2": ("radius_2", "length"), "friction_2": ("friction_2", "-")},
    "lead rubber": {"outer_diameter": ("outer_diameter", "length"), "lead_diameter": ("lead_diameter", "length"),
                    "layer_thickness": ("layer_thickness", "length"), "layers": ("layers", "integer"),
                    "shear_modulus": ("shear_modulus", "stress")},
    "high-damping rubber": {"outer_diameter": ("outer_diameter", "length"),
                            "layer_thickness": ("layer_thickness", "length"), "layers": ("layers", "integer")},
}

STUDY_FIELDS = {  # study key path -> explorer field, for messages
    "building.storeys": "storeys", "building.plan_length": "plan_length", "building.plan_width": "plan_width",
    "building.eccentricity": "eccentricity", "building.fixed_base_period": "fixed_base_period",
    "building.response_modification": "response_modification", "building.storey_heights": "storey_height",
    "site.sms": "sms", "site.sm1": "sm1", "site.s1": "s1", "site.long_period": "long_period", "site.ag": "ag",
    "alternative[0].property_factors.lower": "lower_factor",
    "alternative[0].property_factors.upper": "upper_factor",
    "alternative[0].bearings[0].count": "bearing_count",
    "alternative[0].grid": "grid_along",
    "alternative[0].bearings[0].displacement_capacity_1": "displacement_capacity",
    "alternative[0].bearings[0].displacement_capacity_2": "displacement_capacity",
}
"""Key paths of the generated study that differ from the explorer's field names."""


_SITE_KINDS = {c.field: c.kind for c in CONTROLS if c.group == "Site"}

def _value(value: float, kind: str, system: str | None) -> Any:
    """A number as written to the study: bare SI (system None) or text with its unit."""
    if kind == "integer":
        return int(value)
    if system is None or kind in ("-", "g"):
        return float(value)
    return f"{to_display(value, kind, system):.10g} {unit_name(kind, system)}"


def study_mapping(settings, *, system: str | None = None, time_step: float | None = None) -> dict:
    """A study mapping for the explorer's current alternative.

    Parameters
    ----------
    settings : isolation.app.explorer.answers.ExplorerSettings
        The explorer's settings (SI).
    system : str or None
        None: bare numbers in SI (for computing); "SI" or "US": quantities
        written as text with units of that system and ``units`` set to it.
    time_step : float, optional
        ``analysis.time_step`` to write (omitted when None). [s]
    """
    s = settings
    q = lambda value, kind: _value(value, kind, system)  # noqa: E731
    share = s.weight / (s.storeys + 1)
    site: dict[str, Any] = {}
    for key in _codes.get(s.basis).site_inputs:  # the code's site keys the explorer has
        if hasattr(s, key):
            value, kind = getattr(s, key), _SITE_KINDS.get(key, "-")
            site[key] = value if isinstance(value, str) else (float(value) if kind in ("g", "-") else q(value, kind))
    bearing: dict[str, Any] = {"type": STUDY_TYPES[s.bearing_type], "count": int(s.bearing_count)}
    for field, (key, kind) in _BEARING_FIELDS[s.bearing_type].items():
        bearing[key] = q(getattr(s, field), kind)
    if s.bearing_type == "double concave":  # each dish allows half of the bearing's capacity
        bearing["displacement_capacity_1"] = q(s.displacement_capacity / 2.0, "length")
        bearing["displacement_capacity_2"] = q(s.displacement_capacity / 2.0, "length")
    else:
        bearing["displacement_capacity"] = q(s.displacement_capacity, "length")
    mapping: dict[str, Any] = {
        "units": system or "SI",
        "project": {"name": "Explorer alternative (name it)", "client": "to be named",
                    "prepared_by": "to be named", "revision": "A", "date": _dt.date.today()},
        "code": {"basis": s.basis},
        "site": site,
        "building": {
            "storeys": int(s.storeys),
            "floor_weights": [q(share, "weight")] * int(s.storeys),
            "base_weight": q(share, "weight"),
            "storey_heights": [q(s.storey_height, "length")] * int(s.storeys),
            "lateral_system": "other",
            "response_modification": float(s.response_modification),
            "importance": 1.0,
            "plan_length": q(s.plan_length, "length"),
            "plan_width": q(s.plan_width, "length"),
            "eccentricity": q(s.eccentricity, "length"),
            "fixed_base_period": q(s.fixed_base_period, "time"),
        },
        "alternative": [{
            "name": f"Explorer: {s.bearing_type}",
            "property_factors": {"lower": float(s.lower_factor), "upper": float(s.upper_factor)},
            "bearings": [bearing],
        }],
    }
    if s.grid_along:
        mapping["alternative"][0]["grid"] = [int(s.grid_along), int(s.bearing_count) // int(s.grid_along)]
    if time_step is not None:
        mapping["analysis"] = {"time_step": q(time_step, "time")}
    return mapping


_HEADER = """\
# Study file exported by the isolation explorer ({when}).
# Scope: a feasibility study of seismic base isolation, not construction design.
# Verify every result against the governing local code with a licensed
# structural engineer. Fill in the project names before a report is made.
#
# Explorer assumptions written out here: the seismic weight W = {weight} is shared
# equally by the base floor and the {storeys} storeys above it; storeys of equal
# height; importance factor 1.0; fixed-base period given; one bearing type, all
# bearings alike with equal shares of the weight. Check them against the building.
"""


def _time_step(settings) -> float:
    """analysis.time_step that resolves the superstructure (dt <= T_min/20, 0.001-0.005 s). [s]"""
    import numpy as np

    from isolation.study import parse_study
    from isolation.study.assembly import superstructure

    study = parse_study(study_mapping(settings), "<explorer>")
    shortest = float(np.min(superstructure(study).modal().periods))
    return float(min(0.005, max(0.001, np.floor(shortest / 20.0 * 1e4) / 1e4)))


def study_toml(settings, *, system: str | None = None) -> str:
    """The current alternative as study TOML text.

    Parameters
    ----------
    settings : isolation.app.explorer.answers.ExplorerSettings
    system : str, optional
        "SI" or "US" for the file's quantities; default ``settings.units``.
    """
    system = system or settings.units
    mapping = study_mapping(settings, system=system, time_step=_time_step(settings))
    weight = f"{to_display(settings.weight, 'weight', system):.6g} {unit_name('weight', system)}"
    header = _HEADER.format(when=_dt.date.today().isoformat(), weight=weight, storeys=settings.storeys)
    return header + "\n" + tomli_w.dumps(mapping)


def write_study(settings, path: str | Path, *, system: str | None = None) -> Path:
    """Write :func:`study_toml` to ``path`` atomically; returns the path.

    Parameters
    ----------
    settings : isolation.app.explorer.answers.ExplorerSettings
    path : str or Path
        File to write (its folder must exist).
    system : str, optional
        "SI" or "US"; default ``settings.units``.
    """
    path = Path(path)
    write_text_atomic(path, study_toml(settings, system=system))
    return path
