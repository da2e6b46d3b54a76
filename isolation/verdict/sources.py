"""Where each verdict limit comes from, for each code basis.

The rules of :mod:`isolation.verdict.rules` are the same screening rules for
every study; only the clause they cite changes with the study's code basis
(``"asce7"``: ASCE/SEI 7-16 Chapter 17; ``"eurocode"``: EN 1998-1:2004
Section 10). A limit with no single source is "common practice" whatever the
basis. "From memory" means the clause was not re-read when this was written;
National Annexes may change the Eurocode values. A licensed engineer checks
every clause against the governing local code.
"""

from __future__ import annotations

from isolation import validate

__all__ = ["BASES", "PRACTICE", "source", "drift_limit", "NONSTRUCTURAL", "eurocode_reduction_factor"]

BASES = ("asce7", "eurocode")
"""Code bases the verdict knows: ASCE/SEI 7-16 and EN 1998-1:2004."""

PRACTICE = "common practice"

_ASCE = "ASCE/SEI 7-16"
_EC8 = "EN 1998-1:2004"

_SOURCES = {
    "period shift": {
        "asce7": f"{_ASCE} §17.4.1 item 5 (from memory): ELF needs T_M > 3 T, T from Eq. 12.8-7 or 12.8-8",
        "eurocode": f"{_EC8} §10.9.2 (from memory): T_eff >= 3 T_f for the simplified analysis",
    },
    "isolated period limit": {
        "asce7": f"{_ASCE} §17.4.1 (from memory)",
        # EN 1998-1 §10.9.2 stops the simplified analysis at T_eff = 3 s (reported under
        # "analysis procedure"); the 5 s band end is a rule of thumb.
        "eurocode": PRACTICE,
    },
    "displacement capacity": {
        "asce7": f"{_ASCE} §17.2.4.5 and §17.6.3.4 (from memory): bearings stable at D_TM",
        "eurocode": f"{_EC8} §10.3(2) increased reliability, gamma_x on isolator displacements, and "
                    "§10.4 compliance criteria (from memory): isolators accommodate d_d",
    },
    "moat": {
        "asce7": f"{_ASCE} §17.2.6 (from memory): separation not less than D_TM",
        "eurocode": f"{_EC8} §10.4 compliance criteria (from memory): clearance for the isolator "
                    "design displacement d_d",
    },
    "design shear": {
        "asce7": f"{_ASCE} §17.5.4.2 (R_I = 3/8 R within 1-2) and §12.8.1 (from memory)",
        "eurocode": f"{_EC8} §10.10(5) (q <= 1.5 for the isolated superstructure) and §4.3.3.2 "
                    "fixed-base lateral force method (from memory)",
    },
    "uplift": {
        "asce7": "outermost bearing of a regular grid, rigid-body overturning from V_st at its height "
                 f"(derived), tributary gravity of the lightest bearing group ({PRACTICE}); "
                 f"0.9 D - E_v, E_v = 0.2 S_MS D ({_ASCE} §17.2.4.6, §12.4.2.2, from memory)",
        "eurocode": "outermost bearing of a regular grid, rigid-body overturning from the superstructure's "
                    f"share of V at its mass centre (derived), tributary gravity of the lightest group "
                    f"({PRACTICE}); G with 0.3 of the vertical action where a_vg > 0.25 g "
                    f"(EN 1990 Eq. 6.12b, {_EC8} §4.3.3.5.2, from memory)",
    },
    "soft soil class F": {
        "asce7": f"{_ASCE} §11.4.8, §17.4.1 (from memory)",
        "eurocode": PRACTICE,
    },
    "near fault": {
        "asce7": f"{_ASCE} §11.2 'near-fault site' (within 15 km of a fault of M_w >= 7, 10 km of M_w >= 6) "
                 "and §17.3.2 (from memory)",
        "eurocode": f"{PRACTICE}; {_EC8} §10.9.2 (from memory) allows the simplified analysis only "
                    "beyond 15 km from an active fault of Ms >= 6.5",
    },
    "wind": {
        "asce7": f"{_ASCE} §17.2.4.3 (from memory): wind without yielding the isolation system",
        "eurocode": f"{PRACTICE}: wind without yielding the isolation system",
    },
    "analysis procedure": {
        "asce7": f"{_ASCE} §17.4.1 (from memory)",
        "eurocode": f"{_EC8} §10.9 simplified analysis and its applicability limits, §10.10 modal "
                    "simplified analysis (from memory)",
    },
    "effective damping": {
        "asce7": f"{_ASCE} §17.4.1 (from memory)",
        "eurocode": f"{_EC8} §10.9.1 (from memory): xi_eff <= 30 % for the simplified analysis",
    },
}

