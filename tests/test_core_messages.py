"""Bad input to the numeric core: every ValueError names the parameter and its unit.

The package rule (DEVELOPERS.md, "Bad input"): a clear ValueError naming the field, the
value and what is allowed, with the unit in brackets; and every public parameter's
docstring states its unit in brackets (numpydoc). These tests hold the two together
without restating either: the expected field is the parameter's name in the signature
(or the dataclass field), the expected unit is the one in the numpydoc "Parameters"
section of the same object's docstring. Each parameter is made invalid in turn (NaN for
numbers, an unknown word for choices) with every other argument valid.
"""

from __future__ import annotations

import inspect
import math
import re

import numpy as np
import pytest

from isolation.bearings import backbone as _bb
from isolation.bearings import checks as _ck
from isolation.bearings import damping_rubber as _dr
from isolation.bearings import double_concave as _dc
from isolation.bearings import friction as _fr
from isolation.bearings import rubber as _ru
from isolation.bearings import system as _sy
from isolation.bearings import triple_pendulum as _tp
from isolation.codes import asce7_fixed_base as fixed_base
from isolation.codes import eurocode as design_eurocode
from isolation.codes.asce7 import ElfBuilding
from isolation.design import overturning
from isolation.site import damping
from isolation.site.spectra import CodeSpectrum, EurocodeSpectrum, TabulatedSpectrum
from isolation.verdict import sources as verdict_sources

_SECTION = re.compile(r"^([A-Z][A-Za-z ]+)\n-{3,}$", re.M)


def documented_units(obj) -> dict[str, str]:
    """Parameter name -> the unit in the last [...] of its numpydoc description."""
    doc = inspect.getdoc(obj) or ""
    heads = list(_SECTION.finditer(doc))
    units: dict[str, str] = {}
    for i, head in enumerate(heads):
        if head.group(1) not in ("Parameters", "Other Parameters"):
            continue
        end = heads[i + 1].start() if i + 1 < len(heads) else len(doc)
        names: list[str] = []
        text: list[str] = []
        for line in doc[head.end():end].splitlines() + ["x : end"]:
            if line and not line[0].isspace() and " : " in line:
                found = re.findall(r"\[([^\[\]]+)\]", " ".join(text))
                for name in names:
                    if found:
                        units[name] = found[-1]
                names = [n.strip().lstrip("*") for n in line.split(" : ")[0].split(",")]
                text = []
            else:
                text.append(line)
    return units


def refuses(call, valid: dict, name: str, bad, unit: str | None, field: str | None = None) -> str:
    """Call with ``name`` set to ``bad``: the ValueError names the field (``field``, default the
    parameter's name), the value and the unit."""
    kwargs = dict(valid, **{name: bad})
    with pytest.raises(ValueError) as caught:
        call(**kwargs)
    message = str(caught.value)
    assert re.match(rf"{re.escape(field or name)}(\[\d+\])? = ", message), message
    assert "is not allowed: must be" in message, message
    if unit is not None:
        assert message.endswith(f" [{unit}]"), (message, unit)
    return message


def probe_all(call, valid: dict, *, choices: tuple[str, ...] = (), skip: tuple[str, ...] = (),
              unitless: tuple[str, ...] = (), fields: dict | None = None):
    """Every documented numeric parameter in ``valid`` refused as NaN (message with its documented
    unit; for a sequence, NaN in its second entry and the index in the message), every parameter
    in ``choices`` refused as an unknown word (message listing the choices). ``unitless``: integer
    counts whose message says "an integer" instead of a unit. ``fields``: parameter -> the field
    name its message uses instead (a bearing property passed through a helper)."""
    fields = fields or {}
    units = documented_units(call)
    probed = 0
    for name, value in valid.items():
        if name in skip or name in choices:
            continue
        if isinstance(value, tuple) and len(value) > 1 and all(isinstance(v, float) for v in value):
            bad = value[:1] + (math.nan,) + value[2:]
            message = refuses(call, valid, name, bad, units[name], fields.get(name))
            assert message.startswith(f"{fields.get(name, name)}[1] = nan"), message
            probed += 1
            continue
        if isinstance(value, bool) or not isinstance(value, (int, float)):
            continue
        assert name in units, f"{getattr(call, '__name__', call)}: no unit documented for {name}"
        refuses(call, valid, name, math.nan, None if name in unitless else units[name], fields.get(name))
        probed += 1
    for name in choices:
        message = refuses(call, valid, name, "no-such-choice", None)
        assert repr(valid[name]) in message, message      # the allowed values are listed
        probed += 1
    assert probed, "nothing probed"


