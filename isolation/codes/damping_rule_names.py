"""Names of the damping modification rules of the two code bases, below everything that uses them.

The site spectra (:mod:`isolation.site.spectra`) take their default rule from here, and the code
bases (:mod:`isolation.codes.asce7_basis`, :mod:`isolation.codes.eurocode_basis`) declare them as
their ``damping_rule``, so that the spectra need not import the code bases (which build on the spectra).
"""

from __future__ import annotations

__all__ = ["ASCE7_RULE", "EUROCODE_RULE"]

ASCE7_RULE = "asce7"
"""The ASCE 7 rule, B_M (see :mod:`isolation.site.damping` for its source)."""

EUROCODE_RULE = "eurocode"
"""The Eurocode rule, 1/eta (see :mod:`isolation.site.damping` for its source)."""
