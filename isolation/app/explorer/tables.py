"""The explorer's answer as tables: HTML for the live page, :class:`isolation.output.tables.Table` for notebooks.

Every numeric cell of the HTML carries ``data-key`` (the quantity) and
``data-value`` (its SI value at full precision), so that tests in a browser
compare the page with the core. Lengths show in mm (SI) or in (US), forces in
kN or kip. All names are re-exported from :mod:`isolation.app.explorer.answers`.
"""

from __future__ import annotations

import html
from dataclasses import asdict

import numpy as np

from isolation.app.explorer.controls import to_display, unit_name
from isolation.codes import registry as _codes
from isolation.output.plots import COLOURS
from isolation.output.tables import Table

__all__ = ["summary_table", "summary_html", "quantities_html", "layout_html", "checks_html", "warnings_html",
           "comparison_table", "comparison_html"]


def _length(value: float, system: str) -> tuple[float, str]:
    """Displacements shown in mm (SI) or in (US)."""
    if system == "SI":
        return 1000.0 * value, "mm"
    return to_display(value, "length", system), "in"


def _force(value: float, system: str) -> tuple[float, str]:
    return to_display(value, "weight", system), unit_name("weight", system)


def summary_table(answer) -> Table:
    """Displacement, period, damping and base shear per property set."""
    s = answer.settings
    _, d_unit = _length(1.0, s.units)
    _, f_unit = _force(1.0, s.units)
    rows = tuple(
        (case, _length(r.displacement, s.units)[0], r.period, 100 * r.damping, r.base_shear / s.weight,
         r.period / s.fixed_base_period, _force(r.base_shear, s.units)[0])
        for case, r in answer.results.items()
    )
    source = _codes.get(s.basis).answer_source
    return Table(
        columns=("Properties", f"D [{d_unit}]", "T_eff [s]", "β_eff [%]", "V_b/W [-]", "T_eff/T_fb [-]",
                 f"V_b [{f_unit}]"),
        rows=rows,
        caption=f"Equivalent-linear answer per property set ({source})",
    )


def _cell(text: str, key: str = "", value: float | None = None) -> str:
    attrs = f' data-key="{key}"' if key else ""
    if value is not None:
        attrs += f' data-value="{float(value)!r}"'
    return f"<td{attrs}>{html.escape(text)}</td>"


def summary_html(answer) -> str:
    """The summary table as HTML with the two key ratios; cells carry ``data-key`` and SI ``data-value``."""
    table = summary_table(answer)
    head = "".join(f"<th>{html.escape(c)}</th>" for c in table.columns)
    keys = ("case", "D", "T", "beta", "VW", "shift", "Vb")
    body = ""
    for (case, r), cells in zip(answer.results.items(), table.cells, strict=True):
        values = (None, r.displacement, r.period, r.damping, r.base_shear / answer.settings.weight,
                  r.period / answer.settings.fixed_base_period, r.base_shear)
        colour = COLOURS.get(case, "#000")
        row = "".join(_cell(c, f"{case}-{k}", v) for c, k, v in zip(cells, keys, values, strict=True))
        body += f'<tr style="border-left: 4px solid {colour}">{row}</tr>'
    note = (f"<p>Period shift (nominal): x{answer.period_shift:.1f}; upper-bound base shear is "
            f"{100 * answer.shear_reduction:.0f} % of the fixed-base elastic demand. "
            "Screening only, not design.</p>")
    return f'<table class="iso-table iso-summary"><thead><tr>{head}</tr></thead><tbody>{body}</tbody></table>{note}'


_QUANTITIES = (  # key, kind; the label is the code basis's (CodeBasis.quantity_labels)
    ("displacement", "length"), ("total_displacement", "length"), ("moat", "length"),
    ("isolation_shear", "force"), ("superstructure_shear", "force"), ("shear_ratio", "-"),
)


