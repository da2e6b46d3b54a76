"""isolation: seismic base-isolation feasibility studies.

Scope: concept-stage feasibility, not construction design. Every result must be
checked against the local building code by a licensed structural engineer.

Units inside the package: kN, m, s, t (tonne); stresses and moduli in kPa;
spectral values in g.
"""

__version__ = "0.1.0"

GRAVITY = 9.80665
"""Standard acceleration of gravity. [m/s2]"""

__all__ = ["__version__", "GRAVITY"]

# Modules moved into folders by concern keep their old import paths.
from isolation import _moved  # noqa: E402

_moved.install()
