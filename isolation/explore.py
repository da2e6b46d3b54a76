"""Quick explorer: bearing and site settings in, equivalent-linear answer out.

The callbacks of the widget explorer (``workbooks/explore.ipynb``) are plain
functions here, so they are tested without a browser:

* :func:`explore` - settings to an :class:`ExplorerAnswer` (lower, nominal
  and upper property sets through :func:`isolation.design.design_bounds`);
* :func:`summary_table` and :func:`summary_html` - the answer as a table;
* :func:`explorer_figure` - spectrum with the period shift beside the
  force-displacement loops;
* :func:`update` - all of it in one call, as the widgets use it.

:func:`build_explorer` wires ipywidgets to :func:`update`; it holds no logic.

The site is the two-period MCE_R spectrum of ASCE/SEI 7-16 §11.4.6
(:class:`isolation.spectra.CodeSpectrum`). All bearings are alike and share
the weight equally. Scope: concept-stage screening, not design; a licensed
engineer checks every number against the local code.
"""

from __future__ import annotations

import html
import io
from dataclasses import asdict, dataclass
from typing import Any, Mapping

import numpy as np
from matplotlib.backends.backend_agg import FigureCanvasAgg
from matplotlib.figure import Figure

from isolation import validate
from isolation.bearings import BearingGroup, FrictionPendulum, IsolationSystem, LeadRubber, PropertyFactors
from isolation.design import design_bounds
from isolation.plots import COLOURS, masing_loop
from isolation.spectra import CodeSpectrum
from isolation.tables import Table

__all__ = [
    "BEARING_TYPES",
    "ExplorerSettings",
    "ExplorerAnswer",
    "explore",
    "summary_table",
    "summary_html",
    "explorer_figure",
    "update",
    "build_explorer",
    "trade_off",
]

BEARING_TYPES = ("friction pendulum", "lead rubber")
"""Bearing types the explorer offers."""


@dataclass(frozen=True)
class ExplorerSettings:
    """Everything the explorer's widgets set.

    Parameters
    ----------
    bearing_type : str
        "friction pendulum" or "lead rubber".
    weight : float
        Seismic weight on the isolation plane, > 0. [kN]
    bearing_count : int
        Number of identical bearings, >= 1. [-]
    radius : float
        Friction pendulum: radius of curvature, > 0. [m]
    friction : float
        Friction pendulum: coefficient of friction, in (0, 1). [-]
    outer_diameter : float
        Lead rubber: bonded rubber diameter, > 0. [m]
    lead_diameter : float
        Lead rubber: lead core diameter, in (0, outer_diameter). [m]
    layer_thickness : float
        Lead rubber: one rubber layer, > 0. [m]
    layers : int
        Lead rubber: number of rubber layers, >= 1. [-]
    shear_modulus : float
        Lead rubber: rubber shear modulus, > 0. [kPa]
    sms : float
        MCE_R short-period spectral acceleration S_MS, > 0. [g]
    sm1 : float
        MCE_R spectral acceleration at 1 s, S_M1, > 0. [g]
    long_period : float
        Long-period transition T_L. [s]
    lower_factor : float
        Property modification factor for the lower bound, in (0, 1]. [-]
    upper_factor : float
        Property modification factor for the upper bound, >= 1. [-]
    fixed_base_period : float
        Period of the building on a fixed base, > 0. [s]
    """

    bearing_type: str = "friction pendulum"
    weight: float = 40_000.0
    bearing_count: int = 20
    radius: float = 3.0
    friction: float = 0.06
    outer_diameter: float = 0.8
    lead_diameter: float = 0.16
    layer_thickness: float = 0.01
    layers: int = 20
    shear_modulus: float = 400.0
    sms: float = 1.5
    sm1: float = 0.75
    long_period: float = 8.0
    lower_factor: float = 0.85
    upper_factor: float = 1.3
    fixed_base_period: float = 0.5

    def __post_init__(self) -> None:
        validate.one_of("bearing_type", self.bearing_type, BEARING_TYPES)
        validate.positive("weight", self.weight, "kN")
        if isinstance(self.bearing_count, bool) or int(self.bearing_count) != self.bearing_count \
                or self.bearing_count < 1:
            raise ValueError(f"bearing_count = {self.bearing_count!r} is not allowed: must be a whole number >= 1")
        validate.in_range("lower_factor", self.lower_factor, 0.0, 1.0, "-", low_inclusive=False)
        validate.in_range("upper_factor", self.upper_factor, 1.0, 10.0, "-")
        validate.positive("fixed_base_period", self.fixed_base_period, "s")

    def spectrum(self) -> CodeSpectrum:
        """The site spectrum (MCE_R, ASCE/SEI 7-16 §11.4.6)."""
        return CodeSpectrum(self.sms, self.sm1, self.long_period)

    def bearing(self):
        """One bearing as set."""
        if self.bearing_type == "friction pendulum":
            return FrictionPendulum(self.radius, self.friction)
        return LeadRubber(self.outer_diameter, self.lead_diameter, self.layer_thickness,
                          int(self.layers), self.shear_modulus)

    def system(self) -> IsolationSystem:
        """The isolation plane: all bearings alike, equal shares of the weight."""
        bound = (self.lower_factor, self.upper_factor)
        factors = PropertyFactors(friction=bound) if self.bearing_type == "friction pendulum" \
            else PropertyFactors(stiffness=bound, strength=bound)
        count = int(self.bearing_count)
        group = BearingGroup(self.bearing(), count, self.weight / count)
        return IsolationSystem([group], factors)