def quantities_html(answer) -> str:
    """D_M, D_TM, moat and shears as an HTML table (``data-key`` = quantity name, SI ``data-value``)."""
    s = answer.settings
    rows = ""
    labels = _codes.get(s.basis).quantity_labels
    for key, kind in _QUANTITIES:
        value = answer.quantities.get(key)
        if value is None:
            continue
        if kind == "length":
            shown, unit = _length(value, s.units)
            text = f"{shown:.0f} {unit}" if unit == "mm" else f"{shown:.1f} {unit}"
        elif kind == "force":
            shown, unit = _force(value, s.units)
            text = f"{shown:,.0f} {unit}"
        else:
            text = f"{value:.2f}"
        label = labels.get(key, key)
        rows += f"<tr><th>{html.escape(label)}</th>{_cell(text, key, value)}</tr>"
    return f'<table class="iso-table iso-quantities"><tbody>{rows}</tbody></table>'


def layout_html(answer) -> str:
    """The bearing grid and its per-bearing answers (``data-key`` = quantity name, SI ``data-value``)."""
    layout = answer.layout
    if layout is None:
        return ""
    s = answer.settings
    along, across = layout.grid
    bay = " x ".join(f"{to_display(v, 'length', s.units):.3g}" for v in layout.spacing)
    d_max = float(layout.displacement.max())
    shown, unit = _length(d_max, s.units)
    rows = [
        ("Bearing grid, along the length x across the width", _cell(f"{along} x {across}", "grid_along", along)),
        (f"Bay size [{unit_name('length', s.units)}]", f"<td>{html.escape(bay)}</td>"),
        ("Largest bearing displacement (code torsion formula at each bearing)",
         _cell(f"{shown:.0f} {unit}" if unit == "mm" else f"{shown:.1f} {unit}", "bearing_displacement_max", d_max)),
    ]
    for key, label in (("bearing_axial_min", "Smallest axial load under overturning"),
                       ("bearing_axial_max", "Largest axial load under overturning")):
        value = answer.quantities[key]
        force, f_unit = _force(value, s.units)
        rows.append((label, _cell(f"{force:,.0f} {f_unit}", key, value)))
    rows.append(("Bearings in tension (uplift)",
                 _cell(str(layout.in_tension), "bearings_in_tension", layout.in_tension)))
    body = "".join(f"<tr><th>{html.escape(label)}</th>{cell}</tr>" for label, cell in rows)
    return f'<table class="iso-table iso-layout"><tbody>{body}</tbody></table>'


def _check_value(value, unit: str, system: str, like=None) -> tuple[str, str]:
    if value is None or not np.isfinite(value):
        return "-", unit
    if unit == "m" and like is not None and abs(like) >= 5.0:
        value_ft = to_display(value, "length", system) / (12.0 if system == "US" else 1.0)
        return f"{value_ft:.3g}", ("ft" if system == "US" else "m")
    if unit == "m" and abs(value) < 5.0:  # displacements in mm or in; heights stay in m or ft
        shown, name = _length(value, system)
        return (f"{shown:.0f}" if name == "mm" else f"{shown:.1f}"), name
    if unit == "kN":
        shown, name = _force(value, system)
        return f"{shown:,.0f}", name
    if unit == "kPa" and system == "US":
        return f"{to_display(value, 'stress', system):.4g}", "psi"
    return f"{value:.3g}", unit


