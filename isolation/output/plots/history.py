"""Figures of response histories: displacements, shears, profiles, floor spectra, loops, energy.

The ``history_*`` functions draw from :class:`isolation.dynamics.response.HistoryResult`
objects by case ("fixed", "lower", "upper", ...) and show suite means of the
peak responses; the others take plain arrays.
"""

from __future__ import annotations

from typing import Any, Mapping, Sequence

import numpy as np
from matplotlib.figure import Figure
from numpy.typing import ArrayLike

from isolation.output.plots.common import SERIES_COLOURS, _colour, _figure, axis_unit

__all__ = ["displacement_histories", "base_shear_comparison", "storey_profiles", "floor_spectra",
           "hysteresis_loops", "energy_stack", "history_profiles", "history_base_shear",
           "history_displacements", "history_loops", "history_energy", "history_floor_spectra"]


def displacement_histories(
    time: Sequence[float],
    displacement: Any,
    *,
    labels: Sequence[str] | None = None,
    design_displacement: float | None = None,
    capacity: float | None = None,
    units: str = "SI",
) -> Figure:
    """Isolator displacement histories, one line per record.

    Parameters
    ----------
    time : array
        Time. [s]
    displacement : 2-D array (records, steps)
        Isolator displacement. [m]
    design_displacement : float, optional
        Equivalent-linear displacement for comparison. [m]
    capacity : float, optional
        Displacement capacity of the bearing or moat. [m]
    units : str
        Display unit system, "SI" or "US" (mm or in); inputs stay in SI.
    """
    length = axis_unit("displacement", units)
    series = np.atleast_2d(np.asarray(displacement, dtype=float))
    fig, ax = _figure(3.0)
    for index, row in enumerate(series):
        name = labels[index] if labels is not None else f"record {index + 1}"
        ax.plot(time, length(row), lw=0.7, color=SERIES_COLOURS[index % len(SERIES_COLOURS)],
                label=name if len(series) <= 11 else None)
    for value, text, style in ((design_displacement, "equivalent-linear D", "--"), (capacity, "capacity", "-")):
        if value is not None:
            for sign in (1, -1):
                ax.axhline(sign * float(length(value)), color="k", lw=0.9, ls=style, label=text if sign > 0 else None)
    ax.set_xlabel("Time [s]")
    ax.set_ylabel(f"Isolator displacement [{length.label}]")
    ax.grid(alpha=0.3)
    fig.legend(fontsize=7, ncol=6, loc="outside upper center", frameon=False)
    return fig


def base_shear_comparison(values: Mapping[str, float], *, reference: str | None = None, units: str = "SI") -> Figure:
    """Bar chart of base shear by case (fixed base, isolated bounds, ...).

    Parameters
    ----------
    values : mapping
        Base shear by case label. [kN]
    reference : str, optional
        Label of the case the others are compared with (percent shown on bars).
    units : str
        Display unit system, "SI" or "US" (kN or kip); inputs stay in SI.
    """
    force = axis_unit("force", units)
    labels = list(values)
    heights = force([float(values[k]) for k in labels])
    fig, ax = _figure(3.0)
    bars = ax.bar(labels, heights, color=[_colour(k, i) for i, k in enumerate(labels)])
    if reference is not None and reference in values and values[reference] > 0:
        base = float(force(values[reference]))
        for bar, value in zip(bars, heights, strict=True):
            ax.text(bar.get_x() + bar.get_width() / 2, value, f"{100 * value / base:.0f} %",
                    ha="center", va="bottom", fontsize=8)
    ax.set_ylim(0.0, 1.12 * max(float(heights.max()), 1e-12))
    ax.set_ylabel(f"Base shear [{force.label}]")
    ax.grid(alpha=0.3, axis="y")
    return fig


