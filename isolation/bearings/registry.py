"""The bearing registry: one description per bearing type, registered by its module.

Every bearing type is one module of :mod:`isolation.bearings` that defines the
bearing class (the :class:`Bearing` contract: ``backbone``, ``checks``,
``to_dict``, and ``with_friction_factor`` for sliders) and registers a
:class:`BearingType`: its study ``type`` name, its study keys and the checks
between them, how to build it from validated keys, whether it slides, and its
response-history force law. The study schema (:data:`isolation.study.BEARING_KEYS`),
the assembler (:func:`isolation.study.assembly.isolation_system`), the
isolation system (:class:`isolation.bearings.BearingGroup`) and the history
engine (:func:`isolation.dynamics.isolators.isolator_law`, the plan model's
biaxial laws) ask this registry; none of them names a bearing type.

Adding a bearing type is one module plus its tests (see DEVELOPERS.md, "How to
add a bearing model"). This module imports nothing of the bearing modules.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from types import MappingProxyType
from typing import Any, Callable, Iterator, Mapping, Protocol, runtime_checkable

from isolation.schema import Key

__all__ = ["Bearing", "BearingType", "UnknownBearingType", "register", "unregister", "bearing_type",
           "entry_of", "type_of", "kinds", "registered", "is_sliding"]


@runtime_checkable
class Bearing(Protocol):
    """What every bearing object offers (sliders also ``with_friction_factor(factor)``)."""

    def backbone(self, weight: float) -> Any:
        """Force-displacement model of one bearing under a vertical load [kN]: a ``Bilinear`` or
        ``MultiLinear``, or an object with ``effective_stiffness``, ``effective_damping``,
        ``force``, ``loop_energy``, ``times`` and ``scaled``."""

    def checks(self, axial_load: float, displacement: float, *, axial_load_max: float | None = None,
               axial_load_min: float | None = None, rotation: float = 0.0,
               weight_share: float | None = None) -> list:
        """``Check`` objects at a design displacement [m] under the loads [kN] and rotation [rad]."""

    def to_dict(self) -> dict:
        """Plain-JSON description whose ``"kind"`` is the registered type name."""


class UnknownBearingType(ValueError):
    """A bearing type name or object the registry does not know."""


def _never(bearing: Any) -> bool:
    return False


def _one(bearing: Any) -> float:
    return 1.0


@dataclass(frozen=True, eq=False)
class BearingType:
    """Everything the rest of the package needs to know about one bearing type.

    Parameters
    ----------
    kind : str
        Name of the type: the study file's ``type`` and the ``"kind"`` of the
        bearing's ``to_dict()`` (lower case, words joined by ``_``).
    model : type
        The bearing class (frozen dataclass following :class:`Bearing`).
    keys : mapping of str to Key
        Study-file keys of the type (beside ``type``, ``count``,
        ``axial_load``), internal units; their names are the keyword
        arguments of ``build``.
    cross_checks : tuple, optional
        Checks between keys, each an object with ``problem(values) ->
        (key, message) | None`` such as :class:`isolation.schema.Ordering`.
    sliding : bool, optional
        A friction bearing: property modification factors act on friction
        only (through ``model.with_friction_factor(factor)``), its forces are
        proportional to the axial load it carries (the plane's weight in the
        planar engine, the bearing's axial load in the plan model), and the
        ASCE 7 report treats the plane as sliding.
    build : callable, optional
        ``build(values) -> bearing`` from validated keys; default ``model(**values)``.
    history_law : callable or None, optional
        ``history_law(bearing, weight, friction_law)`` returning the law the
        engine integrates for the bearing standing for the whole plane under
        ``weight`` [kN] (see :mod:`isolation.bearings.laws`). None (default):
        the law of ``bearing.backbone(weight)``, which must then be a
        ``Bilinear`` or ``MultiLinear``.
    own_history_law : callable, optional
        ``own_history_law(bearing) -> bool``: True when a plane of this one
        bearing type runs the bearing's own law in response history rather than
        its backbone (friction that varies with velocity). Default: never.
    slow_friction_ratio : callable, optional
        For sliders, ``slow_friction_ratio(bearing)``: friction at rest over the
        design friction, used by the wind-restraint rule. Default 1. [-]
    label : str, optional
        Words for reports; default ``kind`` with spaces.
    """

    kind: str
    model: type
    keys: Mapping[str, Key]
    cross_checks: tuple = ()
    sliding: bool = False
    build: Callable[[Mapping[str, Any]], Any] | None = None
    history_law: Callable[..., Any] | None = None
    own_history_law: Callable[[Any], bool] = _never
    slow_friction_ratio: Callable[[Any], float] = _one
    label: str = field(default="")

    def __post_init__(self) -> None:
        if not isinstance(self.kind, str) or not self.kind.isidentifier() or self.kind != self.kind.lower():
            raise ValueError(f"kind = {self.kind!r} is not allowed: must be a lower-case name such as "
                             "'friction_pendulum'")
        if not isinstance(self.model, type):
            raise ValueError(f"model = {self.model!r} is not allowed: must be a bearing class")
        needed = ("backbone", "checks", "to_dict") + (("with_friction_factor",) if self.sliding else ())
        missing = [name for name in needed if not callable(getattr(self.model, name, None))]
        if missing:
            raise ValueError(f"model = {self.model.__name__} is not allowed: it has no {', '.join(missing)} "
                             f"(a {'sliding ' if self.sliding else ''}bearing needs {', '.join(needed)})")
        for name, key in self.keys.items():
            if not isinstance(key, Key):
                raise ValueError(f"keys[{name!r}] = {key!r} is not allowed: must be an isolation.schema.Key")
        for check in self.cross_checks:
            if not callable(getattr(check, "problem", None)):
                raise ValueError(f"cross_checks entry {check!r} is not allowed: must have problem(values)")
        object.__setattr__(self, "keys", MappingProxyType(dict(self.keys)))
        object.__setattr__(self, "cross_checks", tuple(self.cross_checks))
        if not self.label:
            object.__setattr__(self, "label", self.kind.replace("_", " "))

    def create(self, values: Mapping[str, Any]) -> Any:
        """A bearing from validated key values (internal units): ``build(values)``, or ``model(**values)``."""
        if self.build is not None:
            return self.build(values)
        return self.model(**values)

    def problems(self, values: Mapping[str, Any]) -> Iterator[tuple[str, str]]:
        """(key, message) for every cross-check the validated ``values`` break."""
        for check in self.cross_checks:
            found = check.problem(values)
            if found is not None:
                yield found


_TYPES: dict[str, BearingType] = {}


def register(entry: BearingType, *, replace: bool = False) -> BearingType:
    """Add a bearing type to the registry (each bearing module calls this once).

    Parameters
    ----------
    entry : BearingType
        The description.
    replace : bool, optional
        Allow replacing a type of the same name (default False: registering
        another description under a registered name is an error; the same
        description again is accepted).

    Returns
    -------
    BearingType
        ``entry``, so a module may keep it.
    """
    if not isinstance(entry, BearingType):
        raise ValueError(f"entry = {entry!r} is not allowed: must be a BearingType")
    if not replace and entry.kind in _TYPES and _TYPES[entry.kind] is not entry:
        raise ValueError(f"kind = {entry.kind!r} is not allowed: a bearing type of that name is already "
                         "registered (pass replace=True to replace it)")
    _TYPES[entry.kind] = entry
    return entry


def unregister(kind: str) -> None:
    """Remove a registered type (for tests and plug-ins that register a type for a while)."""
    if kind not in _TYPES:
        raise UnknownBearingType(_unknown_text(kind))
    del _TYPES[kind]


def _unknown_text(kind: object) -> str:
    return f"type = {kind!r} is not allowed: must be one of {', '.join(repr(k) for k in _TYPES)}"


def kinds() -> tuple[str, ...]:
    """Names of the registered bearing types, in registration order."""
    return tuple(_TYPES)


def registered() -> tuple[BearingType, ...]:
    """The registered descriptions, in registration order."""
    return tuple(_TYPES.values())


def type_of(bearing: object) -> BearingType | None:
    """The description of a bearing object's type (its class or a base class), or None."""
    for cls in type(bearing).__mro__:
        for entry in _TYPES.values():
            if entry.model is cls:
                return entry
    return None


def bearing_type(kind: str) -> BearingType:
    """The description registered under a type name (a study file's ``type``).

    Raises
    ------
    UnknownBearingType
        (a ValueError) naming the value and the registered types.
    """
    if isinstance(kind, str) and kind in _TYPES:
        return _TYPES[kind]
    raise UnknownBearingType(_unknown_text(kind))


def entry_of(bearing: object) -> BearingType:
    """The description of a bearing object's type.

    Raises
    ------
    UnknownBearingType
        (a ValueError) naming the object and the registered bearing classes.
    """
    entry = type_of(bearing)
    if entry is None:
        allowed = ", ".join(e.model.__name__ for e in _TYPES.values())
        raise UnknownBearingType(f"bearing = {bearing!r} is not allowed: must be one of {allowed}")
    return entry


def is_sliding(bearing: object) -> bool:
    """True for a bearing of a registered sliding type; False for anything else (backbones, laws)."""
    entry = type_of(bearing)
    return entry is not None and entry.sliding
