"""Study files: one TOML file describing one base-isolation feasibility study.

A study names the project, the code basis, the site, the superstructure, one
or more isolation alternatives, the analysis options and the wind load. It is
validated once, here, at load: every problem found (missing keys, wrong
types, wrong units, unknown keys, values out of range) is collected and
reported together in one :class:`StudyError` (an
:class:`isolation.errors.InputError`) whose message names each key path, the
value and what is allowed.

Quantities may carry units (``"12 in"``, ``"350 kN"``); bare numbers are read
in the study's unit system (``units = "SI"`` or ``"US"``, see
:mod:`isolation.units`). The :class:`Study` holds everything in the package's
internal units: kN, m, s, kPa, spectral values in g.

``examples/demo_study.toml`` is a complete commented study. The keys
(* required; quantities accept units):

* ``units`` "SI" (default) or "US".
* ``[project]`` name*, client*, prepared_by*, revision*, date* (2026-12-01).
* ``[code]`` basis* "asce7" or "eurocode".
* ``[site]`` near_fault (false). ASCE 7: sms*, sm1* [g], long_period (8 s),
  s1 [g] (default: sm1, for the ELF limits), site_class* A-F. Eurocode: ag*
  [g], spectrum_type 1 or 2, ground_type* A-E. Either basis: spectrum_file, a
  CSV of period [s], Sa [g] at 5 % relative to the study file, in place of
  sms/sm1/long_period or ag/spectrum_type.
* ``[building]`` storeys*, floor_weights* (level 1 to roof; one value for
  all), base_weight*, storey_heights*, lateral_system* (steel_moment_frame,
  concrete_moment_frame, braced_frame, other), response_modification* (R, or
  q for Eurocode), importance (1.0), plan_length*, plan_width* (length is the
  longer side), fixed_base_period (code estimate), eccentricity (0 m),
  damping (0.05).
* ``[analysis]`` suite_size 7 or 11, seed (0), duration (30 s), time_step
  (0.005 s), damping (0.05).
* ``[wind]`` base_shear (no wind check without it).
* ``[[alternative]]`` (one or more) name*, moat, ``[alternative.property_factors]``
  lower (0.85), upper (1.2), and ``[[alternative.bearings]]`` (one or more
  groups) type*, count*, axial_load per bearing (equal share of the weight
  when left out in every group) and the type's keys in :data:`BEARING_KEYS`
  (with unit and allowed range).
"""

from __future__ import annotations

import copy
import csv
import math
import re
import tomllib
from dataclasses import asdict, dataclass, field
from datetime import date as _date
from pathlib import Path
from typing import Any, Mapping

from isolation import units as _units
from isolation.errors import InputError

__all__ = [
    "Study",
    "Project",
    "Site",
    "Building",
    "BearingSpec",
    "Alternative",
    "Analysis",
    "StudyError",
    "load_study",
    "parse_study",
    "read_study_mapping",
    "apply_overrides",
    "BEARING_KEYS",
    "LATERAL_SYSTEMS",
]


class StudyError(InputError):
    """A study file with one or more problems; ``problems`` lists each one."""

    def __init__(self, problems: list[str], source: str = "") -> None:
        self.problems = list(problems)
        self.source = source
        where = f"{source}: " if source else ""
        if len(problems) == 1:
            message = f"{where}{problems[0]}"
        else:
            listed = "; ".join(f"({i}) {p}" for i, p in enumerate(problems, 1))
            message = f"{where}{len(problems)} problems: {listed}"
        super().__init__(message)


@dataclass(frozen=True)
class Project:
    """Names printed on the report's title page (invented in examples)."""

    name: str
    client: str
    prepared_by: str
    revision: str
    date: str  # ISO date, YYYY-MM-DD


@dataclass(frozen=True)
class Site:
    """Site hazard in g and s; which fields are set depends on the code basis.

    ``sms``, ``sm1`` [g], ``long_period`` [s], ``s1`` [g], ``site_class``
    for ASCE 7; ``ag`` [g], ``ground_type``, ``spectrum_type`` for Eurocode;
    ``spectrum_periods`` [s] / ``spectrum_values`` [g, 5 % damped] when a
    tabulated spectrum file was given (``spectrum_file`` is its resolved path).
    """

    near_fault: bool = False
    sms: float | None = None
    sm1: float | None = None
    long_period: float | None = None
    s1: float | None = None
    site_class: str | None = None
    ag: float | None = None
    ground_type: str | None = None
    spectrum_type: int | None = None
    spectrum_file: str | None = None
    spectrum_periods: tuple = ()
    spectrum_values: tuple = ()


