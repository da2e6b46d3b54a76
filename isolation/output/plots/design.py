"""Figures of the site, the bearings, the equivalent-linear answer and the motion suite."""

from __future__ import annotations

from typing import Any, Mapping, Sequence

import numpy as np
from matplotlib.figure import Figure

from isolation.output.plots.common import COLOURS, _colour, _figure, axis_unit

__all__ = ["site_spectrum", "masing_loop", "force_displacement", "equivalent_linear_bounds",
           "suite_match", "suite_figure"]


def site_spectrum(
    spectrum: Any,
    *,
    fixed_base_period: float | None = None,
    isolated_periods: Mapping[str, float] | None = None,
    isolated_damping: float | None = None,
    max_period: float | None = None,
    title: str = "",
) -> Figure:
    """Site spectrum with the fixed-base and isolated periods and the period shift.

    Parameters
    ----------
    spectrum : spectrum object
        Anything with ``sa(period, damping)`` [g] and ``period_range`` [s].
    fixed_base_period : float, optional
        Fundamental period of the fixed-base building. [s]
    isolated_periods : mapping, optional
        Effective periods of the isolated building by label (e.g. bounds), or
        (period [s], damping [-]) pairs; a pair's marker sits on the spectrum
        at its own damping. [s]
    isolated_damping : float, optional
        Effective damping ratio of the isolated building; adds the reduced
        spectrum. [-]
    max_period : float, optional
        Right end of the period axis. [s]
    """
    low, high = spectrum.period_range
    marks = {label: (value if isinstance(value, (tuple, list)) else (value, None))
             for label, value in (isolated_periods or {}).items()}
    periods_shown = [float(p) for p, _ in marks.values()] + [fixed_base_period or 0.0]
    right = max_period or min(high, max(4.0, 1.25 * max(periods_shown)))
    periods = np.linspace(max(low, 0.0) if low > 0 else 0.0, right, 400)
    fig, ax = _figure()
    ax.plot(periods, spectrum.sa(periods, 0.05), color="k", lw=1.6, label="5 % damping")
    if isolated_damping is not None:
        ax.plot(periods, spectrum.sa(periods, isolated_damping), color="k", lw=1.0, ls="--",
                label=f"{100 * isolated_damping:.0f} % damping")
    top = float(np.max(spectrum.sa(periods, 0.05)))
    if fixed_base_period is not None:
        sa_fixed = float(spectrum.sa(fixed_base_period, 0.05))
        ax.axvline(fixed_base_period, color=COLOURS["fixed"], lw=1.0, ls=":")
        ax.plot([fixed_base_period], [sa_fixed], "o", color=COLOURS["fixed"],
                label=f"fixed base T = {fixed_base_period:.2f} s")
    for index, (label, (period, own_damping)) in enumerate(marks.items()):
        colour = _colour(label, index)  # bounds keep their colour however many marks there are
        damping = own_damping if own_damping is not None else (
            0.05 if isolated_damping is None else isolated_damping)
        sa_iso = float(spectrum.sa(period, damping))
        ax.axvline(period, color=colour, lw=1.0, ls=":")
        ax.plot([period], [sa_iso], "s", color=colour, label=f"isolated, {label} T = {period:.2f} s")
        if fixed_base_period is not None and index == 0:
            ax.annotate("", xy=(period, 0.92 * top), xytext=(fixed_base_period, 0.92 * top),
                        arrowprops={"arrowstyle": "->", "color": "0.3"})
            ax.text(0.5 * (period + fixed_base_period), 0.95 * top,
                    f"period shift x{period / fixed_base_period:.1f}", ha="center", va="bottom",
                    fontsize=8, color="0.3")
    ax.set_xlim(0.0, right)
    ax.set_ylim(0.0, 1.08 * top)
    ax.set_xlabel("Period T [s]")
    ax.set_ylabel("Spectral acceleration Sa [g]")
    ax.grid(alpha=0.3)
    ax.legend(fontsize=8)
    if title:
        ax.set_title(title, fontsize=10)
    return fig


