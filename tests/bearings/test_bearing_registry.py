"""The bearing registry: the contract every type meets, and a type added by one module (here: the test).

Sources
-------
- Naeim & Kelly (1999), Design of Seismic Isolated Structures, Ch. 2 (from memory): a bilinear
  isolator has K_eff = K_d + Q_d/D and EDC = 4 Q_d (D - D_y), beta_eff = EDC/(2 pi K_eff D^2);
  its force stays between the post-yield lines K_d u - Q_d and K_d u + Q_d.
- ASCE/SEI 7-16 Eq. 17.5-1 D_M = g S_M1 T_M/(4 pi^2 B_M) (the 1/T branch of the MCE_R spectrum,
  §11.4.6, for T_S < T <= T_L), Eq. 17.5-2 T_M = 2 pi sqrt(W/(K_M g)) and Table 17.5-1 B_M
  (2 %: 0.8, 5 %: 1.0, 10 %: 1.2, 20 %: 1.5, 30 %: 1.7, linear between rows), all from memory.
"""

from __future__ import annotations

import dataclasses
import math
from dataclasses import dataclass

import numpy as np
import pytest

from isolation import GRAVITY, validate
from isolation.bearings import (
    BearingGroup,
    Bilinear,
    Check,
    DoubleConcave,
    FrictionPendulum,
    HighDampingRubber,
    IsolationSystem,
    LeadRubber,
    TripleFrictionPendulum,
    registry,
)
from isolation.bearings.laws import backbone_law
from isolation.dynamics.isolators import isolator_law
from isolation.schema import Key, Ordering

TOY = "toy_spring_damper"


@dataclass(frozen=True)
class ToySpringDamper:
    """A rubber spring beside a yielding steel damper: bilinear, independent of the axial load."""

    post_yield_stiffness: float
    characteristic_strength: float
    yield_displacement: float
    displacement_capacity: float | None = None

    def __post_init__(self) -> None:
        validate.positive("post_yield_stiffness", self.post_yield_stiffness, "kN/m")
        validate.positive("characteristic_strength", self.characteristic_strength, "kN")
        validate.positive("yield_displacement", self.yield_displacement, "m")

    def backbone(self, weight=None) -> Bilinear:
        kd, q = self.post_yield_stiffness, self.characteristic_strength
        return Bilinear(kd + q / self.yield_displacement, kd, q)

    def checks(self, axial_load, displacement, *, axial_load_max=None, axial_load_min=None, rotation=0.0,
               weight_share=None):
        if self.displacement_capacity is None:
            return []
        return [Check("displacement capacity", displacement, self.displacement_capacity,
                      bool(displacement <= self.displacement_capacity), "m", "toy bearing of this test")]

    def to_dict(self) -> dict:
        return {"kind": TOY, **dataclasses.asdict(self)}


TOY_KEYS = {
    "post_yield_stiffness": Key("stiffness", low=10.0, high=1e5),
    "characteristic_strength": Key("force", low=0.0, high=5000.0, low_inclusive=False),
    "yield_displacement": Key("length", low=0.001, high=0.2),
    "displacement_capacity": Key("length", required=False, low=0.0, high=3.0, low_inclusive=False),
}


@pytest.fixture
def toy_type():
    entry = registry.register(registry.BearingType(
        kind=TOY, model=ToySpringDamper, keys=TOY_KEYS,
        cross_checks=(Ordering("yield_displacement", "displacement_capacity", "m"),)))
    try:
        yield entry
    finally:
        registry.unregister(TOY)


# per bearing: K_d 600 kN/m, Q_d 100 kN, D_y 15 mm; 30 bearings
STUDY = """
units = "SI"

[project]
name = "Registry test building (invented)"
client = "Invented client"
prepared_by = "Test"
revision = "A"
date = 2026-12-01

[code]
basis = "asce7"

[site]
sms = 1.50
sm1 = 0.80
long_period = "8 s"
s1 = 0.53
site_class = "C"

[building]
storeys = 4
floor_weights = ["10500 kN", "10500 kN", "10500 kN", "8200 kN"]
base_weight = "12000 kN"
storey_heights = ["4.5 m", "4.0 m", "4.0 m", "4.0 m"]
lateral_system = "concentrically_braced_frame"
response_modification = 6
importance = 1.0
plan_length = "42 m"
plan_width = "28 m"
eccentricity = "0.5 m"

[analysis]
suite_size = 7
seed = 7
duration = "30 s"
time_step = "0.005 s"

[[alternative]]
name = "Spring and damper"
moat = "0.9 m"

[alternative.property_factors]
lower = 0.85
upper = 1.2

[[alternative.bearings]]
type = "toy_spring_damper"
count = 30
post_yield_stiffness = "600 kN/m"
characteristic_strength = "100 kN"
yield_displacement = "15 mm"
displacement_capacity = "0.8 m"
"""