@dataclass(frozen=True)
class Building:
    """Superstructure above the isolation plane, internal units.

    ``floor_weights`` [kN] from level 1 to the roof, ``base_weight`` [kN] of
    the floor just above the isolators, ``storey_heights`` [m],
    ``fixed_base_period`` [s] or None (code estimate), ``plan_length`` and
    ``plan_width`` [m], ``eccentricity`` [m], ``damping`` [-].
    """

    storeys: int
    floor_weights: tuple
    base_weight: float
    storey_heights: tuple
    lateral_system: str
    response_modification: float
    importance: float
    plan_length: float
    plan_width: float
    fixed_base_period: float | None = None
    eccentricity: float = 0.0
    damping: float = 0.05

    @property
    def total_weight(self) -> float:
        """Seismic weight above the isolators, base floor included. [kN]"""
        return self.base_weight + sum(self.floor_weights)

    @property
    def height(self) -> float:
        """Height of the roof above the isolation plane. [m]"""
        return float(sum(self.storey_heights))


@dataclass(frozen=True)
class BearingSpec:
    """One group of identical bearings: ``type``, ``count``, ``axial_load``
    per bearing [kN] (equal share when not given) and the type's
    ``properties`` in internal units (see ``BEARING_KEYS``)."""

    type: str
    count: int
    axial_load: float
    properties: dict = field(default_factory=dict)
    axial_load_given: bool = False


@dataclass(frozen=True)
class Alternative:
    """One isolation alternative: bearing groups, bounds and moat.

    ``moat`` [m] is the clear gap provided around the isolated building (None
    when not yet fixed); ``lower_factor`` / ``upper_factor`` [-] are the
    property modification factors applied to the bearings' nominal properties.
    """

    name: str
    bearings: tuple
    lower_factor: float
    upper_factor: float
    moat: float | None = None

    @property
    def count(self) -> int:
        """Number of bearings in all groups. [-]"""
        return sum(group.count for group in self.bearings)


@dataclass(frozen=True)
class Analysis:
    """Analysis options: ``suite_size`` (7 or 11), ``seed``, ``duration`` [s],
    ``time_step`` [s], ``damping`` [-] of the matched spectra."""

    suite_size: int = 7
    seed: int = 0
    duration: float = 30.0
    time_step: float = 0.005
    damping: float = 0.05


@dataclass(frozen=True)
class Study:
    """A validated study in internal units (kN, m, s, kPa, g).

    ``units`` is the system used for input and display; ``wind_base_shear``
    [kN] is None when the study gives no wind load; ``source`` names the file.
    """

    project: Project
    basis: str
    units: str
    site: Site
    building: Building
    alternatives: tuple
    analysis: Analysis
    wind_base_shear: float | None = None
    source: str = ""

    def alternative(self, name: str) -> Alternative:
        """The alternative called ``name``."""
        for alternative in self.alternatives:
            if alternative.name == name:
                return alternative
        names = ", ".join(repr(a.name) for a in self.alternatives)
        raise InputError(f"alternative = {name!r} is not allowed: must be one of {names}")

    def to_dict(self) -> dict:
        """Plain JSON types (lists, not tuples), internal units."""
        return _plain(asdict(self))


def _plain(value: Any) -> Any:
    if isinstance(value, dict):
        return {str(k): _plain(v) for k, v in value.items()}
    if isinstance(value, (list, tuple)):
        return [_plain(v) for v in value]
    return value


# --------------------------------------------------------------------------
# Key reading with collected problems
# --------------------------------------------------------------------------
@dataclass(frozen=True)
class Key:
    """What a key accepts: ``kind`` is a unit kind of :mod:`isolation.units`,
    ``"number"`` (unit ``unit``) or ``"integer"``; range ``low``..``high``."""

    kind: str
    required: bool = True
    low: float | None = None
    high: float | None = None
    low_inclusive: bool = True
    unit: str = "-"