SPECTRUM = CodeSpectrum(sms=1.5, sm1=0.9, long_period=8.0)


def test_documented_units_reads_numpydoc():
    def sample(a, b, c):
        """Doc.

        Parameters
        ----------
        a, b : float
            Two values,
            over two lines. [kN]
        c : str
            No unit here.

        Returns
        -------
        float
            Something. [m]
        """
    assert documented_units(sample) == {"a": "kN", "b": "kN"}


# --- fixed_base (ASCE/SEI 7-16 §12.8) ------------------------------------------------------

def test_fixed_base_messages():
    probe_all(fixed_base.approximate_period, {"height": 12.0, "frame": "steel_moment"}, choices=("frame",))
    probe_all(fixed_base.period_upper_limit_factor, {"sd1": 0.3})
    probe_all(fixed_base.response_coefficient,
              {"sds": 1.0, "sd1": 0.6, "period": 1.0, "response_modification": 8.0, "importance": 1.0,
               "long_period": 8.0, "s1": 0.7})
    units = documented_units(fixed_base.fixed_base_shear)
    valid = {"spectrum": SPECTRUM, "weight": 1000.0, "response_modification": 8.0, "period": 0.5,
             "height": 12.0, "frame": "steel_moment", "importance": 1.0, "s1": 0.7}
    for name in ("weight", "response_modification", "period", "height", "importance", "s1"):
        refuses(fixed_base.fixed_base_shear, valid, name, math.nan, units[name])
    refuses(fixed_base.fixed_base_shear, valid, "frame", "no-such-choice", None)
    # Without period and height there is nothing to take T from: the message names both.
    with pytest.raises(ValueError, match=r"^period = None is not allowed without height: .*\[s\].*\[m\]"):
        fixed_base.fixed_base_shear(SPECTRUM, 1000.0, 8.0)


# --- ASCE/SEI 7-16 Ch. 17 and EN 1998-1 §10.9 building data -----------------------------------

def test_elf_building_messages():
    valid = dict(base_weight=2000.0, floor_weights=(3000.0, 3000.0, 2000.0), floor_elevations=(4.0, 8.0, 12.0),
                 plan_length=40.0, plan_width=20.0, response_modification=8.0, eccentricity=1.0,
                 corner_distance=21.0, torsion_period_ratio=1.0, isolator_kind="sliding", fixed_base_period=0.5,
                 frame="steel_moment", importance=1.25, wind_base_shear=500.0, activation_force=900.0, s1=0.5,
                 site_class="C", height=13.0, moat_clearance=0.05)
    probe_all(ElfBuilding, valid, choices=("isolator_kind", "frame", "site_class"))
    message = refuses(ElfBuilding, valid, "irregular", "yes", None)
    assert "True" in message and "False" in message


