"""Tables of the comparison with the code-designed, yielding fixed-base building.

From :class:`isolation.study.runner.StudyResults` / ``AlternativeResults`` or their
``to_dict()`` forms: the fixed-base design and its code drift check, the
yielding response of every case beside the elastic fixed base (second view),
and damage indicators against published damage-state medians.
"""

from __future__ import annotations

from typing import Any, Mapping

from isolation.codes import registry as _codes
from isolation.output.tables.table import Table

__all__ = ["fixed_base_design_table", "yielding_response_table", "damage_table", "fixed_base_label"]

_CASES = (("fixed", "Fixed base, code design"), ("lower", "Isolated, lower"), ("upper", "Isolated, upper"),
          ("fixed_elastic", "Fixed base, elastic (2nd view)"))


def _part(obj: Any, name: str) -> Any:
    return obj[name] if isinstance(obj, Mapping) else getattr(obj, name)


def _display(value, kind: str, system: str):
    from isolation.units import to_display

    if value is None:
        return None, to_display(1.0, kind, system)[1]
    return to_display(float(value), kind, system)


def fixed_base_label(results: Any) -> str:
    """How the report names the fixed-base building it compares against."""
    comparison = _part(results, "fixed_base").get("comparison", {})
    return ("the code-designed fixed-base building (yielding)" if comparison.get("yielding", False)
            else "the fixed-base building (elastic)")


def fixed_base_design_table(results: Any) -> Table:
    """Storey by storey: design force and shear, yield shear, code drift check and stability coefficient."""
    study = _part(results, "study")
    system = study.get("units", "SI")
    comparison = _part(results, "fixed_base")["comparison"]
    design, drift, factors = comparison["design"], comparison["drift_check"], comparison["factors"]
    force = _display(1.0, "force", system)[1]
    rows = []
    for i in range(len(design["forces"])):
        rows.append((i + 1, _display(design["forces"][i], "force", system)[0],
                     _display(design["storey_shears"][i], "force", system)[0],
                     _display(design["yield_shears"][i], "force", system)[0],
                     100 * drift["design_drift_ratios"][i], 100 * drift["limit"], drift["stability"][i]))
    checked = _codes.get_or_default(study.get("basis")).drift_formula
    strength = "given in the study" if design.get("given") else \
        f"{factors['overstrength']:g} x design storey shear"
    verdict = "passes" if drift["passed"] else "does NOT pass"
    notes = (f"Design: {design['source']}. Yield shear: {strength}. Drift check ({checked}) {verdict}: "
             f"{drift['source']}. Stability coefficient theta against {drift['stability_limit']:.3g}. "
             "Strength design of members, capacity design and the real overstrength are for the designer.")
    if comparison.get("p_delta_notes"):
        notes += " P-delta in the yielding model: " + "; ".join(comparison["p_delta_notes"]) + "."
    return Table(columns=("Storey", f"Design force [{force}]", f"Design storey shear [{force}]",
                          f"Yield shear [{force}]", "Code drift ratio [%]", "Allowed [%]", "theta [-]"),
                 rows=tuple(rows), align="rrrrrrr", notes=notes,
                 caption="Code-designed fixed-base building: storey strengths and drift check")


def _cases(indicators: Mapping) -> tuple:
    """Columns by case; an elastic comparison building has one fixed-base column, named so."""
    if indicators.get("fixed", {}).get("shear_over_strength") is None:
        return (("fixed", "Fixed base, elastic"),) + _CASES[1:3]
    return _CASES


def _value(indicators: Mapping, case: str, name: str, scale: float = 1.0):
    value = indicators.get(case, {}).get(name)
    return None if value is None else scale * value


def yielding_response_table(alternative: Any, system: str = "SI") -> Table:
    """Suite means of the peak responses: yielding fixed base, isolated bounds, elastic fixed base."""
    history = _part(alternative, "history")
    ind, summary = history["indicators"], history["summary"]
    force = _display(1.0, "force", system)[1]
    cases = _cases(ind)

    def forces(case):
        value = ind.get(case, {}).get("storey_shear")
        return None if value is None else _display(value[0], "force", system)[0]

    design = {"fixed": summary.get("design_shear_fixed"), "lower": summary.get("design_shear_isolated"),
              "upper": summary.get("design_shear_isolated"), "fixed_elastic": summary.get("design_shear_fixed")}
    rows = [
        ("Storey drift ratio [%]",) + tuple(_value(ind, c, "drift_ratio_max", 100) for c, _ in cases),
        ("Residual drift ratio [%]",) + tuple(_value(ind, c, "residual_drift_max", 100) for c, _ in cases),
        ("Storey ductility demand [-]",) + tuple(_value(ind, c, "ductility_max") for c, _ in cases),
        ("Storey shear / yield shear [-]",) + tuple(_value(ind, c, "shear_over_strength_max")
                                                               for c, _ in cases),
        ("Peak floor acceleration [g]",) + tuple(_value(ind, c, "floor_acceleration_max") for c, _ in cases),
        (f"First-storey shear, response [{force}]",) + tuple(forces(c) for c, _ in cases),
        (f"Base shear, code design [{force}]",) + tuple(
            None if design[c] is None else _display(design[c], "force", system)[0] for c, _ in cases),
    ]
    return Table(columns=("Largest over the storeys",) + tuple(label for _, label in cases),
                 rows=tuple(rows), align="l" + "r" * len(cases),
                 caption="Isolated building against the code-designed fixed-base building, "
                         f"{_part(alternative, 'name')}",
                 notes="Suite means of the peaks, the largest storey or floor. Fixed base, code design: storeys yield "
                       "at the design storey shear times the system "
                       "overstrength (bilinear, P-delta). Isolated: the superstructure yields at its own design "
                       "shear V_s times the same overstrength. The elastic fixed base (unreduced, never yields) "
                       "is a second view only. Ductility: peak storey drift over yield drift; '--' where the "
                       "storeys stay elastic or the quantity does not apply. Residual drift: at the end of each "
                       "record.")


def damage_table(results: Any, alternative: Any) -> Table:
    """Damage states the suite-mean peaks reach, against published damage-state medians."""
    thresholds = _part(results, "fixed_base")["damage_thresholds"]
    ind = _part(alternative, "history")["indicators"]
    rows = []
    for case, label in _cases(ind):
        if case not in ind:
            continue
        damage = ind[case]["damage"]
        rows.append((label, 100 * ind[case]["drift_ratio_max"], damage["structural"], damage["nonstructural_drift"],
                     ind[case]["floor_acceleration_max"], damage["nonstructural_acceleration"]))

    def medians(values, scale=1.0, digits=2):
        return " / ".join(f"{scale * v:.{digits}f}" for v in values)

    notes = (f"Damage-state medians (slight / moderate / extensive / complete) for model building type "
             f"{thresholds['building_type']}, {thresholds['design_level']} code: structural drift "
             f"{medians(thresholds['structural_drift'], 100)} %, non-structural drift "
             f"{medians(thresholds['nonstructural_drift'], 100)} %, floor acceleration "
             f"{medians(thresholds['floor_acceleration'])} g. Source: {thresholds['source']}. A suite mean at a "
             "median means about even odds of reaching that state; an indicator, not a loss estimate.")
    return Table(columns=("Case", "Drift ratio [%]", "Structural", "Non-structural (drift)",
                          "Floor acceleration [g]", "Non-structural (acceleration)"),
                 rows=tuple(rows), align="lrlrrl", notes=notes,
                 caption=f"Damage indicators, {_part(alternative, 'name')}")
