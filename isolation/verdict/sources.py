"""Where each verdict limit comes from, for each code basis.

The rules of :mod:`isolation.verdict.rules` are the same screening rules for
every study; only the clause they cite changes with the study's code basis
(``"asce7"``: ASCE/SEI 7-16 Chapter 17; ``"eurocode"``: EN 1998-1:2004
Section 10). A limit with no single source is "common practice" whatever the
basis. "From memory" means the clause was not re-read when this was written;
National Annexes may change the Eurocode values. A licensed engineer checks
every clause against the governing local code.
"""

from __future__ import annotations

from collections.abc import Mapping

from isolation.codes import registry as _codes
from isolation.codes.eurocode_basis import NONSTRUCTURAL, eurocode_reduction_factor
from isolation.codes.registry import DEFAULT_BASIS

__all__ = ["BASES", "PRACTICE", "source", "drift_limit", "NONSTRUCTURAL", "eurocode_reduction_factor"]


BASES = _codes.LiveNames(_codes.names)
"""Code bases the verdict knows: the registered ones (ASCE/SEI 7-16 and EN 1998-1:2004 built in)."""


PRACTICE = "common practice"


class _TopicTable(Mapping):
    """Verdict topic -> {basis name: source}, over the bases registered at the time of use."""

    def __getitem__(self, topic: str) -> dict:
        table = {name: _codes.get(name).sources.get(topic) for name in _codes.names()}
        if all(text is None for text in table.values()):
            raise KeyError(topic)
        return table

    def __iter__(self):
        return iter(dict.fromkeys(t for name in _codes.names() for t in _codes.get(name).sources))

    def __len__(self) -> int:
        return sum(1 for _ in self)


_SOURCES = _TopicTable()

def source(topic: str, basis: str = DEFAULT_BASIS) -> str:
    """The source of one verdict limit for the code basis.

    Parameters
    ----------
    topic : str
        A key of the source table ("period shift", "moat", "wind", ...).
    basis : str
        ``"asce7"`` or ``"eurocode"``.
    """
    return _codes.get(basis, "basis").source(topic)


def drift_limit(basis: str = DEFAULT_BASIS, nonstructural: str | None = None,
                importance: float = 1.0) -> tuple[float, str]:
    """Storey drift ratio limit [-] for the response histories and its source.

    Parameters
    ----------
    basis : str
        ``"asce7"`` (MCE_R histories, 2 %) or ``"eurocode"`` (design-action histories,
        EN 1998-1 §4.4.3.2 damage limitation).
    nonstructural : str or None
        Eurocode only: "brittle", "ductile" or "none" (see :data:`NONSTRUCTURAL`);
        the limit is alpha/nu. None keeps the earlier 2 % (alpha 0.010, nu 0.5).
    importance : float
        Eurocode only: gamma_I, which sets nu (:func:`eurocode_reduction_factor`). [-]
    """
    return _codes.get(basis, "basis").history_drift_limit(nonstructural, importance)