def test_eurocode_messages():
    valid = dict(weight=10000.0, superstructure_period=0.4, plan_length=30.0, plan_width=20.0, eccentricity=1.0,
                 corner_distance=16.0, storeys=3, behaviour_factor=3.9, isolated_behaviour_factor=1.2,
                 displacement_amplification=1.2, fault_distance=20.0, vertical_stiffness_ratio=800.0,
                 superstructure_weight=7000.0)
    probe_all(design_eurocode.EurocodeBuilding, valid, unitless=("storeys",))
    message = refuses(design_eurocode.EurocodeBuilding, valid, "storeys", 0, None)
    assert "integer >= 1" in message
    refuses(design_eurocode.EurocodeBuilding, valid, "regular", "yes", None)
    spectrum = EurocodeSpectrum(0.3, "C")
    probe_all(design_eurocode.eurocode_approximate_period, {"height": 12.0, "frame": "steel_moment"},
              choices=("frame",))
    units = documented_units(design_eurocode.eurocode_design_spectrum)
    valid = {"spectrum": spectrum, "period": 1.0, "behaviour_factor": 3.9, "lower_bound": 0.2}
    for name in ("period", "behaviour_factor", "lower_bound"):
        refuses(design_eurocode.eurocode_design_spectrum, valid, name, math.nan, units[name])
    units = documented_units(design_eurocode.eurocode_fixed_base_shear)
    valid = {"spectrum": spectrum, "weight": 7000.0, "behaviour_factor": 3.9, "period": 0.4, "storeys": 3}
    for name in ("weight", "period", "storeys"):
        refuses(design_eurocode.eurocode_fixed_base_shear, valid, name, math.nan, units[name])


# --- site spectra and damping ------------------------------------------------------------------

def test_spectrum_messages():
    probe_all(CodeSpectrum, dict(sms=1.5, sm1=0.9, long_period=8.0, level="design", max_period=10.0,
                                 rule="eurocode"), choices=("level", "rule"))
    probe_all(EurocodeSpectrum, dict(ag=0.3, ground="B", spectrum_type=2, importance=1.2, rule="asce7",
                                     max_period=6.0), choices=("ground", "rule"), skip=("spectrum_type",))
    refuses(EurocodeSpectrum, dict(ag=0.3), "spectrum_type", 3, None)
    probe_all(TabulatedSpectrum, dict(periods=(0.0, 0.5, 1.0, 2.0), values=(0.4, 1.0, 0.8, 0.4), damping=0.1,
                                      rule="eurocode"), choices=("rule",))
    units = documented_units(CodeSpectrum.sa)
    for spectrum in (SPECTRUM, EurocodeSpectrum(0.3, "C")):
        refuses(spectrum.sa, {"period": 1.0, "damping": 0.1}, "damping", math.nan, units["damping"])
        refuses(spectrum.sa, {"period": 1.0, "damping": 0.1, "rule": "asce7"}, "rule", "no-such-choice", None)


def test_damping_messages():
    # The damping functions serve Spectrum.sa(period, damping): their messages name that field.
    for call in (damping.damping_coefficient, damping.eurocode_eta):
        unit = documented_units(call)["beta"]
        for bad in (math.nan, 1.5, -0.1):
            with pytest.raises(ValueError) as caught:
                call(bad)
            assert re.match(r"damping = .* is not allowed: must be .* \[" + re.escape(unit) + r"\]$", str(caught.value))
        with pytest.raises(ValueError, match=r"^damping\[1\] = nan is not allowed: .* \[-\]$"):
            call([0.1, math.nan])
    refuses(damping.damping_coefficient, {"beta": 0.2, "rule": "eurocode"}, "rule", "no-such-choice", None)


# --- overturning and verdict sources -----------------------------------------------------------

def test_overturning_messages():
    probe_all(overturning.grid_rows, {"count": 12, "across": 20.0, "along": 30.0}, unitless=("count",))
    for bad in (1, 2.5, True):
        assert "integer >= 2" in refuses(overturning.grid_rows, {"count": 12, "across": 20.0, "along": 30.0},
                                         "count", bad, None)
    probe_all(overturning.asce7_vertical_fraction, {"sms": 1.5})
    probe_all(overturning.eurocode_vertical_fraction, {"ag": 0.3, "spectrum_type": 1}, skip=("spectrum_type",))
    refuses(overturning.eurocode_vertical_fraction, {"ag": 0.3, "spectrum_type": 1}, "spectrum_type", 3, None)
    probe_all(overturning.bearing_uplift, dict(shear=1000.0, height=6.0, bearings=[(4, 1000.0), (8, 2000.0)],
                                                plan_length=30.0, plan_width=20.0, gravity_factor=0.9,
                                                vertical_fraction=0.2))


