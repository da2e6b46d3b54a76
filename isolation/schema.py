"""Descriptions of input keys, shared by the study schema and the models that declare their inputs.

A :class:`Key` says what one key of a study file accepts (a quantity kind of
:mod:`isolation.units`, a plain number, a whole number or a choice, its
allowed range in internal units); an :class:`Ordering` is a check between two
keys of one table (e.g. a slider's height below the dish radius). Bearing
types declare their keys and orderings in their own module
(:mod:`isolation.bearings.registry`); :mod:`isolation.study.keys` reads them.
This module imports nothing of the package.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Mapping

__all__ = ["Key", "Ordering"]


@dataclass(frozen=True)
class Key:
    """What a key accepts: ``kind`` is a unit kind of :mod:`isolation.units`,
    ``"number"`` (unit ``unit``), ``"integer"`` or ``"choice"`` (one of
    ``options``); range ``low``..``high`` in internal units (m, kN, kPa, s).
    A ``ratio`` also accepts a percent written as text (``"6 %"``)."""

    kind: str
    required: bool = True
    low: float | None = None
    high: float | None = None
    low_inclusive: bool = True
    unit: str = "-"
    options: tuple = ()
    ratio: bool = False


@dataclass(frozen=True)
class Ordering:
    """A check between two keys of one table: ``small`` must stay below ``large``.

    Parameters
    ----------
    small, large : str
        Key names; the check is skipped when either is absent.
    unit : str
        Internal unit both share, for the message. [-]
    strict : bool, optional
        ``small < large`` when True (default), ``small <= large`` when False.
    """

    small: str
    large: str
    unit: str
    strict: bool = True

    def problem(self, values: Mapping[str, float]) -> tuple[str, str] | None:
        """(key, message after "key = ") when the values break the ordering, else None.

        Parameters
        ----------
        values : mapping
            Validated values of the table's keys, internal units.
        """
        a, b = values.get(self.small), values.get(self.large)
        if a is None or b is None:
            return None
        if (a >= b) if self.strict else (a > b):
            relation = "<" if self.strict else "<="
            return self.small, (f"{a:.4g} {self.unit} is not allowed: must be {relation} "
                                f"{self.large} = {b:.4g} {self.unit}")
        return None