BEARING_KEYS: dict[str, dict[str, Key]] = {
    "friction_pendulum": {
        "radius": Key("length", low=0.3, high=20.0),
        "friction": Key("number", low=0.0, high=0.3, low_inclusive=False),
        "slider_height": Key("length", required=False, low=0.0, high=2.0),
        "displacement_capacity": Key("length", required=False, low=0.0, high=3.0, low_inclusive=False),
        "friction_slow": Key("number", required=False, low=0.0, high=0.3, low_inclusive=False),
        "rate_parameter": Key("number", required=False, low=0.0, high=500.0, unit="s/m"),
    },
    "double_concave": {
        "radius_1": Key("length", low=0.3, high=20.0),
        "friction_1": Key("number", low=0.0, high=0.3, low_inclusive=False),
        "radius_2": Key("length", low=0.3, high=20.0),
        "friction_2": Key("number", low=0.0, high=0.3, low_inclusive=False),
        "slider_height_1": Key("length", required=False, low=0.0, high=2.0),
        "slider_height_2": Key("length", required=False, low=0.0, high=2.0),
        "displacement_capacity_1": Key("length", required=False, low=0.0, high=3.0, low_inclusive=False),
        "displacement_capacity_2": Key("length", required=False, low=0.0, high=3.0, low_inclusive=False),
    },
    "lead_rubber": {
        "outer_diameter": Key("length", low=0.2, high=2.5),
        "lead_diameter": Key("length", low=0.0, high=1.0, low_inclusive=False),
        "layer_thickness": Key("length", low=0.002, high=0.05),
        "layers": Key("integer", low=1, high=200),
        "shear_modulus": Key("stress", low=200.0, high=2000.0),
        "lead_yield_stress": Key("stress", required=False, low=1000.0, high=30000.0),
        "stiffness_ratio": Key("number", required=False, low=1.0, high=50.0, low_inclusive=False),
        "displacement_capacity": Key("length", required=False, low=0.0, high=3.0, low_inclusive=False),
    },
    "high_damping_rubber": {
        "outer_diameter": Key("length", low=0.2, high=2.5),
        "layer_thickness": Key("length", low=0.002, high=0.05),
        "layers": Key("integer", low=1, high=200),
        "inner_diameter": Key("length", required=False, low=0.0, high=1.0),
        "stiffness_ratio": Key("number", required=False, low=1.0, high=50.0, low_inclusive=False),
        "displacement_capacity": Key("length", required=False, low=0.0, high=3.0, low_inclusive=False),
    },
}
"""Keys of each bearing type (beside ``type``, ``count``, ``axial_load``),
with kind, whether required, and allowed range in internal units (m, kPa)."""

ROOT_KEYS = ("units", "project", "code", "site", "building", "analysis", "wind", "alternative")

_MISSING = object()


class Problems:
    """An ordered list of problem messages."""

    def __init__(self) -> None:
        self.items: list[str] = []

    def add(self, message: str) -> None:
        self.items.append(message)

    def __bool__(self) -> bool:
        return bool(self.items)

    def __len__(self) -> int:
        return len(self.items)


def _range_text(low, high, low_inclusive=True, high_inclusive=True) -> str:
    if low is not None and high is not None:
        left, right = ("[" if low_inclusive else "("), ("]" if high_inclusive else ")")
        return f"in {left}{low:g}, {high:g}{right}"
    if low is not None:
        return f"{'>=' if low_inclusive else '>'} {low:g}"
    if high is not None:
        return f"<= {high:g}"
    return "finite"


