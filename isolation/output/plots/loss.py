"""Figure of the owner's page: expected repair cost against intensity, fixed base and isolated."""

from __future__ import annotations

from typing import Any

import numpy as np

from isolation.codes import registry as _codes
from isolation.output.plots.common import _colour, _figure

__all__ = ["loss_curves"]


def _part(obj: Any, name: str) -> Any:
    return obj[name] if isinstance(obj, dict) else getattr(obj, name)


def loss_curves(results: Any):
    """Mean repair cost (with the 10 %-90 % band) against intensity, one line per case.

    Parameters
    ----------
    results : StudyResults or its ``to_dict()`` form
        With a loss study; intensities as fractions of the site spectrum [-],
        cost in the study's currency (shown in millions).
    """
    cases = []
    fixed = _part(results, "fixed_base").get("loss") or {}
    if fixed:
        cases.append(("Fixed base", fixed))
    for alternative in _part(results, "alternatives"):
        loss = _part(alternative, "loss") or {}
        if loss:
            cases.append((_part(alternative, "name"), loss))
    if not cases:
        raise ValueError("results hold no loss study: nothing to plot")
    info = _part(results, "loss")
    currency = info.get("currency", "")
    fig, ax = _figure(3.4)
    for index, (name, case) in enumerate(cases):
        x = np.array([lv["intensity"] for lv in case["levels"]])
        mean = np.array([lv["loss"]["mean"] for lv in case["levels"]]) / 1e6
        low = np.array([lv["loss"]["p10"] for lv in case["levels"]]) / 1e6
        high = np.array([lv["loss"]["p90"] for lv in case["levels"]]) / 1e6
        colour = _colour("fixed" if name == "Fixed base" else name, index + 1)
        style = "--" if name == "Fixed base" else "-"
        ax.plot(x, mean, style, marker="o", color=colour, label=name)
        ax.fill_between(x, low, high, color=colour, alpha=0.12, linewidth=0)
    design, top = cases[0][1]["design_level"], cases[0][1]["mce_level"]
    code = _codes.get_or_default(_part(results, "study").get("basis"))
    names = code.level_marks
    for level, label in zip((design, top), names, strict=True):
        ax.axvline(level, color="0.6", linewidth=0.8, linestyle=":")
        ax.annotate(label, (level, 1.0), xycoords=("data", "axes fraction"), xytext=(3, -12),
                    textcoords="offset points", fontsize=8, color="0.35")
    unit = code.site_level
    ax.set_xlabel(f"Shaking intensity [fraction of the {unit} spectrum]")
    ax.set_ylabel(f"Expected repair cost [million {currency}]")
    ax.set_ylim(bottom=0.0)
    ax.grid(True, alpha=0.3)
    ax.legend(fontsize=8, loc="upper left")
    return fig
