"""The single-mode report of every code basis: one type, common names, one ``permitted`` flag.

:class:`SingleModeReport` is what :meth:`isolation.codes.basis.CodeBasis.design_report`
answers; ``isolation.codes.asce7.ElfReport`` and ``isolation.codes.eurocode.EurocodeReport``
are its thin subclasses (their symbols, and their earlier names of the flag).
"""

from __future__ import annotations

from dataclasses import dataclass, field, fields
from typing import Any, ClassVar, Mapping

from isolation.plain import plain

__all__ = ["SingleModeReport", "DesignAnswer", "COMMON_QUANTITIES"]

COMMON_QUANTITIES = ("displacement", "total_displacement", "period", "isolation_shear", "unreduced_shear",
                     "superstructure_shear", "fixed_base_shear", "shear_ratio")
"""Common names of the single-mode quantities every basis maps to its own symbols (e.g.
``displacement`` is D_M in ASCE/SEI 7 and d_dc in EN 1998-1)."""


@dataclass(frozen=True)
class SingleModeReport:
    """Single-mode (equivalent lateral force / simplified) report of one code basis.

    Attributes
    ----------
    bounds : BoundsResult
        Equivalent-linear results of all property sets.
    building : object
        The building data the code procedure used.
    quantities : tuple of Item
        Every reported number with its symbol, unit and source.
    applicability : tuple of Check
        Conditions under which the code permits the single-mode procedure.
    warnings : tuple of str
        Each failed condition and its consequence.
    permitted : bool
        True when the code permits the single-mode procedure for this design.
    checks : tuple of Check
        Further checks (e.g. the drift estimate).
    storey_forces : tuple
        Lateral force per level of the code's distribution (empty when the code gives none).
    fixed_base : object or None
        The fixed-base comparison shear, when the code procedure computes it.
    """

    bounds: Any
    building: Any
    quantities: tuple
    applicability: tuple
    warnings: tuple
    permitted: bool
    checks: tuple = ()
    storey_forces: tuple = ()
    fixed_base: Any = None
    scope: str = ("Concept-stage feasibility, not construction design; verify against the local code "
                  "with a licensed structural engineer.")

    #: common name -> the code's symbol (see :data:`COMMON_QUANTITIES`)
    SYMBOLS: ClassVar[Mapping[str, str]] = {}
    #: keys of :meth:`to_dict`, each an attribute (a subclass keeps the layout of its earlier report)
    DICT_FIELDS: ClassVar[tuple] = ()

    def value(self, symbol: str) -> float:
        """Value of the quantity with this symbol (e.g. "D_TM")."""
        for item in self.quantities:
            if item.symbol == symbol:
                return item.value
        raise KeyError(f"symbol = {symbol!r} is not in the report: known {[i.symbol for i in self.quantities]}")

    def common(self, name: str) -> float | None:
        """Value of a common quantity (:data:`COMMON_QUANTITIES`), None when the code reports none."""
        symbol = self.SYMBOLS.get(name)
        if symbol is None:
            return None
        try:
            return self.value(symbol)
        except KeyError:
            return None

    @property
    def D_M(self) -> float | None:  # noqa: N802 - the code's symbol
        """Design displacement at the stiffness centre (D_M, d_dc). [m]"""
        return self.common("displacement")

    @property
    def D_TM(self) -> float | None:  # noqa: N802
        """Total design displacement with torsion (D_TM, d_d). [m]"""
        return self.common("total_displacement")

    @property
    def V_b(self) -> float | None:  # noqa: N802
        """Shear of the isolation system. [kN]"""
        return self.common("isolation_shear")

    @property
    def V_st(self) -> float | None:  # noqa: N802
        """Unreduced superstructure shear (None where the code has none). [kN]"""
        return self.common("unreduced_shear")

    @property
    def V_s(self) -> float | None:  # noqa: N802
        """Design shear of the isolated superstructure. [kN]"""
        return self.common("superstructure_shear")

    @property
    def F_x(self) -> tuple:  # noqa: N802
        """Lateral force per level above the base, bottom up (empty where the code gives none). [kN]"""
        return tuple(s.force for s in self.storey_forces)

    @property
    def drift(self) -> float | None:
        """Largest storey drift ratio estimate of the report (None where the code gives none). [-]"""
        return max((s.drift_ratio for s in self.storey_forces), default=None)

    def to_dict(self) -> dict:
        names = self.DICT_FIELDS or tuple(f.name for f in fields(self))
        return {name: plain(getattr(self, name), keep_nonfinite=True) for name in names}


@dataclass(frozen=True)
class DesignAnswer:
    """What a study takes from the single-mode report of one alternative.

    Attributes
    ----------
    report : SingleModeReport
    quantities : dict
        Common name -> value (displacement, total_displacement, isolation_shear,
        superstructure_shear, fixed_base_shear, shear_ratio; None when absent). [m, kN, -]
    permitted : bool
    reasons : tuple of str
        Names of the failed applicability conditions.
    """

    report: Any
    quantities: dict
    permitted: bool
    reasons: tuple = field(default=())

    def as_tuple(self) -> tuple:
        """(report, quantities, permitted, reasons), the layout of ``design_alternative``."""
        return self.report, self.quantities, self.permitted, self.reasons
