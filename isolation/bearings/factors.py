"""Property modification factors: lower and upper bounds on each bearing property.

Lower-bound, nominal and upper-bound property sets apply factors lambda to each
property (ASCE/SEI 7-16 §17.2.8.4):

    lambda_max = (1 + 0.75 (lambda_ae,max - 1)) lambda_test,max lambda_spec,max
    lambda_min = (1 - 0.75 (1 - lambda_ae,min)) lambda_test,min lambda_spec,min

(form from memory of the standard; verify the clause before quoting it).

* Elastomeric bearings: ``stiffness`` scales K_d (and K_u with it), ``strength``
  scales Q_d.
* Sliding bearings: ``friction`` scales the coefficients of friction; the
  post-yield stiffness W/R is geometry and is not factored.
"""

from __future__ import annotations

from dataclasses import dataclass, field

from isolation import validate

__all__ = ["PropertyBound", "PropertyFactors", "UNQUALIFIED_LOWER", "UNQUALIFIED_UPPER", "CASES"]

UNQUALIFIED_LOWER = 0.6
"""Default lambda_min for bearings without qualification data (from memory of ASCE/SEI 7-16 §17.2.8.4). [-]"""
UNQUALIFIED_UPPER = 1.8
"""Default lambda_max for bearings without qualification data (from memory of ASCE/SEI 7-16 §17.2.8.4). [-]"""

CASES = ("lower", "nominal", "upper")


@dataclass(frozen=True)
class PropertyBound:
    """Lower and upper property modification factors of one property.

    Parameters
    ----------
    lower : float
        lambda_min, in (0, 1]. Default 1. [-]
    upper : float
        lambda_max, >= 1 and finite. Default 1. [-]
    """

    lower: float = 1.0
    upper: float = 1.0

    def __post_init__(self) -> None:
        object.__setattr__(self, "lower", validate.in_range("lower", self.lower, 0.0, 1.0, "-",
                                                            low_inclusive=False))
        upper = validate.finite("upper", self.upper, "-")
        if upper < 1.0:
            raise ValueError(f"upper = {self.upper!r} is not allowed: must be a finite number >= 1 [-]")
        object.__setattr__(self, "upper", upper)

    @classmethod
    def from_factors(cls, *, aging_max=1.0, aging_min=1.0, test_max=1.0, test_min=1.0,
                     spec_max=1.0, spec_min=1.0, adjustment=0.75) -> "PropertyBound":
        """Combine component factors into lambda_min and lambda_max (ASCE/SEI 7-16 §17.2.8.4, from memory).

        Parameters
        ----------
        aging_max, aging_min : float
            Aging and environment factors lambda_ae (max >= 1, min in (0, 1]). [-]
        test_max, test_min : float
            Testing factors lambda_test (max >= 1, min in (0, 1]). [-]
        spec_max, spec_min : float
            Specification tolerance lambda_spec (max >= 1, min in (0, 1]);
            1.15/0.85 is common practice. [-]
        adjustment : float, optional
            Share of the aging factor counted, in [0, 1]; 0.75 for most
            buildings, 1.0 for essential facilities (from memory). [-]
        """
        a = validate.in_range("adjustment", adjustment, 0.0, 1.0, "-")
        maxima = {"aging_max": aging_max, "test_max": test_max, "spec_max": spec_max}
        minima = {"aging_min": aging_min, "test_min": test_min, "spec_min": spec_min}
        for name, value in maxima.items():
            number = validate.finite(name, value, "-")
            if number < 1.0:
                raise ValueError(f"{name} = {value!r} is not allowed: must be a finite number >= 1 [-]")
            maxima[name] = number
        for name, value in minima.items():
            minima[name] = validate.in_range(name, value, 0.0, 1.0, "-", low_inclusive=False)
        upper = (1.0 + a * (maxima["aging_max"] - 1.0)) * maxima["test_max"] * maxima["spec_max"]
        lower = (1.0 - a * (1.0 - minima["aging_min"])) * minima["test_min"] * minima["spec_min"]
        return cls(lower, upper)

    def factor(self, case: str) -> float:
        """The factor for "lower", "nominal" or "upper". [-]"""
        validate.one_of("case", case, CASES)
        return {"lower": self.lower, "nominal": 1.0, "upper": self.upper}[case]

    def to_dict(self) -> dict:
        return {"lower": self.lower, "upper": self.upper}


def _bound(name, value) -> PropertyBound:
    if isinstance(value, PropertyBound):
        return value
    if isinstance(value, (tuple, list)) and len(value) == 2:
        return PropertyBound(*value)
    raise ValueError(f"{name} = {value!r} is not allowed: must be a PropertyBound or a pair (lower, upper)")


@dataclass(frozen=True)
class PropertyFactors:
    """Property modification factors for each property of a bearing type.

    Parameters
    ----------
    stiffness : PropertyBound or (lower, upper)
        Factors on the post-yield stiffness K_d (elastomers). [-]
    strength : PropertyBound or (lower, upper)
        Factors on the characteristic strength Q_d (elastomers). [-]
    friction : PropertyBound or (lower, upper)
        Factors on the coefficient of friction (sliders). [-]
    """

    stiffness: PropertyBound = field(default_factory=PropertyBound)
    strength: PropertyBound = field(default_factory=PropertyBound)
    friction: PropertyBound = field(default_factory=PropertyBound)

    def __post_init__(self) -> None:
        for name in ("stiffness", "strength", "friction"):
            object.__setattr__(self, name, _bound(name, getattr(self, name)))

    @classmethod
    def unqualified(cls) -> "PropertyFactors":
        """Default bounds 0.6/1.8 on every property for unqualified bearings (from memory)."""
        bound = PropertyBound(UNQUALIFIED_LOWER, UNQUALIFIED_UPPER)
        return cls(bound, bound, bound)

    @classmethod
    def nominal_only(cls) -> "PropertyFactors":
        """All factors 1: the three property sets coincide."""
        return cls()

    def to_dict(self) -> dict:
        return {"stiffness": self.stiffness.to_dict(), "strength": self.strength.to_dict(),
                "friction": self.friction.to_dict()}
