"""How the engine's compiled loop is made and kept (isolation.dynamics.newmark).

Requirements (issue 14, "a faster engine": compiled, cached, identical to the interpreted fallback):
the laws are compiled for LLVM to inline, every compiled function releases the GIL (threads of a
Dask worker run in parallel) and follows numpy's floating-point rules (a division by zero gives
inf, as in the interpreted kernel, instead of raising); a cached loop whose force laws changed is
dropped. numba's options as documented in the numba reference manual (``numba.njit``: ``nogil``,
``cache``, ``error_model``, ``forceinline``), version 0.6x.
"""

import types

import pytest

from isolation.dynamics import newmark

numba = pytest.importorskip("numba")


def test_compiled_kernel_options():
    module = newmark.kernel_module(compiled=True)
    loop = module.run_columns
    assert loop.targetoptions["nogil"] is True
    assert loop.targetoptions["error_model"] == "numpy"
    assert loop.targetoptions.get("forceinline", False) is False  # the loop itself is called from Python
    laws = module.kernel_laws
    for name in laws.JIT_FUNCTIONS:
        options = getattr(laws, name).targetoptions
        assert options["nogil"] is True and options["error_model"] == "numpy"
        assert options["forceinline"] is True, name


def test_compile_marks_only_the_named_functions_for_inlining():
    source = types.ModuleType("tiny_kernel")
    exec("def half(x):\n    return x / 0.0 if x == 0.0 else x / 2.0\n"
         "def twice(x):\n    return 2.0 * half(x)\n", source.__dict__)
    found = newmark._compile(source, ("half", "twice"), inline=("half",))
    assert [f.py_func.__name__ for f in found] == ["half", "twice"]
    assert source.half.targetoptions["forceinline"] is True
    assert source.twice.targetoptions["forceinline"] is False
    # error_model="numpy": 0/0 is nan, not ZeroDivisionError (IEEE 754 division, as numpy)
    assert source.twice(3.0) == 3.0
    assert source.twice(0.0) != source.twice(0.0)


class _FakeCache:
    def __init__(self, folder):
        self._cache_path = str(folder)
        self.flushed = 0

    def flush(self):
        self.flushed += 1


def test_cached_loop_is_dropped_when_the_laws_change(tmp_path):
    laws = tmp_path / "kernel_laws.py"
    laws.write_text("A = 1\n")
    loop = [types.SimpleNamespace(_cache=_FakeCache(tmp_path)), types.SimpleNamespace(_cache=_FakeCache(tmp_path))]
    newmark._forget_stale(loop, str(laws))  # no stamp yet: whatever is cached may be stale
    assert [f._cache.flushed for f in loop] == [1, 1]
    stamp = (tmp_path / "kernel_laws.sha256").read_text(encoding="ascii").strip()
    import hashlib

    assert stamp == hashlib.sha256(b"A = 1\n").hexdigest()  # FIPS 180-4 SHA-256 of the laws' bytes
    newmark._forget_stale(loop, str(laws))  # same laws: the cache is kept
    assert [f._cache.flushed for f in loop] == [1, 1]
    laws.write_text("A = 2\n")
    newmark._forget_stale(loop, str(laws))  # the laws changed: dropped, stamp renewed
    assert [f._cache.flushed for f in loop] == [2, 2]
    assert (tmp_path / "kernel_laws.sha256").read_text(encoding="ascii").strip() == hashlib.sha256(
        b"A = 2\n").hexdigest()


def test_no_cache_folder_is_not_an_error(tmp_path):
    laws = tmp_path / "kernel_laws.py"
    laws.write_text("A = 1\n")
    newmark._forget_stale([types.SimpleNamespace()], str(laws))  # a dispatcher without a cache
    newmark._forget_stale([types.SimpleNamespace(_cache=_FakeCache(tmp_path / "missing"))], str(laws))
    assert not (tmp_path / "missing").exists()