def _b_m(beta: float) -> float:
    # ASCE/SEI 7-16 Table 17.5-1 (from memory), linear between rows
    return float(np.interp(beta, [0.02, 0.05, 0.10, 0.20, 0.30, 0.40, 0.50], [0.8, 1.0, 1.2, 1.5, 1.7, 1.9, 2.0]))


def test_a_type_registered_in_a_test_runs_a_study_through_check_design_and_history(toy_type, tmp_path, capsys):
    from isolation.app.cli import main
    from isolation.dynamics.history import run_cases
    from isolation.study import BEARING_KEYS, load_study
    from isolation.study.assembly import (
        design_alternative,
        fixed_base_period,
        history_isolator,
        isolation_system,
        site_spectrum,
        superstructure,
    )

    assert BEARING_KEYS[TOY] is toy_type.keys  # the study schema reads the registry
    path = tmp_path / "toy.toml"
    path.write_text(STUDY, encoding="utf-8")
    assert main(["check", str(path)]) == 0  # schema, assembly and the code design of `check`
    assert "valid" in capsys.readouterr().out

    study = load_study(path)
    system = isolation_system(study.alternatives[0])
    bearing = system.groups[0].bearing
    assert isinstance(bearing, ToySpringDamper) and not system.is_sliding
    assert bearing.post_yield_stiffness == pytest.approx(600.0)
    assert system.groups[0].name == "group 1 (toy spring damper)"

    weight = study.building.total_weight
    spectrum = site_spectrum(study)
    t_fb, _ = fixed_base_period(study)
    report, quantities, _, _ = design_alternative(study, system.property_sets(weight), system, spectrum, t_fb)
    results = report.bounds.results
    for case, factor in (("lower", 0.85), ("nominal", 1.0), ("upper", 1.2)):
        r = results[case]
        kd, q, dy = 30 * 600.0 * factor, 30 * 100.0 * factor, 0.015
        d = r.displacement
        k_eff = kd + q / d  # Naeim & Kelly 1999
        beta = 4.0 * q * (d - dy) / (2.0 * math.pi * k_eff * d**2)
        period = 2.0 * math.pi * math.sqrt(weight / (k_eff * GRAVITY))  # ASCE 7-16 Eq. 17.5-2
        assert r.stiffness == pytest.approx(k_eff, rel=1e-9)
        assert r.damping == pytest.approx(beta, rel=1e-9)
        assert r.period == pytest.approx(period, rel=1e-9)
        assert 0.8 / 1.5 < period < 8.0  # on the 1/T branch of the spectrum
        # ASCE 7-16 Eq. 17.5-1 with S_a = S_M1/T: the design displacement is its fixed point
        assert d == pytest.approx(GRAVITY * 0.8 * period / (4.0 * math.pi**2 * _b_m(beta)), rel=1e-3)
    assert results["lower"].displacement > results["nominal"].displacement > results["upper"].displacement
    assert quantities["displacement"] is not None
    checks = system.checks(results["lower"].displacement)
    assert any(c.name == "group 1 (toy spring damper): displacement capacity" for c in checks)

    # a short response history: the law comes from the registry (the default: the backbone's)
    law = history_isolator(system.property_sets(weight)["nominal"], results["nominal"], system, "nominal")
    assert law == Bilinear(30 * (600.0 + 100.0 / 0.015), 30 * 600.0, 30 * 100.0)
    plane = ToySpringDamper(30 * 600.0, 30 * 100.0, 0.015)
    assert isolator_law(plane, weight) == backbone_law(law)
    structure = superstructure(study)
    t = np.arange(0.0, 6.0, 0.01)
    motion = np.where(t < 2.0, 0.35 * np.sin(2.0 * math.pi * t / 2.0), 0.0)  # g
    histories = run_cases(structure, study.building.base_weight / GRAVITY, {"toy": plane, "law": law}, motion,
                          0.01, include_fixed=False)
    u, force = histories["toy"].isolator_displacement, histories["toy"].isolator_force
    np.testing.assert_array_equal(u, histories["law"].isolator_displacement)
    assert np.max(np.abs(u)) > 0.05  # it yields and slides well past D_y
    # bilinear loop between the post-yield lines K_d u -/+ Q_d (Naeim & Kelly 1999)
    kd, q = 30 * 600.0, 30 * 100.0
    assert np.all(np.abs(np.asarray(force) - kd * np.asarray(u)) <= q * (1.0 + 1e-9))