class Reader:
    """Reads the keys of one table, adding a message to ``problems`` for each
    bad or missing value and remembering which keys are known."""

    def __init__(self, mapping: Mapping, path: str, problems: Problems, system: str = "SI") -> None:
        self.mapping, self.path, self.problems, self.system = mapping, path, problems, system
        self.known: set[str] = set()
        self.used = self.known
        self._start = len(problems)

    def path_of(self, key: str) -> str:
        return f"{self.path}.{key}" if self.path else key

    def failed(self) -> bool:
        """Whether any problem was found in this table (and its children) so far."""
        return len(self.problems) > self._start

    def _get(self, key: str, required: bool, allowed: str):
        self.known.add(key)
        if key in self.mapping:
            return self.mapping[key]
        if required:
            self.problems.add(f"{self.path_of(key)} is missing: must be {allowed}")
        return _MISSING

    def _bad(self, key: str, value: Any, allowed: str) -> None:
        self.problems.add(f"{self.path_of(key)} = {value!r} is not allowed: must be {allowed}")

    def text(self, key: str, *, required: bool = True, default=None, allow_int: bool = False):
        allowed = "text in quotes" + (" or a whole number" if allow_int else "")
        value = self._get(key, required, allowed)
        if value is _MISSING:
            return default
        if allow_int and isinstance(value, int) and not isinstance(value, bool):
            return str(value)
        if not isinstance(value, str) or not value.strip():
            self._bad(key, value, "non-empty " + allowed)
            return None
        return value.strip()

    def date(self, key: str):
        allowed = "a date such as 2026-12-01"
        value = self._get(key, True, allowed)
        if value is _MISSING:
            return None
        try:
            if isinstance(value, _date) and not hasattr(value, "hour"):
                return value.isoformat()
            return _date.fromisoformat(str(value)).isoformat() if isinstance(value, str) else _raise()
        except (ValueError, TypeError):
            self._bad(key, value, allowed)
            return None

    def boolean(self, key: str, *, required: bool = True, default=None):
        value = self._get(key, required, "true or false")
        if value is _MISSING:
            return default
        if not isinstance(value, bool):
            self._bad(key, value, "true or false")
            return None
        return value

    def choice(self, key: str, options: tuple, *, required: bool = True, default=None):
        allowed = "one of " + ", ".join(repr(o) for o in options)
        value = self._get(key, required, allowed)
        if value is _MISSING:
            return default
        if isinstance(value, bool) or value not in options:
            self._bad(key, value, allowed)
            return None
        return value

    def number(self, key: str, *, low=None, high=None, low_inclusive=True, high_inclusive=True,
               unit: str = "-", required: bool = True, default=None):
        allowed = f"a number {_range_text(low, high, low_inclusive, high_inclusive)} [{unit}]"
        value = self._get(key, required, allowed)
        if value is _MISSING:
            return default
        if isinstance(value, bool) or not isinstance(value, (int, float)) or not math.isfinite(value):
            self._bad(key, value, allowed + " (without a unit)")
            return None
        if not _inside(float(value), low, high, low_inclusive, high_inclusive):
            self._bad(key, value, allowed)
            return None
        return float(value)

    def integer(self, key: str, *, low=None, high=None, required: bool = True, default=None):
        allowed = f"a whole number {_range_text(low, high)}"
        value = self._get(key, required, allowed)
        if value is _MISSING:
            return default
        if isinstance(value, bool) or not isinstance(value, int) or not _inside(value, low, high):
            self._bad(key, value, allowed)
            return None
        return int(value)

    def quantity(self, key: str, kind: str, *, low=None, high=None, low_inclusive=True,
                 high_inclusive=True, required: bool = True, default=None):
        unit = _units.KINDS[kind][0]
        bounds = _range_text(low, high, low_inclusive, high_inclusive)
        allowed = f"a {kind} {bounds} [{unit}], e.g. {_units.KINDS[kind][1]}"
        value = self._get(key, required, allowed)
        if value is _MISSING:
            return default
        return self._quantity_value(self.path_of(key), value, kind, low, high, low_inclusive, high_inclusive)

    def _quantity_value(self, where, value, kind, low, high, low_inclusive=True, high_inclusive=True):
        try:
            number = _units.parse_quantity(value, kind, field=where, system=self.system)
        except InputError as error:
            self.problems.add(str(error))
            return None
        if not _inside(number, low, high, low_inclusive, high_inclusive):
            unit = _units.KINDS[kind][0]
            shown = f"{value!r}" if isinstance(value, str) else f"{value!r} ({self.system} bare number)"
            self.problems.add(f"{where} = {shown} = {number:.4g} {unit} is not allowed: must be "
                              f"{_range_text(low, high, low_inclusive, high_inclusive)} [{unit}]")
            return None
        return number

    def quantity_list(self, key: str, kind: str, *, length=None, low=None, high=None,
                      low_inclusive=True):
        unit = _units.KINDS[kind][0]
        allowed = (f"a list of {length or 'n'} values of {kind} [{unit}] (one per storey, "
                   f"level 1 first) or one value for every storey")
        value = self._get(key, True, allowed)
        if value is _MISSING:
            return None
        if not isinstance(value, list):
            number = self._quantity_value(self.path_of(key), value, kind, low, high,
                                          low_inclusive=low_inclusive)
            return None if number is None else (number,) * (length or 1)
        if length is not None and len(value) != length:
            self._bad(key, value, allowed + f"; {len(value)} values were given")
            return None
        numbers = [self._quantity_value(f"{self.path_of(key)}[{i}]", v, kind, low, high,
                                        low_inclusive=low_inclusive)
                   for i, v in enumerate(value)]
        if any(n is None for n in numbers):
            return None
        return tuple(numbers)

    def by_spec(self, key: str, spec: Key):
        if spec.kind == "number":
            return self.number(key, low=spec.low, high=spec.high, low_inclusive=spec.low_inclusive,
                               unit=spec.unit, required=spec.required)
        if spec.kind == "integer":
            return self.integer(key, low=spec.low, high=spec.high, required=spec.required)
        return self.quantity(key, spec.kind, low=spec.low, high=spec.high,
                             low_inclusive=spec.low_inclusive, required=spec.required)

    def table(self, key: str, *, required: bool = True) -> "Reader | None":
        value = self._get(key, required, "a table of keys")
        if value is _MISSING:
            return None
        if not isinstance(value, dict):
            self._bad(key, value, f"a table [{self.path_of(key)}] of keys")
            return None
        return Reader(value, self.path_of(key), self.problems, self.system)

    def array_of_tables(self, key: str, *, required: bool = True) -> "list[Reader] | None":
        value = self._get(key, required, f"one or more tables [[{self.path_of(key)}]]")
        if value is _MISSING:
            return None
        if not isinstance(value, list) or not value or not all(isinstance(v, dict) for v in value):
            self._bad(key, value, f"one or more tables [[{self.path_of(key)}]]")
            return None
        return [Reader(v, f"{self.path_of(key)}[{i}]", self.problems, self.system)
                for i, v in enumerate(value)]

    def done(self) -> None:
        """Report keys of this table that nobody asked for."""
        unknown = [k for k in self.mapping if k not in self.known]
        for key in unknown:
            known = ", ".join(sorted(self.known))
            self.problems.add(f"{self.path_of(key)} is not a known key: known keys here are {known}")


