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
* ``[[alternative]]`` (one or more) name*, moat, ``[alternative.property_factors]``
  lower (0.85), upper (1.2), and ``[[alternative.bearings]]`` (one or more
  groups) type*, count*, axial_load per bearing (equal share of the weight
  when left out in every group) and the type's keys in :data:`BEARING_KEYS`
  (with unit and allowed range).

Layout: the input dataclasses and :class:`StudyError` are in
:mod:`isolation.study_inputs`, the key schema and the problem-collecting
reader in :mod:`isolation.study_keys`, the readers of each table in
:mod:`isolation.study_sections`; this module loads, parses and overrides, and
re-exports the public names of the others.
"""

from __future__ import annotations

import copy
import re
import tomllib
from pathlib import Path
from typing import Any, Mapping

from isolation.errors import InputError
from isolation.study_inputs import (Alternative, Analysis, BearingSpec, Building, Project, Site, Study,
                                    StudyError)
from isolation.study_keys import BEARING_KEYS, Problems, Reader
from isolation.study_sections import (LATERAL_SYSTEMS, _alternatives, _analysis, _basis, _building, _project,
                                      _site)

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