def test_a_registered_type_is_checked_between_keys_and_gone_after_unregistering(toy_type, tmp_path):
    from isolation.errors import InputError
    from isolation.study import BEARING_KEYS, load_study

    path = tmp_path / "toy.toml"
    path.write_text(STUDY.replace('displacement_capacity = "0.8 m"', 'displacement_capacity = "10 mm"'),
                    encoding="utf-8")
    with pytest.raises(InputError, match=r"alternative\[0\]\.bearings\[0\]\.yield_displacement = 0\.015 m is "
                                         r"not allowed: must be < displacement_capacity = 0\.01 m"):
        load_study(path)
    registry.unregister(TOY)
    try:
        assert TOY not in BEARING_KEYS
        with pytest.raises(InputError, match=r"type = 'toy_spring_damper' is not allowed: must be one of "
                                             r"'friction_pendulum', "):
            load_study(path)
    finally:
        registry.register(toy_type)


@pytest.mark.parametrize("bearing, kind, sliding", [
    (FrictionPendulum(3.0, 0.05), "friction_pendulum", True),
    (DoubleConcave(2.0, 0.04, 2.0, 0.06), "double_concave", True),
    (TripleFrictionPendulum(3.0, 0.5, 0.02, 0.05, 0.08), "triple_pendulum", True),
    (LeadRubber(0.8, 0.14, 0.008, 32, 400.0), "lead_rubber", False),
    (HighDampingRubber(0.8, 0.008, 32), "high_damping_rubber", False),
])
def test_each_package_type_meets_the_contract(bearing, kind, sliding):
    entry = registry.entry_of(bearing)
    assert entry.kind == kind == bearing.to_dict()["kind"]
    assert entry.sliding is sliding is registry.is_sliding(bearing)
    assert isinstance(bearing, registry.Bearing)
    # every study key is a keyword of the class, so build(values) is the constructor
    assert set(entry.keys) <= {f.name for f in dataclasses.fields(entry.model)}
    assert any(key.required for key in entry.keys.values())
    if sliding:  # property factors act on friction only; forces scale with the axial load
        assert type(bearing.with_friction_factor(1.1)) is type(bearing)
        for w in (100.0, 250.0):
            np.testing.assert_allclose(isolator_law(bearing, w).linear_stiffness,
                                       w * isolator_law(bearing, 1.0).linear_stiffness, rtol=1e-12)


def test_the_registry_refuses_what_it_does_not_know():
    with pytest.raises(ValueError, match=r"^type = 'slab' is not allowed: must be one of 'friction_pendulum'"):
        registry.bearing_type("slab")
    with pytest.raises(ValueError, match=r"^bearing = 'slab' is not allowed: must be one of FrictionPendulum"):
        BearingGroup("slab", 4, 1000.0)
    assert registry.type_of(Bilinear(1000.0, 100.0, 10.0)) is None and not registry.is_sliding("slab")
    with pytest.raises(ValueError, match=r"^kind = 'friction_pendulum' is not allowed: a bearing type of that name"):
        registry.register(registry.BearingType("friction_pendulum", ToySpringDamper, TOY_KEYS))
    with pytest.raises(ValueError, match=r"it has no with_friction_factor"):
        registry.BearingType("toy_slider", ToySpringDamper, TOY_KEYS, sliding=True)
    with pytest.raises(ValueError, match=r"^kind = 'Toy Slider' is not allowed"):
        registry.BearingType("Toy Slider", ToySpringDamper, TOY_KEYS)
    with pytest.raises(ValueError, match=r"^keys\['radius'\] = 3 is not allowed"):
        registry.BearingType("toy", ToySpringDamper, {"radius": 3})
    with pytest.raises(ValueError, match=r"^type = 'toy' is not allowed"):
        registry.unregister("toy")


def test_an_amplitude_dependent_type_without_a_history_law_says_what_to_run():
    hdr = HighDampingRubber(0.8, 0.008, 32)
    with pytest.raises(ValueError, match=r"high damping rubber bearing's backbone is not piecewise linear"):
        isolator_law(hdr, 1000.0)
    system = IsolationSystem([BearingGroup(hdr, 4, 1000.0)])
    assert not system.is_sliding


@pytest.mark.slow
def test_a_registered_type_runs_a_whole_quick_study(toy_type, tmp_path):
    from isolation.study import load_study
    from isolation.study.runner import run_study

    path = tmp_path / "toy.toml"
    path.write_text(STUDY, encoding="utf-8")
    data = run_study(load_study(path), quick=True).to_dict()
    alternative = data["alternatives"][0]
    assert alternative["system"]["groups"][0]["bearing"]["kind"] == TOY
    assert alternative["system"]["is_sliding"] is False
    design = alternative["bounds"]["lower"]["displacement"]
    history = alternative["history"]["summary"]["isolator_displacement_lower"]
    # the suite is matched to the design spectrum, so the mean peak is of the order of the design
    # displacement (common practice: within a factor of 2 for a bilinear isolator)
    assert 0.5 * design < history < 2.0 * design