def _raise():
    raise ValueError


def _inside(value, low, high, low_inclusive=True, high_inclusive=True) -> bool:
    if low is not None and (value < low if low_inclusive else value <= low):
        return False
    if high is not None and (value > high if high_inclusive else value >= high):
        return False
    return True


# --------------------------------------------------------------------------
# Loading
# --------------------------------------------------------------------------
def read_study_mapping(path: str | Path) -> dict:
    """Read a study file's TOML into a plain mapping (no validation).

    Raises :class:`StudyError` for a missing file or malformed TOML.
    """
    path = Path(path)
    try:
        text = path.read_text(encoding="utf-8")
    except FileNotFoundError:
        raise StudyError([f"study file {str(path)!r} does not exist"]) from None
    except (OSError, UnicodeDecodeError) as error:
        raise StudyError([f"study file {str(path)!r} cannot be read: {error}"]) from None
    try:
        return tomllib.loads(text)
    except tomllib.TOMLDecodeError as error:
        raise StudyError([f"not valid TOML: {error}"], source=str(path)) from None


def load_study(path: str | Path, overrides: Mapping[str, Any] | None = None) -> Study:
    """Load and validate a study file.

    Parameters
    ----------
    path : str or Path
        The TOML study file. A tabulated spectrum file it names is read
        relative to the study file's folder.
    overrides : mapping, optional
        ``{"dotted.key.path": value}`` applied before validation (see
        :func:`apply_overrides`).

    Returns
    -------
    Study

    Raises
    ------
    StudyError
        Listing every problem found, each naming the key path, the value and
        what is allowed.
    """
    path = Path(path)
    mapping = read_study_mapping(path)
    if overrides:
        mapping = apply_overrides(mapping, overrides)
    return parse_study(mapping, source=str(path), base_dir=path.parent)


def parse_study(mapping: Mapping[str, Any], source: str = "<study>", *,
                base_dir: str | Path | None = None) -> Study:
    """Validate a study given as a mapping (parsed TOML) and build a :class:`Study`.

    Parameters
    ----------
    mapping : mapping
        The study's keys, as read from TOML.
    source : str
        Name used in error messages and kept as ``Study.source``.
    base_dir : str or Path, optional
        Folder against which a relative ``site.spectrum_file`` is resolved
        (default: the folder of ``source`` when it is a path, else the
        current folder).
    """
    if not isinstance(mapping, Mapping):
        raise StudyError([f"the study must be a table of keys, not {type(mapping).__name__}"], source)
    if base_dir is None:
        base_dir = Path(source).parent if source and not source.startswith("<") else Path.cwd()
    problems = Problems()
    reader = Reader(mapping, "", problems, system="SI")
    units = reader.choice("units", ("SI", "US"), required=False, default="SI")
    system = units if units in ("SI", "US") else "SI"
    reader.system = system
    project = _project(reader.table("project"))
    basis = _basis(reader.table("code"))
    site = _site(reader.table("site"), basis, Path(base_dir))
    building = _building(reader.table("building"), basis)
    analysis = _analysis(reader.table("analysis", required=False))
    wind = reader.table("wind", required=False)
    wind_shear = wind.quantity("base_shear", "force", low=0.0, required=False) if wind else None
    if wind:
        wind.done()
    total_weight = None
    if building is not None:
        total_weight = building.total_weight
    alternatives = _alternatives(reader.array_of_tables("alternative"), total_weight)
    reader.done()
    if problems:
        raise StudyError(problems.items, source)
    return Study(project=project, basis=basis, units=units, site=site, building=building,
                 alternatives=alternatives, analysis=analysis, wind_base_shear=wind_shear,
                 source=source)


