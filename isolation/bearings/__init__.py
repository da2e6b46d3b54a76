"""Isolator models: backbones, friction pendulums, elastomeric bearings, checks, systems."""

from isolation.bearings.backbone import Bilinear, MultiLinear

__all__ = ["Bilinear", "MultiLinear"]
