"""The verdict: pure rules over plain numbers (`rules`, `site`, `yielding`),
their sources per code basis (`sources`), and the assessment that turns them
into one outcome per alternative (`assess`).

``isolation.verdict`` re-exports the public names of `assess`.
"""

from isolation.verdict.assess import *  # noqa: F401,F403
from isolation.verdict.assess import __all__  # noqa: F401
