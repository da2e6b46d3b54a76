"""Site response spectra and damping modification rules.

Three spectrum shapes share one interface (pseudo-acceleration in g at any
damping ratio through a damping rule):

* :class:`CodeSpectrum` - the two-period spectrum of ASCE/SEI 7-16 §11.4.6
  built from the MCE_R values S_MS, S_M1 and the long-period corner T_L;
  :meth:`CodeSpectrum.design` gives the design level (2/3 of MCE_R).
* :class:`EurocodeSpectrum` - the horizontal elastic spectrum of
  EN 1998-1:2004 §3.2.2.2 (Types 1 and 2, ground types A-E, recommended
  values of Tables 3.2/3.3), to 4 s by default; ``max_period`` extends its
  1/T^2 branch for long isolated periods.
* :class:`TabulatedSpectrum` - user data (site-specific or multi-period
  spectrum), interpolated log-log, refusing periods outside its table.

Every spectrum answers ``sa(period, damping)`` [g], ``sd(period, damping)``
[m], ``rule`` (its default damping rule), ``period_range`` [s] and
``to_dict()``.

Damping rules (:func:`damping_coefficient`): Sa(beta) = Sa(5 %) / B(beta);
they live in :mod:`isolation.site.damping` and are re-exported here with
:data:`RULES` and :func:`eurocode_eta`.

References
----------
ASCE/SEI 7-16, Minimum Design Loads and Associated Criteria for Buildings and
Other Structures, §11.4.6 and Table 17.5-1.
EN 1998-1:2004, Eurocode 8, Part 1, §3.2.2.2 and Tables 3.2/3.3.
AASHTO, Guide Specifications for Seismic Isolation Design (B_L = (beta/0.05)^0.3 <= 1.7).
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any, Mapping

import numpy as np

from isolation import validate
from isolation.codes.damping_rule_names import ASCE7_RULE, EUROCODE_RULE
from isolation.site.damping import RULES, _unwrap, damping_coefficient, eurocode_eta, rules
from isolation.site.spectrum_base import _Spectrum
from isolation.site.tabulated_spectrum import TabulatedSpectrum

EUROCODE_KIND = "eurocode"  # file-format tag of a serialised EN 1998-1 spectrum (not a basis name)

__all__ = [
    "RULES",
    "rules",
    "damping_coefficient",
    "eurocode_eta",
    "CodeSpectrum",
    "EurocodeSpectrum",
    "TabulatedSpectrum",
    "spectrum_from_dict",
]


# EN 1998-1:2004 Tables 3.2 (Type 1) and 3.3 (Type 2), recommended values:
# ground -> (S, T_B, T_C, T_D) with periods in s.
_EC8_PARAMETERS = {
    1: {
        "A": (1.0, 0.15, 0.4, 2.0),
        "B": (1.2, 0.15, 0.5, 2.0),
        "C": (1.15, 0.20, 0.6, 2.0),
        "D": (1.35, 0.20, 0.8, 2.0),
        "E": (1.4, 0.15, 0.5, 2.0),
    },
    2: {
        "A": (1.0, 0.05, 0.25, 1.2),
        "B": (1.35, 0.05, 0.25, 1.2),
        "C": (1.5, 0.10, 0.25, 1.2),
        "D": (1.8, 0.10, 0.30, 1.2),
        "E": (1.6, 0.05, 0.25, 1.2),
    },
}

# Largest max_period EurocodeSpectrum accepts: 10 s is T_F of EN 1998-1 Annex A
# Table A.1 (from memory) and covers motion matching to max(6 s, 1.5 T_M) for
# isolated periods up to about 6.5 s; a larger value is more likely a unit mistake. [s]
_EC8_LONGEST = 10.0


@dataclass(frozen=True)
class CodeSpectrum(_Spectrum):
    """Two-period spectrum of ASCE/SEI 7-16 §11.4.6 at MCE_R (or design) level.

    Parameters
    ----------
    sms : float
        MCE_R short-period spectral acceleration S_MS, > 0. [g]
    sm1 : float
        MCE_R spectral acceleration at 1 s, S_M1, > 0. [g]
    long_period : float
        Long-period transition T_L, > T_S. [s]
    level : str
        ``"MCE_R"`` (ordinates from S_MS, S_M1) or ``"design"`` (2/3 of them). [-]
    max_period : float
        Longest period the spectrum answers for (the formula holds at any
        period; the limit only guards against unit mistakes), > 0. [s]
    rule : str
        Damping rule used by :meth:`sa` by default. [-]

    Notes
    -----
    T_0 = 0.2 S_1/S_S, T_S = S_1/S_S; Sa = S_S (0.4 + 0.6 T/T_0) below T_0,
    S_S up to T_S, S_1/T up to T_L and S_1 T_L/T^2 beyond. Damping other than
    5 % divides the whole curve by B.
    """

    sms: float
    sm1: float
    long_period: float = 8.0
    level: str = "MCE_R"
    max_period: float = 10.0
    rule: str = ASCE7_RULE

    def __post_init__(self) -> None:
        sms = validate.positive("sms", self.sms, "g")
        sm1 = validate.positive("sm1", self.sm1, "g")
        tl = validate.positive("long_period", self.long_period, "s")
        validate.one_of("level", self.level, ("MCE_R", "design"))
        validate.one_of("rule", self.rule, rules())
        if tl <= sm1 / sms:
            raise ValueError(
                f"long_period = {tl!r} is not allowed: must exceed T_S = sm1/sms = {sm1 / sms:g} [s]"
            )
        top = validate.positive("max_period", self.max_period, "s")
        object.__setattr__(self, "sms", sms)
        object.__setattr__(self, "sm1", sm1)
        object.__setattr__(self, "long_period", tl)
        object.__setattr__(self, "max_period", top)

    @classmethod
    def from_design_values(cls, sds: float, sd1: float, long_period: float = 8.0, **kwargs) -> "CodeSpectrum":
        """MCE_R spectrum from design values (S_MS = 1.5 S_DS, S_M1 = 1.5 S_D1).

        Parameters
        ----------
        sds : float
            Design short-period spectral acceleration S_DS, > 0. [g]
        sd1 : float
            Design spectral acceleration at 1 s, S_D1, > 0. [g]
        long_period : float
            Long-period transition T_L. [s]
        """
        sds = validate.positive("sds", sds, "g")
        sd1 = validate.positive("sd1", sd1, "g")
        return cls(1.5 * sds, 1.5 * sd1, long_period, **kwargs)

    def design(self) -> "CodeSpectrum":
        """The design-level spectrum (2/3 of MCE_R, ASCE/SEI 7-16 §11.4.5)."""
        return CodeSpectrum(self.sms, self.sm1, self.long_period, "design", self.max_period, self.rule)

    @property
    def scale(self) -> float:
        """Ordinate factor on the MCE_R values: 1 or 2/3. [-]"""
        return 1.0 if self.level == "MCE_R" else 2.0 / 3.0

    @property
    def sds(self) -> float:
        """Design S_DS = 2/3 S_MS. [g]"""
        return 2.0 / 3.0 * self.sms

    @property
    def sd1(self) -> float:
        """Design S_D1 = 2/3 S_M1. [g]"""
        return 2.0 / 3.0 * self.sm1

    @property
    def t0(self) -> float:
        """T_0 = 0.2 S_M1/S_MS. [s]"""
        return 0.2 * self.sm1 / self.sms

    @property
    def ts(self) -> float:
        """T_S = S_M1/S_MS. [s]"""
        return self.sm1 / self.sms

    @property
    def period_range(self) -> tuple[float, float]:
        return (0.0, self.max_period)

    def _sa5(self, period: np.ndarray) -> np.ndarray:
        ss, s1 = self.scale * self.sms, self.scale * self.sm1
        t = np.asarray(period, dtype=float)
        safe = np.maximum(t, 1e-12)
        return np.select(
            [t < self.t0, t <= self.ts, t <= self.long_period],
            [ss * (0.4 + 0.6 * t / self.t0), np.full_like(t, ss), s1 / safe],
            s1 * self.long_period / safe**2,
        )

    def to_dict(self) -> dict:
        return {
            "kind": "code",
            "sms": self.sms,
            "sm1": self.sm1,
            "long_period": self.long_period,
            "level": self.level,
            "max_period": self.max_period,
            "rule": self.rule,
        }


@dataclass(frozen=True)
class EurocodeSpectrum(_Spectrum):
    """Horizontal elastic spectrum of EN 1998-1:2004 §3.2.2.2 (recommended values).

    Parameters
    ----------
    ag : float
        Reference peak ground acceleration on rock a_gR, > 0. [g]
    ground : str
        Ground type ``"A"``-``"E"`` (Table 3.1). [-]
    spectrum_type : int
        1 (larger magnitudes, Table 3.2) or 2 (Ms <= 5.5, Table 3.3). [-]
    importance : float
        Importance factor gamma_I; design a_g = gamma_I a_gR, > 0. [-]
    rule : str
        Damping rule used by :meth:`sa` by default. [-]
    max_period : float
        Longest period the spectrum answers for, keyword-only,
        4 <= max_period <= 10. The default 4 s is where EN 1998-1 §3.2.2.2
        ends; a larger value extends the T_C T_D/T^2 branch (see Notes). [s]

    Notes
    -----
    Se = a_g S [1 + T/T_B (2.5 eta - 1)] up to T_B, 2.5 a_g S eta up to T_C,
    times T_C/T up to T_D and T_C T_D/T^2 up to 4 s. eta = sqrt(10/(5 + xi))
    >= 0.55 enters the rising branch as written (no reduction at T = 0).
    National Annexes may change the values.

    Beyond 4 s EN 1998-1 refers to the elastic displacement spectrum of its
    informative Annex A (corner periods T_E and T_F), which is **not
    implemented** here. With ``max_period`` above 4 s the T_C T_D/T^2 branch
    simply continues, so Se(T) = Se(4 s) (4/T)^2 and the spectral
    displacement Sd = g Se T^2/(4 pi^2) = 2.5 g a_g S eta T_C T_D/(4 pi^2)
    stays constant at its T_D..4 s level. From memory (Annex A not re-read):
    Annex A keeps that constant displacement up to T_E and then lets it fall
    towards the peak ground displacement d_g at T_F, so the extension equals
    Annex A up to T_E and lies on the conservative (larger displacement) side
    beyond T_E. For a site-specific or Annex A displacement spectrum use a
    :class:`TabulatedSpectrum`.
    """

    ag: float
    ground: str = "C"
    spectrum_type: int = 1
    importance: float = 1.0
    rule: str = field(default=EUROCODE_RULE)
    max_period: float = field(default=4.0, kw_only=True)

    def __post_init__(self) -> None:
        ag = validate.positive("ag", self.ag, "g")
        validate.one_of("ground", self.ground, tuple("ABCDE"))
        validate.one_of("spectrum_type", self.spectrum_type, (1, 2))
        importance = validate.positive("importance", self.importance, "-")
        validate.one_of("rule", self.rule, rules())
        top = validate.in_range("max_period", self.max_period, 4.0, _EC8_LONGEST, "s")
        object.__setattr__(self, "ag", ag)
        object.__setattr__(self, "importance", importance)
        object.__setattr__(self, "max_period", top)

    @property
    def design_ag(self) -> float:
        """Design ground acceleration a_g = gamma_I a_gR on ground type A. [g]"""
        return self.importance * self.ag

    @property
    def parameters(self) -> tuple[float, float, float, float]:
        """(S [-], T_B [s], T_C [s], T_D [s]) for this ground and spectrum type."""
        return _EC8_PARAMETERS[self.spectrum_type][self.ground]

    @property
    def period_range(self) -> tuple[float, float]:
        return (0.0, self.max_period)

    def _range_hint(self) -> str:
        if self.max_period >= _EC8_LONGEST:
            return ""
        return (f"; EN 1998-1 §3.2.2.2 ends at 4 s: pass max_period (up to {_EC8_LONGEST:g} s) "
                "to extend the T_C T_D/T^2 branch")

    def _shape(self, t: np.ndarray, eta) -> np.ndarray:
        soil, tb, tc, td = self.parameters
        ag = self.design_ag
        safe = np.maximum(t, 1e-12)
        plateau = 2.5 * ag * soil * eta
        return np.select(
            [t < tb, t <= tc, t <= td],
            [ag * soil * (1.0 + t / tb * (2.5 * eta - 1.0)), plateau * np.ones_like(t), plateau * tc / safe],
            plateau * tc * td / safe**2,
        )

    def _sa5(self, period: np.ndarray) -> np.ndarray:
        return self._shape(np.asarray(period, dtype=float), 1.0)

    def sa(self, period, damping=0.05, *, rule: str | None = None):
        """Elastic spectral acceleration Se.

        Parameters
        ----------
        period : float or array
            Natural period, 0 <= T <= ``max_period`` (4 s by default). [s]
        damping : float or array
            Viscous damping ratio. [-]
        rule : str, optional
            Damping rule; with ``"eurocode"`` (default) eta enters as in
            §3.2.2.2, any other rule divides the 5 % curve by B.

        Returns
        -------
        float or array
            Pseudo-acceleration. [g]
        """
        chosen = self.rule if rule is None else validate.one_of("rule", rule, rules())
        if chosen != EUROCODE_RULE:
            return super().sa(period, damping, rule=chosen)
        t = self._periods(period)
        return _unwrap(np.asarray(self._shape(t, np.asarray(eurocode_eta(damping))), dtype=float))

    def to_dict(self) -> dict:
        return {
            "kind": EUROCODE_KIND,
            "ag": self.ag,
            "ground": self.ground,
            "spectrum_type": int(self.spectrum_type),
            "importance": self.importance,
            "rule": self.rule,
            "max_period": self.max_period,
        }


_KINDS: dict[str, type[CodeSpectrum | EurocodeSpectrum | TabulatedSpectrum]] = {
    "code": CodeSpectrum, EUROCODE_KIND: EurocodeSpectrum, "tabulated": TabulatedSpectrum}


def spectrum_from_dict(mapping: Mapping[str, Any]):
    """Rebuild a spectrum from its ``to_dict()`` form.

    Parameters
    ----------
    mapping : mapping
        ``{"kind": "code" | "eurocode" | "tabulated", ...constructor fields}``.

    Returns
    -------
    CodeSpectrum, EurocodeSpectrum or TabulatedSpectrum
    """
    if not isinstance(mapping, Mapping):
        raise ValueError(f"spectrum = {mapping!r} is not allowed: must be a mapping with a 'kind' key")
    kind = validate.one_of("spectrum.kind", mapping.get("kind"), tuple(_KINDS))
    cls = _KINDS[kind]
    allowed = [f for f in cls.__dataclass_fields__]
    fields = {k: v for k, v in mapping.items() if k != "kind"}
    unknown = sorted(set(fields) - set(allowed))
    if unknown:
        raise ValueError(
            f"spectrum.{unknown[0]} is not allowed for kind {kind!r}: known keys are {', '.join(allowed)}"
        )
    return cls(**fields)