@dataclass(frozen=True)
class ExplorerAnswer:
    """Equivalent-linear answer of the explorer.

    Attributes
    ----------
    settings : ExplorerSettings
    results : dict
        :class:`isolation.design.EquivalentLinearResult` by property set.
    backbones : dict
        Whole-plane backbones by property set.
    """

    settings: ExplorerSettings
    results: dict
    backbones: dict

    @property
    def period_shift(self) -> float:
        """Nominal effective period over the fixed-base period. [-]"""
        return self.results["nominal"].period / self.settings.fixed_base_period

    @property
    def shear_reduction(self) -> float:
        """Upper-bound base shear coefficient over the fixed-base Sa(T_fb, 5 %). [-]"""
        fixed = float(self.settings.spectrum().sa(self.settings.fixed_base_period, 0.05))
        return (self.results["upper"].base_shear / self.settings.weight) / fixed

    def to_dict(self) -> dict:
        return {"settings": asdict(self.settings),
                "results": {k: v.to_dict() for k, v in self.results.items()},
                "period_shift": self.period_shift, "shear_reduction": self.shear_reduction}


def explore(settings: ExplorerSettings | Mapping[str, Any] | None = None, **values: Any) -> ExplorerAnswer:
    """Equivalent-linear answer for the lower, nominal and upper property sets.

    Parameters
    ----------
    settings : ExplorerSettings or mapping, optional
        Starting settings (default :class:`ExplorerSettings`).
    **values
        Settings to change, by field name (see :class:`ExplorerSettings`).
    """
    base = settings if isinstance(settings, ExplorerSettings) else ExplorerSettings(**dict(settings or {}))
    unknown = sorted(set(values) - set(ExplorerSettings.__dataclass_fields__))
    if unknown:
        allowed = ", ".join(ExplorerSettings.__dataclass_fields__)
        raise ValueError(f"setting = {unknown[0]!r} is not allowed: must be one of {allowed}")
    chosen = ExplorerSettings(**{**asdict(base), **values})
    backbones = chosen.system().property_sets(chosen.weight)
    bounds = design_bounds(backbones, chosen.weight, chosen.spectrum(), "asce7")
    return ExplorerAnswer(chosen, dict(bounds.results), backbones)


