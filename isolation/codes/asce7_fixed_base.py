"""Fixed-base comparison: approximate period and ASCE/SEI 7-16 §12.8 base shear.

The isolated design is judged against the same building on a fixed base:
its period (given, or the code's approximate formula by system type), the
seismic response coefficient C_s with its caps and floors, and the design
base shear C_s W.

References
----------
ASCE/SEI 7-16 §12.8.1.1 (Eqs. 12.8-2 to 12.8-6), §12.8.2 (Table 12.8-1),
§12.8.2.1 (Table 12.8-2, coefficients in SI: h in m).
"""

from __future__ import annotations

from dataclasses import asdict, dataclass

import numpy as np

from isolation import validate

__all__ = [
    "FRAME_TYPES",
    "approximate_period",
    "period_upper_limit_factor",
    "response_coefficient",
    "design_values",
    "FixedBaseShear",
    "fixed_base_shear",
]

# ASCE/SEI 7-16 Table 12.8-2 (same rows in ASCE/SEI 7-22 Table 12.8-2; from memory) in SI
# units (h in m): frame type -> (C_t, x). Rows: steel moment-resisting frames; concrete
# moment-resisting frames; steel eccentrically braced frames; steel buckling-restrained braced
# frames; all other structural systems (which includes concentrically braced frames and walls).
# "braced" is the eccentrically/buckling-restrained row, kept under its earlier name.
FRAME_TYPES = {
    "steel_moment": (0.0724, 0.8),
    "concrete_moment": (0.0466, 0.9),
    "braced": (0.0731, 0.75),
    "eccentric_braced": (0.0731, 0.75),
    "buckling_restrained_braced": (0.0731, 0.75),
    "other": (0.0488, 0.75),
}

# ASCE/SEI 7-16 Table 12.8-1 (from memory): S_D1 [g] -> C_u [-], linear between rows.
_CU_SD1 = np.array([0.1, 0.15, 0.2, 0.3, 0.4])
_CU_VALUE = np.array([1.7, 1.6, 1.5, 1.4, 1.4])


def approximate_period(height: float, frame: str = "other") -> float:
    """Approximate fundamental period T_a = C_t h^x (ASCE/SEI 7-16 Eq. 12.8-7).

    Parameters
    ----------
    height : float
        Structural height above the base, > 0. [m]
    frame : str
        Lateral system (row of ASCE/SEI 7-16 Table 12.8-2): ``"steel_moment"``,
        ``"concrete_moment"``, ``"eccentric_braced"``, ``"buckling_restrained_braced"``,
        ``"braced"`` (either of the last two, earlier name) or ``"other"`` (all other
        structural systems, including concentrically braced frames). [-]

    Returns
    -------
    float
        T_a. [s]
    """
    h = validate.positive("height", height, "m")
    validate.one_of("frame", frame, tuple(FRAME_TYPES))
    ct, x = FRAME_TYPES[frame]
    return ct * h**x


def period_upper_limit_factor(sd1: float) -> float:
    """Coefficient C_u on T_a (ASCE/SEI 7-16 Table 12.8-1, from memory).

    Parameters
    ----------
    sd1 : float
        Design spectral acceleration at 1 s. [g]

    Returns
    -------
    float
        C_u, from 1.7 (S_D1 <= 0.1 g) to 1.4 (S_D1 >= 0.3 g). [-]
    """
    s = validate.non_negative("sd1", sd1, "g")
    return float(np.interp(s, _CU_SD1, _CU_VALUE))


def response_coefficient(
    sds: float,
    sd1: float,
    period: float,
    response_modification: float,
    importance: float = 1.0,
    long_period: float = 8.0,
    s1: float = 0.0,
) -> tuple[float, str]:
    """Seismic response coefficient C_s of ASCE/SEI 7-16 §12.8.1.1.

    Parameters
    ----------
    sds, sd1 : float
        Design spectral accelerations S_DS and S_D1, > 0. [g]
    period : float
        Fundamental period T, > 0. [s]
    response_modification : float
        Response modification coefficient R, > 0. [-]
    importance : float
        Importance factor I_e, > 0. [-]
    long_period : float
        Long-period transition T_L, > 0. [s]
    s1 : float
        Mapped MCE_R spectral acceleration at 1 s, S_1 (for Eq. 12.8-6), >= 0. [g]

    Returns
    -------
    (float, str)
        C_s [-] and the equation that governs.
    """
    sds = validate.positive("sds", sds, "g")
    sd1 = validate.positive("sd1", sd1, "g")
    t = validate.positive("period", period, "s")
    r = validate.positive("response_modification", response_modification, "-")
    ie = validate.positive("importance", importance, "-")
    tl = validate.positive("long_period", long_period, "s")
    s1 = validate.non_negative("s1", s1, "g")
    ratio = r / ie
    cs, governs = sds / ratio, "ASCE/SEI 7-16 Eq. 12.8-2 (S_DS/(R/I_e))"
    cap = sd1 / (t * ratio) if t <= tl else sd1 * tl / (t**2 * ratio)
    if cap < cs:
        eq = "12.8-3 (S_D1/(T R/I_e))" if t <= tl else "12.8-4 (S_D1 T_L/(T^2 R/I_e))"
        cs, governs = cap, f"ASCE/SEI 7-16 Eq. {eq}"
    floor = max(0.044 * sds * ie, 0.01)
    if cs < floor:
        cs, governs = floor, "ASCE/SEI 7-16 Eq. 12.8-5 (0.044 S_DS I_e >= 0.01)"
    if s1 >= 0.6 and cs < 0.5 * s1 / ratio:
        cs, governs = 0.5 * s1 / ratio, "ASCE/SEI 7-16 Eq. 12.8-6 (0.5 S_1/(R/I_e), S_1 >= 0.6 g)"
    return cs, governs


