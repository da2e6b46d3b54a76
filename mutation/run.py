"""Mutation testing of the numeric core, one module at a time (``make mutation``).

Each run copies the package, its tests and the examples into a scratch folder
``.mutation/<module>/`` (git-ignored), writes a mutmut configuration there that
mutates that one module and runs only the test files that check it, and runs
``mutmut run`` in it. One module at a time keeps each run to one core's worth of
work (the machine is shared); results stay in the scratch folder:
``cd .mutation/<module> && mutmut results`` / ``mutmut show <mutant>``.

Not part of CI: a full pass over the core takes hours. Usage::

    python -m mutation                    # every module in MODULES, in order
    python -m mutation design_asce7 spectra
    python -m mutation --list             # the module -> tests map
    python -m mutation --survivors design_asce7   # survivors again, after new tests

mutmut (PyPI, ``pip install -e .[mutation]``) generates the mutants and runs pytest.
"""

from __future__ import annotations

import argparse
import ast
import difflib
import io
import json
import os
import re
import shutil
import subprocess
import sys
import tokenize
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
SCRATCH = ROOT / ".mutation"

_ENGINE_TESTS = ("tests/dynamics/test_newmark_closed_forms.py", "tests/dynamics/test_newmark_kernel.py")
"""Fast closed-form tests of the response-history engine (small models, short records)."""

MODULES: dict[str, tuple[str, ...]] = {
    "codes/asce7": ("tests/design/test_design.py", "tests/codes/test_code_procedures.py"),
    "codes/eurocode": ("tests/design/test_design.py", "tests/codes/test_code_procedures.py"),
    "codes/asce7_fixed_base": ("tests/design/test_design.py", "tests/codes/test_code_procedures.py"),
    "verdict/rules": ("tests/verdict/test_verdict.py",),
    "verdict/site": ("tests/verdict/test_verdict.py",),
    "verdict/sources": ("tests/verdict/test_verdict.py", "tests/codes/test_code_procedures.py"),
    "design/overturning": ("tests/codes/test_code_procedures.py",),
    "site/spectra": ("tests/site/test_spectra.py", "tests/design/test_design.py",
                     "tests/codes/test_code_procedures.py"),
    "site/damping": ("tests/site/test_spectra.py", "tests/design/test_design.py"),
    "site/spectrum_base": ("tests/site/test_spectra.py", "tests/design/test_design.py"),
    "site/tabulated_spectrum": ("tests/site/test_spectra.py", "tests/design/test_design.py",
                                "tests/design/test_single_mode_edges.py"),
    "design/single_mode": ("tests/design/test_design.py", "tests/design/test_single_mode_edges.py",
                           "tests/codes/test_code_procedures.py"),
    "bearings/backbone": ("tests/bearings/test_backbone.py", "tests/bearings/test_bearings_system.py"),
    "bearings/friction": ("tests/bearings/test_bearings_friction.py",),
    "bearings/rubber": ("tests/bearings/test_bearings_rubber.py",),
    "bearings/system": ("tests/bearings/test_bearings_system.py",),
    "bearings/double_concave": ("tests/bearings/test_bearings_friction.py", "tests/bearings/test_bearings_system.py"),
    "bearings/triple_pendulum": ("tests/bearings/test_bearings_triple_pendulum.py",),
    "bearings/damping_rubber": ("tests/bearings/test_bearings_rubber.py",),
    "bearings/checks": ("tests/bearings/test_bearings_rubber.py", "tests/bearings/test_bearings_system.py",
                        "tests/bearings/test_bearings_friction.py", "tests/bearings/test_bearings_triple_pendulum.py"),
    "dynamics/newmark": _ENGINE_TESTS + ("tests/dynamics/test_kernel_compile.py",),
    "dynamics/newmark_columns": _ENGINE_TESTS,
    "dynamics/kernel": _ENGINE_TESTS,
    "dynamics/kernel_laws": _ENGINE_TESTS + ("tests/dynamics/test_solve_base.py",),
    "dynamics/isolators": ("tests/dynamics/test_history_isolators.py", "tests/dynamics/test_history_reference.py",
                           "tests/dynamics/test_isolator_laws.py", "tests/bearings/test_bearing_registry.py"),
}
"""Module of ``isolation/`` (without .py) -> the test files that check it."""

_COMMON = ("tests/test_core_messages.py",)
"""Test files run for every module (bad-input messages of the whole numeric core)."""

_SKIP = "not demo and not without_a_cycle and not no_nan_for_valid_input"
"""Tests left out of mutant runs: whole-study runs and subprocess imports (seconds each, and
they check wiring rather than one module's arithmetic)."""

_ENVIRONMENT: dict[str, dict[str, str]] = {name: {"ISOLATION_ENGINE": "python"}
                                           for name in ("dynamics/kernel", "dynamics/kernel_laws")}
"""Extra environment per module: the kernel runs interpreted (numba cannot compile mutmut's mutated copy)."""

_MODULE_SKIP: dict[str, str] = {name: "kernel_module_chooses or compiled_and_interpreted"
                                for name in ("dynamics/kernel", "dynamics/kernel_laws")}