def trade_off(settings: ExplorerSettings | Mapping[str, Any] | None = None, name: str = "radius",
              values=None, **fixed: Any) -> dict:
    """Equivalent-linear answers along one setting, for a trade-off curve (one array-kernel call).

    Parameters
    ----------
    settings : ExplorerSettings or mapping, optional
        Starting settings (default :class:`ExplorerSettings`).
    name : str
        The setting that varies (a field of :class:`ExplorerSettings`, e.g.
        ``"radius"`` [m] or ``"friction"`` [-]).
    values : sequence of float
        Its values, in the setting's unit.
    **fixed
        Other settings to change, by field name.

    Returns
    -------
    dict
        ``values``; per property set ``lower``/``nominal``/``upper`` a dict of
        arrays ``displacement`` [m], ``period`` [s], ``damping`` [-],
        ``base_shear`` [kN]; ``shear_reduction`` (upper-bound V_b/W over the
        fixed-base Sa(T_fb, 5 %)) [-]. Equal to :func:`explore` at each value.
    """
    from isolation.design_array import design_bounds_many

    if name not in ExplorerSettings.__dataclass_fields__:
        allowed = ", ".join(ExplorerSettings.__dataclass_fields__)
        raise ValueError(f"name = {name!r} is not allowed: must be one of {allowed}")
    if values is None or np.ndim(values) != 1 or len(values) == 0:
        raise ValueError(f"values = {values!r} is not allowed: must be a non-empty sequence of {name} values")
    base = settings if isinstance(settings, ExplorerSettings) else ExplorerSettings(**dict(settings or {}))
    chosen = [ExplorerSettings(**{**asdict(base), **fixed, name: value}) for value in values]
    weights = np.array([c.weight for c in chosen])
    groups: dict = {}  # one kernel call per site spectrum (a spectrum setting may be the one varied)
    for i, c in enumerate(chosen):
        groups.setdefault(c.spectrum(), []).append(i)
    bounds: list = [None] * len(chosen)
    for spectrum, index in groups.items():
        found = design_bounds_many([chosen[i].system().property_sets(chosen[i].weight) for i in index],
                                   weights[index], spectrum, "asce7")
        for i, b in zip(index, found):
            bounds[i] = b
    out: dict = {"values": list(values)}
    for case in ("lower", "nominal", "upper"):
        out[case] = {key: np.array([getattr(b.results[case], key) for b in bounds])
                     for key in ("displacement", "period", "damping", "base_shear")}
    fixed_sa = np.array([float(c.spectrum().sa(c.fixed_base_period, 0.05)) for c in chosen])
    out["shear_reduction"] = out["upper"]["base_shear"] / weights / fixed_sa
    return out


def summary_table(answer: ExplorerAnswer) -> Table:
    """Displacement, period, damping and base shear per property set."""
    weight = answer.settings.weight
    rows = tuple(
        (case, 1000 * r.displacement, r.period, 100 * r.damping, r.base_shear / weight, r.period / answer.settings.fixed_base_period)
        for case, r in answer.results.items()
    )
    return Table(
        columns=("Properties", "D [mm]", "T_eff [s]", "β_eff [%]", "V_b/W [-]", "T_eff/T_fb [-]"),
        rows=rows,
        caption="Equivalent-linear answer (ASCE/SEI 7-16 §17.5, MCE_R)",
    )


def summary_html(answer: ExplorerAnswer) -> str:
    """The summary table as HTML for the widget, with the two key ratios."""
    table = summary_table(answer)
    head = "".join(f"<th>{html.escape(c)}</th>" for c in table.columns)
    body = "".join("<tr>" + "".join(f"<td>{html.escape(c)}</td>" for c in row) + "</tr>" for row in table.cells)
    note = (f"<p>Period shift (nominal): x{answer.period_shift:.1f}; upper-bound base shear is "
            f"{100 * answer.shear_reduction:.0f} % of the fixed-base elastic demand. "
            "Screening only, not design.</p>")
    return f"<table><thead><tr>{head}</tr></thead><tbody>{body}</tbody></table>{note}"


def explorer_figure(answer: ExplorerAnswer) -> Figure:
    """Spectrum with fixed-base and isolated periods beside the loops at D."""
    fig = Figure(figsize=(9.0, 3.4), layout="constrained")
    FigureCanvasAgg(fig)
    left, right = fig.subplots(1, 2)
    spectrum = answer.settings.spectrum()
    longest = max(r.period for r in answer.results.values())
    periods = np.linspace(0.0, max(4.0, 1.2 * longest), 300)
    left.plot(periods, spectrum.sa(periods, 0.05), color="k", lw=1.5, label="5 % damping")
    t_fb = answer.settings.fixed_base_period
    left.plot([t_fb], [spectrum.sa(t_fb, 0.05)], "o", color=COLOURS["fixed"], label=f"fixed base {t_fb:.2f} s")
    for case, result in answer.results.items():
        colour = COLOURS[case]
        left.plot([result.period], [spectrum.sa(result.period, result.damping)], "s", color=colour,
                  label=f"{case} {result.period:.2f} s")
        x, f = masing_loop(answer.backbones[case], result.displacement)
        right.plot(1000 * x, f, color=colour, lw=1.3, label=f"{case}: D = {1000 * result.displacement:.0f} mm")
    left.set_xlabel("Period T [s]")
    left.set_ylabel("Sa [g]")
    right.set_xlabel("Displacement [mm]")
    right.set_ylabel("Force, isolation plane [kN]")
    for ax in (left, right):
        ax.grid(alpha=0.3)
        ax.legend(fontsize=7)
    return fig