def checks_html(answer) -> str:
    """Bearing checks at D_TM and the code's conditions for its simplified method, with PASS/FAIL flags."""
    s = answer.settings

    def rows(checks, kind):
        out = ""
        for i, c in enumerate(checks):
            like = max((abs(x) for x in (c.value, c.limit) if x is not None and np.isfinite(x)), default=0.0)
            value, unit = _check_value(c.value, c.unit, s.units, like)
            limit, _ = _check_value(c.limit, c.unit, s.units, like)
            flag = "PASS" if c.passed else "FAIL"
            colour = "#1b7a2a" if c.passed else "#b00020"
            out += (f'<tr data-check="{kind}-{i}" data-passed="{str(bool(c.passed)).lower()}">'
                    f"<td>{html.escape(c.name)}</td><td>{value}</td><td>{limit}</td><td>{html.escape(unit)}</td>"
                    f'<td style="color:{colour};font-weight:bold">{flag}</td>'
                    f'<td class="iso-source">{html.escape(c.source)}</td></tr>')
        return out

    head = "<tr><th>Check</th><th>Value</th><th>Limit</th><th>Unit</th><th>Result</th><th>Source</th></tr>"
    method = _codes.get(s.basis).report_title
    return (f'<table class="iso-table iso-checks"><thead>{head}</thead><tbody>'
            f'<tr><th colspan="6">Bearings at D_TM</th></tr>{rows(answer.checks, "bearing")}'
            f'<tr><th colspan="6">Conditions of the {method}; a FAIL asks for response-history analysis</th></tr>'
            f'{rows(answer.applicability, "code")}</tbody></table>')


def warnings_html(answer) -> str:
    """Plausibility warnings as an HTML list (empty text when there are none)."""
    if not answer.warnings:
        return ""
    items = "".join(f"<li>{html.escape(w)}</li>" for w in answer.warnings)
    return f'<div class="iso-warnings"><b>Check the input:</b><ul>{items}</ul></div>'


def _comparison_rows(answer) -> dict:
    s, r = answer.settings, answer.results
    d_unit = _length(1.0, s.units)[1]
    return {
        "bearing": (s.bearing_type, ""),
        f"D_M lower [{d_unit}]": (_length(answer.quantities["displacement"], s.units)[0], ""),
        f"D_TM [{d_unit}]": (_length(answer.quantities["total_displacement"], s.units)[0], ""),
        f"moat [{d_unit}]": (_length(answer.quantities["moat"], s.units)[0], ""),
        "T_eff lower [s]": (r["lower"].period, ""),
        "T_eff upper [s]": (r["upper"].period, ""),
        "β_eff lower [%]": (100 * r["lower"].damping, ""),
        "V_b/W upper [-]": (r["upper"].base_shear / s.weight, ""),
        "V_s/V_fb [-]": (answer.quantities.get("shear_ratio") or float("nan"), ""),
        "failed checks [-]": (len(answer.failed), ""),
        "warnings [-]": (len(answer.warnings), ""),
    }


def comparison_table(pinned, current) -> Table:
    """A pinned alternative beside the current one, with the change in per cent."""
    a, b = _comparison_rows(pinned), _comparison_rows(current)
    if pinned.settings.units != current.settings.units:  # show both in the current system
        settings = type(pinned.settings)(**{**asdict(pinned.settings), "units": current.settings.units})
        a = _comparison_rows(type(pinned)(**{**pinned.__dict__, "settings": settings}))
    rows: list[tuple[str, str | float, str | float, str]] = []
    for key in b:
        x, y = a[key][0], b[key][0]
        if isinstance(x, str) or isinstance(y, str):
            rows.append((key, str(x), str(y), "-" if x == y else "changed"))
            continue
        change = "-" if not x or not np.isfinite(x) or not np.isfinite(y) else f"{100 * (y - x) / abs(x):+.0f} %"
        rows.append((key, float(x), float(y), change))
    return Table(columns=("Quantity", "Pinned", "Current", "Change"), rows=tuple(rows),
                 caption="Pinned alternative beside the current one (change = current over pinned - 1)")


def comparison_html(pinned, current) -> str:
    """:func:`comparison_table` as HTML, or a hint when nothing is pinned."""
    if pinned is None:
        return "<p>Nothing pinned yet: press <i>Pin this alternative</i> to keep it for comparison.</p>"
    table = comparison_table(pinned, current)
    head = "".join(f"<th>{html.escape(c)}</th>" for c in table.columns)
    body = "".join("<tr>" + "".join(f"<td>{html.escape(c)}</td>" for c in row) + "</tr>" for row in table.cells)
    return f'<table class="iso-table iso-compare"><thead><tr>{head}</tr></thead><tbody>{body}</tbody></table>'