"""Extra tests left out per module: those that compile the kernel on purpose."""

_COPY = ("isolation", "tests", "examples", "workbooks", "templates", "records")


def _config(module: str, tests: tuple[str, ...]) -> str:
    listed = "\n    ".join(tuple(tests) + _COMMON)
    skip = _SKIP + (f" and not ({_MODULE_SKIP[module]})" if module in _MODULE_SKIP else "")
    return (f"[mutmut]\nsource_paths = isolation\nonly_mutate = isolation/{module}.py\n"
            f"pytest_add_cli_args_test_selection =\n    {listed}\n"
            "pytest_add_cli_args =\n    -q\n    -x\n    -p\n    no:cacheprovider\n    -m\n    not slow\n"
            f"    -k\n    {skip}\n"
            "do_not_mutate =\n    *__init__.py\n"
            "also_copy =\n    examples\n    workbooks\n    templates\n")


def prepare(module: str) -> Path:
    """Fresh scratch copy for one module; returns its folder."""
    if module not in MODULES:
        raise SystemExit(f"module = {module!r} is not allowed: must be one of {', '.join(MODULES)}")
    folder = SCRATCH / module.replace("/", "_")
    if folder.exists():
        shutil.rmtree(folder)
    folder.mkdir(parents=True)
    for name in _COPY:
        source = ROOT / name
        if source.is_dir():
            shutil.copytree(source, folder / name, ignore=shutil.ignore_patterns("__pycache__", "*.pyc"))
    (folder / "setup.cfg").write_text(_config(module, MODULES[module]), encoding="utf-8")
    return folder


def run(module: str, max_children: int = 1) -> int:
    """Run mutmut on one module in its scratch folder; returns mutmut's exit code."""
    folder = prepare(module)
    env = dict(os.environ, PYTHONDONTWRITEBYTECODE="1", **_ENVIRONMENT.get(module, {}))
    mutmut = [sys.executable, "-m", "mutmut"]
    print(f"== {module}: mutmut in {folder}", flush=True)
    code = subprocess.call(mutmut + ["run", "--max-children", str(max_children)], cwd=folder, env=env,
                           stdout=subprocess.DEVNULL)
    summarise(module, folder)
    return code


_LOGIC_CONTEXT = re.compile(r"==|!=|\bin\b|\[\s*f?[\"']|\.get\(|startswith|endswith|one_of|choice|replace\(|split\(")


def _tokens(line: str) -> list[str] | None:
    """Tokens of one source line with every string literal (and a bare None) removed."""
    found = []
    try:
        for token in tokenize.generate_tokens(io.StringIO(line.strip() + "\n").readline):
            found.append(token)
    except (tokenize.TokenError, IndentationError, SyntaxError):
        if not found:
            return None
    return [t.string for t in found if t.type != tokenize.STRING and t.string != "None"
            and t.type not in (tokenize.NEWLINE, tokenize.NL, tokenize.ENDMARKER, tokenize.COMMENT)]


def text_only(diff: list[str]) -> bool:
    """Whether a mutant changes only the wording of a message, a source citation or a unit label:
    the removed and added lines are equal once string literals are left out, and no string there
    takes part in a comparison, a lookup or a choice (where its value is logic)."""
    old = [x[1:] for x in diff if x.startswith("-")]
    new = [x[1:] for x in diff if x.startswith("+")]
    if len(old) != len(new) or not old:
        return False
    for a, b in zip(old, new, strict=True):
        if _LOGIC_CONTEXT.search(a):
            return False
        ta, tb = _tokens(a), _tokens(b)
        if ta is None or tb is None or [t for t in ta if t != ","] != [t for t in tb if t != ","]:
            return False
    return True


def _mutant_sources(path: Path) -> dict[str, str]:
    """Source of every function in mutmut's mutated copy of a module, by name."""
    if not path.exists():
        return {}
    text = path.read_text(encoding="utf-8")
    lines = text.splitlines()
    found = {}
    for node in ast.walk(ast.parse(text)):
        if isinstance(node, (ast.FunctionDef, ast.AsyncFunctionDef)) and "__mutmut_" in node.name:
            found[node.name] = "\n".join(lines[node.lineno - 1:node.end_lineno])
    return found


def _diff(sources: dict[str, str], mutant: str) -> list[str]:
    """Changed lines of one mutant against its original function (what ``mutmut show`` prints)."""
    base = mutant.rpartition("__mutmut_")[0]
    original = sources.get(base + "__mutmut_orig", "").replace(base + "__mutmut_orig", base, 1)
    changed = sources.get(mutant, "").replace(mutant, base, 1)
    lines = difflib.unified_diff(original.splitlines(), changed.splitlines(), lineterm="", n=0)
    return [x for x in lines if x[:1] in "+-" and x[:3] not in ("+++", "---")]


_STATUS = {1: "killed", 3: "killed", 0: "survived", 5: "no tests", 33: "no tests", None: "not checked",
           34: "skipped", 36: "timeout", -24: "timeout", 24: "timeout", 152: "timeout", 255: "timeout",
           -11: "segfault", -9: "segfault"}
