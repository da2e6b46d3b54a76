"""Code tables of the package against the check values in tests/data (each file names its source and status).

Interpolated values between rows are "[derived]": linear interpolation of the published rows.
"""

import glob
import os

import pytest
from check_values import DATA, read

from isolation.codes.asce7_fixed_base import approximate_period, period_upper_limit_factor
from isolation.codes.eurocode import eurocode_approximate_period
from isolation.site.damping import damping_coefficient
from isolation.site.spectra import EurocodeSpectrum

# Rows of ASCE/SEI 7-16 Table 12.8-2 and EN 1998-1 §4.3.3.2.2(3) -> the package's frame keys.
ASCE_ROWS = {"steel moment-resisting frames": "steel_moment", "concrete moment-resisting frames": "concrete_moment",
             "steel eccentrically braced frames": "eccentric_braced",
             "steel buckling-restrained braced frames": "buckling_restrained_braced",
             "all other structural systems": "other"}
EC8_ROWS = {"moment resistant space steel frames": "steel_moment",
            "moment resistant space concrete frames": "concrete_moment",
            "eccentrically braced steel frames": "eccentric_braced", "all other structures": "other"}


def test_every_check_value_file_names_its_source():
    names = [os.path.basename(p) for p in glob.glob(str(DATA / "*.csv"))]
    assert len(names) >= 6
    for name in names:
        table = read(name)
        assert table.rows and table.source


def test_damping_coefficient_b_m():
    table = read("asce7_16_table_17_5_1.csv")  # ASCE/SEI 7-16 Table 17.5-1
    for beta, b_m in zip(table.column("effective_damping"), table.column("B_M"), strict=True):
        assert float(damping_coefficient(beta, "asce7")) == pytest.approx(b_m, rel=1e-12)
    # [derived] halfway between the 10 % and 20 % rows: (1.2 + 1.5)/2.
    assert float(damping_coefficient(0.15, "asce7")) == pytest.approx(1.35, rel=1e-12)


def test_upper_limit_coefficient_c_u():
    table = read("asce7_16_table_12_8_1.csv")  # ASCE/SEI 7-16 Table 12.8-1
    for sd1, cu in zip(table.column("S_D1"), table.column("C_u"), strict=True):
        assert period_upper_limit_factor(sd1) == pytest.approx(cu, rel=1e-12)
    # Beyond the end rows the end values hold (">= 0.4" and "<= 0.1" rows).
    assert period_upper_limit_factor(0.8) == pytest.approx(1.4)
    assert period_upper_limit_factor(0.05) == pytest.approx(1.7)


@pytest.mark.parametrize("row", read("asce7_16_table_12_8_2_si.csv").rows, ids=lambda r: r["structure_type"])
def test_approximate_period_coefficients(row):
    # ASCE/SEI 7-16 Eq. 12.8-7, T_a = C_t h^x, with the Table 12.8-2 row, h = 20 m.
    expected = float(row["C_t"]) * 20.0 ** float(row["x"])
    assert approximate_period(20.0, ASCE_ROWS[row["structure_type"]]) == pytest.approx(expected, rel=1e-12)


@pytest.mark.parametrize("row", read("en1998_1_2004_4_3_3_2_2_ct.csv").rows, ids=lambda r: r["structure_type"])
def test_eurocode_period_coefficients(row):
    # EN 1998-1:2004 Eq. 4.6, T_1 = C_t H^(3/4), H = 20 m.
    expected = float(row["C_t"]) * 20.0 ** 0.75
    assert eurocode_approximate_period(20.0, EC8_ROWS[row["structure_type"]]) == pytest.approx(expected, rel=1e-12)


@pytest.mark.parametrize("row", read("en1998_1_2004_tables_3_2_3_3.csv").rows,
                         ids=lambda r: f"type{r['spectrum_type']}-{r['ground_type']}")
def test_eurocode_spectrum_parameters_and_plateau(row):
    # EN 1998-1:2004 Tables 3.2/3.3 and §3.2.2.2: the plateau is 2.5 a_g S (eta = 1 at 5 % damping).
    s, tb, tc, td = (float(row[k]) for k in ("S", "T_B", "T_C", "T_D"))
    spectrum = EurocodeSpectrum(0.3, row["ground_type"], int(row["spectrum_type"]))
    assert spectrum.parameters == pytest.approx((s, tb, tc, td), rel=1e-12)
    assert spectrum.sa((tb + tc) / 2, 0.05) == pytest.approx(2.5 * 0.3 * s, rel=1e-12)
    # [derived] T_C < T < T_D: 2.5 a_g S T_C/T.
    assert spectrum.sa((tc + td) / 2, 0.05) == pytest.approx(2.5 * 0.3 * s * tc / ((tc + td) / 2), rel=1e-12)


def test_importance_factor_range():
    table = read("asce7_16_table_1_5_2.csv")  # ASCE/SEI 7-16 Table 1.5-2, re-read (see the file)
    from isolation.study.sections import IMPORTANCE_RANGES

    assert table.status == "re-read"
    values = table.column("I_e")
    assert IMPORTANCE_RANGES["asce7"] == (min(values), max(values))