def masing_loop(backbone: Any, amplitude: float, points: int = 200) -> tuple[np.ndarray, np.ndarray]:
    """Closed steady-state loop of a Masing hysteresis at an amplitude.

    Descending branch F(x) = F(D) - 2 F_b((D - x)/2), ascending branch its
    mirror (Masing rule; Iwan 1966).

    Parameters
    ----------
    backbone : Bilinear or MultiLinear
        Anything with ``force(d)`` [kN] that follows Masing's rule.
    amplitude : float
        Displacement amplitude D > 0. [m]

    Returns
    -------
    displacement [m], force [kN] : arrays
    """
    if not np.isfinite(amplitude) or amplitude <= 0:
        raise ValueError(f"amplitude = {amplitude!r} is not allowed: must be a finite number > 0 [m]")
    x = np.linspace(amplitude, -amplitude, points)
    peak = backbone.force(amplitude)
    down = peak - 2.0 * np.asarray(backbone.force((amplitude - x) / 2.0))
    return np.concatenate([x, -x]), np.concatenate([down, -down])


def force_displacement(
    backbones: Mapping[str, Any],
    *,
    amplitudes: Mapping[str, float] | None = None,
    max_displacement: float | None = None,
    per: str = "isolation plane",
    units: str = "SI",
) -> Figure:
    """Backbones and closed loops of the isolation system, one curve per label.

    Parameters
    ----------
    backbones : mapping
        Backbones by label (e.g. lower/upper bound): anything with ``force(d)`` [kN].
    amplitudes : mapping, optional
        Loop amplitude by label, e.g. the design displacement of each bound. [m]
    max_displacement : float, optional
        Extent of the displacement axis. [m]
    per : str
        What the force is for ("isolation plane", "one bearing").
    units : str
        Display unit system, "SI" (mm, kN) or "US" (in, kip); inputs stay in m and kN.
    """
    length, force = axis_unit("displacement", units), axis_unit("force", units)
    amplitudes = dict(amplitudes or {})
    extent = max_displacement or 1.2 * max(list(amplitudes.values()) or [0.5])
    fig, ax = _figure()
    d = np.linspace(-extent, extent, 401)
    for index, (label, backbone) in enumerate(backbones.items()):
        colour = _colour(label, index)
        ax.plot(length(d), force(backbone.force(d)), color=colour, lw=0.8, ls="--")
        if label in amplitudes:
            x, f = masing_loop(backbone, amplitudes[label])
            ax.plot(length(x), force(f), color=colour, lw=1.5,
                    label=f"{label}: loop at D = {length.text(amplitudes[label])}")
        else:
            ax.plot([], [], color=colour, ls="--", label=f"{label}: backbone")
    ax.axhline(0, color="0.6", lw=0.5)
    ax.axvline(0, color="0.6", lw=0.5)
    ax.set_xlabel(f"Displacement [{length.label}]")
    ax.set_ylabel(f"Force, {per} [{force.label}]")
    ax.grid(alpha=0.3)
    ax.legend(fontsize=8)
    return fig


