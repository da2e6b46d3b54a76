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
* ``[site]`` near_fault (false), fault_distance (km to the nearest active fault,
  a bare number; the verdict's near-fault rule uses it when given). ASCE 7: sms*, sm1* [g], long_period (8 s),
  s1 [g] (default: sm1, for the ELF limits), site_class* A-F. Eurocode: ag*
  [g], spectrum_type 1 or 2, ground_type* A-E. Either basis: spectrum_file, a
  CSV of period [s], Sa [g] at 5 % relative to the study file, in place of
  sms/sm1/long_period or ag/spectrum_type.
* ``[building]`` storeys*, floor_weights* (level 1 to roof; one value for
  all), base_weight*, storey_heights*, lateral_system* (steel_moment_frame,
  concrete_moment_frame, steel_eccentrically_braced_frame,
  steel_buckling_restrained_braced_frame, concentrically_braced_frame,
  shear_wall, other: the row of ASCE/SEI 7-16 Table 12.8-2 or EN 1998-1
  §4.3.3.2.2(3), see ``study_sections.LATERAL_SYSTEM_ROWS``; the earlier
  braced_frame is refused with the choices), response_modification* (R, or
  q for Eurocode), importance (1.0; ASCE 7: the seismic importance factor I_e,
  0.8-1.5, of the fixed-base design shear; Eurocode: the importance factor
  gamma_I of EN 1998-1 §4.2.5, 0.8-1.4, recommended 0.8/1.0/1.2/1.4 for
  importance classes I-IV (from memory), which scales the site spectrum as
  a_g = gamma_I a_gR with ``site.ag`` = a_gR; a ``spectrum_file`` is used as
  given, gamma_I included), plan_length*, plan_width* (length is the longer
  side), fixed_base_period (code estimate), eccentricity (0 m), damping (0.05),
  nonstructural ("brittle", "ductile" or "none": Eurocode drift limit of
  EN 1998-1 §4.4.3.2, default "brittle").
* ``[analysis]`` suite_size 7 or 11, seed (0), duration (30 s), time_step
  (0.005 s), damping (0.05).
* ``[wind]`` base_shear (no wind check without it).
* ``[cost]``, ``[hazard]``, ``[loss]`` (all optional): the loss study's costs
  (defaults are invented demo values), hazard and options; keys in
  :mod:`isolation.loss.inputs`.
* ``[[alternative]]`` (one or more) name*, moat, ``[alternative.property_factors]``
  lower (0.85), upper (1.2), and ``[[alternative.bearings]]`` (one or more
  groups) type*, count*, axial_load per bearing (equal share of the weight
  when left out in every group) and the type's keys in :data:`BEARING_KEYS`
  (with unit and allowed range).

Layout: the input dataclasses and :class:`StudyError` are in
:mod:`isolation.study.inputs`, the key schema and the problem-collecting
reader in :mod:`isolation.study.keys`, the readers of each table in
:mod:`isolation.study.sections`; this module loads, parses and overrides, and
re-exports the public names of the others.
"""

from __future__ import annotations

from pathlib import Path
from typing import Any, Mapping

from isolation.errors import InputError
from isolation.study.inputs import Alternative, Analysis, BearingSpec, Building, Project, Site, Study, StudyError
from isolation.study.keys import BEARING_KEYS, Problems, Reader
from isolation.study.overrides import _own, apply_overrides, overlay  # noqa: F401 - re-exported
from isolation.study.sections import LATERAL_SYSTEMS, _alternatives, _analysis, _basis, _building, _project, _site
from isolation.study.toml_text import (  # noqa: F401 - re-exported
    NESTING_LIMIT,
    STUDY_LIMIT,
    _bracket_depth,
    _nesting,
    parse_toml,
    read_study_mapping,
)

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
    "overlay",
    "parse_variants",
    "parse_toml",
    "BEARING_KEYS",
    "LATERAL_SYSTEMS",
]


# --------------------------------------------------------------------------
# Loading
# --------------------------------------------------------------------------


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
    return _parse(mapping, source, Path(base_dir), None)


WIND_SHEAR_MAX = 1.0e6
"""Largest ``wind.base_shear`` accepted [kN] (common practice: a plausibility bound, far above
any building this tool is meant for)."""


def _parse(mapping: Mapping[str, Any], source: str, base_dir: Path, cache: dict | None) -> Study:
    """parse_study's work. With ``cache`` (a dict kept over many variants of one study),
    each table whose content was seen before is taken from it with its problems: a batch's
    variants are validated against the schema once per distinct table, not once each."""
    problems = Problems()
    reader = Reader(mapping, "", problems, system="SI")
    units = reader.choice("units", ("SI", "US"), required=False, default="SI")
    system = units if units in ("SI", "US") else "SI"
    reader.system = system

    def part(key: str, context: tuple, build, *, array: bool = False, required: bool = True):
        reader.known.add(key)
        present = key in mapping
        value = mapping.get(key)
        memo = None
        if cache is not None:
            memo = (key, context, system, present, repr(value))
            hit = cache.get(memo)
            if hit is not None:
                problems.items.extend(hit[1])
                return hit[0]
        local = Problems()
        sub = Reader({key: value} if present else {}, "", local, system)
        table = sub.array_of_tables(key) if array else sub.table(key, required=required)
        result = build(table)
        if cache is not None and memo is not None:
            cache[memo] = (result, tuple(local.items))
        problems.items.extend(local.items)
        return result

    def wind_part(wind):
        if not wind:
            return None
        shear = wind.quantity("base_shear", "force", low=0.0, high=WIND_SHEAR_MAX, required=False)
        wind.done()
        return shear

    project = part("project", (), _project)
    basis = part("code", (), _basis)
    site = part("site", (basis, str(base_dir)), lambda t: _site(t, basis, base_dir))
    building = part("building", (basis,), lambda t: _building(t, basis))
    analysis = part("analysis", (), _analysis, required=False)
    wind_shear = part("wind", (), wind_part, required=False)
    total_weight = building.total_weight if building is not None else None
    alternatives = part("alternative", (total_weight,),
                        lambda t: _cached_alternatives(t, total_weight, system, cache), array=True)
    loss = _loss_tables(mapping, reader, problems, basis, system, cache)
    reader.done()
    if problems:
        raise StudyError(problems.items, source)
    return Study(project=project, basis=basis, units=units, site=site, building=building,
                 alternatives=alternatives, analysis=analysis, wind_base_shear=wind_shear,
                 source=source, loss=loss)


_LOSS_KEYS = ("cost", "hazard", "loss")


def _loss_tables(mapping, reader, problems, basis: str, system: str, cache: dict | None):
    """[cost], [hazard] and [loss] of a study, read once per distinct content when ``cache`` is given."""
    from isolation.loss.inputs import read_loss_tables

    reader.known.update(_LOSS_KEYS)
    part = {key: mapping[key] for key in _LOSS_KEYS if key in mapping}
    memo = ("loss tables", basis, system, repr(part)) if cache is not None else None
    if cache is not None and memo is not None and memo in cache:
        result, found = cache[memo]
        problems.items.extend(found)
        return result
    local = Problems()
    result = read_loss_tables(Reader(part, "", local, system), basis, bearing_kinds=tuple(BEARING_KEYS))
    if cache is not None and memo is not None:
        cache[memo] = (result, tuple(local.items))
    problems.items.extend(local.items)
    return result


def _cached_alternatives(tables, total_weight, system: str, cache: dict | None) -> tuple:
    """_alternatives, each alternative's table read once per distinct content (with ``cache``)."""
    if cache is None or not tables:
        return _alternatives(tables, total_weight)
    found: list = []
    names: set[str] = set()
    for t in tables:
        memo = ("alternative", t.path, system, total_weight, repr(t.mapping))
        hit = cache.get(memo)
        if hit is None:
            local = Problems()
            hit = (_alternatives([Reader(t.mapping, t.path, local, system)], total_weight), tuple(local.items))
            cache[memo] = hit
        t.problems.items.extend(hit[1])
        found.extend(hit[0])
        name = t.mapping.get("name")
        if isinstance(name, str) and name.strip():
            if name.strip() in names:
                t.problems.add(f"{t.path_of('name')} = {name.strip()!r} is not allowed: alternative names "
                               "must be unique")
            names.add(name.strip())
    return tuple(found)


def parse_variants(base: Mapping[str, Any], variants, source: str = "<study>", *,
                   base_dir: str | Path | None = None):
    """Validate many variants of one study, each table's content once.

    Parameters
    ----------
    base : mapping
        The study's parsed TOML.
    variants : iterable of mapping
        Each variant's overrides (``{"dotted.key": value}``, see
        :func:`apply_overrides`).
    source, base_dir
        As for :func:`parse_study`.

    Yields
    ------
    Study or InputError
        The validated study of each variant, or the error naming its problems.
    """
    if base_dir is None:
        base_dir = Path(source).parent if source and not source.startswith("<") else Path.cwd()
    cache: dict = {}
    for overrides in variants:
        try:
            mapping = overlay(base, overrides)
            if not isinstance(mapping, Mapping):
                raise StudyError(["the study must be a table of keys"], source)
            yield _parse(mapping, source, Path(base_dir), cache)
        except InputError as error:
            yield error


# --------------------------------------------------------------------------
# Overrides
# --------------------------------------------------------------------------


