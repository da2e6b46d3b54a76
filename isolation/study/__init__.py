"""A study: the study file's schema (`keys`), its validated inputs in SI
(`inputs`, `sections`, `parse`), the assembly of core objects from them
(`assembly`, `plan`) and the pipeline that runs it (`runner`).

``isolation.study`` re-exports the public names of `parse` (load and validate
a study file).
"""

from isolation.study.parse import *  # noqa: F401,F403
from isolation.study.parse import __all__  # noqa: F401
