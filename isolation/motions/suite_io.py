"""A matched suite on disk: one accelerogram file per record plus a metadata file.

:func:`write_suite` writes our own format (``isolation accelerogram v1``,
:data:`FORMAT_NAME`) atomically; :func:`isolation.motions.records_io.read_suite_records`
reads a suite back. Both names are re-exported from :mod:`isolation.motions.records_io`.
"""

from __future__ import annotations

import json
import os
import re
import tempfile
from pathlib import Path
from typing import Any

import numpy as np

__all__ = ["write_suite", "FORMAT_NAME"]

FORMAT_NAME = "isolation accelerogram v1"
"""The first line of our accelerogram files; the ``format`` of a suite's metadata."""


def _check_name(name: str) -> str:
    if not isinstance(name, str) or not re.fullmatch(r"[A-Za-z0-9][A-Za-z0-9_.-]{0,79}", name):
        raise ValueError(f"name = {name!r} is not allowed: must be 1-80 letters, digits, '_', '-' or '.'")
    return name


def write_suite(suite: Any, folder: Any = "records/motions", name: str = "suite") -> list[Path]:
    """Write a matched suite: one text file per record plus JSON metadata.

    Parameters
    ----------
    suite : MatchedSuite
        The suite (acceleration in g, dt in s).
    folder : str or Path
        Output folder, created when missing.
    name : str
        File stem: records ``<name>_01.txt`` ..., metadata ``<name>.json``.

    Returns
    -------
    list of Path
        The record files followed by the metadata file.
    """
    stem = _check_name(name)
    target = Path(folder)
    target.mkdir(parents=True, exist_ok=True)
    count = int(suite.acceleration.shape[0])
    width = max(2, len(str(count)))
    texts: dict[Path, str] = {}
    for index in range(count):
        header = [
            f"# {FORMAT_NAME}",
            "# units = g",
            f"# dt = {suite.dt!r}",
            f"# count = {suite.acceleration.shape[1]}",
            f"# record = {index + 1} of {count}",
            f"# seed = {int(suite.seeds[index])}",
        ]
        values = np.asarray(suite.acceleration[index])
        padded = np.full(-(-values.size // 5) * 5, np.nan)
        padded[: values.size] = values
        body = [
            " ".join(f"{v:.8e}" for v in row if not np.isnan(v)) for row in padded.reshape(-1, 5)
        ]
        texts[target / f"{stem}_{index + 1:0{width}d}.txt"] = "\n".join(header + body) + "\n"
    metadata = suite.to_dict()
    metadata["format"] = FORMAT_NAME
    metadata["files"] = [p.name for p in texts]
    texts[target / f"{stem}.json"] = json.dumps(metadata, indent=1) + "\n"
    temporary: dict[Path, str] = {}
    try:
        for final, text in texts.items():
            handle, temp_name = tempfile.mkstemp(dir=target, prefix=f".{final.name}.", suffix=".tmp")
            temporary[final] = temp_name
            try:
                stream = os.fdopen(handle, "w", encoding="utf-8")
            except BaseException:
                os.close(handle)
                raise
            with stream:
                stream.write(text)
        for final, temp_name in temporary.items():
            os.replace(temp_name, final)
    except BaseException:
        for temp_name in temporary.values():
            if os.path.exists(temp_name):
                os.remove(temp_name)
        raise
    return list(texts)
