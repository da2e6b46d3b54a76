"""A matched suite on disk: one accelerogram file per record plus a metadata file.

:func:`write_suite` writes our own format (``isolation accelerogram v1``,
:data:`isolation.motions.records_io.FORMAT_NAME`) atomically;
:func:`read_suite_records` reads a suite back. Re-exported from
:mod:`isolation.motions.records_io`.
"""

from __future__ import annotations

import json
import os
import re
import tempfile
from pathlib import Path
from typing import TYPE_CHECKING, Any

import numpy as np

if TYPE_CHECKING:
    from isolation.motions.records_io import Accelerogram

__all__ = ["write_suite", "read_suite_records"]


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
    from isolation.motions.records_io import FORMAT_NAME

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


def read_suite_records(metadata_path: Any) -> list[Accelerogram]:
    """Read back the records listed in a suite's JSON metadata file.

    Parameters
    ----------
    metadata_path : str or Path
        The ``<name>.json`` written by :func:`write_suite`.
    """
    from isolation.motions.records_io import FORMAT_NAME, read_text_accelerogram

    file = Path(metadata_path)
    if not file.is_file():
        raise ValueError(f"metadata_path = {str(file)!r} is not allowed: must be an existing file")
    try:
        metadata = json.loads(file.read_text(encoding="utf-8"))
    except json.JSONDecodeError as error:
        raise ValueError(f"{file}: line {error.lineno}: not valid JSON ({error.msg})") from None
    if metadata.get("format") != FORMAT_NAME or not isinstance(metadata.get("files"), list):
        raise ValueError(f"{file}: format = {metadata.get('format')!r} is not allowed: must be {FORMAT_NAME!r} with a "
                         "'files' list")
    return [read_text_accelerogram(file.parent / name) for name in metadata["files"]]