def _project(t: Reader | None) -> Project | None:
    if t is None:
        return None
    values = dict(
        name=t.text("name"), client=t.text("client"), prepared_by=t.text("prepared_by"),
        revision=t.text("revision", allow_int=True), date=t.date("date"),
    )
    t.done()
    return Project(**values)


def _basis(t: Reader | None) -> str:
    if t is None:
        return "asce7"
    basis = t.choice("basis", ("asce7", "eurocode"))
    t.done()
    return basis or "asce7"


def _site(t: Reader | None, basis: str, base_dir: Path) -> Site | None:
    if t is None:
        return None
    values: dict[str, Any] = {"near_fault": t.boolean("near_fault", required=False, default=False)}
    tabulated = "spectrum_file" in t.mapping
    t.known.add("spectrum_file")
    if tabulated:
        name = t.text("spectrum_file")
        if name:
            path = (base_dir / name) if not Path(name).is_absolute() else Path(name)
            table = _read_spectrum_table(path, t.path_of("spectrum_file"), t.problems)
            if table:
                values["spectrum_file"] = str(path)
                values["spectrum_periods"], values["spectrum_values"] = table
        shape_keys = ("sms", "sm1", "long_period") if basis == "asce7" else ("ag", "spectrum_type")
        for key in shape_keys:
            if key in t.mapping:
                t.problems.add(f"{t.path_of(key)} = {t.mapping[key]!r} is not allowed together with "
                               f"site.spectrum_file: give either the spectrum file or the code parameters")
                t.used.add(key)
    if basis == "asce7":
        if not tabulated:
            values["sms"] = t.number("sms", low=0.0, high=5.0, low_inclusive=False, unit="g")
            values["sm1"] = t.number("sm1", low=0.0, high=5.0, low_inclusive=False, unit="g")
            values["long_period"] = t.quantity("long_period", "time", low=1.0, high=20.0,
                                               required=False, default=8.0)
        values["s1"] = t.number("s1", low=0.0, high=5.0, unit="g", required=False)
        values["site_class"] = t.choice("site_class", ("A", "B", "C", "D", "E", "F"))
        if not tabulated and isinstance(values.get("sms"), float) and isinstance(values.get("sm1"), float):
            tl = values.get("long_period")
            if isinstance(tl, float) and tl <= values["sm1"] / values["sms"]:
                t.problems.add(f"site.long_period = {tl:g} s is not allowed: must exceed "
                               f"T_S = sm1/sms = {values['sm1'] / values['sms']:.3g} s")
    else:
        if not tabulated:
            values["ag"] = t.number("ag", low=0.0, high=1.5, low_inclusive=False, unit="g")
            values["spectrum_type"] = t.choice("spectrum_type", (1, 2), required=False, default=1)
        values["ground_type"] = t.choice("ground_type", ("A", "B", "C", "D", "E"))
    t.done()
    return Site(**values)


def _read_spectrum_table(path: Path, key: str, problems: Problems):
    """Two columns: period [s], Sa [g] at 5 % damping; an optional header line."""
    try:
        lines = path.read_text(encoding="utf-8").splitlines()
    except OSError:
        problems.add(f"{key} = {str(path)!r} is not allowed: must name an existing CSV file "
                     "(relative to the study file) with columns period [s], Sa [g]")
        return None
    periods, values = [], []
    for number, row in enumerate(csv.reader(lines), 1):
        if not row or not "".join(row).strip() or row[0].lstrip().startswith("#"):
            continue
        try:
            t_value, sa_value = (float(x) for x in row[:2])
            if len(row) != 2:
                raise ValueError
        except ValueError:
            if not periods and number == 1:
                continue  # header line
            problems.add(f"{key}: line {number} = {','.join(row)!r} is not allowed: "
                         "must be two numbers, period [s] and Sa [g]")
            return None
        periods.append(t_value)
        values.append(sa_value)
    if len(periods) < 2:
        problems.add(f"{key} = {str(path)!r} is not allowed: must hold at least 2 rows period [s], Sa [g]")
        return None
    bad = [i for i in range(len(periods)) if not (math.isfinite(periods[i]) and math.isfinite(values[i])
                                                  and periods[i] >= 0 and values[i] > 0)]
    rising = all(b > a for a, b in zip(periods, periods[1:]))
    if bad or not rising:
        problems.add(f"{key} = {str(path)!r} is not allowed: periods must be >= 0 and strictly "
                     "increasing and Sa values > 0 [s, g]")
        return None
    return tuple(periods), tuple(values)


