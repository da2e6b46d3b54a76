"""The owner's summary of a study: one short table and a few plain sentences.

Every number is read from :class:`isolation.study.runner.StudyResults` (or its
``to_dict()`` form, i.e. ``results.json``); nothing is re-computed here but
unit conversion and percentages of ratios the results hold.

The preferred alternative is a presentation choice, not a verdict rule: the
best outcome ("feasible" before "feasible with conditions"), then fewer
deciding findings, then the lower peak floor acceleration relative to the
fixed base. When every alternative is "not recommended" there is none.
"""

from __future__ import annotations

import math
import re
from typing import Any

from isolation.codes import registry as _codes
from isolation.output.tables.results import _display, _part, _quantities, _summary, _times_100, display_quantity
from isolation.output.tables.symbols import markdown_text
from isolation.output.tables.table import Table, format_number

__all__ = ["summary_table", "summary_text", "preferred_alternative", "code_symbols"]

_OUTCOME_ORDER = {"feasible": 0, "feasible with conditions": 1, "not recommended": 2}



def code_symbols(basis: str) -> dict[str, str]:
    """Symbols of a code basis: maximum and total displacement, isolated period.

    Parameters
    ----------
    basis : str
        "asce7" (D_M, D_TM, T_M) or "eurocode" (d_dc, d_d, T_eff).
    """
    symbols = _codes.get(basis, "basis").symbols
    return {key: symbols[key] for key in ("displacement", "total_displacement", "period")}


def _outcome(alternative: Any) -> str:
    return _part(alternative, "verdict")["outcome"]


def _deciding(alternative: Any) -> list[dict]:
    """The findings that decided the outcome: those against, else the conditions."""
    reasons = [r if isinstance(r, dict) else r.to_dict() for r in _part(alternative, "verdict")["reasons"]]
    against = [r for r in reasons if r["level"] == "against"]
    return against or [r for r in reasons if r["level"] == "condition"]


def _floor_ratio(alternative: Any) -> float:
    value = _summary(alternative).floor_acceleration_ratio
    return math.inf if value is None else float(value)


def _ranked(results: Any) -> list:
    return sorted(_part(results, "alternatives"),
                  key=lambda a: (_OUTCOME_ORDER.get(_outcome(a), 3), len(_deciding(a)), _floor_ratio(a)))


def preferred_alternative(results: Any) -> Any | None:
    """The alternative the summary recommends, or None when all are "not recommended"."""
    ranked = _ranked(results)
    if not ranked or _outcome(ranked[0]) not in ("feasible", "feasible with conditions"):
        return None
    return ranked[0]


def _percent(ratio: float | None) -> str:
    return "--" if ratio is None else f"{100 * ratio:.0f}"


def summary_table(results: Any) -> Table:
    """Verdict and key numbers of each alternative, one column each, for the owner.

    Rows: verdict; isolated period from the upper to the lower property bound;
    total design displacement and moat width (study units); shear above the
    isolators and peak floor acceleration as % of the fixed-base building
    (response histories, suite means); peak storey drift ratio isolated and
    fixed base [%].
    """
    study = _part(results, "study")
    system = study.get("units", "SI")
    length = _display(1.0, "length", system)[1]
    symbols = code_symbols(study["basis"])
    alternatives = list(_part(results, "alternatives"))

    def column(alternative: Any) -> list[str]:
        q, s = _quantities(alternative), _summary(alternative)
        moat = q.moat
        return [
            _outcome(alternative),
            f"{q.period_upper:.2f} – {q.period_lower:.2f}",
            format_number(_display(q.total_displacement, "length", system)[0]),
            "not given" if moat is None else format_number(_display(moat, "length", system)[0]),
            _percent(s.superstructure_shear_ratio),
            _percent(s.floor_acceleration_ratio),
            f"{format_number(_times_100(s.drift_ratio_isolated), 2)} / "
            f"{format_number(_times_100(s.drift_ratio_fixed), 2)}",
        ]

    labels = ("Verdict", f"Isolated period {symbols['period']}, upper to lower bound [s]",
              f"Total design displacement {symbols['total_displacement']} [{length}]", f"Moat width [{length}]",
              "Base shear above the isolators [% of fixed base]", "Peak floor acceleration [% of fixed base]",
              "Peak storey drift ratio, isolated / fixed base [%]")
    columns = [column(a) for a in alternatives]
    rows = tuple(tuple([label] + [c[index] for c in columns]) for index, label in enumerate(labels))
    return Table(
        columns=tuple(["" if len(alternatives) > 1 else "Alternative"] + [_part(a, "name") for a in alternatives]),
        rows=rows, align="l" + "r" * len(alternatives), caption="Summary of the isolation alternatives",
        notes=(f"Verdicts: see the Verdict section. {symbols['total_displacement']} from the code procedure, "
               "torsion included. Shear, floor acceleration and drift: response-history suite means of the "
               "peaks; shear at the upper bound, floor acceleration and drift at the bound giving the larger "
               f"value. Fixed base: {_fixed_label(results)}. A feasibility screening, not a design: a "
               "licensed structural engineer must confirm it against the local code."))