def test_verdict_sources_messages():
    probe_all(verdict_sources.eurocode_reduction_factor, {"importance": 1.2})
    refuses(verdict_sources.source, {"topic": "drift", "basis": "asce7"}, "basis", "no-such-choice", None)
    refuses(verdict_sources.drift_limit, {"basis": "asce7"}, "basis", "no-such-choice", None)
    refuses(verdict_sources.drift_limit, {"basis": "eurocode", "nonstructural": "brittle"}, "nonstructural",
            "no-such-choice", None)


def test_spectrum_range_and_table_messages():
    # Periods outside a spectrum's range: field, value, the range and the unit; the Eurocode
    # spectrum says where EN 1998-1 §3.2.2.2 ends (4 s) and how to go further.
    with pytest.raises(ValueError) as caught:
        SPECTRUM.sa(12.0)
    assert str(caught.value) == "period = 12.0 is not allowed: must lie in [0, 10] for this CodeSpectrum [s]"
    with pytest.raises(ValueError) as caught:
        EurocodeSpectrum(0.3).sd([1.0, 5.0])
    message = str(caught.value)
    assert message.startswith("period = 5.0 is not allowed: must lie in [0, 4] for this EurocodeSpectrum [s]; ")
    assert "EN 1998-1 §3.2.2.2 ends at 4 s" in message and "max_period" in message
    with pytest.raises(ValueError) as caught:
        EurocodeSpectrum(0.3, max_period=10.0).sa(11.0)
    assert str(caught.value).endswith("for this EurocodeSpectrum [s]")      # nothing further to suggest
    # ASCE/SEI 7-16 §11.4.6 (from memory): T_L beyond T_S = S_M1/S_MS.
    with pytest.raises(ValueError, match=r"^long_period = 0\.5 is not allowed: must exceed T_S = sm1/sms = 0\.6 "
                                         r"\[s\]$"):
        CodeSpectrum(1.5, 0.9, long_period=0.5)
    refuses(CodeSpectrum.from_design_values, {"sds": 1.0, "sd1": 0.6}, "sds", math.nan,
            documented_units(CodeSpectrum.from_design_values)["sds"])
    refuses(CodeSpectrum.from_design_values, {"sds": 1.0, "sd1": 0.6}, "sd1", -1.0,
            documented_units(CodeSpectrum.from_design_values)["sd1"])
    table = dict(periods=(0.0, 0.5, 1.0), values=(0.4, 1.0, 0.8))
    with pytest.raises(ValueError, match=r"^periods = \(1\.0,\) is not allowed: must be a list of at least 2 periods "
                                         r"\[s\]$"):
        TabulatedSpectrum(periods=(1.0,), values=(0.5,))
    with pytest.raises(ValueError, match=r"^values has 2 entries but periods has 3: must be the same length$"):
        TabulatedSpectrum(periods=table["periods"], values=(0.4, 1.0))
    with pytest.raises(ValueError, match=r"^periods = \[0\.5, 0\.0, 1\.0\] is not allowed: must be >= 0 \(only the "
                                         r"first may be 0\) \[s\]$"):
        TabulatedSpectrum(periods=(0.5, 0.0, 1.0), values=table["values"])
    with pytest.raises(ValueError, match=r"^periods\[2\] = 0\.5 is not allowed: must be strictly increasing \(previous "
                                         r"0\.5\) \[s\]$"):
        TabulatedSpectrum(periods=(0.0, 0.5, 0.5), values=table["values"])
    with pytest.raises(ValueError, match=r"^damping = 0\.0 is not allowed: must be a finite number in \(0, 1\] \[-\]$"):
        TabulatedSpectrum(**table, damping=0.0)


