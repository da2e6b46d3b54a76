"""Single-mode (equivalent-linear) design of an isolation system: one variant
(`single_mode`), many variants at once (`array_kernel`), and the per-bearing
overturning and uplift estimate (`overturning`).

``isolation.design`` re-exports the single-mode procedure's public names.
"""

from isolation.design.single_mode import *  # noqa: F401,F403
from isolation.design.single_mode import __all__  # noqa: F401