LATERAL_SYSTEMS = ("steel_moment_frame", "concrete_moment_frame", "braced_frame", "other")
"""Lateral systems for the code's approximate fixed-base period (ASCE/SEI 7-16 Table 12.8-2)."""


def _building(t: Reader | None, basis: str) -> Building | None:
    if t is None:
        return None
    storeys = t.integer("storeys", low=1, high=40)
    count = storeys if isinstance(storeys, int) else None
    values = dict(
        storeys=storeys,
        floor_weights=t.quantity_list("floor_weights", "weight", length=count, low=0.0,
                                      low_inclusive=False),
        base_weight=t.quantity("base_weight", "weight", low=0.0, low_inclusive=False),
        storey_heights=t.quantity_list("storey_heights", "length", length=count, low=1.5, high=20.0),
        lateral_system=t.choice("lateral_system", LATERAL_SYSTEMS),
        response_modification=t.number("response_modification", low=1.0, high=8.0),
        importance=t.number("importance", low=0.8, high=1.5, required=False, default=1.0),
        plan_length=t.quantity("plan_length", "length", low=1.0, high=500.0),
        plan_width=t.quantity("plan_width", "length", low=1.0, high=500.0),
        fixed_base_period=t.quantity("fixed_base_period", "time", low=0.02, high=10.0, required=False),
        eccentricity=t.quantity("eccentricity", "length", low=0.0, required=False, default=0.0),
        damping=t.number("damping", low=0.0, high=0.3, low_inclusive=False, required=False, default=0.05),
    )
    length, width = values["plan_length"], values["plan_width"]
    if isinstance(width, float) and isinstance(length, float) and width > length:
        t.problems.add(f"building.plan_width = {width:g} m is not allowed: must not exceed "
                       f"building.plan_length = {length:g} m (length is the longer side)")
    ecc = values["eccentricity"]
    if isinstance(ecc, float) and isinstance(length, float) and ecc > 0.5 * length:
        t.problems.add(f"building.eccentricity = {ecc:g} m is not allowed: must be at most half the "
                       f"plan length ({0.5 * length:g} m)")
    t.done()
    if t.failed():
        return None
    return Building(**values)


def _analysis(t: Reader | None) -> Analysis:
    if t is None:
        return Analysis()
    values = dict(
        suite_size=t.choice("suite_size", (7, 11), required=False, default=7),
        seed=t.integer("seed", low=0, high=2**32 - 1, required=False, default=0),
        duration=t.quantity("duration", "time", low=5.0, high=120.0, required=False, default=30.0),
        time_step=t.quantity("time_step", "time", low=0.001, high=0.02, required=False, default=0.005),
        damping=t.number("damping", low=0.01, high=0.3, required=False, default=0.05),
    )
    t.done()
    if t.failed():
        return Analysis()
    return Analysis(**values)


def _alternatives(tables: list | None, total_weight: float | None) -> tuple:
    if not tables:
        return ()
    alternatives, names = [], set()
    for t in tables:
        name = t.text("name")
        if isinstance(name, str):
            if name in names:
                t.problems.add(f"{t.path_of('name')} = {name!r} is not allowed: alternative names must be unique")
            names.add(name)
        moat = t.quantity("moat", "length", low=0.0, high=5.0, low_inclusive=False, required=False)
        factors = t.table("property_factors", required=False)
        lower, upper = 0.85, 1.2
        if factors is not None:
            lower = factors.number("lower", low=0.3, high=1.0, required=False, default=lower)
            upper = factors.number("upper", low=1.0, high=3.0, required=False, default=upper)
            factors.done()
        groups = t.array_of_tables("bearings") or []
        specs = [_bearing_group(g) for g in groups]
        t.done()
        if not specs or any(s is None for s in specs) or not isinstance(name, str):
            continue
        specs = _share_axial_loads(specs, total_weight, t)
        alternatives.append(Alternative(name=name, bearings=tuple(specs), lower_factor=lower,
                                        upper_factor=upper, moat=moat))
    return tuple(alternatives)


