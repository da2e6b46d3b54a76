"""Plausibility warnings: input that gives numbers but makes little physical sense.

:func:`plausibility` looks at an :class:`isolation.app.explorer.answers.ExplorerAnswer`
and returns one sentence per doubtful point: the number, why it is doubtful
and what is usual. Impossible input (a lead core as wide as the bearing, T_L
below T_S) is refused earlier with a ValueError; what is left here still
computes. Limits marked "common practice" have no single source.
"""

from __future__ import annotations

from isolation.app.explorer.controls import to_display, unit_name
from isolation.codes import registry as _codes

__all__ = ["plausibility"]


def _length(value: float, system: str) -> str:
    """A length [m] as text: mm (SI) or in (US)."""
    if system == "US":
        return f"{to_display(value, 'length', 'US'):.1f} in"
    return f"{1000 * value:.0f} mm"


def _force(value: float, system: str) -> str:
    """A force [kN] as text: kN (SI) or kip (US)."""
    return f"{to_display(value, 'weight', system):,.0f} {unit_name('weight', system)}"


def plausibility(answer) -> list[str]:
    """Warnings for doubtful input or answers (empty when none).

    Parameters
    ----------
    answer : isolation.app.explorer.answers.ExplorerAnswer
        An answer with its quantities (D_TM [m]) filled in.
    """
    s = answer.settings
    mm = lambda value: _length(value, s.units)  # noqa: E731
    force = lambda value: _force(value, s.units)  # noqa: E731
    out: list[str] = []
    d_tm = answer.quantities["total_displacement"]
    out += _codes.get(s.basis).site_advice(s)
    if s.bearing_type in ("lead rubber", "high-damping rubber"):
        if s.bearing_type == "lead rubber" and s.lead_diameter > s.outer_diameter / 3.0:
            out.append(f"Lead core D_L = {mm(s.lead_diameter)} is more than a third of the rubber diameter "
                       f"D_o = {mm(s.outer_diameter)}: lead-rubber bearings have D_o/6 <= D_L <= D_o/3 "
                       "(common practice); a larger core is not confined by the rubber and its strength "
                       "Q_d = sigma_y A_L is not reliable.")
        if s.bearing_type == "lead rubber" and s.lead_diameter < s.outer_diameter / 8.0:
            out.append(f"Lead core D_L = {mm(s.lead_diameter)} is less than an eighth of D_o = "
                       f"{mm(s.outer_diameter)}: little damping from the core (usual D_o/6 to D_o/3, common practice).")
        if d_tm >= s.outer_diameter:
            out.append(f"D_TM = {mm(d_tm)} is not smaller than the rubber diameter D_o = {mm(s.outer_diameter)}: "
                       "the top and bottom plates no longer overlap (overlap area A_r = 0, Naeim & Kelly 1999, "
                       "reduced-area formula) and the bearing cannot carry its load. Use larger bearings.")
        rubber = s.layers * s.layer_thickness
        if d_tm / rubber > 3.5:
            out.append(f"Shear strain D_TM/T_r = {d_tm / rubber:.1f} (T_r = {mm(rubber)}) is beyond what "
                       "elastomeric bearings are tested to (about 3.0-3.5, common practice).")
        if rubber > s.outer_diameter:
            out.append(f"Total rubber T_r = {mm(rubber)} exceeds the diameter D_o = {mm(s.outer_diameter)}: "
                       "a slender bearing that buckles at small load (second shape factor D_o/T_r >= 3 usual, "
                       "common practice).")
    else:
        radius = s.radius if s.bearing_type == "friction pendulum" else s.radius_1 + s.radius_2
        if d_tm > 0.25 * radius:
            out.append(f"D_TM = {mm(d_tm)} is {d_tm / radius:.2f} of the effective radius {mm(radius)}: the "
                       "pendulum stiffness W/R holds for small rotations, D/R up to about 0.2 (common practice).")
    if d_tm > 2.0 * s.displacement_capacity:
        out.append(f"D_TM = {mm(d_tm)} is more than twice the bearing's displacement capacity "
                   f"{mm(s.displacement_capacity)}: the bearing is far too small for this site.")
    if d_tm > 1.5:
        out.append(f"D_TM = {mm(d_tm)} is far beyond the displacements of isolated buildings in service "
                   "(up to about 1.0-1.5 m, common practice); the moat, services and bearings would be extreme.")
    load = s.weight / s.bearing_count
    if load > 20_000.0:
        out.append(f"Each bearing carries {force(load)}: more than the largest bearings usually made "
                   "(about 20 000 kN, common practice). Use more bearings.")
    if load < 200.0:
        out.append(f"Each bearing carries only {force(load)}: a light building on many bearings; "
                   "wind and restoring force may govern (common practice).")
    layout = getattr(answer, "layout", None)
    if layout is not None and layout.in_tension:
        along, across = layout.grid
        out.append(f"{layout.in_tension} of {len(layout.gravity)} bearings go into tension under overturning on "
                   f"this {along} x {across} grid (smallest axial load {force(float(layout.axial_min.min()))}; "
                   "rigid-base statics): sliders lift off and rubber bearings are pulled. Spread the bearings "
                   "further apart or check with response histories.")
    upper = answer.results["upper"].period
    if upper < 2.0 * s.fixed_base_period:
        out.append(f"The upper-bound period {upper:.2f} s is less than twice the fixed-base period "
                   f"{s.fixed_base_period:.2f} s: isolation shifts the building little and gains little.")
    return out
