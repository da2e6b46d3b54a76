"""Per-bearing uplift check: overturning of the isolated superstructure against the
tributary gravity load of the outermost bearing.

The superstructure's lateral force ``shear`` acts at ``height`` above the isolation
plane; the overturning moment M = shear x height is carried by the bearings as a
rigid base-level diaphragm on a regular grid of bearings spread over the plan
(rows at equal spacing across the plan dimension in the direction of the shear):
the axial change of a bearing at distance x from the centroid is
dP = M x / sum(x_j^2) (rigid-body statics, derived). The outermost bearing's
gravity load is its tributary load (the lightest bearing group given, since edge
and corner bearings carry the smallest tributary areas, common practice), factored
and reduced by the vertical earthquake as the code basis states it:

* ASCE/SEI 7-16 §17.2.4.6 and §12.4.2.2 (from memory, not re-read): minimum vertical
  load 0.9 D - E_v - E_h with E_v = 0.2 S_MS D at the MCE_R level;
* EN 1990 Eq. 6.12b (gravity unfactored in the seismic combination) and EN 1998-1
  §4.3.3.5.2 (vertical component only where a_vg > 0.25 g, combined as 0.3 of its
  effect; plateau of the vertical spectrum 3.0 a_vg, §3.2.2.3 Table 3.4), all from memory.

A bearing goes into tension when ``ratio`` = dP / net gravity exceeds 1.

Scope: concept-stage feasibility, not construction design; bearing positions come
from the design drawings in a real check.
"""

from __future__ import annotations

import math
import numbers
from dataclasses import asdict, dataclass
from typing import Iterable

from isolation import validate

__all__ = ["BearingUplift", "bearing_uplift", "grid_rows", "grid_axial_loads", "asce7_vertical_fraction",
           "eurocode_vertical_fraction"]


def grid_rows(count: int, across: float, along: float) -> int:
    """Rows of a regular bearing grid across a plan dimension. [-]

    Parameters
    ----------
    count : int
        Number of bearings, >= 2. [-]
    across : float
        Plan dimension the rows are spread over (direction of the shear), > 0. [m]
    along : float
        The other plan dimension, > 0. [m]

    Returns
    -------
    int
        round(sqrt(count across/along)) within [2, count]: a grid of nearly square bays.
    """
    if isinstance(count, bool) or not isinstance(count, numbers.Integral) or count < 2:
        raise ValueError(f"count = {count!r} is not allowed: must be an integer >= 2 (bearings)")
    a = validate.positive("across", across, "m")
    b = validate.positive("along", along, "m")
    n = int(count)
    return int(min(max(round(math.sqrt(n * a / b)), 2), n))


def asce7_vertical_fraction(sms: float) -> tuple[float, float, str]:
    """Gravity factor, vertical fraction of D and source for the ASCE 7 minimum vertical load.

    Parameters
    ----------
    sms : float
        S_MS, MCE_R short-period spectral acceleration, >= 0. [g]
    """
    s = validate.non_negative("sms", sms, "g")
    return 0.9, 0.2 * s, ("ASCE/SEI 7-16 §17.2.4.6 minimum vertical load 0.9 D - |E|, E_v = 0.2 S_MS D "
                          "(§12.4.2.2 at MCE_R level; from memory)")


def eurocode_vertical_fraction(ag: float, spectrum_type: int = 1) -> tuple[float, float, str]:
    """Gravity factor, vertical fraction of G and source for the Eurocode seismic combination.

    Parameters
    ----------
    ag : float
        Design ground acceleration a_g (gamma_I a_gR) on rock, >= 0. [g]
    spectrum_type : int
        1 or 2: a_vg = 0.90 a_g or 0.45 a_g (EN 1998-1 Table 3.4, from memory). [-]
    """
    a = validate.non_negative("ag", ag, "g")
    validate.one_of("spectrum_type", spectrum_type, (1, 2))
    avg = (0.90 if spectrum_type == 1 else 0.45) * a
    if avg <= 0.25:
        return 1.0, 0.0, (f"EN 1990 Eq. 6.12b (G unfactored); vertical component not combined: a_vg = "
                          f"{avg:.3g} g <= 0.25 g (EN 1998-1 §4.3.3.5.2(1), from memory)")
    return 1.0, 0.3 * 3.0 * avg, (f"EN 1990 Eq. 6.12b (G unfactored); 0.3 x vertical plateau 3.0 a_vg, a_vg = "
                                  f"{avg:.3g} g (EN 1998-1 §3.2.2.3, §4.3.3.5.2(4), from memory)")


@dataclass(frozen=True)
class BearingUplift:
    """Result of :func:`bearing_uplift` (forces [kN], lengths [m], moment [kN m])."""

    moment: float
    rows: int
    edge_distance: float
    tributary_load: float
    net_gravity: float
    overturning_load: float
    ratio: float
    minimum_axial_load: float
    in_tension: bool
    source: str

    def to_dict(self) -> dict:
        return asdict(self)


