"""Table of the plan model's storey shears against storey strength (bidirectional runs).

From :class:`isolation.study.runner.AlternativeResults` or its ``to_dict()`` form: per storey and per
direction, the peak storey shear of the isolated superstructure (suite mean, worst over the property
sets and the accidental eccentricities), its yield shear and the ratio
(:class:`isolation.study.plan_strength.StoreyStrength`).
"""

from __future__ import annotations

from typing import Any, Mapping

from isolation.output.tables.table import Table

__all__ = ["plan_storey_table"]


def _part(obj: Any, name: str) -> Any:
    return obj[name] if isinstance(obj, Mapping) else getattr(obj, name)


def plan_storey_table(alternative: Any, system: str = "SI") -> Table | None:
    """Storey shear against storey strength in x and y, storey by storey; None without a bidirectional run.

    Parameters
    ----------
    alternative : AlternativeResults or mapping
        One alternative's results. [-]
    system : str
        "SI" or "US": units of the forces shown. [-]
    """
    from isolation.study.plan_strength import StoreyStrength
    from isolation.units import to_display

    b = (_part(alternative, "history") or {}).get("bidirectional")
    found = ((b or {}).get("storeys") or {}).get("storey_strength")
    if not found:
        return None
    strength = StoreyStrength.from_dict(found)
    unit = to_display(1.0, "force", system)[1]

    def force(value):
        return None if value is None or value == float("inf") else to_display(value, "force", system)[0]

    def nan_none(value):
        return None if value is None or value != value else value

    rows = []
    for i in range(strength.storeys):
        row: list = [i + 1]
        for shear, given, ratio in ((strength.shear_x, strength.strength_x, strength.ratio_x),
                                    (strength.shear_y, strength.strength_y, strength.ratio_y)):
            row += [force(shear[i]), None if given is None else force(given[i]),
                    None if ratio is None else nan_none(ratio[i])]
        rows.append(tuple(row))
    largest = strength.largest_ratio
    verdict = ("no storey strength given: the storeys are elastic" if largest is None else
               f"largest demand / capacity {largest:.2f}: "
               + ("the suite-mean shear reaches the yield shear (see the storey ductility)" if largest >= 1.0
                  else "the suite-mean shear stays below the yield shear in every storey (single records may "
                       "still yield; see the storey ductility)"))
    notes = ("Plan model under the matched component pairs: peak storey shear (force of the storey's x or y "
             "spring at its centre of rigidity, without damping and P-delta), suite mean, the largest over the "
             "lower and upper properties and the four accidental-eccentricity signs; capacity: the storey yield "
             f"shear the model uses (the isolated superstructure's design shear times the overstrength); {verdict}. "
             "'--': elastic storey, no ratio.")
    return Table(columns=("Storey", f"Shear x [{unit}]", f"Yield shear x [{unit}]", "Demand / capacity x [-]",
                          f"Shear y [{unit}]", f"Yield shear y [{unit}]", "Demand / capacity y [-]"),
                 rows=tuple(rows), align="rrrrrrr", notes=notes,
                 caption=f"Storey shear against storey strength, plan model, {_part(alternative, 'name')}")
