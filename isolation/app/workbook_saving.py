"""Keep the repository's workbooks free of outputs when JupyterLab saves them.

A Jupyter server extension (enabled by ``etc/jupyter/jupyter_server_config.d/isolation.json``,
which ``pip install`` puts into the environment): before JupyterLab writes a
notebook that lies in the package's ``workbooks/`` folder, :func:`strip_outputs`
empties its code cells' outputs and execution counts. Opening, running and
autosaving a workbook therefore never writes results into the tracked file;
results go where the workbook's parameters say (``records/`` by default).
Executed copies elsewhere (calculation records, papermill output) keep their outputs.
"""

from __future__ import annotations

from pathlib import Path

__all__ = ["is_workbook", "strip_outputs", "pre_save"]


def is_workbook(path: str | Path) -> bool:
    """Whether ``path`` is a notebook in the repository's ``workbooks/`` folder (beside ``isolation/``)."""
    path = Path(path).resolve()
    return (path.suffix == ".ipynb" and path.parent.name == "workbooks"
            and (path.parent.parent / "isolation" / "__init__.py").is_file())


def strip_outputs(notebook: dict) -> dict:
    """Remove what running a notebook leaves in it, in place; returns the notebook.

    Code cells lose their outputs, execution counts and execution timings; the
    notebook loses saved widget state and keeps only the name of its language
    (JupyterLab would add the interpreter's version), so that running and
    saving a workbook leaves the tracked file as it was.
    """
    for cell in notebook.get("cells", []):
        if cell.get("cell_type") == "code":
            cell["outputs"] = []
            cell["execution_count"] = None
        if isinstance(cell.get("metadata"), dict):
            cell["metadata"].pop("execution", None)
    metadata = notebook.get("metadata")
    if isinstance(metadata, dict):
        metadata.pop("widgets", None)
        language = metadata.get("language_info")
        if isinstance(language, dict) and "name" in language:
            metadata["language_info"] = {"name": language["name"]}
    return notebook


def pre_save(model: dict, path: str, contents_manager, **_) -> None:
    """Jupyter pre-save hook: strip the outputs of a repository workbook before it is written."""
    if model.get("type") != "notebook" or not isinstance(model.get("content"), dict):
        return
    root = Path(getattr(contents_manager, "root_dir", "") or ".")
    target = root / path.lstrip("/")
    if is_workbook(target):
        strip_outputs(model["content"])
        _keep_kernel_metadata(model["content"], target)


def _keep_kernel_metadata(notebook: dict, target: Path) -> None:
    """Keep the kernelspec and language_info of the file on disk (JupyterLab rewrites their names)."""
    import json

    try:
        before = json.loads(target.read_text(encoding="utf-8")).get("metadata", {})
    except (OSError, ValueError, AttributeError):
        return
    metadata = notebook.setdefault("metadata", {})
    for key in ("kernelspec", "language_info"):
        if key in before:
            metadata[key] = before[key]


def _jupyter_server_extension_points():
    return [{"module": "isolation.app.workbook_saving"}]


def _load_jupyter_server_extension(server_app) -> None:
    server_app.contents_manager.register_pre_save_hook(pre_save)
    server_app.log.info("isolation: outputs of workbooks/*.ipynb are not saved into the repository")


CONFIG = {"ServerApp": {"jpserver_extensions": {"isolation.app.workbook_saving": True}}}
"""The server configuration that enables this extension."""


def install(prefix: str | Path | None = None) -> Path:
    """Enable the extension in an environment: write ``PREFIX/etc/jupyter/jupyter_server_config.d/isolation.json``.

    ``pip install .`` ships the same file; an editable install (``pip install -e``, as ``make`` does)
    does not, so ``make`` calls this. Returns the file written.

    Parameters
    ----------
    prefix : str or Path, optional
        Environment prefix; default ``sys.prefix``.
    """
    import json
    import sys

    from isolation.files import write_text_atomic

    folder = Path(prefix or sys.prefix) / "etc" / "jupyter" / "jupyter_server_config.d"
    folder.mkdir(parents=True, exist_ok=True)
    return write_text_atomic(folder / "isolation.json", json.dumps(CONFIG, indent=2) + "\n")


if __name__ == "__main__":
    print(f"enabled: {install()}")
