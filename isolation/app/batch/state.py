"""A batch folder's resume state: ``batch.json`` (:data:`STATE_FILE`), and which variants run again.

Used by :mod:`isolation.app.batch.execute` (which re-exports :data:`STATE_FILE`): every variant's
input hash, status, error, record and summary rows, written atomically; a variant done with the
same input and an intact record, or failed with the same input (unless retried), is kept; the
record of one that runs again is removed first.
"""

from __future__ import annotations

import json
import shutil
import uuid
from pathlib import Path

from isolation.app.batch.plan import BatchPlan
from isolation.app.batch.runners import VariantTask
from isolation.files import write_text_atomic

__all__ = ["STATE_FILE", "load_state", "write_state", "record_intact", "remove_superseded", "plan_tasks"]

STATE_FILE = "batch.json"
"""The state file in a batch folder."""


def load_state(out_dir: Path) -> dict:
    """Variant id -> state entry of the batch folder ``out_dir`` (empty when missing or unreadable). [-]"""
    path = out_dir / STATE_FILE
    if not path.is_file():
        return {}
    try:
        state = json.loads(path.read_text(encoding="utf-8"))
    except (OSError, json.JSONDecodeError):
        return {}
    return state.get("variants", {}) if isinstance(state, dict) else {}


def write_state(out_dir: Path, plan: BatchPlan, entries: dict, settings: dict) -> None:
    """Write ``batch.json`` whole: the plan, the run settings and every variant's entry. [-]"""
    payload = {"batch": plan.to_dict(), "settings": settings, "variants": entries}
    write_text_atomic(out_dir / STATE_FILE, json.dumps(payload, indent=1, sort_keys=False) + "\n")


def record_intact(out_dir: Path, entry: dict) -> bool:
    """True when the entry's record (if it has one) holds every file of its manifest, unchanged. [-]"""
    record = entry.get("record")
    if not record:
        return True  # runners without records (direct evaluation) keep their rows in the state
    from isolation.app.calc_records import verify_record

    return verify_record(out_dir / record) is None  # every file present with the sha256 of its manifest


def remove_superseded(out_dir: Path, entry: dict) -> None:
    """Delete the record of an earlier run of a variant that is about to run again.

    Its input changed, it failed, or it was interrupted; the new run replaces
    it. Only folders inside the batch folder are touched.
    """
    record = entry.get("record")
    if not record:
        return
    folder = (out_dir / record).resolve()
    if folder.is_dir() and out_dir in folder.parents:
        shutil.rmtree(folder)


def plan_tasks(plan: BatchPlan, out_dir: Path, hashes: dict[str, str], use_pdf: bool, quick: bool,
                retry_failed: bool, head_start: bool = True) -> tuple[dict[str, dict], list[VariantTask], list[str]]:
    """(state entries, tasks to run, variant ids taken from an earlier invocation): a variant done with the
    same input and an intact record, or failed with the same input (unless ``retry_failed``), is kept."""
    previous = load_state(out_dir)
    invocation = uuid.uuid4().hex
    entries: dict[str, dict] = {}
    tasks: list[VariantTask] = []
    reused: list[str] = []
    for variant in plan.variants:
        key = variant.variant_id
        entry = previous.get(key, {})
        same_input = entry.get("input_hash") == hashes[key]
        if same_input and entry.get("status") == "done" and record_intact(out_dir, entry):
            entries[key] = entry
            reused.append(key)
            continue
        if same_input and entry.get("status") == "failed" and not retry_failed:
            entries[key] = entry
            reused.append(key)
            continue
        entries[key] = {"input_hash": hashes[key], "overrides": variant.overrides, "status": "pending",
                        "superseded": entry.get("record")}
        tasks.append(VariantTask(key, str(plan.study_file), plan.overrides_for(variant), str(out_dir), use_pdf,
                                 hashes[key], quick, invocation, head_start))
    return entries, tasks, reused
