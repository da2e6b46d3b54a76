"""Isolator models: backbones, one module per bearing type, checks, the bearing registry, systems.

Importing this package registers every bearing type of the package
(:mod:`isolation.bearings.registry`).
"""

# Each bearing module registers its type on import; this order is the order study messages list them in.
from isolation.bearings import friction, double_concave, triple_pendulum, rubber, damping_rubber  # noqa: I001, F401
from isolation.bearings import registry
from isolation.bearings.backbone import Bilinear, CombinedBackbone, MultiLinear
from isolation.bearings.checks import Check
from isolation.bearings.damping_rubber import (
    TYPICAL_COMPOUND,
    AmplitudeBackbone,
    HighDampingRubber,
    RubberCompound,
)
from isolation.bearings.double_concave import DoubleConcave
from isolation.bearings.factors import PropertyBound, PropertyFactors
from isolation.bearings.friction import FrictionPendulum
from isolation.bearings.registry import BearingType, bearing_type, register
from isolation.bearings.rubber import LeadRubber
from isolation.bearings.system import BearingGroup, IsolationSystem
from isolation.bearings.triple_pendulum import TripleFrictionPendulum

__all__ = [
    "Bilinear", "MultiLinear",
    "FrictionPendulum", "DoubleConcave", "TripleFrictionPendulum",
    "LeadRubber", "HighDampingRubber", "RubberCompound", "TYPICAL_COMPOUND", "AmplitudeBackbone",
    "Check",
    "BearingGroup", "IsolationSystem", "PropertyFactors", "PropertyBound", "CombinedBackbone",
    "BearingType", "bearing_type", "register", "registry",
]
