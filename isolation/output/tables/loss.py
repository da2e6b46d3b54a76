"""The owner's page "What isolation buys": loss, downtime and economics per case.

Every number is read from the results (``fixed_base["loss"]``, each
alternative's ``loss`` and the study-level ``loss`` with levels, hazard,
currency and cautions); nothing is re-computed here.
"""

from __future__ import annotations

import math
from typing import Any

from isolation.codes import registry as _codes
from isolation.output.tables.results import _part
from isolation.output.tables.table import Table

__all__ = ["loss_table", "loss_text", "money"]


def money(value: float | None, digits: int = 3) -> str:
    """An amount for reading: "--", "850", "39.0 k", "1.67 M" (no currency label). [currency]"""
    if value is None or (isinstance(value, float) and not math.isfinite(value)):
        return "--"
    v = float(value)
    for scale, suffix in ((1e9, " bn"), (1e6, " M"), (1e3, " k")):
        if abs(v) >= scale:
            return f"{v / scale:.{digits}g}{suffix}"
    return f"{v:.{digits}g}"


def _band(stats: dict, formatter) -> str:
    return f"{formatter(stats['mean'])} ({formatter(stats['p10'])} to {formatter(stats['p90'])})"


def _days(value: float | None) -> str:
    return "--" if value is None else f"{float(value):.0f}"


def _years(value: float | None) -> str:
    return "never" if value is None else (f"{float(value):.0f}" if value >= 10 else f"{float(value):.1f}")


def _range(economics: dict) -> str:
    """Shortest to longest payback of the 10 % and 90 % pairings."""
    values = [economics["bands"][p]["payback_years"] for p in ("p10", "p90")]
    finite = sorted(v for v in values if v is not None)
    ends = [_years(v) for v in finite] + ["never"] * (2 - len(finite))
    return f"{ends[0]} to {ends[1]}"


def _npv_range(economics: dict) -> str:
    """Lower to higher net present value of the 10 % and 90 % pairings."""
    low, high = sorted(economics["bands"][p]["net_present_value"] for p in ("p10", "p90"))
    return f"{money(low)} to {money(high)}"


def _cases(results: Any) -> list:
    fixed = _part(results, "fixed_base").get("loss") or {}
    cases = [("Fixed base", fixed)] if fixed else []
    for alternative in _part(results, "alternatives"):
        loss = _part(alternative, "loss") or {}
        if loss:
            cases.append((_part(alternative, "name"), loss))
    return cases


def _top_label(results: Any) -> tuple[str, str]:
    return _codes.get_or_default(_part(results, "study").get("basis")).level_names


def loss_table(results: Any) -> Table:
    """Loss, repair time, annual figures and economics: one column per case.

    Means with the 10 % to 90 % band of the Monte Carlo in brackets; money
    in the study's currency.

    Parameters
    ----------
    results : StudyResults or its ``to_dict()`` form
    """
    cases = _cases(results)
    if not cases:
        raise ValueError("results hold no loss study: run it (loss.enabled = true) to make this table")
    info = _part(results, "loss")
    currency = info.get("currency", "")
    design, top = _top_label(results)
    rows = [
        (f"Expected repair cost at the {design} [{currency}]",
         *[_band(c["loss_design"], money) for _, c in cases]),
        (f"Expected repair cost at the {top} [{currency}]", *[_band(c["loss_mce"], money) for _, c in cases]),
        (f"Repair time at the {top} [days]", *[_band(c["repair_days_mce"], _days) for _, c in cases]),
        (f"Loss of use at the {top} [days]", *[_band(c["downtime_days_mce"], _days) for _, c in cases]),
        (f"Expected annual loss [{currency}/year]", *[money(c["expected_annual_loss"]) for _, c in cases]),
        ("Expected annual loss of use [days/year]", *[f"{c['expected_annual_downtime']:.2g}" for _, c in cases]),
    ]
    econ = [c.get("economics") for _, c in cases]

    def row(label, pick):
        return (label, *["--" if e is None else pick(e) for e in econ])

    life = info.get("inputs", {}).get("cost", {}).get("design_life", 50)
    rate = info.get("inputs", {}).get("cost", {}).get("discount_rate", 0.0)
    rows += [
        row(f"Isolation cost [{currency}]", lambda e: money(e["isolation_cost"])),
        row(f"Saving in the superstructure [{currency}]", lambda e: money(e["superstructure_saving"])),
        row(f"Net cost of isolation [{currency}]", lambda e: money(e["net_premium"])),
        row(f"Expected yearly benefit [{currency}/year]", lambda e: money(e["annual_benefit"])),
        row("Payback [years] (range)", lambda e: f"{_years(e['payback_years'])} ({_range(e)})"),
        row(f"Net present value over {life:g} years at {100 * rate:g} % [{currency}] (range)",
            lambda e: f"{money(e['net_present_value'])} ({_npv_range(e)})"),
    ]
    notes = ("Means of the Monte Carlo with its 10 % to 90 % range in brackets; k = thousand, M = million. "
             "Yearly benefit = expected annual loss avoided + loss-of-use days avoided x the cost of a day. "
             "Bands of the annual figures pair the same percentile of the fixed-base and isolated loss curves: "
             "an indication of spread, not a confidence interval. Order-of-magnitude screening.")
    return Table(("", *[name for name, _ in cases]), tuple(rows),
                 caption="What isolation buys: expected repair cost, loss of use and economics",
                 align="p" + "r" * len(cases), notes=notes)


def loss_text(results: Any) -> str:
    """Plain sentences for the owner: the basis, which inputs are invented defaults, the cautions."""
    info = _part(results, "loss")
    if not info:
        return "The loss study was not run for this report."
    cost = info.get("inputs", {}).get("cost", {})
    defaults = cost.get("defaults", [])
    settings = info.get("settings", {})
    lines = [
        f"Losses at {len(info['levels'])} intensities ({', '.join(f'{x:.2g}' for x in info['levels'])} x the "
        f"site spectrum), {settings.get('records', '?')} records each, {settings.get('samples', '?')} Monte Carlo "
        f"realisations per intensity (seed {settings.get('seed', '?')}); {settings.get('occupancy', '')} "
        "occupancy, storey-based damage and repair data of FEMA's earthquake loss estimation technical manual "
        "(Multi-hazard Loss Estimation Methodology, MR5, 2010); "
        "irreparability from residual drift (FEMA P-58-1, 2012); collapse from the code's target collapse "
        "probability at MCE_R (ASCE/SEI 7-16 Commentary C.1.3.1b) and, for isolated buildings, isolator "
        "displacement (times the torsion factor of the code design) beyond the bearing capacity or the moat.",
        f"Hazard: {info.get('hazard', {}).get('basis', '')}.",
        f"Fixed base: {settings.get('fixed_base', '')}; isolated alternatives with nominal bearing properties.",
    ]
    if defaults:
        lines.append("**Invented demo values** (not from a cost database) were used for: "
                     + ", ".join(d.replace("_", " ") for d in defaults) + ".")
    lines += [f"**Caution:** {c}" for c in info.get("cautions", [])]
    return "\n\n".join(lines)