def test_spectrum_from_dict_messages():
    from isolation.site.spectra import spectrum_from_dict
    with pytest.raises(ValueError, match=r"^spectrum = 3 is not allowed: must be a mapping with a 'kind' key$"):
        spectrum_from_dict(3)
    with pytest.raises(ValueError, match=r"^spectrum\.kind = 'nz' is not allowed: must be one of 'code', 'eurocode', "
                                         r"'tabulated'$"):
        spectrum_from_dict({"kind": "nz"})
    with pytest.raises(ValueError, match=r"^spectrum\.sds is not allowed for kind 'code': known keys are sms, sm1, "):
        spectrum_from_dict({"kind": "code", "sms": 1.5, "sm1": 0.9, "sds": 1.0})
    # Each kind's to_dict() names its kind and rebuilds the same spectrum.
    for spectrum in (CodeSpectrum(1.5, 0.9, level="design", rule="eurocode"),
                     EurocodeSpectrum(0.3, "B", 2, 1.2, max_period=6.0),
                     TabulatedSpectrum(periods=(0.0, 0.5, 1.0), values=(0.4, 1.0, 0.8), damping=0.1)):
        data = spectrum.to_dict()
        assert data["kind"] == {"CodeSpectrum": "code", "EurocodeSpectrum": "eurocode",
                                "TabulatedSpectrum": "tabulated"}[type(spectrum).__name__]
        assert spectrum_from_dict(data) == spectrum


# --- bearings ---------------------------------------------------------------------------------

_COMPOUND = _dr.RubberCompound((0.5, 1.0, 2.0), (700.0, 500.0, 400.0), (0.18, 0.15, 0.12))
_BEARING_CASES = [
    (_bb.Bilinear, dict(elastic_stiffness=20000.0, post_yield_stiffness=1000.0, characteristic_strength=100.0), ()),
    (_bb.MultiLinear, dict(linear_stiffness=1000.0, stiffnesses=(20000.0, 5000.0), strengths=(100.0, 200.0)), ()),
    (_fr.FrictionPendulum, dict(radius=3.0, friction=0.05, slider_height=0.2, displacement_capacity=0.5,
                                friction_slow=0.03, rate_parameter=20.0, yield_displacement=0.001), ()),
    (_dc.DoubleConcave, dict(radius_1=2.0, friction_1=0.03, radius_2=3.0, friction_2=0.06, slider_height_1=0.1,
                             slider_height_2=0.1, displacement_capacity_1=0.3, displacement_capacity_2=0.3,
                             yield_displacement=0.001), ()),
    (_tp.TripleFrictionPendulum, dict(radius_outer=2.5, radius_inner=0.5, friction_inner=0.02, friction_1=0.06,
                                      friction_4=0.10, slider_height_outer=0.2, slider_height_inner=0.1,
                                      displacement_capacity_outer=0.5, displacement_capacity_inner=0.1,
                                      yield_displacement=0.001), ()),
    (_ru.LeadRubber, dict(outer_diameter=0.8, lead_diameter=0.2, layer_thickness=0.01, layers=20, shear_modulus=400.0,
                          lead_yield_stress=10000.0, stiffness_ratio=10.0, bulk_modulus=2.0e6, shim_thickness=0.003,
                          end_plate_thickness=0.025, displacement_capacity=0.4), ("layers",)),
    (_dr.RubberCompound, dict(strains=(0.5, 1.0, 2.0), shear_moduli=(700.0, 500.0, 400.0),
                              dampings=(0.18, 0.15, 0.12)), ()),
    (_dr.HighDampingRubber, dict(outer_diameter=0.9, layer_thickness=0.01, layers=15, compound=_COMPOUND,
                                 inner_diameter=0.1, reference_strain=1.0, stiffness_ratio=10.0, bulk_modulus=2.0e6,
                                 shim_thickness=0.003, end_plate_thickness=0.025, displacement_capacity=0.4),
     ("layers",)),
    # Helpers of the bearings: their messages name the bearing property the value comes from.
    (_dr.equivalent_bilinear, dict(stiffness=1000.0, damping=0.15, displacement=0.2, ratio=10.0), ()),
    (_dr.max_bilinear_damping, dict(ratio=10.0), ()),
    (_sy.PropertyBound, dict(lower=0.9, upper=1.2), ()),
    (_sy.BearingGroup, dict(bearing=_fr.FrictionPendulum(3.0, 0.05), count=4, axial_load=1000.0,
                            axial_load_max=1500.0, axial_load_min=500.0, rotation=0.005), ("count",)),
    (_ck.shape_factor, dict(outer_diameter=0.8, layer_thickness=0.01, inner_diameter=0.1), ()),
    (_ck.hole_factor, dict(outer_diameter=0.8, inner_diameter=0.1), ()),
    (_ck.compression_modulus, dict(shear_modulus=400.0, shape=20.0, bulk_modulus=2.0e6, hole=0.9), ()),
    (_ck.overlap_ratio, dict(diameter=0.8, displacement=0.3), ()),
    (_ck.buckling_load, dict(shear_modulus=400.0, area=0.5, inertia=0.02, compression=5.0e5, rubber_thickness=0.2,
                             height=0.3), ()),
    (_ck.rotation_strain, dict(diameter=0.8, layer_thickness=0.01, rubber_thickness=0.2, rotation=0.005), ()),
]