def _fixed_label(results: Any) -> str:
    from isolation.output.tables.yielding import fixed_base_label
    return fixed_base_label(results)


def _name(alternative: Any) -> str:
    return re.sub(r"([\\`*_|\[\]])", r"\\\1", str(_part(alternative, "name")))


def _topics(reasons: list[dict]) -> str:
    topics = list(dict.fromkeys(r["topic"] for r in reasons))
    return topics[0] if len(topics) == 1 else ", ".join(topics[:-1]) + " and " + topics[-1]


def summary_text(results: Any) -> str:
    """Two to four plain sentences (markdown, symbols as math) naming the preferred
    alternative, if any, and the main condition or reason against."""
    study = _part(results, "study")
    system = study.get("units", "SI")
    symbols = code_symbols(study["basis"])
    alternatives = list(_part(results, "alternatives"))
    best = preferred_alternative(results)
    if best is None:
        each = "; ".join(f"**{_name(a)}**: {_deciding(a)[0]['message']}" if _deciding(a) else f"**{_name(a)}**"
                         for a in alternatives)
        sentences = [f"None of the {len(alternatives)} alternatives studied is recommended as designed.",
                     f"The main reason against each: {each}."]
        return markdown_text(" ".join(sentences))

    outcome = _outcome(best)
    if len(alternatives) == 1:
        first = f"The alternative studied, **{_name(best)}**, is {outcome}."
    else:
        equal = [a for a in alternatives if a is not best and _outcome(a) == outcome]
        if not equal:
            why = f"the best verdict of the {len(alternatives)} alternatives studied"
        elif all(len(_deciding(a)) > len(_deciding(best)) for a in equal):
            why = f"like {', '.join(_name(a) for a in equal)}, but with fewer conditions"
        else:
            why = f"like {', '.join(_name(a) for a in equal)}, and with the lower peak floor acceleration"
        first = f"**{_name(best)}** is the preferred alternative: {outcome}, {why}."
    q, s = _quantities(best), _summary(best)
    moat = q.moat
    fixed = q.fixed_base_period
    start = "" if fixed is None else f" from T_fb = {fixed:.2f} s"
    room = "no moat width given" if moat is None else f"moat {display_quantity(moat, 'length', system)}"
    sentences = [first, (
        f"It lengthens the building's period{start} to {symbols['period']} = {q.period_upper:.2f}–"
        f"{q.period_lower:.2f} s, its isolators move by up to {symbols['total_displacement']} = "
        f"{display_quantity(q.total_displacement, 'length', system)} ({room}), and it brings the peak floor "
        f"acceleration to {_percent(s.floor_acceleration_ratio)} % and the base shear above the isolators "
        f"to {_percent(s.superstructure_shear_ratio)} % of those of {_fixed_label(results)}.")]
    deciding = _deciding(best)
    if deciding:
        more = deciding[1:]
        sentences.append(f"Its main condition: {deciding[0]['message']}"
                         + (f"; further conditions on {_topics(more)}" if more else "") + ".")
    others = []
    for alternative in alternatives:
        if alternative is best:
            continue
        reasons = _deciding(alternative)
        text = f"**{_name(alternative)}** is {_outcome(alternative)}"
        if reasons and reasons[0]["level"] == "against":
            text += f": {reasons[0]['message']}" + (f" (also {_topics(reasons[1:])})" if reasons[1:] else "")
        elif reasons:
            text += f" on {_topics(reasons)}"
        others.append(text)
    if others:
        sentences.append("; ".join(others) + ".")
    return markdown_text(" ".join(sentences))
