"""Motions of a history sweep, chosen once, and the fixed base run once (:func:`prepare_motions`).

The suite a history sweep (:mod:`isolation.app.batch.histories`) runs every
variant under: ``--motions SUITE.json`` or the base study's matched suite,
written into ``<batch folder>/motions/`` with the fixed-base statistics
(``fixed_base.json``); workers read them from there (:func:`_load`).
:func:`with_motions` folds the suite into the variants' input hashes.
Re-exported from :mod:`isolation.app.batch.histories`.
"""

from __future__ import annotations

import dataclasses
import functools
import hashlib
import json
from pathlib import Path
from typing import Any, Mapping

import numpy as np

from isolation.app.batch.runners import VariantTask

__all__ = ["MOTIONS_FOLDER", "prepare_motions", "with_motions"]

MOTIONS_FOLDER = "motions"
SUITE_NAME = "suite"
FIXED_FILE = "fixed_base.json"
SOURCE_FILE = "source.json"


def _structure_fingerprint(value) -> str:
    """SHA-256 of a model object (or mapping) as plain JSON."""
    from isolation.plain import plain

    return hashlib.sha256(json.dumps(plain(value), sort_keys=True).encode("utf-8")).hexdigest()


def _suite_hash(acceleration: np.ndarray, dt: float) -> str:
    digest = hashlib.sha256(np.ascontiguousarray(acceleration, dtype=float).tobytes())
    digest.update(repr(float(dt)).encode("ascii"))
    return digest.hexdigest()


def _read_suite(metadata: Path) -> tuple[np.ndarray, float]:
    """(acceleration (records, steps) [g], dt [s]) of a written suite; shorter records padded with zeros."""
    from isolation.motions.records_io import read_suite_records

    records = read_suite_records(metadata)
    if not records:
        raise ValueError(f"motions = {str(metadata)!r} is not allowed: the suite lists no records")
    steps = {round(r.dt, 12) for r in records}
    if len(steps) != 1:
        raise ValueError(f"motions = {str(metadata)!r} is not allowed: every record must have the same time step "
                         f"(found {sorted(steps)} s)")
    length = max(r.acceleration.size for r in records)
    acc = np.zeros((len(records), length))
    for i, record in enumerate(records):
        acc[i, :record.acceleration.size] = record.acceleration
    return acc, float(records[0].dt)


def prepare_motions(plan, out_dir: str | Path, *, motions: str | Path | None = None, quick: bool = False) -> dict:
    """Choose the motions of a history sweep and run the fixed base once.

    Parameters
    ----------
    plan : isolation.app.batch.plan.BatchPlan
        The batch; its base study (with the ``[common]`` overrides) gives the
        superstructure and, without ``motions``, the matched suite.
    out_dir : str or Path
        Batch folder; ``motions/`` is written in it.
    motions : str or Path, optional
        Metadata file of a suite (``suite.json`` of ``python -m isolation
        motions``) to use instead of the base study's matched suite.
    quick : bool
        Small matched suite (trials and tests only, never for a report).

    Returns
    -------
    dict
        Run settings: ``motions`` (what was used) and ``motions_hash``
        (folded into every variant's input hash).

    Raises
    ------
    isolation.errors.InputError
        A motions file that cannot be read, or a time step too coarse for the
        superstructure.
    """
    from isolation.app.batch.variants import variant_study
    from isolation.errors import InputError
    from isolation.files import write_text_atomic
    from isolation.study import assembly as model

    folder = Path(out_dir).resolve() / MOTIONS_FOLDER
    study = variant_study(plan.study_file, dict(plan.common))
    structure = model.superstructure(study)
    source = _write_motions(study, folder, motions, quick)
    acc, dt = _read_suite(folder / f"{SUITE_NAME}.json")
    try:
        model.check_study(dataclasses.replace(study, analysis=dataclasses.replace(study.analysis, time_step=dt)))
    except ValueError as error:
        raise InputError(f"motions time step: {' '.join(str(error).split())}") from None
    spectrum = model.site_spectrum(study)
    period, _ = model.fixed_base_period(study)
    comparison = _comparison(study, spectrum, structure, period)
    fixed = _fixed_runs(study, comparison, structure, acc, dt)
    write_text_atomic(folder / FIXED_FILE, json.dumps({"structure": _structure_fingerprint(comparison.building),
                                                       **fixed}) + "\n")
    return {"motions": source["motions"], "motions_quick": source["quick"], "motions_hash": _suite_hash(acc, dt),
            "records": int(acc.shape[0]), "steps": int(acc.shape[1]), "dt": dt}


