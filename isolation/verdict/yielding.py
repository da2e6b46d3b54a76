"""Verdict rule on yielding: the isolated superstructure against the code-designed fixed base.

One pure function over plain numbers, like :mod:`isolation.verdict.rules`;
re-exported from :mod:`isolation.verdict`.
"""

from __future__ import annotations

from isolation.codes import registry as _codes
from isolation.codes.registry import DEFAULT_BASIS
from isolation.verdict.rules import Reason

__all__ = ["superstructure_yielding", "YIELDING_SOURCES"]

YIELDING_SOURCES = _codes.PerBasis(lambda basis: basis.yielding_source)
"""Source of the limits per code basis (:attr:`isolation.codes.basis.CodeBasis.yielding_source`)."""


def superstructure_yielding(ductility_isolated: float | None, residual_drift_isolated: float | None,
                            ductility_fixed: float | None = None,
                            residual_drift_fixed: float | None = None, *, basis: str = DEFAULT_BASIS,
                            model: str = "") -> Reason | None:
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
    model : str
        What the numbers come from, quoted in the message when given (e.g. the plan model). [-]
    """
    source = _codes.get(basis, "basis").yielding_source
    if ductility_isolated is None or residual_drift_isolated is None:
        return None
    text = (f"the isolated superstructure reaches storey ductility {ductility_isolated:.2f} and residual drift "
            f"{100 * residual_drift_isolated:.2f} %" + (f" ({model})" if model else ""))
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