def storey_profiles(
    heights: ArrayLike,
    drift_ratios: Mapping[str, ArrayLike],
    floor_accelerations: Mapping[str, ArrayLike],
    *,
    units: str = "SI",
) -> Figure:
    """Storey drift ratio and peak floor acceleration over the height, per case.

    Parameters
    ----------
    heights : array
        Floor levels above the base, ground (0) first, one more than storeys. [m]
    drift_ratios : mapping
        Peak storey drift ratio by case, one per storey. [-]
    floor_accelerations : mapping
        Peak floor acceleration by case, one per level including the base. [g]
    units : str
        Display unit system, "SI" or "US" (heights in m or ft; drift ratio and acceleration are unitless or g);
        inputs stay in SI.
    """
    height = axis_unit("height", units)
    levels = height(heights)
    fig, (left, right) = _figure(3.6, ncols=2)
    for index, (label, drifts) in enumerate(drift_ratios.items()):
        values = 100 * np.asarray(drifts, dtype=float)
        bottoms, tops = levels[: len(values)], levels[1: len(values) + 1]
        left.plot(np.repeat(values, 2), np.column_stack([bottoms, tops]).ravel(),
                  color=_colour(label, index), label=label)
    for index, (label, accel) in enumerate(floor_accelerations.items()):
        values = np.asarray(accel, dtype=float)
        right.plot(values, levels[-len(values):], "o-", color=_colour(label, index), label=label, ms=3)
    left.set_xlabel("Peak storey drift ratio [%]")
    right.set_xlabel("Peak floor acceleration [g]")
    for ax in (left, right):
        ax.set_ylabel(f"Height [{height.label}]")
        ax.set_xlim(left=0)
        ax.grid(alpha=0.3)
        ax.legend(fontsize=7)
    return fig


def floor_spectra(periods: ArrayLike, spectra: Mapping[str, ArrayLike], *, damping: float = 0.05) -> Figure:
    """Floor response spectra (e.g. roof, fixed base vs isolated).

    Parameters
    ----------
    periods : array
        Periods. [s]
    spectra : mapping
        Spectral acceleration by case label. [g]
    damping : float
        Damping ratio of the spectra. [-]
    """
    fig, ax = _figure(3.0)
    for index, (label, values) in enumerate(spectra.items()):
        ax.plot(periods, values, color=_colour(label, index), lw=1.3, label=label)
    ax.set_xscale("log")
    ax.set_xlabel("Period T [s]")
    ax.set_ylabel(f"Floor Sa at {100 * damping:.0f} % [g]")
    ax.grid(alpha=0.3, which="both")
    ax.legend(fontsize=8)
    return fig


def hysteresis_loops(displacement: Mapping[str, Sequence[float]], force: Mapping[str, Sequence[float]],
                     *, units: str = "SI") -> Figure:
    """Isolator force-displacement histories (loops) by case.

    Parameters
    ----------
    displacement : mapping
        Isolator displacement history by case. [m]
    force : mapping
        Isolator force history by case, same keys. [kN]
    units : str
        Display unit system, "SI" or "US" (mm and kN, or in and kip); inputs stay in SI.
    """
    length, force_unit = axis_unit("displacement", units), axis_unit("force", units)
    fig, ax = _figure()
    for index, label in enumerate(displacement):
        ax.plot(length(displacement[label]), force_unit(force[label]), lw=0.7, color=_colour(label, index), label=label)
    ax.axhline(0, color="0.6", lw=0.5)
    ax.axvline(0, color="0.6", lw=0.5)
    ax.set_xlabel(f"Isolator displacement [{length.label}]")
    ax.set_ylabel(f"Isolator force [{force_unit.label}]")
    ax.grid(alpha=0.3)
    ax.legend(fontsize=8)
    return fig


def energy_stack(time: Sequence[float], components: Mapping[str, Sequence[float]], *,
                 input_energy: Sequence[float] | None = None, units: str = "SI") -> Figure:
    """Cumulative energy by component (stacked), with the input energy as a line.

    Parameters
    ----------
    time : array
        Time. [s]
    components : mapping
        Energy histories by component (kinetic, strain, viscous, hysteretic...). [kN m]
    input_energy : array, optional
        Input energy history. [kN m]
    units : str
        Display unit system, "SI" or "US" (kN m or kip in); inputs stay in SI.
    """
    energy = axis_unit("energy", units)
    fig, ax = _figure(3.0)
    names = list(components)
    ax.stackplot(time, *[energy(components[k]) for k in names], labels=names, alpha=0.8)
    if input_energy is not None:
        ax.plot(time, energy(input_energy), color="k", lw=1.0, ls="--", label="input")
    ax.set_xlabel("Time [s]")
    ax.set_ylabel(f"Energy [{energy.label}]")
    ax.grid(alpha=0.3)
    ax.legend(fontsize=8, loc="upper left")
    return fig


