"""Readers of the tables of a study file, one per table, each building one input.

Each reader takes the :class:`isolation.study.keys.Reader` of its table (None
when the table is missing), reads and checks its keys, reports unknown keys and
returns the dataclass of :mod:`isolation.study.inputs` (None when it failed).
:func:`isolation.study.parse_study` calls them in order.
"""

from __future__ import annotations

import csv
import math
from pathlib import Path
from typing import Any

from isolation.bearings.registry import bearing_type
from isolation.codes.lateral_systems import LATERAL_SYSTEM_ROWS
from isolation.codes.registry import DEFAULT_BASIS
from isolation.codes.registry import PerBasis as _PerBasis
from isolation.codes.registry import get as _get_basis
from isolation.codes.registry import names as _basis_names
from isolation.study.inputs import Alternative, Analysis, BearingSpec, Building, Project, Site
from isolation.study.keys import BEARING_KEYS, Problems, Reader

__all__ = ["LATERAL_SYSTEMS", "IMPORTANCE_RANGES", "WEIGHT_MAX", "AXIAL_LOAD_MAX", "SPECTRUM_PERIOD_MAX",
           "SPECTRUM_SA_MAX"]


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
        return DEFAULT_BASIS
    basis = t.choice("basis", _basis_names())
    t.done()
    return basis or DEFAULT_BASIS


def _code(basis: str | None):
    """The study's code basis; the default one while ``code.basis`` itself is in error."""
    return _get_basis(basis if basis in _basis_names() else DEFAULT_BASIS)


def _site(t: Reader | None, basis: str, base_dir: Path) -> Site | None:
    if t is None:
        return None
    code = _code(basis)
    values: dict[str, Any] = {"near_fault": t.boolean("near_fault", required=False, default=False),
                              "fault_distance": t.number("fault_distance", low=0.0, high=1000.0, unit="km",
                                                         required=False)}
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
        for key in code.site_keys:
            if key in t.mapping:
                t.problems.add(f"{t.path_of(key)} = {t.mapping[key]!r} is not allowed together with "
                               f"site.spectrum_file: give either the spectrum file or the code parameters")
                t.used.add(key)
    code.read_site(t, values, tabulated)
    t.done()
    return Site(**values)


def _read_spectrum_table(path: Path, key: str, problems: Problems):
    """Two columns: period [s], Sa [g] at 5 % damping; an optional header line."""
    from isolation.errors import InputError
    from isolation.files import read_input_text

    try:
        lines = read_input_text(path, what=key, limit=1_000_000).splitlines()
    except InputError as error:
        problems.add(f"{error}; must name an existing CSV file (relative to the study file) with columns "
                     "period [s], Sa [g]")
        return None
    periods: list[float] = []
    values: list[float] = []
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
                                                  and 0 <= periods[i] <= SPECTRUM_PERIOD_MAX
                                                  and 0 < values[i] <= SPECTRUM_SA_MAX)]
    rising = all(b > a for a, b in zip(periods, periods[1:], strict=False))
    if bad or not rising:
        where = f" (row {bad[0] + 1} of the data: {periods[bad[0]]!r}, {values[bad[0]]!r})" if bad else ""
        problems.add(f"{key} = {str(path)!r} is not allowed: periods must lie in [0, {SPECTRUM_PERIOD_MAX:g}] s "
                     f"and be strictly increasing, Sa values in (0, {SPECTRUM_SA_MAX:g}] g{where}")
        return None
    return tuple(periods), tuple(values)


WEIGHT_MAX = 2.0e6
"""Largest floor or base weight accepted [kN] (about 200 000 t; common practice: a
plausibility bound far above any floor this tool is meant for)."""

AXIAL_LOAD_MAX = 2.0e5
"""Largest axial load per bearing accepted [kN] (common practice: the largest bearings
made carry a few 10^4 kN)."""

SPECTRUM_PERIOD_MAX = 20.0
"""Longest period of a tabulated site spectrum [s]."""

