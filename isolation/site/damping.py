"""Damping modification rules: Sa(beta) = Sa(5 %) / B(beta).

* ``"asce7"`` - B_M of ASCE/SEI 7-16 Table 17.5-1, linear between rows;
* ``"eurocode"`` - B = 1/eta with eta = sqrt(10/(5 + xi)) >= 0.55
  (EN 1998-1:2004 §3.2.2.2);
* ``"aashto"`` - B_L = (beta/0.05)^0.3 <= 1.7 (AASHTO Guide Specifications
  for Seismic Isolation Design).

Every name here is re-exported from :mod:`isolation.site.spectra`, whose spectra
apply these rules.

References
----------
ASCE/SEI 7-16, Table 17.5-1.
EN 1998-1:2004, Eurocode 8, Part 1, §3.2.2.2.
AASHTO, Guide Specifications for Seismic Isolation Design.
"""

from __future__ import annotations

from typing import Any

import numpy as np

from isolation import validate
from isolation.codes import registry as _codes

__all__ = ["RULES", "rules", "damping_coefficient", "eurocode_eta", "b_m", "b_l"]

AASHTO = "aashto"
"""Name of the AASHTO damping rule (not a code basis of the package)."""


def rules() -> tuple:
    """Names of the damping modification rules: those of the registered code bases, then AASHTO."""
    return tuple(_codes.damping_rules()) + (AASHTO,)


RULES = _codes.LiveNames(rules)
"""Names of the damping modification rules (computed on use, so that a code basis registered later counts)."""

# ASCE/SEI 7-16 Table 17.5-1: damping ratio [-] -> B_M [-]; linear between rows, clamped.
_ASCE7_DAMPING = np.array([0.02, 0.05, 0.10, 0.20, 0.30, 0.40, 0.50])
_ASCE7_FACTOR = np.array([0.8, 1.0, 1.2, 1.5, 1.7, 1.9, 2.0])

# Lowest damping used in the AASHTO formula (common practice; B_L -> 0 as beta -> 0).
_AASHTO_FLOOR = 0.02


def _checked_array(field: str, values: Any, unit: str) -> np.ndarray:
    """Float array of ``values``; a scalar gets the scalar message (no index)."""
    if np.ndim(values) == 0 and not isinstance(values, np.ndarray):
        return np.asarray(validate.finite(field, values, unit))
    return validate.finite_array(field, values, unit)


def _damping_array(beta: Any) -> np.ndarray:
    array = _checked_array("damping", beta, "-")
    bad = (array < 0.0) | (array > 1.0)
    if bad.any():
        value = array[tuple(np.argwhere(bad)[0])] if array.ndim else float(array)
        raise ValueError(
            f"damping = {float(value)!r} is not allowed: must be a damping ratio in [0, 1] "
            "(0.05 means 5 %) [-]"
        )
    return array


def _unwrap(array: np.ndarray):
    return float(array) if np.ndim(array) == 0 else array


def b_m(beta):
    """B_M of ASCE/SEI 7-16 Table 17.5-1, linear between rows, clamped to 0.8 below 2 % and 2.0 above 50 %.

    Parameters
    ----------
    beta : float or array
        Effective damping ratio, 0 <= beta <= 1. [-]

    Returns
    -------
    float or array
        B_M. [-]
    """
    return _unwrap(np.asarray(_b_m(_damping_array(beta)), dtype=float))


def _b_m(b: np.ndarray) -> np.ndarray:
    """B_M of checked damping ratios ``b`` (see :func:`b_m`)."""
    return np.interp(b, _ASCE7_DAMPING, _ASCE7_FACTOR)


def _eta(b: np.ndarray) -> np.ndarray:
    """eta of checked damping ratios ``b`` (see :func:`eurocode_eta`)."""
    return np.maximum(np.sqrt(10.0 / (5.0 + 100.0 * b)), 0.55)


def b_l(beta):
    """B_L = (beta/0.05)^0.3 <= 1.7 (AASHTO Guide Specifications for Seismic Isolation Design), beta >= 2 %.

    Parameters
    ----------
    beta : float or array
        Effective damping ratio, 0 <= beta <= 1. [-]

    Returns
    -------
    float or array
        B_L. [-]
    """
    b = _damping_array(beta)
    return _unwrap(np.asarray(np.minimum((np.maximum(b, _AASHTO_FLOOR) / 0.05) ** 0.3, 1.7), dtype=float))


def _rule_of(rule: str):
    """The basis whose damping rule is ``rule``, or None for AASHTO."""
    known = _codes.damping_rules()
    if rule in known:
        return known[rule]
    validate.one_of("rule", rule, rules())
    return None


def damping_coefficient(beta, rule: str = _codes.DEFAULT_BASIS):
    """Damping coefficient B: the spectral ordinate at beta is Sa(5 %)/B.

    Parameters
    ----------
    beta : float or array
        Effective damping ratio, 0 <= beta <= 1 (0.05 means 5 %). [-]
    rule : str
        The damping rule of a registered code basis
        (:meth:`isolation.codes.basis.CodeBasis.damping_coefficient`), or ``"aashto"``.
        ``"asce7"``: ASCE/SEI 7-16 Table 17.5-1 (B_M, :func:`b_m`), linear between rows,
        clamped to 0.8 below 2 % and 2.0 above 50 %.
        ``"eurocode"``: 1/eta with eta = sqrt(10/(5 + xi)) >= 0.55, xi in
        percent (EN 1998-1 §3.2.2.2).
        ``"aashto"``: B_L = (beta/0.05)^0.3 <= 1.7 (AASHTO Guide
        Specifications for Seismic Isolation Design), with beta taken
        >= 2 % so that B stays finite near zero damping (common practice,
        mirroring the 2 % end of Table 17.5-1).

    Returns
    -------
    float or array
        Damping coefficient B. [-]
    """
    basis = _rule_of(rule)
    b = _damping_array(beta)  # checked once here; a basis's coefficient takes checked ratios
    out = b_l(b) if basis is None else basis.damping_coefficient(b)
    return _unwrap(np.asarray(out, dtype=float))


def eurocode_eta(beta):
    """Damping correction factor eta = sqrt(10/(5 + xi)) >= 0.55 (EN 1998-1 §3.2.2.2).

    Parameters
    ----------
    beta : float or array
        Damping ratio, 0 <= beta <= 1 (xi = 100 beta percent). [-]

    Returns
    -------
    float or array
        eta. [-]
    """
    return _unwrap(_eta(_damping_array(beta)))
