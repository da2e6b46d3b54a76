"""Layering of the package, read from the source with ``ast``: the numeric core never imports the shells.

The rule is the project's own (DEVELOPERS.md, "Architecture: one direction of flow"): the core
folders (site, codes, bearings, design, dynamics, motions, performance, loss) import nothing from
study, verdict, output or app, whether by the new names or by the old flat names that
``isolation/_moved.py`` still answers. No outside source: a structural check of this repository.
"""

import ast
from pathlib import Path

import pytest

from isolation._moved import MOVED

PACKAGE = Path(__file__).resolve().parents[1] / "isolation"
CORE = ("site", "codes", "bearings", "design", "dynamics", "motions", "performance", "loss")
SHELLS = ("study", "verdict", "output", "app")


def _shell_of(name: str) -> str | None:
    """The shell folder a module name below ``isolation.`` lies in (old flat names mapped), or None."""
    name = MOVED.get(name.split(".")[0], name.split(".")[0]) + name[len(name.split(".")[0]):]
    top = name.split(".")[0]
    return top if top in SHELLS else None


def _answering(tree: ast.Module) -> set[int]:
    """Ids of the nodes inside a module-level ``__getattr__``: a name that moved up a layer is still
    answered there, loaded only when asked for (as ``isolation/_moved.py`` answers old module names);
    the module itself never uses it."""
    inside: set[int] = set()
    for node in tree.body:
        if isinstance(node, ast.FunctionDef) and node.name == "__getattr__":
            inside.update(id(n) for n in ast.walk(node))
    return inside


def _imports(path: Path):
    """(line, module name below ``isolation.``) of every import in a file, at any depth (except in a
    module-level ``__getattr__`` that answers a moved name)."""
    tree = ast.parse(path.read_text(encoding="utf-8"), filename=str(path))
    skipped = _answering(tree)
    for node in ast.walk(tree):
        if id(node) in skipped:
            continue
        if isinstance(node, ast.Import):
            for alias in node.names:
                if alias.name.startswith("isolation."):
                    yield node.lineno, alias.name[len("isolation."):]
        elif isinstance(node, ast.ImportFrom) and node.level == 0 and node.module:
            if node.module == "isolation":
                for alias in node.names:
                    yield node.lineno, alias.name
            elif node.module.startswith("isolation."):
                yield node.lineno, node.module[len("isolation."):]
        elif isinstance(node, ast.ImportFrom) and node.level > 0:
            raise AssertionError(f"{path}:{node.lineno}: relative import; the package uses absolute imports")


def _core_files():
    for folder in CORE:
        yield from sorted((PACKAGE / folder).rglob("*.py"))


def test_core_folders_exist():
    # Guards the test itself: an empty scan would pass anything.
    assert all((PACKAGE / folder).is_dir() for folder in CORE)
    assert sum(1 for _ in _core_files()) > 40


@pytest.mark.parametrize("path", list(_core_files()), ids=lambda p: str(p.relative_to(PACKAGE)))
def test_core_never_imports_a_shell(path):
    upward = [f"line {line}: isolation.{name}" for line, name in _imports(path) if _shell_of(name)]
    assert not upward, f"{path.relative_to(PACKAGE)} imports above the core: {upward}"


def test_the_check_sees_an_upward_import(tmp_path):
    # The scan must flag each way of writing an upward import (new name, old flat name, package import).
    source = ("from isolation.study.assembly import superstructure\n"
              "def f():\n    import isolation.output.plots\n    from isolation import verdict\n"
              "    from isolation.runner import run_study\n    from isolation.site import spectra\n")
    path = tmp_path / "sample.py"
    path.write_text(source)
    assert [_shell_of(name) for _, name in _imports(path)] == ["study", "output", "verdict", "study", None]
    # A module-level __getattr__ may answer a name that moved up; any other function may not import up.
    path.write_text("def __getattr__(name):\n    from isolation.output.tables import clause_table\n"
                    "    return clause_table\n\n\ndef g():\n    from isolation.output import plots\n")
    assert [_shell_of(name) for _, name in _imports(path)] == ["output"]
