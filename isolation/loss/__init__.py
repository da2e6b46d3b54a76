"""Is isolation worth it? Expected loss, downtime and the owner's economics.

One module per concern: :mod:`~isolation.loss.hazard` (hazard curves and the
annual rate of a lognormal damage state), :mod:`~isolation.loss.fragility`
(storey component fragilities, irreparability, collapse screen, with their
published sources), :mod:`~isolation.loss.consequences` (repair-cost ratios and
repair times by occupancy), :mod:`~isolation.loss.costs` (isolation cost,
superstructure saving, NPV, payback), :mod:`~isolation.loss.simulation`
(seeded Monte Carlo at one intensity), :mod:`~isolation.loss.analysis`
(levels, histories, annual figures) and :mod:`~isolation.loss.inputs` (the
study file's ``[cost]``, ``[hazard]`` and ``[loss]`` tables).

Scope: an order-of-magnitude screening for a feasibility study, not an
insurance estimate; costs are to be confirmed by a cost consultant.
"""

from isolation.loss.analysis import CAUTIONS, case_loss, economics, expected_annual, run_loss
from isolation.loss.consequences import OCCUPANCIES, Occupancy
from isolation.loss.costs import CostInputs, annuity_factor, net_present_value, payback_years
from isolation.loss.fragility import Fragility
from isolation.loss.hazard import HazardCurve, PowerLawHazard, annual_rate, default_hazard, rate_from_probability
from isolation.loss.inputs import HazardInputs, LossInputs, LossOptions
from isolation.loss.simulation import Demands, LossModel, simulate

__all__ = ["PowerLawHazard", "HazardCurve", "annual_rate", "default_hazard", "rate_from_probability", "Fragility",
           "Occupancy", "OCCUPANCIES", "CostInputs", "annuity_factor", "net_present_value", "payback_years",
           "Demands", "LossModel", "simulate", "expected_annual", "case_loss", "economics", "run_loss",
           "LossInputs", "HazardInputs", "LossOptions", "CAUTIONS"]