SPECTRUM_SA_MAX = 10.0
"""Largest spectral value of a tabulated site spectrum [g] (common practice: recorded
5 %-damped spectra stay below about 5 g)."""

LATERAL_SYSTEMS = tuple(LATERAL_SYSTEM_ROWS)
"""Lateral systems for the code's approximate fixed-base period (ASCE/SEI 7-16 Table 12.8-2,
EN 1998-1 §4.3.3.2.2(3))."""

_RETIRED_LATERAL_SYSTEMS = {
    "braced_frame": ("it did not say which braced frame; choose 'concentrically_braced_frame' (the 'all other "
                     "structural systems' row), 'steel_eccentrically_braced_frame' or "
                     "'steel_buckling_restrained_braced_frame'"),
}


def _lateral_system(t: Reader) -> str | None:
    """building.lateral_system, with a clear message for a retired choice."""
    value = t.mapping.get("lateral_system")
    if isinstance(value, str) and value in _RETIRED_LATERAL_SYSTEMS:
        t.known.add("lateral_system")
        t.problems.add(f"{t.path_of('lateral_system')} = {value!r} is no longer accepted: "
                       f"{_RETIRED_LATERAL_SYSTEMS[value]}")
        return None
    return t.choice("lateral_system", LATERAL_SYSTEMS)


IMPORTANCE_RANGES = _PerBasis(lambda basis: basis.importance_range)
"""Allowed ``building.importance`` [-] per code basis (``IMPORTANCE_RANGES``, from
:attr:`isolation.codes.basis.CodeBasis.importance_range`). ASCE 7: the seismic importance
factor I_e (ASCE/SEI 7-16 Table 1.5-2: 1.0, 1.25, 1.5). Eurocode: the importance factor
gamma_I (EN 1998-1 §4.2.5, recommended 0.8, 1.0, 1.2, 1.4 for importance classes I-IV;
it scales a_g = gamma_I a_gR, §2.1(3)). Both from memory; National Annexes may differ."""


def _importance(t: Reader, basis: str) -> float | None:
    """building.importance: I_e (ASCE 7) or gamma_I (Eurocode), range per basis."""
    value = t.number("importance", required=False, default=1.0)
    code = _code(basis)
    low, high = code.importance_range
    if value is not None and not low <= value <= high:
        meaning = code.importance_meaning
        t.problems.add(f"{t.path_of('importance')} = {value:g} is not allowed: must be a number in "
                       f"[{low:g}, {high:g}] [-] for code.basis = {basis!r} ({meaning})")
        return None
    return value


def _building(t: Reader | None, basis: str) -> Building | None:
    if t is None:
        return None
    storeys = t.integer("storeys", low=1, high=40)
    count = storeys if isinstance(storeys, int) else None
    values = dict(
        storeys=storeys,
        floor_weights=t.quantity_list("floor_weights", "weight", length=count, low=0.0,
                                      high=WEIGHT_MAX, low_inclusive=False),
        base_weight=t.quantity("base_weight", "weight", low=0.0, high=WEIGHT_MAX, low_inclusive=False),
        storey_heights=t.quantity_list("storey_heights", "length", length=count, low=1.5, high=20.0),
        lateral_system=_lateral_system(t),
        response_modification=t.number("response_modification", low=1.0, high=8.0),
        importance=_importance(t, basis),
        plan_length=t.quantity("plan_length", "length", low=1.0, high=500.0),
        plan_width=t.quantity("plan_width", "length", low=1.0, high=500.0),
        fixed_base_period=t.quantity("fixed_base_period", "time", low=0.02, high=10.0, required=False),
        eccentricity=t.quantity("eccentricity", "length", low=0.0, required=False, default=0.0),
        damping=t.number("damping", low=0.0, high=0.3, low_inclusive=False, required=False, default=0.05, ratio=True),
        nonstructural=t.choice("nonstructural", ("brittle", "ductile", "none"), required=False, default="brittle"),
    )
    values.update(_yielding_keys(t, count))
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