def _write_motions(study, folder: Path, motions, quick: bool) -> dict:
    """The chosen suite in ``folder`` (written again only when the choice or the base study changed);
    returns what was chosen (``source.json``)."""
    from isolation.errors import InputError
    from isolation.files import write_text_atomic
    from isolation.motions.records_io import write_suite
    from isolation.study.runner import export_suite

    source = {"motions": str(Path(motions).resolve()) if motions else "matched suite of the base study",
              "quick": bool(quick) and not motions, "study": _structure_fingerprint(study.to_dict())}
    metadata = folder / f"{SUITE_NAME}.json"
    try:
        previous = json.loads((folder / SOURCE_FILE).read_text(encoding="utf-8"))
    except (OSError, json.JSONDecodeError):
        previous = None
    folder.mkdir(parents=True, exist_ok=True)
    if previous != source or not metadata.is_file():
        if motions:
            try:
                acc, dt = _read_suite(Path(motions))
            except ValueError as error:
                raise InputError(f"--motions: {' '.join(str(error).split())}") from None
            write_suite(_Suite(acc, dt), folder, name=SUITE_NAME)
        else:
            export_suite(study, folder, quick=bool(quick))
        write_text_atomic(folder / SOURCE_FILE, json.dumps(source, indent=1) + "\n")
    return source


@dataclasses.dataclass(frozen=True)
class _Suite:
    """The least a suite needs for :func:`isolation.motions.records_io.write_suite`."""

    acceleration: np.ndarray
    dt: float

    @property
    def seeds(self):
        return np.zeros(self.acceleration.shape[0], dtype=int)

    def to_dict(self) -> dict:
        return {"dt": self.dt, "count": int(self.acceleration.shape[0]), "source": "chosen records"}


@functools.lru_cache(maxsize=4)
def _motions(folder: str, modified: float) -> tuple:  # noqa: ARG001 - the file time keys the cache
    acc, dt = _read_suite(Path(folder) / f"{SUITE_NAME}.json")
    fixed = json.loads((Path(folder) / FIXED_FILE).read_text(encoding="utf-8"))
    return acc, dt, fixed


def _load(task: VariantTask) -> tuple:
    folder = Path(task.out_dir) / MOTIONS_FOLDER
    return _motions(str(folder), (folder / FIXED_FILE).stat().st_mtime)


def with_motions(hashes: Mapping[str, str], motions: Mapping[str, Any]) -> dict[str, str]:
    """Variant input hashes that also identify the motions (a changed suite runs the variants again).

    Parameters
    ----------
    hashes : mapping
        Variant id -> input hash of the validated variant.
    motions : mapping
        What :func:`prepare_motions` returned.
    """
    return {key: hashlib.sha256(f"{value}:{motions['motions_hash']}".encode("ascii")).hexdigest()
            for key, value in hashes.items()}


def _comparison(study, spectrum, structure, period):
    """The code-designed fixed-base comparison building of a study (as the study run builds it)."""
    from isolation.performance.comparison import fixed_base_comparison

    return fixed_base_comparison(study, spectrum, structure, period)


def _fixed_runs(study, comparison, structure, acc: np.ndarray, dt: float) -> dict:
    """Statistics of the comparison fixed base and indicators of it and of the elastic fixed base."""
    from isolation.dynamics.history import run
    from isolation.performance.comparison import response_indicators, thresholds_of
    from isolation.plain import plain

    thresholds = thresholds_of(study)
    fixed = run(comparison.building, acc, dt)
    elastic = run(structure, acc, dt) if comparison.yielding else fixed
    strengths = comparison.design.yield_shears if comparison.yielding else None
    return {"statistics": plain(fixed.statistics()),
            "indicators": plain({"fixed": response_indicators(fixed, strengths, thresholds),
                                 "fixed_elastic": response_indicators(elastic, None, thresholds)})}
