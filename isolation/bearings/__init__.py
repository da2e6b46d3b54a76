"""Isolator models: backbones, friction pendulums, elastomeric bearings, checks, systems."""

from isolation.bearings.backbone import Bilinear, MultiLinear
from isolation.bearings.checks import Check
from isolation.bearings.damping_rubber import (
    TYPICAL_COMPOUND,
    AmplitudeBackbone,
    HighDampingRubber,
    RubberCompound,
)
from isolation.bearings.double_concave import DoubleConcave
from isolation.bearings.friction import FrictionPendulum
from isolation.bearings.rubber import LeadRubber
from isolation.bearings.system import (
    BearingGroup,
    CombinedBackbone,
    IsolationSystem,
    PropertyBound,
    PropertyFactors,
)
from isolation.bearings.triple_pendulum import TripleFrictionPendulum

__all__ = [
    "Bilinear", "MultiLinear",
    "FrictionPendulum", "DoubleConcave", "TripleFrictionPendulum",
    "LeadRubber", "HighDampingRubber", "RubberCompound", "TYPICAL_COMPOUND", "AmplitudeBackbone",
    "Check",
    "BearingGroup", "IsolationSystem", "PropertyFactors", "PropertyBound", "CombinedBackbone",
]