def _bearing_group(t: Reader) -> BearingSpec | None:
    kind = t.choice("type", tuple(BEARING_KEYS))
    count = t.integer("count", low=1, high=2000)
    axial = t.quantity("axial_load", "force", low=0.0, low_inclusive=False, required=False)
    properties = {}
    if kind in BEARING_KEYS:
        for key, spec in BEARING_KEYS[kind].items():
            value = t.by_spec(key, spec)
            if value is not None:
                properties[key] = value
        _cross_check_bearing(t, kind, properties)
        t.done()  # unknown keys are judged only when the type is known
    if kind not in BEARING_KEYS or not isinstance(count, int) or t.failed():
        return None
    return BearingSpec(type=kind, count=count, axial_load=axial or 0.0, properties=properties,
                       axial_load_given=axial is not None)


def _cross_check_bearing(t: Reader, kind: str, props: dict) -> None:
    """Checks between keys of one bearing group."""
    pairs = []
    if kind == "friction_pendulum":
        pairs = [("slider_height", "radius", "m"), ("friction_slow", "friction", "-")]
    elif kind == "double_concave":
        pairs = [("slider_height_1", "radius_1", "m"), ("slider_height_2", "radius_2", "m")]
    elif kind == "lead_rubber":
        pairs = [("lead_diameter", "outer_diameter", "m")]
    elif kind == "high_damping_rubber":
        pairs = [("inner_diameter", "outer_diameter", "m")]
    for small, large, unit in pairs:
        a, b = props.get(small), props.get(large)
        if a is None or b is None:
            continue
        strict = small != "friction_slow"
        if (a >= b) if strict else (a > b):
            relation = "<" if strict else "<="
            t.problems.add(f"{t.path_of(small)} = {a:.4g} {unit} is not allowed: must be {relation} "
                           f"{large} = {b:.4g} {unit}")


def _share_axial_loads(specs: list, total_weight: float | None, t: Reader) -> list:
    given = [s.axial_load_given for s in specs]
    if any(given) and not all(given):
        t.problems.add(f"{t.path_of('bearings')}: axial_load is given for some bearing groups but not "
                       "others: give it for every group or for none (equal share of the weight)")
        return specs
    if total_weight is None:
        return specs
    count = sum(s.count for s in specs)
    if not any(given):
        share = total_weight / count
        return [BearingSpec(s.type, s.count, share, s.properties, False) for s in specs]
    total = sum(s.count * s.axial_load for s in specs)
    if not 0.5 * total_weight <= total <= 2.0 * total_weight:
        t.problems.add(f"{t.path_of('bearings')}: the axial loads add up to {total:.4g} kN, which is not "
                       f"allowed: must lie between 0.5 and 2 times the building weight "
                       f"{total_weight:.4g} kN (check the units)")
    return specs


# --------------------------------------------------------------------------
# Overrides
# --------------------------------------------------------------------------
def apply_overrides(mapping: Mapping[str, Any], overrides: Mapping[str, Any]) -> dict:
    """Return a copy of a study mapping with dotted-key overrides applied.

    Parameters
    ----------
    mapping : mapping
        Parsed study TOML (not changed).
    overrides : mapping
        ``{"site.sms": 1.2, "alternative.0.bearings.0.radius": "3 m"}``: dots
        separate keys, whole numbers index arrays of tables (from 0). A
        missing last key is added (validation then judges it); a missing
        table on the way is created.

    Raises
    ------
    InputError
        When a path is malformed, indexes past an array's end or runs through
        a value that is not a table.
    """
    result = copy.deepcopy(dict(mapping))
    for given, value in overrides.items():
        path = re.sub(r"\[(\d+)\]", r".\1", given) if isinstance(given, str) else given
        if not isinstance(path, str) or not path or any(not part for part in path.split(".")):
            raise InputError(f"override key {path!r} is not allowed: must be a dotted key path "
                             "such as 'site.sms' or 'alternative.0.bearings.0.radius'")
        parts = path.split(".")
        node: Any = result
        for depth, part in enumerate(parts):
            last = depth == len(parts) - 1
            where = ".".join(parts[:depth + 1])
            if isinstance(node, list):
                if not part.isdigit() or int(part) >= len(node):
                    raise InputError(f"override {path!r}: {where!r} is not allowed: must index the array "
                                     f"with a whole number from 0 to {len(node) - 1}")
                if last:
                    node[int(part)] = value
                else:
                    node = node[int(part)]
            elif isinstance(node, dict):
                if last:
                    node[part] = value
                elif part not in node:
                    node[part] = {}
                    node = node[part]
                else:
                    node = node[part]
            else:
                raise InputError(f"override {path!r} is not allowed: "
                                 f"{'.'.join(parts[:depth])!r} is a value, not a table")
    return result

