"""Code bases as peers: one object per design code behind one interface, found by name.

``isolation.codes.get(study.basis)`` answers the :class:`~isolation.codes.basis.CodeBasis`
of a study (``"asce7"``: ASCE/SEI 7-16 in :mod:`~isolation.codes.asce7_basis`, with the
Ch. 17 report in :mod:`~isolation.codes.asce7` and §12.8 in
:mod:`~isolation.codes.asce7_fixed_base`; ``"eurocode"``: EN 1998-1 in
:mod:`~isolation.codes.eurocode_basis` with :mod:`~isolation.codes.eurocode`);
``register(name, basis)`` adds one. Outside this folder no module compares a basis name.
"""

from isolation.codes.basis import COMMON_QUANTITIES, CodeBasis, DesignAnswer, SingleModeReport, SuiteRules
from isolation.codes.registry import (
                                      DEFAULT_BASIS,
                                      ENTRY_POINT_GROUP,
                                      UnknownBasisError,
                                      get,
                                      names,
                                      register,
                                      unregister,
)

__all__ = ["CodeBasis", "SuiteRules", "SingleModeReport", "DesignAnswer", "COMMON_QUANTITIES", "DEFAULT_BASIS",
           "ENTRY_POINT_GROUP", "UnknownBasisError", "get", "names", "register", "unregister"]