def update(values: Mapping[str, Any]) -> tuple[ExplorerAnswer, str, Figure]:
    """The widgets' callback: settings to (answer, HTML summary, figure).

    Parameters
    ----------
    values : mapping
        Settings by field name of :class:`ExplorerSettings`.
    """
    answer = explore(**dict(values))
    return answer, summary_html(answer), explorer_figure(answer)


def _png(figure: Figure) -> bytes:
    buffer = io.BytesIO()
    figure.savefig(buffer, format="png", dpi=90)
    return buffer.getvalue()


_SLIDERS = {  # field: (minimum, maximum, step, label)
    "weight": (5_000.0, 200_000.0, 1_000.0, "Weight W [kN]"),
    "bearing_count": (4, 120, 1, "Bearings [-]"),
    "radius": (1.0, 8.0, 0.1, "Radius R [m]"),
    "friction": (0.02, 0.15, 0.005, "Friction μ [-]"),
    "outer_diameter": (0.4, 1.5, 0.05, "Rubber diameter [m]"),
    "lead_diameter": (0.05, 0.35, 0.01, "Lead diameter [m]"),
    "layer_thickness": (0.005, 0.025, 0.001, "Layer thickness [m]"),
    "layers": (5, 60, 1, "Rubber layers [-]"),
    "shear_modulus": (300.0, 1_000.0, 25.0, "Shear modulus G [kPa]"),
    "sms": (0.2, 3.0, 0.05, "S_MS [g]"),
    "sm1": (0.1, 2.0, 0.05, "S_M1 [g]"),
    "lower_factor": (0.5, 1.0, 0.05, "Lower factor [-]"),
    "upper_factor": (1.0, 2.0, 0.05, "Upper factor [-]"),
    "fixed_base_period": (0.1, 2.5, 0.05, "Fixed-base T [s]"),
}


def build_explorer(settings: ExplorerSettings | None = None):
    """ipywidgets explorer; every change calls :func:`update`.

    Returns
    -------
    ipywidgets.VBox
        The explorer; its ``controls`` attribute maps field names to widgets,
        ``summary`` is the HTML widget and ``image`` the figure widget.
    """
    import ipywidgets as widgets

    start = settings or ExplorerSettings()
    controls: dict[str, Any] = {
        "bearing_type": widgets.ToggleButtons(options=list(BEARING_TYPES), value=start.bearing_type,
                                              description="Bearing"),
    }
    for name, (low, high, step, label) in _SLIDERS.items():
        kind = widgets.IntSlider if isinstance(step, int) else widgets.FloatSlider
        controls[name] = kind(value=getattr(start, name), min=low, max=high, step=step, description=label,
                              continuous_update=False, style={"description_width": "140px"})
    summary = widgets.HTML()
    image = widgets.Image(format="png")
    message = widgets.HTML()

    def refresh(_change=None) -> None:
        values = {name: control.value for name, control in controls.items()}
        try:
            _, text, figure = update(values)
        except (ValueError, RuntimeError) as exc:  # show bad combinations, keep the last answer
            message.value = f"<b>Not computed:</b> {html.escape(str(exc))}"
            return
        message.value = ""
        summary.value = text
        image.value = _png(figure)

    for control in controls.values():
        control.observe(refresh, names="value")
    refresh()
    box = widgets.VBox([widgets.HBox([widgets.VBox(list(controls.values())), widgets.VBox([summary, message])]), image])
    box.controls, box.summary, box.image, box.message = controls, summary, image, message
    return box