def bearing_uplift(shear: float, height: float, bearings: Iterable[tuple[int, float]], plan_length: float,
                   plan_width: float, *, gravity_factor: float = 1.0, vertical_fraction: float = 0.0,
                   source: str = "") -> BearingUplift:
    """Axial load of the outermost bearing under overturning (see the module text).

    Parameters
    ----------
    shear : float
        Lateral force on the superstructure, >= 0. [kN]
    height : float
        Height of its resultant above the isolation plane, >= 0. [m]
    bearings : iterable of (int, float)
        (count, gravity axial load per bearing) of each bearing group. [-, kN]
    plan_length, plan_width : float
        Plan dimensions, > 0. [m]
    gravity_factor : float
        Factor on gravity in the load combination (0.9 ASCE 7, 1.0 Eurocode), > 0. [-]
    vertical_fraction : float
        Vertical earthquake as a fraction of gravity, >= 0. [-]
    source : str
        Where the load combination comes from (kept in the result).

    Returns
    -------
    BearingUplift
        The worse of the two plan directions.
    """
    v = validate.non_negative("shear", shear, "kN")
    h = validate.non_negative("height", height, "m")
    length = validate.positive("plan_length", plan_length, "m")
    width = validate.positive("plan_width", plan_width, "m")
    g = validate.positive("gravity_factor", gravity_factor, "-")
    ev = validate.non_negative("vertical_fraction", vertical_fraction, "-")
    groups = [(int(c), validate.positive("axial_load", p, "kN")) for c, p in bearings]
    count = sum(c for c, _ in groups)
    if not groups or count < 2:
        raise ValueError(f"bearings = {groups!r} is not allowed: must hold at least 2 bearings")
    moment = v * h
    worst: tuple[float, int, float] | None = None
    for across, along in ((width, length), (length, width)):
        rows = grid_rows(count, across, along)
        per_row = count / rows
        positions = [-across / 2.0 + i * across / (rows - 1) for i in range(rows)]
        arm2 = per_row * sum(x * x for x in positions)
        load = moment * (across / 2.0) / arm2
        if worst is None or load > worst[0]:
            worst = (load, rows, across / 2.0)
    assert worst is not None  # set on the first of the two directions
    load, rows, edge = worst
    tributary = min(p for _, p in groups)
    net = (g - ev) * tributary
    ratio = load / net if net > 0.0 else math.inf
    return BearingUplift(moment=moment, rows=rows, edge_distance=edge, tributary_load=tributary,
                         net_gravity=net, overturning_load=load, ratio=ratio,
                         minimum_axial_load=net - load, in_tension=net - load < 0.0,
                         source=source or "rigid-body overturning on a regular bearing grid (derived)")


def grid_axial_loads(moment: float, positions, gravity_loads, *, gravity_factor: float = 1.0,
                     vertical_fraction: float = 0.0) -> tuple:
    """Smallest and largest axial load of every bearing of a given layout under overturning.

    The moment acts about either plan axis (the worse for each bearing); the
    change of a bearing at ``x_i`` from the centroid is ``dP_i = M x_i / sum
    x_j^2`` (rigid-body statics, derived; the grid's own coordinates, not the
    rows of :func:`grid_rows`). Smallest load ``(gravity_factor -
    vertical_fraction) P_g - |dP|``, largest ``(1 + vertical_fraction) P_g +
    |dP|`` (gravity unfactored for the largest: a screen, common practice).

    Parameters
    ----------
    moment : float
        Overturning moment at the isolation plane, >= 0. [kN m]
    positions : array_like
        (n, 2) bearing positions relative to the centroid of the layout. [m]
    gravity_loads : array_like
        (n,) gravity axial load of each bearing, > 0. [kN]
    gravity_factor, vertical_fraction : float
        As for :func:`bearing_uplift`. [-]

    Returns
    -------
    (ndarray, ndarray)
        Smallest and largest axial load of each bearing, compression positive. [kN]
    """
    import numpy as np

    m = validate.non_negative("moment", moment, "kN m")
    pos = validate.finite_array("positions", positions, "m")
    if pos.ndim != 2 or pos.shape[1] != 2 or pos.shape[0] < 1:
        raise ValueError(f"positions has shape {pos.shape}: must be (n, 2) with n >= 1 [m]")
    loads = validate.positive_array("gravity_loads", gravity_loads, "kN")
    if loads.shape != (pos.shape[0],):
        raise ValueError(f"gravity_loads has {loads.size} entries: must be one per bearing [kN]")
    g = validate.positive("gravity_factor", gravity_factor, "-")
    ev = validate.non_negative("vertical_fraction", vertical_fraction, "-")
    change = np.zeros(pos.shape[0])
    for axis in (0, 1):
        arm2 = float((pos[:, axis] ** 2).sum())
        if arm2 > 0.0:
            change = np.maximum(change, m * np.abs(pos[:, axis]) / arm2)
    return (g - ev) * loads - change, (1.0 + ev) * loads + change