"""mutmut's exit code of a mutant run -> its status (as mutmut's own stats module maps them)."""


def summarise(module: str, folder: Path) -> dict:
    """Count mutants by status and write ``survivors.txt`` (each survivor's diff) in ``folder``."""
    meta = folder / "mutants" / "isolation" / f"{module}.py.meta"
    codes = json.loads(meta.read_text(encoding="utf-8")).get("exit_code_by_key", {}) if meta.exists() else {}
    status: dict[str, list[str]] = {}
    for name, code in codes.items():
        status.setdefault(_STATUS.get(code, "suspicious"), []).append(name)
    counts = {k: len(v) for k, v in status.items()}
    killed = counts.get("killed", 0) + counts.get("timeout", 0)
    decided = killed + counts.get("survived", 0)
    entries, text = [], 0
    sources = _mutant_sources(folder / "mutants" / "isolation" / f"{module}.py")
    for name in status.get("survived", []) + status.get("no tests", []):
        diff = _diff(sources, name.rpartition(".")[2])
        wording = text_only(diff)
        text += wording and name in status.get("survived", [])
        entries.append((wording, f"{name} [{'text' if wording else 'logic'}]\n    " + "\n    ".join(diff)))
    score = killed / decided if decided else float("nan")
    logic = killed / (decided - text) if decided - text else float("nan")
    head = (f"{module}: {counts}; killed {score:.1%} of all decided mutants, {logic:.1%} of those that change "
            f"logic ({text} surviving mutants change only message, citation or unit text)")
    lines = [head] + [e for w, e in entries if not w] + [e for w, e in entries if w]
    (folder / "survivors.txt").write_text("\n".join(lines) + "\n", encoding="utf-8")
    print(head, flush=True)
    return counts


def _refresh_sources(module: str, folder: Path) -> bool:
    """Copy the package's current files, all but the mutated module, into the scratch folder (a fix
    elsewhere, e.g. in ``validate``, counts in a re-run). False when the mutated module itself
    changed: its mutants no longer match it."""
    source, mutated = ROOT / "isolation", f"{module}.py"
    copied = folder / "isolation" / mutated
    if not copied.exists() or copied.read_bytes() != (source / mutated).read_bytes():
        return False
    for target in (folder / "isolation", folder / "mutants" / "isolation"):
        for path in source.rglob("*.py"):
            relative = path.relative_to(source)
            if relative.as_posix() != mutated and "__pycache__" not in relative.parts:
                (target / relative).parent.mkdir(parents=True, exist_ok=True)
                shutil.copy2(path, target / relative)
    return True


def recheck(module: str, max_children: int = 1) -> int:
    """Run the surviving mutants of an earlier run again against the current tests."""
    folder = SCRATCH / module.replace("/", "_")
    meta = folder / "mutants" / "isolation" / f"{module}.py.meta"
    if not meta.exists():
        return run(module, max_children)
    codes = json.loads(meta.read_text(encoding="utf-8")).get("exit_code_by_key", {})
    names = [name for name, code in codes.items() if code in (0, None)]
    if not _refresh_sources(module, folder):
        print(f"== {module}: the module changed since its last run; running all its mutants", flush=True)
        return run(module, max_children)
    for target in (folder / "tests", folder / "mutants" / "tests"):
        if target.exists():
            shutil.rmtree(target)
        shutil.copytree(ROOT / "tests", target, ignore=shutil.ignore_patterns("__pycache__", "*.pyc"))
    (folder / "setup.cfg").write_text(_config(module, MODULES[module]), encoding="utf-8")
    env = dict(os.environ, PYTHONDONTWRITEBYTECODE="1", **_ENVIRONMENT.get(module, {}))
    print(f"== {module}: {len(names)} surviving or unchecked mutants again in {folder}", flush=True)
    code = 0
    for start in range(0, len(names), 200):
        code = max(code, subprocess.call([sys.executable, "-m", "mutmut", "run", "--max-children", str(max_children)]
                                         + names[start:start + 200], cwd=folder, env=env,
                                         stdout=subprocess.DEVNULL))
    summarise(module, folder)
    return code


def main(argv=None) -> int:
    parser = argparse.ArgumentParser(prog="python -m mutation", description=__doc__.split("\n\n")[0])
    parser.add_argument("modules", nargs="*", help="modules of isolation/ (default: all of MODULES)")
    parser.add_argument("--list", action="store_true", help="show the module -> tests map and stop")
    parser.add_argument("--max-children", type=int, default=1, help="parallel mutant runs (default 1)")
    parser.add_argument("--survivors", action="store_true",
                        help="only run the survivors of the last run again, against the current tests")
    args = parser.parse_args(argv)
    if args.list:
        for module, tests in MODULES.items():
            print(f"{module}: {' '.join(tests)}")
        return 0
    step = recheck if args.survivors else run
    codes = [step(m, args.max_children) for m in (args.modules or list(MODULES))]
    return max(codes, default=0)


if __name__ == "__main__":
    sys.exit(main())
