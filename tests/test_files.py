"""The atomic file writer (isolation/files.py): a failed write leaves nothing half-written.

Behaviour checked against the writer's documented contract (its module text) and the
POSIX rename guarantee of os.replace (Python documentation, os.replace).
"""

import os

import pytest

from isolation import files
from isolation.files import write_bytes_atomic, write_text_atomic


def hidden(folder):
    return sorted(p.name for p in folder.iterdir() if p.name.startswith("."))


def test_write_replaces_and_leaves_no_temporary(tmp_path):
    target = tmp_path / "results.json"
    write_text_atomic(target, "old\n")
    write_text_atomic(target, "new\r\n")
    assert target.read_bytes() == b"new\r\n"   # no newline translation
    assert hidden(tmp_path) == []


def test_failed_write_keeps_the_old_content(tmp_path):
    target = tmp_path / "results.json"
    target.write_text("old content")

    class Broken:
        """Not bytes: the write into the temporary file fails part-way."""

    with pytest.raises(TypeError):
        write_bytes_atomic(target, Broken())
    assert target.read_text() == "old content"
    assert hidden(tmp_path) == []


def test_failed_rename_keeps_the_old_content_and_removes_the_temporary(tmp_path, monkeypatch):
    target = tmp_path / "report.html"
    target.write_text("old")

    def refuse(src, dst):
        raise OSError("disk full")

    monkeypatch.setattr(files.os, "replace", refuse)
    with pytest.raises(OSError, match="disk full"):
        write_text_atomic(target, "new")
    monkeypatch.setattr(files.os, "replace", os.replace)
    assert target.read_text() == "old"
    assert hidden(tmp_path) == []


def test_failed_first_write_leaves_no_target(tmp_path, monkeypatch):
    target = tmp_path / "new.txt"
    monkeypatch.setattr(files.os, "replace", lambda src, dst: (_ for _ in ()).throw(OSError("no")))
    with pytest.raises(OSError):
        write_text_atomic(target, "x")
    assert not target.exists() and list(tmp_path.iterdir()) == []