_DRIFT = {
    "asce7": (0.020, f"{_ASCE} §17.6.4.4, MCE_R response-history analysis (from memory)"),
    "eurocode": (0.020, f"{_EC8} §4.4.3.2 damage limitation (from memory): d_r nu <= 0.010 h with "
                        "nu = 0.5 (recommended for importance classes I-II; 0.4 for III-IV allows 2.5 %), i.e. "
                        "2 % under the design seismic action; 0.005 h or 0.0075 h when brittle or "
                        "ductile non-structural elements interfere"),
}

NONSTRUCTURAL = {"brittle": 0.005, "ductile": 0.0075, "none": 0.010}
"""EN 1998-1:2004 §4.4.3.2(1) (from memory): d_r nu <= alpha h with alpha 0.005 (brittle
non-structural elements attached to the structure), 0.0075 (ductile ones), 0.010 (none, or
fixed so as not to interfere with structural deformations)."""


def eurocode_reduction_factor(importance: float = 1.0) -> float:
    """nu of EN 1998-1 §4.4.3.2(2) (recommended 0.5 for importance classes I-II, 0.4 for III-IV;
    from memory), from gamma_I (0.8/1.0 classes I-II, 1.2/1.4 classes III-IV). [-]

    Parameters
    ----------
    importance : float
        gamma_I, > 0. [-]
    """
    gamma = validate.positive("importance", importance, "-")
    return 0.5 if gamma <= 1.1 else 0.4


def source(topic: str, basis: str = "asce7") -> str:
    """The source of one verdict limit for the code basis.

    Parameters
    ----------
    topic : str
        A key of the source table ("period shift", "moat", "wind", ...).
    basis : str
        ``"asce7"`` or ``"eurocode"``.
    """
    basis = validate.one_of("basis", basis, BASES)
    return _SOURCES[topic][basis]


def drift_limit(basis: str = "asce7", nonstructural: str | None = None,
                importance: float = 1.0) -> tuple[float, str]:
    """Storey drift ratio limit [-] for the response histories and its source.

    Parameters
    ----------
    basis : str
        ``"asce7"`` (MCE_R histories, 2 %) or ``"eurocode"`` (design-action histories,
        EN 1998-1 §4.4.3.2 damage limitation).
    nonstructural : str or None
        Eurocode only: "brittle", "ductile" or "none" (see :data:`NONSTRUCTURAL`);
        the limit is alpha/nu. None keeps the earlier 2 % (alpha 0.010, nu 0.5).
    importance : float
        Eurocode only: gamma_I, which sets nu (:func:`eurocode_reduction_factor`). [-]
    """
    basis = validate.one_of("basis", basis, BASES)
    if basis != "eurocode" or nonstructural is None:
        return _DRIFT[basis]
    validate.one_of("nonstructural", nonstructural, tuple(NONSTRUCTURAL))
    alpha, nu = NONSTRUCTURAL[nonstructural], eurocode_reduction_factor(importance)
    return alpha / nu, (f"{_EC8} §4.4.3.2 damage limitation (from memory): d_r nu <= {alpha:g} h for "
                        f"non-structural elements '{nonstructural}', nu = {nu:g} (gamma_I = {importance:g}), "
                        f"so {alpha / nu:.2%} under the design seismic action")
