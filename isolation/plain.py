"""Plain JSON types from result objects (no I/O).

:func:`plain` turns what the package's results hold (objects with a
``to_dict()``, mappings, tuples, numpy arrays and scalars) into dicts with
string keys, lists, and Python ``float`` / ``int`` / ``bool`` / ``str`` /
``None``, so ``json.dumps`` takes the result as it is. Imports only numpy,
so every module of the numeric core may use it.
"""

from __future__ import annotations

import math
from typing import Any, Mapping

import numpy as np

__all__ = ["plain"]


def plain(value: Any, *, keep_nonfinite: bool = False) -> Any:
    """The same value in plain JSON types.

    Parameters
    ----------
    value : any
        An object with ``to_dict()`` (its result is converted in turn), a
        mapping (keys become ``str``), a list or tuple (becomes a list), a
        numpy array (nested lists) or scalar (Python scalar); anything else is
        returned as it is. [-]
    keep_nonfinite : bool
        False (default): NaN and infinity become None, so strict JSON
        (``allow_nan=False``) accepts the result. True: they stay floats. [-]

    Returns
    -------
    any
        Dicts, lists and Python scalars only (for the types above).
    """
    if hasattr(value, "to_dict") and not isinstance(value, type):
        return plain(value.to_dict(), keep_nonfinite=keep_nonfinite)
    if isinstance(value, Mapping):
        return {str(k): plain(v, keep_nonfinite=keep_nonfinite) for k, v in value.items()}
    if isinstance(value, (list, tuple)):
        return [plain(v, keep_nonfinite=keep_nonfinite) for v in value]
    if isinstance(value, np.ndarray):
        return plain(value.tolist(), keep_nonfinite=keep_nonfinite)
    if isinstance(value, np.generic):
        value = value.item()
    if not keep_nonfinite and isinstance(value, float) and not math.isfinite(value):
        return None
    return value