_FIELDS = {"equivalent_bilinear": {"stiffness": "effective stiffness", "ratio": "stiffness_ratio"},
           "compression_modulus": {"shape": "shape_factor"}, "buckling_load": {"compression": "compression_modulus"}}


@pytest.mark.parametrize("call, valid, skip", _BEARING_CASES, ids=[c[0].__name__ for c in _BEARING_CASES])
def test_bearing_messages(call, valid, skip):
    call(**valid)
    probe_all(call, valid, skip=skip, fields=_FIELDS.get(call.__name__))


def test_damping_range_ends_and_first_bad_entry():
    # 0 <= beta <= 1 (documented): beta = 1 is allowed and the ASCE/SEI 7-16 Table 17.5-1 B_M stays at
    # its 50 % value 2.0 beyond the table (clamped, as documented).
    assert damping.damping_coefficient(1.0) == 2.0 and type(damping.damping_coefficient(0.2)) is float
    assert damping.damping_coefficient(0.0) == 0.8                  # the 2 % row, clamped below
    # The message quotes the first offending entry and says what a damping ratio is.
    with pytest.raises(ValueError) as caught:
        damping.damping_coefficient([0.1, 1.5, 2.0])
    assert str(caught.value) == ("damping = 1.5 is not allowed: must be a damping ratio in [0, 1] "
                                 "(0.05 means 5 %) [-]")
    with pytest.raises(ValueError, match=r"^damping = -0\.1 is not allowed: must be a damping ratio in \[0, 1\]"):
        damping.eurocode_eta(-0.1)


def test_spectrum_zero_dimensional_period_array():
    # A 0-d array is a number: the message shows the plain value.
    with pytest.raises(ValueError, match=r"^period = 12\.0 is not allowed: must lie in \[0, 10\] for this CodeSpectrum "
                                         r"\[s\]$"):
        SPECTRUM.sa(np.array(12.0))
    with pytest.raises(ValueError, match=r"^period = 11\.0 is not allowed: must lie in \[0, 10\]"):
        SPECTRUM.sd(np.array([1.0, 11.0, 12.0]))
    assert type(SPECTRUM.sa(np.array(1.0))) is float


# --- bearings written out: to_dict() rebuilds the same bearing --------------------------------

@pytest.mark.parametrize("call, valid, skip", _BEARING_CASES[2:6] + _BEARING_CASES[7:8],
                         ids=[c[0].__name__ for c in _BEARING_CASES[2:6] + _BEARING_CASES[7:8]])