FIXED_BASE_MODELS = ("yielding", "elastic")
"""``building.fixed_base_model``: the comparison building yields at its code-design storey strengths
(default) or stays elastic (then the isolated superstructure stays elastic too)."""


def _yielding_keys(t: Reader, count: int | None) -> dict:
    """Optional keys of the yielding superstructure (defaults keep older study files valid)."""
    values = dict(
        fixed_base_model=t.choice("fixed_base_model", FIXED_BASE_MODELS, required=False) or "yielding",
        overstrength=t.number("overstrength", low=1.0, high=5.0, required=False),
        deflection_amplification=t.number("deflection_amplification", low=1.0, high=10.0, required=False),
        hardening=t.number("hardening", low=0.0, high=0.5, required=False, default=0.03),
        p_delta=t.boolean("p_delta", required=False, default=True),
        design_level=t.choice("design_level", ("high", "moderate"), required=False) or "high",
        storey_hysteresis=t.choice("storey_hysteresis", ("bilinear", "clough"), required=False) or "bilinear",
    )
    for key in ("storey_strengths", "isolated_storey_strengths"):
        t.known.add(key)
        values[key] = ()
        if key in t.mapping:
            values[key] = t.quantity_list(key, "force", length=count, low=0.0, low_inclusive=False) or ()
    return values


def _analysis(t: Reader | None) -> Analysis:
    if t is None:
        return Analysis()
    values = dict(
        suite_size=t.choice("suite_size", (7, 11), required=False, default=7),
        seed=t.integer("seed", low=0, high=2**32 - 1, required=False, default=0),
        duration=t.quantity("duration", "time", low=5.0, high=120.0, required=False, default=30.0),
        time_step=t.quantity("time_step", "time", low=0.001, high=0.02, required=False, default=0.005),
        damping=t.number("damping", low=0.01, high=0.3, required=False, default=0.05, ratio=True),
        bidirectional=t.boolean("bidirectional", required=False, default=False),
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
        grid = _grid(t, specs)
        t.done()
        if not specs or any(s is None for s in specs) or not isinstance(name, str):
            continue
        specs = _share_axial_loads(specs, total_weight, t)
        alternatives.append(Alternative(name=name, bearings=tuple(specs), lower_factor=lower,
                                        upper_factor=upper, moat=moat, grid=grid))
    return tuple(alternatives)


def _grid(t: Reader, specs: list) -> tuple | None:
    """Optional ``grid = [along length, along width]`` whose product is the bearing count."""
    value = t.raw("grid")
    if value is None:
        return None
    allowed = "two whole numbers >= 1 [along length, along width] whose product is the number of bearings"
    if (not isinstance(value, list) or len(value) != 2
            or any(isinstance(v, bool) or not isinstance(v, int) or not 1 <= v <= 200 for v in value)):
        t.problems.add(f"{t.path_of('grid')} = {value!r} is not allowed: must be {allowed}")
        return None
    count = sum(s.count for s in specs if s is not None)
    if all(s is not None for s in specs) and value[0] * value[1] != count:
        t.problems.add(f"{t.path_of('grid')} = {value!r} is not allowed: {value[0]} x {value[1]} = "
                       f"{value[0] * value[1]} must equal the number of bearings ({count})")
        return None
    return (int(value[0]), int(value[1]))


def _bearing_group(t: Reader) -> BearingSpec | None:
    kind = t.choice("type", tuple(BEARING_KEYS))
    count = t.integer("count", low=1, high=2000)
    axial = t.quantity("axial_load", "force", low=0.0, high=AXIAL_LOAD_MAX, low_inclusive=False, required=False)
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
    """Checks between keys of one bearing group (declared by the bearing type, see the registry)."""
    for key, text in bearing_type(kind).problems(props):
        t.problems.add(f"{t.path_of(key)} = {text}")


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
