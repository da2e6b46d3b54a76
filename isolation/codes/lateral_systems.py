"""Lateral systems a study may name, and their rows in the codes' approximate-period tables.

The study's ``building.lateral_system`` choices (:data:`LATERAL_SYSTEM_ROWS`), shared by the
study reader (:mod:`isolation.study.sections`), the assembly of the fixed-base period
(:mod:`isolation.study.assembly`) and the code-designed comparison building
(:mod:`isolation.performance.comparison`), which is why it lives here, below all of them.
"""

from __future__ import annotations

__all__ = ["LATERAL_SYSTEM_ROWS", "LATERAL_SYSTEMS", "FRAMES"]

LATERAL_SYSTEM_ROWS = {
    "steel_moment_frame": ("steel_moment", "Table 12.8-2 row 'steel moment-resisting frames' (C_t 0.0724, x 0.8)",
                           "§4.3.3.2.2(3) 'moment resistant space steel frames' (C_t 0.085)"),
    "concrete_moment_frame": ("concrete_moment",
                              "Table 12.8-2 row 'concrete moment-resisting frames' (C_t 0.0466, x 0.9)",
                              "§4.3.3.2.2(3) 'moment resistant space concrete frames' (C_t 0.075)"),
    "steel_eccentrically_braced_frame": ("eccentric_braced",
                                         "Table 12.8-2 row 'steel eccentrically braced frames' (C_t 0.0731, x 0.75)",
                                         "§4.3.3.2.2(3) 'eccentrically braced steel frames' (C_t 0.075)"),
    "steel_buckling_restrained_braced_frame": ("buckling_restrained_braced",
                                               "Table 12.8-2 row 'steel buckling-restrained braced frames' "
                                               "(C_t 0.0731, x 0.75)",
                                               "§4.3.3.2.2(3) 'all other structures' (C_t 0.050)"),
    "concentrically_braced_frame": ("other", "Table 12.8-2 row 'all other structural systems' (C_t 0.0488, x 0.75)",
                                    "§4.3.3.2.2(3) 'all other structures' (C_t 0.050)"),
    "shear_wall": ("other", "Table 12.8-2 row 'all other structural systems' (C_t 0.0488, x 0.75)",
                   "§4.3.3.2.2(3) 'all other structures' (C_t 0.050; the wall-area form of (4) is not used)"),
    "other": ("other", "Table 12.8-2 row 'all other structural systems' (C_t 0.0488, x 0.75)",
              "§4.3.3.2.2(3) 'all other structures' (C_t 0.050)"),
}
"""Study choice of ``building.lateral_system`` -> (frame type of :data:`isolation.codes.asce7_fixed_base.FRAME_TYPES`,
row of ASCE/SEI 7-16 Table 12.8-2, row of EN 1998-1:2004 §4.3.3.2.2(3)) for the approximate
fixed-base period. Rows as in both tables, from memory (not re-read this session)."""

LATERAL_SYSTEMS = tuple(LATERAL_SYSTEM_ROWS)
"""Study choices of ``building.lateral_system``."""

FRAMES = {name: row[0] for name, row in LATERAL_SYSTEM_ROWS.items()}
"""Study choice of ``building.lateral_system`` -> frame type of
:data:`isolation.codes.asce7_fixed_base.FRAME_TYPES`."""
