"""Size limits of the house (issue 9): no module over 400 lines, no function over 60 code lines.

Limits as the issue states them ("Long functions split into named steps; no module over ~400 lines").
Module length counts every line; function length counts code lines only (docstring, comments and
blank lines left out), so that a well-documented step is not penalised for its documentation.
"""

import ast
from pathlib import Path

PACKAGE = Path(__file__).resolve().parents[1] / "isolation"
MODULE_LINES = 400
FUNCTION_CODE_LINES = 60
COMPILED_LOOP = {"dynamics/kernel.py:run_columns"}
"""The one exception: the compiled time loop of the response-history engine. Measured on
``python -m benchmarks history`` (common practice: same process, best of 7), the loop split into
force-inlined compiled steps ran 13-17 % slower even with the steps compiled without reference
counting (and still 87 code lines); split into ordinary compiled calls, 3-5 times slower. Its named
steps are the comment-marked blocks inside it and the force laws of dynamics/kernel_laws.py."""


def _docstring_lines(tree: ast.AST) -> set[int]:
    lines: set[int] = set()
    for node in ast.walk(tree):
        if isinstance(node, (ast.Module, ast.ClassDef, ast.FunctionDef, ast.AsyncFunctionDef)) and node.body:
            first = node.body[0]
            if isinstance(first, ast.Expr) and isinstance(first.value, ast.Constant) \
                    and isinstance(first.value.value, str):
                lines.update(range(first.lineno, (first.end_lineno or first.lineno) + 1))
    return lines


def code_lines(source: str) -> list[int]:
    """Line numbers (1-based) holding code: not blank, not a comment, not a docstring."""
    skip = _docstring_lines(ast.parse(source))
    return [number for number, line in enumerate(source.splitlines(), start=1)
            if line.strip() and not line.strip().startswith("#") and number not in skip]


def long_functions(source: str) -> list[tuple[str, int]]:
    """(name, code lines) of every function over the limit."""
    code = code_lines(source)
    found = []
    for node in ast.walk(ast.parse(source)):
        if isinstance(node, (ast.FunctionDef, ast.AsyncFunctionDef)):
            count = sum(1 for n in code if node.lineno <= n <= (node.end_lineno or node.lineno))
            if count > FUNCTION_CODE_LINES:
                found.append((node.name, count))
    return found


def test_counter_sees_code_not_documentation():
    # the counter itself, on a hand-written function: 3 code lines, docstring and comment left out
    source = 'def f(x):\n    """Doc.\n\n    More.\n    """\n    # note\n\n    y = x\n    return y\n'
    assert code_lines(source) == [1, 8, 9]
    long = "def g():\n" + "    a = 1\n" * 61 + "    return a\n"
    assert long_functions(long) == [("g", 63)]
    assert long_functions("def h():\n" + "    a = 1\n" * 58 + "    return a\n") == []


def test_no_module_over_400_lines():
    over = {str(p.relative_to(PACKAGE)): n for p in sorted(PACKAGE.rglob("*.py"))
            if (n := len(p.read_text(encoding="utf-8").splitlines())) > MODULE_LINES}
    assert over == {}


def test_no_function_over_60_code_lines():
    over = {f"{p.relative_to(PACKAGE)}:{name}": n for p in sorted(PACKAGE.rglob("*.py"))
            for name, n in long_functions(p.read_text(encoding="utf-8"))}
    assert set(over) - COMPILED_LOOP == set()
    assert set(over) == COMPILED_LOOP, "the compiled loop is short now: drop the exception"
