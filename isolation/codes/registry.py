"""Registry of code bases: one object per code, found by the name a study file gives.

``get(name)`` answers the :class:`isolation.codes.basis.CodeBasis` registered under
``name`` (a study's ``code.basis``); ``register(name, basis)`` adds one. The bases of
the package are the module-level basis objects of the modules ``isolation/codes/*_basis.py``
(ASCE/SEI 7-16 in ``asce7_basis``, EN 1998-1 in ``eurocode_basis``), found and loaded on
first use, so that this module imports nothing heavy and low-level modules may ask it;
bases of outside packages are found through the entry-point group :data:`ENTRY_POINT_GROUP`
(``name = "package.module:OBJECT"``).

Outside :mod:`isolation.codes` no module compares a basis name: it asks the object.
"""

from __future__ import annotations

import importlib
import pathlib
import pkgutil
from collections.abc import Mapping, Sequence
from importlib import metadata
from typing import TYPE_CHECKING, Any, Callable

if TYPE_CHECKING:
    from isolation.codes.basis import CodeBasis

__all__ = ["DEFAULT_BASIS", "ENTRY_POINT_GROUP", "UnknownBasisError", "register", "unregister", "get", "names",
           "get_or_default", "damping_rules", "PerBasis", "LiveNames"]

DEFAULT_BASIS = "asce7"
"""Name of the code basis a study without ``[code]`` takes, and the default of every
function that takes a basis name."""

ENTRY_POINT_GROUP = "isolation.code_bases"
"""Entry-point group through which outside packages offer a code basis."""

_MODULE_SUFFIX = "_basis"
"""Modules of this folder whose name ends so hold one code basis each (a module-level object)."""

_REGISTRY: dict[str, Any] = {}
_LOADED = False
_BY_RULE: dict[str, Any] = {}  # damping rule -> the first basis that has it (rebuilt when the registry changes)


class UnknownBasisError(ValueError):
    """A code-basis name that is not registered (a ValueError naming the field, the value and the known names)."""


def _load() -> None:
    global _LOADED
    if _LOADED:
        return
    _LOADED = True
    from isolation.codes.basis import CodeBasis

    # the modules beside this one (the package's folder), found without importing the package back
    package = __name__.rpartition(".")[0]
    for info in sorted(pkgutil.iter_modules([str(pathlib.Path(__file__).parent)]), key=lambda m: m.name):
        if not info.name.endswith(_MODULE_SUFFIX):
            continue
        module = importlib.import_module(f"{package}.{info.name}")
        for value in vars(module).values():
            if isinstance(value, CodeBasis) and type(value).__module__ == module.__name__:
                _REGISTRY.setdefault(value.name, value)
    points: Any
    try:
        points = metadata.entry_points(group=ENTRY_POINT_GROUP)
    except Exception:  # pragma: no cover - broken metadata of some installed distribution
        points = ()
    for point in points:
        if point.name not in _REGISTRY:
            _REGISTRY[point.name] = point.load()


def register(name: str, basis: "CodeBasis", *, replace: bool = False) -> "CodeBasis":
    """Register a code basis under ``name`` (the value of a study's ``code.basis``).

    Parameters
    ----------
    name : str
        Registry name, lower case letters, digits and underscores. [-]
    basis : CodeBasis
        The basis object; its ``name`` must equal ``name``. [-]
    replace : bool
        Allow replacing a basis already registered under ``name``. [-]

    Returns
    -------
    CodeBasis
        ``basis``, so that a module can write ``MY_CODE = register("my_code", MyCode())``.
    """
    from isolation.codes.basis import CodeBasis

    _load()
    if not isinstance(name, str) or not name or not name.replace("_", "").isalnum() or name != name.lower():
        raise ValueError(f"name = {name!r} is not allowed: must be lower-case letters, digits and underscores")
    if not isinstance(basis, CodeBasis):
        raise ValueError(f"basis = {type(basis).__name__} is not allowed: must be a CodeBasis")
    if basis.name != name:
        raise ValueError(f"basis.name = {basis.name!r} is not allowed: must equal the registry name {name!r}")
    if name in _REGISTRY and not replace:
        raise ValueError(f"name = {name!r} is not allowed: a code basis of that name is registered "
                         "(pass replace=True to replace it)")
    _REGISTRY[name] = basis
    _BY_RULE.clear()
    return basis


def unregister(name: str) -> None:
    """Remove the basis registered under ``name`` (a no-op when there is none)."""
    _load()
    _REGISTRY.pop(name, None)
    _BY_RULE.clear()


def names() -> tuple:
    """Names of the registered code bases, built-ins first. [-]"""
    _load()
    return tuple(_REGISTRY)


def get_or_default(name: Any) -> "CodeBasis":
    """The basis registered under ``name``, or the default basis when ``name`` is not registered
    (for results written by another installation, or a study whose ``code.basis`` is in error)."""
    _load()
    return get(name if isinstance(name, str) and name in _REGISTRY else DEFAULT_BASIS)


def damping_rules() -> dict:
    """Damping rule -> the (first) registered basis whose spectra use it."""
    _load()
    if not _BY_RULE or any(b is not _REGISTRY.get(b.name) for b in _BY_RULE.values()):
        _BY_RULE.clear()
        for basis in _REGISTRY.values():
            _BY_RULE.setdefault(basis.damping_rule, basis)
    return _BY_RULE


def get(name: Any = DEFAULT_BASIS, field: str = "code.basis") -> "CodeBasis":
    """The code basis registered under ``name`` (a basis object is returned as it is).

    Parameters
    ----------
    name : str or CodeBasis
        Registry name, e.g. a study's ``code.basis``. [-]
    field : str
        Name of the field the value came from, for the error message. [-]

    Raises
    ------
    UnknownBasisError
        ``name`` is not registered; the message names the field, the value and the known names.
    """
    if _LOADED and isinstance(name, str) and name in _REGISTRY:  # the common case, kept quick
        return _REGISTRY[name]
    from isolation.codes.basis import CodeBasis

    if isinstance(name, CodeBasis):
        return name
    _load()
    try:
        return _REGISTRY[name]
    except (KeyError, TypeError):
        listed = ", ".join(repr(n) for n in _REGISTRY)
        raise UnknownBasisError(f"{field} = {name!r} is not allowed: must be one of {listed}") from None


class PerBasis(Mapping):
    """Read-only table basis name -> ``getter(basis)`` over the bases registered at the time of use.

    The per-basis tables that modules kept as dictionaries (e.g.
    ``isolation.motions.suite.MEAN_RULES``) are these views: a basis registered later
    appears in them, and their values come from the basis objects.
    """

    def __init__(self, getter: Callable[[Any], Any]) -> None:
        self._getter = getter

    def __getitem__(self, name: str) -> Any:
        if not isinstance(name, str) or name not in names():
            raise KeyError(name)
        return self._getter(get(name))

    def __iter__(self):
        return iter(names())

    def __len__(self) -> int:
        return len(names())

    def __repr__(self) -> str:
        return repr(dict(self))


class LiveNames(Sequence):
    """Read-only tuple of names computed at the time of use (e.g. the registered bases)."""

    def __init__(self, source: Callable[[], tuple]) -> None:
        self._source = source

    def __getitem__(self, index):
        return self._source()[index]

    def __len__(self) -> int:
        return len(self._source())

    def __eq__(self, other: object) -> bool:
        return isinstance(other, (tuple, LiveNames)) and tuple(self) == tuple(other)

    def __hash__(self) -> int:
        return hash(tuple(self))

    def __repr__(self) -> str:
        return repr(tuple(self))