def equivalent_linear_bounds(spectrum: Any, results: Mapping[str, Any], *, max_period: float = 6.0,
                             units: str = "SI") -> Figure:
    """Displacement-acceleration (ADRS) view of the equivalent-linear answer per bound.

    Demand curves at each bound's effective damping, the secant stiffness line
    and the performance point (D, Sa(T_eff, beta_eff)).

    Parameters
    ----------
    spectrum : spectrum object
        Anything with ``sa(period, damping)`` [g] and ``sd(period, damping)`` [m].
    results : mapping
        Equivalent-linear results by bound, each with ``displacement`` [m],
        ``period`` [s] and ``damping`` [-] (attributes or dict keys).
    max_period : float
        Longest period of the demand curves. [s]
    units : str
        Display unit system of the spectral displacement, "SI" (mm) or "US" (in).
    """
    length = axis_unit("displacement", units)
    low, high = spectrum.period_range
    periods = np.linspace(max(low, 0.02), min(high, max_period), 300)
    fig, ax = _figure()
    for index, (label, result) in enumerate(results.items()):
        d_m, t_m, beta = (_get(result, k) for k in ("displacement", "period", "damping"))
        colour = _colour(label, index)
        ax.plot(length(spectrum.sd(periods, beta)), spectrum.sa(periods, beta), color=colour, lw=1.0,
                ls="--", label=f"{label}: demand at {100 * beta:.0f} % damping")
        sa_point = float(spectrum.sa(t_m, beta))
        ax.plot(length([0.0, d_m * 1.4]), [0, sa_point * 1.4], color=colour, lw=0.8)
        ax.plot(length([d_m]), [sa_point], "o", color=colour,
                label=f"{label}: D = {length.text(d_m)}, T = {t_m:.2f} s")
    ax.set_xlim(left=0)
    ax.set_ylim(bottom=0)
    ax.set_xlabel(f"Spectral displacement [{length.label}]")
    ax.set_ylabel("Spectral acceleration [g]")
    ax.grid(alpha=0.3)
    ax.legend(fontsize=8)
    return fig


def _get(obj: Any, key: str) -> float:
    return float(obj[key] if isinstance(obj, Mapping) else getattr(obj, key))


def suite_match(
    periods: Sequence[float],
    target: Sequence[float],
    record_spectra: Any,
    *,
    lower_factor: float = 0.9,
    upper_factor: float | None = 1.3,
    period_range: tuple[float, float] | None = None,
    labels: Sequence[str] | None = None,
) -> Figure:
    """Suite of record spectra against the target, with the mean and tolerance band.

    Parameters
    ----------
    periods : array
        Periods of the spectra. [s]
    target : array
        Target spectrum at ``periods``. [g]
    record_spectra : 2-D array (records, periods)
        Response spectra of the records at the target damping. [g]
    lower_factor, upper_factor : float
        Tolerance band as fractions of the target (e.g. 0.9 common practice). [-]
    period_range : (float, float), optional
        Period range in which the match is required; shaded. [s]
    """
    t = np.asarray(periods, dtype=float)
    spectra = np.atleast_2d(np.asarray(record_spectra, dtype=float))
    goal = np.asarray(target, dtype=float)
    fig, ax = _figure()
    for index, row in enumerate(spectra):
        ax.plot(t, row, color="0.65", lw=0.7,
                label="records" if index == 0 else None)
    upper = goal * upper_factor if upper_factor else None
    ax.fill_between(t, goal * lower_factor, upper if upper is not None else goal, color="#1f5fa8",
                    alpha=0.15, lw=0,
                    label=f"tolerance {lower_factor:.2f}-{upper_factor:.2f} x target" if upper_factor
                    else f"at least {lower_factor:.2f} x target")
    ax.plot(t, goal, color="k", lw=1.6, label="target")
    ax.plot(t, spectra.mean(axis=0), color="#b23a10", lw=1.6, label=f"mean of {len(spectra)} records")
    if period_range is not None:
        ax.axvspan(*period_range, color="0.5", alpha=0.08, lw=0)
        for edge in period_range:
            ax.axvline(edge, color="0.4", lw=0.6, ls=":")
    ax.set_xscale("log")
    ax.set_xlabel("Period T [s]")
    ax.set_ylabel("Spectral acceleration Sa [g]")
    ax.grid(alpha=0.3, which="both")
    ax.legend(fontsize=8)
    return fig


def suite_figure(suite: Any) -> Figure:
    """:func:`suite_match` of a :class:`isolation.motions.MatchedSuite` with its own band and range."""
    check = suite.check()
    return suite_match(suite.periods, suite.target, suite.spectra, lower_factor=check.band[0],
                       upper_factor=check.band[1], period_range=tuple(suite.check_range))
