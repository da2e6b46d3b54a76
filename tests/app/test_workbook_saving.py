"""Saving a workbook from JupyterLab keeps outputs out of the tracked file.

The hook runs inside jupyter_server's own FileContentsManager (the class
JupyterLab saves through), so the check covers the real save path.
"""

from __future__ import annotations

import json
import subprocess
import sys

import nbformat
import pytest

from isolation.app import workbook_saving


def _notebook_with_output():
    nb = nbformat.v4.new_notebook()
    cell = nbformat.v4.new_code_cell("1 + 1")
    cell.outputs = [nbformat.v4.new_output("execute_result", {"text/plain": "2"}, execution_count=1)]
    cell.execution_count = 1
    cell.metadata["execution"] = {"iopub.status.busy": "2026-12-01T10:00:00Z"}
    nb.cells = [nbformat.v4.new_markdown_cell("# title"), cell]
    nb.metadata["language_info"] = {"name": "python", "version": "3.11.2", "mimetype": "text/x-python"}
    nb.metadata["widgets"] = {"application/vnd.jupyter.widget-state+json": {"state": {}}}
    return nb


@pytest.fixture
def manager(tmp_path):
    from jupyter_server.services.contents.filemanager import FileContentsManager

    (tmp_path / "isolation").mkdir()
    (tmp_path / "isolation" / "__init__.py").write_text("")
    (tmp_path / "workbooks").mkdir()
    (tmp_path / "records").mkdir()
    contents = FileContentsManager(root_dir=str(tmp_path))

    class App:  # the part of ServerApp the extension uses
        contents_manager = contents

        class log:  # noqa: N801
            @staticmethod
            def info(message):
                pass

    workbook_saving._load_jupyter_server_extension(App)
    return contents


def test_saving_a_workbook_strips_outputs(manager, tmp_path):
    manager.save({"type": "notebook", "format": "json", "content": _notebook_with_output()}, "workbooks/a.ipynb")
    saved = json.loads((tmp_path / "workbooks" / "a.ipynb").read_text())
    code = [c for c in saved["cells"] if c["cell_type"] == "code"]
    assert code[0]["outputs"] == [] and code[0]["execution_count"] is None
    assert "".join(code[0]["source"]) == "1 + 1"  # the code itself is kept
    assert "execution" not in code[0]["metadata"]
    assert saved["metadata"]["language_info"] == {"name": "python"} and "widgets" not in saved["metadata"]


def test_saving_elsewhere_keeps_outputs(manager, tmp_path):
    manager.save({"type": "notebook", "format": "json", "content": _notebook_with_output()}, "records/run.ipynb")
    saved = json.loads((tmp_path / "records" / "run.ipynb").read_text())
    assert [c for c in saved["cells"] if c["cell_type"] == "code"][0]["outputs"]


def test_install_enables_the_extension(tmp_path):
    path = workbook_saving.install(tmp_path)
    assert json.loads(path.read_text()) == {
        "ServerApp": {"jpserver_extensions": {"isolation.app.workbook_saving": True}}}
    assert path.relative_to(tmp_path).as_posix() == "etc/jupyter/jupyter_server_config.d/isolation.json"


def test_extension_is_enabled_in_this_environment():
    # make (and pip install . through pyproject's data-files) enable it for the environment.
    done = subprocess.run([sys.executable, "-m", "jupyter", "server", "extension", "list"], capture_output=True,
                          text=True, timeout=120)
    text = done.stdout + done.stderr
    assert "isolation.app.workbook_saving" in text and "enabled" in text


def test_tracked_workbooks_hold_no_outputs():
    from pathlib import Path

    for path in (Path(__file__).resolve().parents[2] / "workbooks").glob("*.ipynb"):
        nb = json.loads(path.read_text())
        assert all(not c.get("outputs") for c in nb["cells"] if c["cell_type"] == "code"), path.name