def _levels(result: Any) -> np.ndarray:
    return np.concatenate([[0.0], np.cumsum(result.heights)])


def _label(case: str) -> str:
    if case == "fixed_elastic":
        return "fixed base, elastic"
    return "fixed base" if case == "fixed" else f"isolated, {case}"


def history_profiles(results: Mapping[str, Any], *, units: str = "SI") -> Figure:
    """:func:`storey_profiles` of suite means from :class:`isolation.dynamics.response.HistoryResult` by case.

    The lowest level shows the peak ground acceleration (fixed base) or the
    peak base-slab acceleration (isolated), suite means. [g] ``units``: "SI" or
    "US", the display system of the heights.
    """
    if not results:
        raise ValueError(f"results = {dict(results)!r} is not allowed: must hold at least one case")
    drifts, accelerations = {}, {}
    levels = _levels(next(iter(results.values())))
    for case, result in results.items():
        peaks = result.peaks()
        levels = _levels(result)
        base = result.base_acceleration if result.isolated else result.ground_acceleration
        drifts[_label(case)] = peaks["drift_ratio"].mean(axis=0)
        accelerations[_label(case)] = np.concatenate(
            [[np.abs(base).max(axis=1).mean()], peaks["floor_acceleration"].mean(axis=0)])
    return storey_profiles(levels, drifts, accelerations, units=units)


def history_base_shear(results: Mapping[str, Any], *, units: str = "SI") -> Figure:
    """:func:`base_shear_comparison` of suite-mean peak base shear by case, against fixed base.

    ``units``: "SI" (kN) or "US" (kip), the display system.
    """
    values = {_label(case): float(r.peaks()["base_shear"].mean()) for case, r in results.items()}
    return base_shear_comparison(values, reference="fixed base" if "fixed" in results else None, units=units)


def history_displacements(result: Any, *, design_displacement: float | None = None,
                          capacity: float | None = None, units: str = "SI") -> Figure:
    """:func:`displacement_histories` of an isolated :class:`HistoryResult` (``units``: "SI" or "US")."""
    return displacement_histories(result.time, result.isolator_displacement,
                                  design_displacement=design_displacement, capacity=capacity, units=units)


def history_loops(results: Mapping[str, Any], record: int = 0, *, units: str = "SI") -> Figure:
    """:func:`hysteresis_loops` of one record for every isolated case (``units``: "SI" or "US")."""
    isolated = {_label(c): r for c, r in results.items() if r.isolated}
    return hysteresis_loops({k: r.isolator_displacement[record] for k, r in isolated.items()},
                            {k: r.isolator_force[record] for k, r in isolated.items()}, units=units)


def history_energy(result: Any, record: int = 0, *, units: str = "SI") -> Figure:
    """:func:`energy_stack` of one record of a :class:`HistoryResult` (``units``: "SI" or "US")."""
    names = {"kinetic": "kinetic", "elastic_strain": "elastic strain", "viscous": "viscous damping",
             "hysteretic": "isolator hysteresis"}
    parts = {label: result.energy[key][record] for key, label in names.items() if key in result.energy}
    return energy_stack(result.time, parts, input_energy=result.energy["input"][record], units=units)


def history_floor_spectra(results: Mapping[str, Any], periods: Sequence[float] | None = None,
                          *, damping: float = 0.05) -> Figure:
    """:func:`floor_spectra` of the roof, suite mean, by case. Periods default 0.05-4 s. [s]"""
    t = np.geomspace(0.05, 4.0, 40) if periods is None else np.asarray(periods, dtype=float)
    from isolation.dynamics.oscillator import response_spectrum

    # The roof alone: the spectra of the other floors would be computed and dropped.
    spectra = {f"roof, {_label(c)}": response_spectrum(r.floor_acceleration[:, :, -1], r.dt, t, damping).mean(axis=0)
               for c, r in results.items()}
    return floor_spectra(t, spectra, damping=damping)