def test_bearing_to_dict_rebuilds_the_bearing(call, valid, skip):
    # Each bearing's record names its kind by the study's bearing type (isolation.study.keys.BEARING_KEYS),
    # holds every constructor field, and any other entry is the bearing's property of that name.
    import dataclasses

    from isolation.study.keys import BEARING_KEYS
    bearing = call(**valid)
    data = bearing.to_dict()
    assert data["kind"] in BEARING_KEYS
    fields = {f.name for f in dataclasses.fields(bearing)}
    assert fields <= set(data), fields - set(data)
    rebuilt = {k: v for k, v in data.items() if k in fields}
    if "compound" in rebuilt:
        rebuilt["compound"] = _dr.RubberCompound(**{k: tuple(v) if isinstance(v, list) else v
                                                    for k, v in rebuilt["compound"].items()})
    assert call(**rebuilt) == bearing
    for key in set(data) - fields - {"kind"}:
        value = getattr(bearing, key)
        assert data[key] == (list(value) if isinstance(value, tuple) else value), key


def test_spectra_keep_plain_floats_and_refuse_unknown_ground():
    code = CodeSpectrum(2, 1, 8, max_period=10)
    assert all(type(x) is float for x in (code.sms, code.sm1, code.long_period, code.max_period))
    ec = EurocodeSpectrum(1, "C", importance=1, max_period=4)
    assert all(type(x) is float for x in (ec.ag, ec.importance, ec.max_period))
    assert type(TabulatedSpectrum(periods=(0, 1), values=(1, 1), damping=1).damping) is float
    # EN 1998-1 Table 3.2/3.3: ground types A-E only.
    with pytest.raises(ValueError, match=r"^ground = 'X' is not allowed: must be one of 'A', 'B', 'C', 'D', 'E'$"):
        EurocodeSpectrum(0.3, "X")
    # A period that is not a number: named, with its unit.
    with pytest.raises(ValueError, match=r"^period = nan is not allowed: must be a finite number \[s\]$"):
        SPECTRUM.sa(math.nan)
    with pytest.raises(ValueError) as caught:
        EurocodeSpectrum(0.3).sa(4.5)
    assert str(caught.value).endswith("pass max_period (up to 10 s) to extend the T_C T_D/T^2 branch")


def test_bearing_check_messages_and_record():
    # The checks of a bearing take loads [kN], a displacement [m] and a rotation [rad] as documented.
    fp = _fr.FrictionPendulum(2.0, 0.05)
    lrb = _ru.LeadRubber(0.8, 0.2, 0.01, 20, 400.0)
    loads = dict(axial_load=1000.0, displacement=0.2, axial_load_max=1500.0, axial_load_min=100.0,
                 weight_share=1000.0)
    probe_all(fp.checks, loads)
    probe_all(lrb.checks, dict(loads, rotation=0.005))
    check = fp.checks(1000.0, 0.2)[0]
    assert set(check.to_dict()) == {"name", "value", "limit", "passed", "unit", "source"}
    assert check.to_dict()["unit"] == check.unit and check.to_dict()["source"] == check.source


def test_property_factor_inputs_and_records():
    # ASCE/SEI 7-16 §17.2.8.4 component factors (from memory): every factor is a ratio [-].
    probe_all(_sy.PropertyBound.from_factors, dict(aging_max=1.1, aging_min=0.95, test_max=1.1, test_min=0.9,
                                                   spec_max=1.15, spec_min=0.85, adjustment=0.75))
    bound = _sy.PropertyBound(np.float64(0.9), np.float64(1.2))
    assert (type(bound.lower), type(bound.upper)) == (float, float)
    factors = _sy.PropertyFactors(stiffness=(0.9, 1.2), strength=(0.8, 1.3), friction=(0.85, 1.25))
    data = factors.to_dict()
    assert _sy.PropertyFactors(**{k: (v["lower"], v["upper"]) for k, v in data.items()}) == factors
    group = _sy.BearingGroup(_fr.FrictionPendulum(2.0, 0.05), np.int64(4), 1000, axial_load_max=1500,
                             axial_load_min=-10, rotation=0)
    assert type(group.count) is int and group.count == 4
    assert all(type(getattr(group, n)) is float for n in ("axial_load", "axial_load_max", "axial_load_min", "rotation"))
    record = group.to_dict()
    assert (record["count"], record["axial_load"], record["axial_load_max"], record["axial_load_min"]) == (
        4, 1000.0, 1500.0, -10.0)
