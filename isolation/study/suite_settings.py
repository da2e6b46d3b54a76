"""The settings of a study's matched motion suite: :func:`suite_options` and :data:`QUICK`.

Re-exported from :mod:`isolation.study.runner`; used by the run and by the checks of a study
(:mod:`isolation.study.checks`), which ask beforehand whether the suite can cover the isolated periods.
"""

from __future__ import annotations

from typing import Any

from isolation import codes as _codes
from isolation.study import Study

__all__ = ["QUICK", "suite_options"]

QUICK = {"count": 3, "duration": 10.0, "control_points": 30, "max_iterations": 8}
"""Suite settings of a quick run (tests and trials only, not for reports)."""


def suite_options(study: Study, spectrum, periods: tuple, quick: bool, progress: bool = False):
    """Options of :func:`isolation.motions.matched_suite` for a study's suite, and a note.

    ``periods`` is (T_M upper bound, T_M lower bound) [s] over all alternatives.
    """
    a = study.analysis
    code = _codes.get(study.basis)
    rule = code.matching_rule()
    options: dict[str, Any] = dict(count=a.suite_size, damping=a.damping, duration=a.duration, dt=a.time_step,
                   seed=a.seed, rule=rule, isolated_period=periods, progress=progress)
    # D5-95 of a magnitude 7 event (the suite generator's default), shortened to 40 % of the
    # record for short records so the envelope keeps its rise and decay (common practice).
    from isolation.motions import typical_significant_duration
    options["significant_duration"] = min(typical_significant_duration(7.0), 0.4 * a.duration)
    # Suite-mean check range around T_M: ASCE 7 up to 1.25 T_M (lower bound), Eurocode up to 2 T_M.
    reach = code.suite.period_range[1]
    if quick:
        # The matched band reaches duration/3 and must cover the check range: 5 T_M (ASCE 7),
        # 6.5 T_M (Eurocode).
        shortest = max(QUICK["duration"], max(5.0, 3.0 * reach + 0.5) * max(periods))
        options.update(count=QUICK["count"], duration=min(a.duration, shortest),
                       control_points=QUICK["control_points"], max_iterations=QUICK["max_iterations"])
        options["significant_duration"] = min(options["significant_duration"], 0.4 * options["duration"])
    # The check range must lie inside the matched band, which ends at the spectrum's longest period
    # and at a third of the record length. When it cannot, the suite is matched over its whole band
    # and checked there (noted in the results). The suite's default band ends at max(6 s, 1.5 T_M);
    # when the check range reaches further (Eurocode, T_M > 3 s) the band is widened to it.
    band_end = min(spectrum.period_range[1], options["duration"] / 3.0)
    longest = reach * max(periods)
    note = ""
    if longest > band_end * (1.0 + 1e-9):
        options["isolated_period"] = None
        note = (f"check range around T_M ({reach:g} x {max(periods):.2f} s) exceeds the matched band "
                f"(up to {band_end:.2f} s): the suite is checked over its whole band")
    elif longest > max(6.0, 1.5 * max(periods)):
        options["period_range"] = (max(0.05, 4.0 * a.time_step, spectrum.period_range[0]), min(longest, band_end))
    return options, note
