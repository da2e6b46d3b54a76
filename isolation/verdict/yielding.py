"""Verdict rule on yielding: the isolated superstructure against the code-designed fixed base.

One pure function over plain numbers, like :mod:`isolation.verdict.rules`;
re-exported from :mod:`isolation.verdict`.
"""

from __future__ import annotations

from isolation.verdict.rules import Reason

__all__ = ["superstructure_yielding", "YIELDING_SOURCES"]

_RESIDUAL = ("residual drift ratio 0.5 % at which the structure needs realignment, FEMA P-58-1 (2012) "
             "residual drift damage states (from memory)")
YIELDING_SOURCES = {
    "asce7": ("common practice: R_I <= 2 (ASCE/SEI 7-16 §17.5.4.2) aims at an essentially elastic isolated "
              "superstructure, ductility demand above 2 taken as more than that (from memory); " + _RESIDUAL),
    "eurocode": ("common practice: q <= 1.5 (EN 1998-1 §10.10(5)) keeps the isolated superstructure essentially "
                 "elastic, ductility demand above 2 taken as more than that (from memory); " + _RESIDUAL),
}
"""Source of the limits per code basis."""


def superstructure_yielding(ductility_isolated: float | None, residual_drift_isolated: float | None,
                            ductility_fixed: float | None = None,
                            residual_drift_fixed: float | None = None, *, basis: str = "asce7") -> Reason | None:
    """Storey ductility and residual drift of the isolated superstructure, beside the fixed base's.

    Ductility <= 2 and residual drift < 0.5 %: ok; else a condition (more
    strength above the isolators). The fixed-base values are quoted for
    comparison only.

    Parameters
    ----------
    ductility_isolated : float or None
        Largest storey ductility demand of the isolated superstructure (suite
        mean, worse bound); None when its storeys are elastic. [-]
    residual_drift_isolated : float or None
        Largest residual storey drift ratio, isolated (suite mean). [-]
    ductility_fixed, residual_drift_fixed : float or None
        The same for the code-designed fixed-base building. [-]
    basis : str
        ``"asce7"`` or ``"eurocode"``: the clause the source cites. [-]
    """
    from isolation import validate

    source = YIELDING_SOURCES[validate.one_of("basis", basis, tuple(YIELDING_SOURCES))]
    if ductility_isolated is None or residual_drift_isolated is None:
        return None
    text = (f"the isolated superstructure reaches storey ductility {ductility_isolated:.2f} and residual drift "
            f"{100 * residual_drift_isolated:.2f} %")
    if ductility_fixed is not None and residual_drift_fixed is not None:
        text += (f", against {ductility_fixed:.2f} and {100 * residual_drift_fixed:.2f} % for the code-designed "
                 "fixed-base building")
    if residual_drift_isolated >= 0.005:
        return Reason("superstructure yielding", "condition", text + ": residual drift needs more strength or "
                      "stiffness above the isolators", residual_drift_isolated, 0.005, "-", source)
    if ductility_isolated > 2.0:
        return Reason("superstructure yielding", "condition", text + ": more than limited yielding; give the "
                      "superstructure more strength", ductility_isolated, 2.0, "-", source)
    return Reason("superstructure yielding", "ok", text, ductility_isolated, 2.0, "-", source)
