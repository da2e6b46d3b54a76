"""The CSV table of a batch (``batch.table``): one variant per row, dotted key paths as columns.

Read by :func:`isolation.app.batch.plan.load_batch`; a cell reads as TOML would
(bool, int, float, else the string), an ``id`` column names the variant.
Every problem is added to the batch's problem list, none raised.
"""

from __future__ import annotations

import csv
import io
from pathlib import Path
from typing import Any

from isolation.errors import InputError
from isolation.files import read_input_text

__all__: list[str] = []


def _csv_value(text: str) -> Any:
    """A CSV cell as TOML would read it: bool, int, float, else the string."""
    stripped = text.strip()
    if stripped.lower() in ("true", "false"):
        return stripped.lower() == "true"
    for kind in (int, float):
        try:
            return kind(stripped)
        except ValueError:
            pass
    return stripped


def _read_table(path: Path, problems: list[str]) -> list[tuple[str | None, dict, str]]:
    rows: list[tuple[str | None, dict, str]] = []
    try:
        text = read_input_text(path, what="batch.table")
    except InputError as error:
        problems.append(str(error))
        return rows
    try:
        with io.StringIO(text, newline="") as handle:
            reader = csv.DictReader(handle)
            if not reader.fieldnames:
                problems.append(f"table {path.name}: no header row; allowed: dotted key paths and 'id'")
                return rows
            names = [n.strip() for n in reader.fieldnames]
            for bad in [n for n in names if not n]:
                problems.append(f"table {path.name}: empty column name {bad!r}; allowed: dotted key paths and 'id'")
            repeated = sorted({n for n in names if n and names.count(n) > 1})
            for name in repeated:
                columns = ", ".join(str(i) for i, n in enumerate(names, start=1) if n == name)
                problems.append(f"table {path.name}: column name {name!r} appears more than once (columns "
                                f"{columns}); allowed: each key path once")
            if repeated:
                return rows
            for number, row in enumerate(reader, start=2):
                if row.get(None):
                    problems.append(f"table {path.name} row {number} has {len(names) + len(row[None])} fields, "
                                    f"the header {len(names)}: not allowed (a decimal comma, or a comma in an "
                                    "unquoted value? quote it: \"1.5 m\")")
                    continue
                overrides = {}
                variant_id = None
                for name, cell in zip(names, row.values(), strict=True):
                    if cell is None or not str(cell).strip() or not name:
                        continue
                    if name == "id":
                        variant_id = str(cell).strip()
                    else:
                        overrides[name] = _csv_value(str(cell))
                rows.append((variant_id, overrides, f"{path.name} row {number}"))
    except csv.Error as error:
        problems.append(f"batch.table = {str(path)!r}: not a readable CSV table ({error}); allowed: a CSV file "
                        "with a header row of dotted key paths")
    return rows