def design_values(spectrum) -> tuple[float, float, float, str]:
    """Design S_DS, S_D1 and T_L for the §12.8 formulas from any spectrum.

    A :class:`~isolation.site.spectra.CodeSpectrum` gives its own values. Any other
    spectrum is taken as MCE_R level and reduced to design level (2/3); then
    S_DS = 0.9 max Sa over 0.2-5 s and S_D1 = max T Sa over 1-5 s, both within
    the spectrum's period range, with T_L = the longest period of the range
    (ASCE/SEI 7-16 §21.4 style, from memory).

    Returns
    -------
    (float, float, float, str)
        S_DS [g], S_D1 [g], T_L [s] and a note on how they were found.
    """
    if hasattr(spectrum, "sds") and hasattr(spectrum, "sd1") and hasattr(spectrum, "long_period"):
        return spectrum.sds, spectrum.sd1, spectrum.long_period, "ASCE/SEI 7-16 §11.4.5 (2/3 of S_MS, S_M1)"
    low, high = spectrum.period_range
    short = np.linspace(max(0.2, low), min(5.0, high), 200)
    sds = 0.9 * 2.0 / 3.0 * float(np.max(spectrum.sa(short)))
    lo1, hi1 = max(1.0, low), min(5.0, high)
    if lo1 > hi1:
        lo1 = hi1
    onesec = np.linspace(lo1, hi1, 200)
    sd1 = 2.0 / 3.0 * float(np.max(onesec * spectrum.sa(onesec)))
    note = "ASCE/SEI 7-16 §21.4 style from the spectrum (from memory): 0.9 max Sa 0.2-5 s, max T Sa 1-5 s, 2/3 of MCE_R"
    return sds, sd1, float(high), note


@dataclass(frozen=True)
class FixedBaseShear:
    """Design base shear of the same building on a fixed base (ASCE/SEI 7-16 §12.8).

    Attributes: ``period`` [s] used, ``period_source`` (given / approximate /
    capped at C_u T_a), ``approximate_period`` T_a [s] (None when height is
    unknown), ``response_coefficient`` C_s [-], ``governs`` (equation),
    ``weight`` [kN], ``base_shear`` [kN], ``sds``, ``sd1`` [g], ``source``.
    """

    period: float
    period_source: str
    approximate_period: float | None
    response_coefficient: float
    governs: str
    weight: float
    base_shear: float
    sds: float
    sd1: float
    source: str

    def to_dict(self) -> dict:
        return asdict(self)


def fixed_base_shear(
    spectrum,
    weight: float,
    response_modification: float,
    *,
    period: float | None = None,
    height: float | None = None,
    frame: str = "other",
    importance: float = 1.0,
    s1: float = 0.0,
) -> FixedBaseShear:
    """Fixed-base design base shear V = C_s W (ASCE/SEI 7-16 §12.8.1).

    Parameters
    ----------
    spectrum : spectrum object
        Site spectrum; see :func:`design_values`.
    weight : float
        Effective seismic weight W, > 0. [kN]
    response_modification : float
        R of the fixed-base lateral system, > 0. [-]
    period : float, optional
        Fundamental period from analysis; capped at C_u T_a when ``height`` is
        given (§12.8.2). [s]
    height : float, optional
        Structural height, for T_a = C_t h^x. [m]
    frame : str
        Lateral system for T_a (see :func:`approximate_period`). [-]
    importance : float
        Importance factor I_e. [-]
    s1 : float
        Mapped S_1 for Eq. 12.8-6. [g]
    """
    w = validate.positive("weight", weight, "kN")
    sds, sd1, tl, source = design_values(spectrum)
    t_a = approximate_period(height, frame) if height is not None else None
    if period is None:
        if t_a is None:
            raise ValueError("period = None is not allowed without height: give the fixed-base period [s] or the "
                             "height [m]")
        t, how = t_a, f"approximate T_a = C_t h^x, {frame} (ASCE/SEI 7-16 Eq. 12.8-7)"
    else:
        t, how = validate.positive("period", period, "s"), "given"
        if t_a is not None:
            cap = period_upper_limit_factor(sd1) * t_a
            if t > cap:
                t, how = cap, "given, capped at C_u T_a (ASCE/SEI 7-16 §12.8.2, Table 12.8-1 from memory)"
    cs, governs = response_coefficient(sds, sd1, t, response_modification, importance, tl, s1)
    return FixedBaseShear(
        period=t, period_source=how, approximate_period=t_a, response_coefficient=cs,
        governs=governs, weight=w, base_shear=cs * w, sds=sds, sd1=sd1, source=source,
    )
