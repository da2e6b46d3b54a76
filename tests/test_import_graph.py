"""No import circles in the package.

The import graph is read from the source with ``ast`` (no module is run): an edge
A -> B for every ``import B`` / ``from B import ...`` in A (``from P import m``
with ``m`` a module counts as an edge to ``P.m``), beside the implicit import of
each parent package, which is not counted. Imports under ``if TYPE_CHECKING:``
never run and are left out.

* At module level (the imports that run when a module is loaded) the graph of
  the whole package has no cycle.
* Counting the imports inside functions too (and in a module ``__getattr__``),
  the graph of the whole package has no cycle either, without exceptions (the
  last one, explorer answers <-> live, went when the explorer's calculation
  moved below both). (Issue 9 found
  friction <-> double_concave, rubber -> damping_rubber -> system -> rubber
  and symbols <-> table, then ten more made when long modules were split and
  the old module re-exported the new one while the new one imported back
  inside a function; the shared pieces now live in the lower module.)
* Each module of those two packages imports alone in a fresh interpreter (and,
  in the slow run, every module of the package).

Sources: the Python language reference, "The import system" (5.4, package
__init__ runs before its submodules; a partially initialised module is what a
circular import sees), common practice for judging layering by an acyclic graph.
"""

from __future__ import annotations

import ast
import concurrent.futures
import pathlib
import subprocess
import sys

import pytest

ROOT = pathlib.Path(__file__).resolve().parents[1] / "isolation"


def _modules() -> dict[str, tuple[pathlib.Path, bool]]:
    out = {}
    for path in sorted(ROOT.rglob("*.py")):
        parts = list(path.relative_to(ROOT.parent).with_suffix("").parts)
        package = parts[-1] == "__init__"
        if package:
            parts = parts[:-1]
        out[".".join(parts)] = (path, package)
    return out


MODULES = _modules()


def _import_nodes(statements, top_level: bool):
    for node in statements:
        if isinstance(node, ast.If) and "TYPE_CHECKING" in ast.dump(node.test):
            continue
        if isinstance(node, (ast.Import, ast.ImportFrom)):
            yield node
        elif top_level and isinstance(node, (ast.If, ast.Try, ast.With)):
            inner = list(node.body) + list(getattr(node, "orelse", [])) + list(getattr(node, "finalbody", []))
            inner += [s for handler in getattr(node, "handlers", []) for s in handler.body]
            yield from _import_nodes(inner, True)
        elif not top_level:
            yield from _import_nodes(ast.iter_child_nodes(node), False)


def _edges(name: str, top_level: bool) -> set[str]:
    path, package = MODULES[name]
    tree = ast.parse(path.read_text(encoding="utf-8"))
    out = set()
    for node in _import_nodes(tree.body, top_level):
        if isinstance(node, ast.Import):
            out.update(alias.name for alias in node.names if alias.name in MODULES)
            continue
        if node.level:
            base = name.split(".") if package else name.split(".")[:-1]
            base = base[:len(base) - (node.level - 1)]
            source = ".".join(base + ([node.module] if node.module else []))
        else:
            source = node.module or ""
        for alias in node.names:
            full = f"{source}.{alias.name}"
            if full in MODULES:
                out.add(full)
            elif source in MODULES:
                out.add(source)
    out.discard(name)
    return out


def _cycles(top_level: bool) -> list[list[str]]:
    """Strongly connected components with more than one module (Tarjan 1972)."""
    return _cycles_of({name: _edges(name, top_level) for name in MODULES})


def _cycles_of(graph: dict[str, set[str]]) -> list[list[str]]:
    index: dict[str, int] = {}
    low: dict[str, int] = {}
    stack: list[str] = []
    on_stack: set[str] = set()
    found: list[list[str]] = []

    def visit(v: str) -> None:
        index[v] = low[v] = len(index)
        stack.append(v)
        on_stack.add(v)
        for w in graph[v]:
            if w not in index:
                visit(w)
                low[v] = min(low[v], low[w])
            elif w in on_stack:
                low[v] = min(low[v], index[w])
        if low[v] == index[v]:
            component = []
            while True:
                w = stack.pop()
                on_stack.discard(w)
                component.append(w)
                if w == v:
                    break
            if len(component) > 1:
                found.append(sorted(component))

    for name in graph:
        if name not in index:
            visit(name)
    return found


def test_the_graph_reader_sees_a_known_edge():
    # the reader must find real edges, or an empty result would prove nothing
    assert "isolation.bearings.backbone" in _edges("isolation.bearings.system", True)
    assert "isolation.bearings.checks" in _edges("isolation.bearings.friction", True)
    assert "isolation.bearings.double_concave" in _edges("isolation.bearings.friction", False)
    assert "isolation.bearings.double_concave" not in _edges("isolation.bearings.friction", True)


def test_no_import_circle_at_module_level():
    assert _cycles(top_level=True) == []


def test_no_import_circle_even_inside_functions():
    # no exceptions: the explorer's answers module gathers names from modules that never import it back
    assert _cycles(top_level=False) == []


def test_the_cycle_finder_finds_a_circle_and_only_that():
    # Tarjan's strongly connected components on a hand-made graph: a -> b -> c -> a is one circle, d hangs off it
    graph = {"a": {"b"}, "b": {"c"}, "c": {"a"}, "d": {"a"}, "e": set()}
    assert _cycles_of(graph) == [["a", "b", "c"]]
    assert _cycles_of({"a": {"b"}, "b": set()}) == []


def _imports_alone(name: str) -> tuple[str, str]:
    done = subprocess.run([sys.executable, "-c", f"import importlib; importlib.import_module({name!r})"],
                          capture_output=True, text=True, timeout=300)
    return name, "" if done.returncode == 0 else (done.stderr.strip().splitlines() or ["?"])[-1]


def _import_each(names) -> list[tuple[str, str]]:
    with concurrent.futures.ThreadPoolExecutor(2) as pool:
        return [(name, error) for name, error in pool.map(_imports_alone, names) if error]


def test_each_bearing_and_table_module_imports_alone_in_a_fresh_interpreter():
    names = [n for n in MODULES if n.startswith(("isolation.bearings", "isolation.output.tables"))]
    assert len(names) >= 15
    assert _import_each(names) == []


@pytest.mark.slow
def test_every_module_imports_alone_in_a_fresh_interpreter():
    names = [n for n in MODULES if not n.endswith("__main__")]
    assert _import_each(names) == []
