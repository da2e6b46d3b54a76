"""Tables for notebook, HTML and PDF.

Outside checks: markdown tables are parsed by mistune (the markdown library
nbconvert uses, GFM table syntax); LaTeX's ten special characters and their
escapes follow Lamport, "LaTeX: A Document Preparation System", 2nd ed.,
§2.2.1 and the textcomp commands (from memory); significant-figure rounding
is checked against hand-rounded values. Symbols: subscripts in TeX math
syntax (Lamport §3.3.1, from memory), descriptive subscripts upright and index
subscripts italic (ISO 80000-2, from memory); pandoc (the converter nbconvert
uses for markdown in the PDF) must read the markdown form as TeX math.
"""

from __future__ import annotations

import json
import math
import re

import mistune
import numpy as np
import pytest

from isolation.output.tables import Table, checks_table, escape_latex, format_number, key_value_table


@pytest.mark.parametrize(
    "value, digits, text",
    [
        (0.31274, 3, "0.313"),      # hand-rounded
        (3.046, 3, "3.05"),
        (2.7, 3, "2.70"),
        (1234.4, 4, "1234"),
        (12345.0, 3, "12300"),
        (-98765.4, 2, "-99000"),
        (2.5e9, 3, "2.50e+09"),
        (0.000123, 2, "1.2e-04"),
        (-0.5, 3, "-0.500"),
        (0.99999, 3, "1.00"),       # rounds up across a power of ten: still 3 figures
        (99.996, 3, "100"),
        (9.9996, 3, "10.0"),
        (-999.7, 3, "-1000"),
        (0.0, 3, "0"),
        (7, 3, "7"),
        (np.int64(11), 3, "11"),
        (np.float32(0.25), 2, "0.25"),
        (True, 3, "yes"),
        (False, 3, "no"),
        (None, 3, "--"),
        (math.nan, 3, "--"),
        ("lower", 3, "lower"),
    ],
)
def test_format_number(value, digits, text):
    assert format_number(value, digits) == text


def _table() -> Table:
    return Table(
        columns=("Bound", "D_M [m]", "T_M [s]", "Note"),
        rows=(("lower", 0.31274, 3.046, "50% & $"), ("upper", 0.25, 2.7, "lead_rubber #1")),
        caption="Results {both} bounds",
        notes="Source: ASCE 7-16 §17.5.3.1",
    )


def test_markdown_parses_to_a_table_with_the_cells():
    html = mistune.create_markdown(plugins=["table"])(_table()._repr_markdown_())
    headers = re.findall(r"<th[^>]*>(.*?)</th>", html)
    cells = re.findall(r"<td[^>]*>(.*?)</td>", html)
    # Symbols as TeX math, which the notebook and the HTML report render with MathJax.
    assert headers == ["Bound", r"$D_{\mathrm{M}}$ [m]", r"$T_{\mathrm{M}}$ [s]", "Note"]
    assert cells[:4] == ["lower", "0.313", "3.05", "50% &amp; $"]
    assert cells[4:] == ["upper", "0.250", "2.70", "lead_rubber #1"]  # a word, not a symbol
    assert "Results {both} bounds" in html


def test_markdown_escapes_pipes_so_columns_stay():
    table = Table(columns=("a", "b"), rows=(("x|y", 1.0),))
    html = mistune.create_markdown(plugins=["table"])(table._repr_markdown_())
    assert re.findall(r"<td[^>]*>(.*?)</td>", html) == ["x|y", "1.00"]


def test_latex_is_a_captioned_booktabs_table_with_escaped_cells():
    latex = _table()._repr_latex_()
    assert latex.startswith(r"\begin{table}[H]") and latex.rstrip().endswith(r"\end{table}")
    assert r"\caption{Results \{both\} bounds}" in latex
    assert r"\toprule" in latex and r"\midrule" in latex and r"\bottomrule" in latex
    assert r"\begin{tabular}{@{}lrrr@{}}" in latex
    assert r"lower & 0.313 & 3.05 & 50\% \& \$ \\" in latex
    assert r"upper & 0.250 & 2.70 & lead\_rubber \#1 \\" in latex
    assert r"\textbf{\(D_{\mathrm{M}}\) [m]} & \textbf{\(T_{\mathrm{M}}\) [s]}" in latex
    assert r"Source: ASCE 7-16 §17.5.3.1" in latex
    # Notes sit inside the table's own width.
    assert r"\begin{threeparttable}" in latex and r"\item[] Source" in latex


def test_escape_latex_of_the_ten_special_characters():
    assert escape_latex(r"# $ % & ~ _ ^ \ { }") == (
        r"\# \$ \% \& \textasciitilde{} \_ \textasciicircum{} \textbackslash{} \{ \}"
    )


def test_long_tables_break_over_pages():
    rows = tuple((f"row {i}", float(i)) for i in range(40))
    latex = Table(columns=("name", "value"), rows=rows, caption="Long")._repr_latex_()
    assert r"\begin{longtable}" in latex and r"\endhead" in latex
    assert latex.count(r"\\") >= 40


def test_wrapping_columns_take_the_full_width_and_break_when_long():
    short = Table(columns=("topic", "finding"), rows=(("drift", "a long sentence"),), align="lp",
                  caption="Wraps")._repr_latex_()
    assert r"\begin{tabularx}{\linewidth}{@{}l>{\raggedright\arraybackslash}X@{}}" in short
    assert r"\begin{table}[H]" in short
    rows = tuple((f"topic {i}", "a long sentence") for i in range(13))
    long = Table(columns=("topic", "finding"), rows=rows, align="lp", caption="Wraps")._repr_latex_()
    assert r"\begin{xltabular}{\linewidth}{@{}l>{\raggedright\arraybackslash}X@{}}" in long
    assert r"\caption{Wraps}\\" in long and r"\endhead" in long


def test_to_dict_is_plain_json():
    data = _table().to_dict()
    assert data["columns"][1] == "D_M [m]"
    assert data["rows"][0] == ["lower", "0.313", "3.05", "50% & $"]


@pytest.mark.parametrize(
    "kwargs, message",
    [
        ({"columns": (), "rows": ()}, "columns = ()"),
        ({"columns": ("a", "b"), "rows": ((1,),)}, r"rows\[0\] has 1 cells.*must have 2"),
        ({"columns": ("a", "b"), "rows": ((1, 2),), "align": "lx"}, "align = 'lx'.*l, r, c, p"),
        ({"columns": ("a", "b"), "rows": ((1, 2),), "align": "l"}, "align = 'l'"),
    ],
)
def test_bad_tables_are_refused(kwargs, message):
    with pytest.raises(ValueError, match=message):
        Table(**kwargs)


def test_key_value_table():
    table = key_value_table({"Seismic weight W [kN]": 41260.0, "Storeys": 4}, "Inputs")
    assert table.cells == (("Seismic weight W [kN]", "41300"), ("Storeys", "4"))
    assert table.align == "lr"


def test_checks_table_reads_check_objects_and_dicts():
    from isolation.bearings import Check

    check = Check(name="shear strain", value=1.8, limit=2.5, passed=True, unit="-",
                  source="AASHTO (from memory)")
    table = checks_table([check, {"name": "tension", "value": 310.0, "limit": 240.0,
                                  "passed": False, "unit": "kPa", "source": ""}], "Checks")
    assert table.cells[0] == ("shear strain", "1.80", "2.50", "-", "pass", "AASHTO (from memory)")
    assert table.cells[1] == ("tension", "310", "240", "kPa", "FAIL", "--")


# NIST SP 811 (2008), Appendix B: 1 in = 0.0254 m exactly; 1 lbf = 4.448 221 615 260 5 N exactly
# (defining: 0.453 592 37 kg x 9.806 65 m/s2); 1 psi = 1 lbf/in2 = 6.894 757 293 168 kPa.
_INCH_M = 0.0254
_KIP_KN = 4.4482216152605
_PSI_KPA = _KIP_KN / 1000.0 / _INCH_M**2  # 1 lbf (kip/1000) over 1 in2, in kPa
_KIP_PER_IN_KN_M = _KIP_KN / _INCH_M


def _unit_checks():
    return [
        {"name": "displacement capacity", "value": _INCH_M, "limit": 2 * _INCH_M, "passed": True, "unit": "m",
         "source": "s"},
        {"name": "net tension (uplift)", "value": _KIP_KN, "limit": 0.0, "passed": True, "unit": "kN", "source": ""},
        {"name": "tension stress", "value": 100 * _PSI_KPA, "limit": 3 * 80 * _PSI_KPA, "passed": True,
         "unit": "kPa", "source": ""},
        {"name": "compression modulus", "value": 1000 * _PSI_KPA, "limit": None, "passed": True, "unit": "kPa",
         "source": ""},
        {"name": "shear strain", "value": 1.8, "limit": 2.5, "passed": True, "unit": "-", "source": ""},
        {"name": "vertical period", "value": 0.08, "limit": 0.1, "passed": True, "unit": "s", "source": ""},
        {"name": "mapped S_1 below 0.6 g", "value": 0.45, "limit": 0.6, "passed": True, "unit": "g", "source": ""},
    ]


def test_checks_table_in_us_units_converts_lengths_forces_and_stresses_only():
    us = checks_table(_unit_checks(), "Checks", system="US")
    assert _row(us, "displacement capacity")[1:4] == ("1.00", "2.00", "in")
    assert _row(us, "net tension (uplift)")[1:4] == ("1.00", "0", "kip")
    assert _row(us, "tension stress")[1:4] == ("100", "240", "psi")   # 3 G with G = 80 psi
    assert _row(us, "compression modulus")[1:4] == ("1000", "--", "psi")
    # Dimensionless, periods and spectral values: as given.
    assert _row(us, "shear strain")[1:4] == ("1.80", "2.50", "-")
    assert _row(us, "vertical period")[1:4] == ("0.0800", "0.100", "s")
    assert _row(us, "mapped S_1 below 0.6 g")[1:4] == ("0.450", "0.600", "g")


def test_checks_table_in_si_units_is_unchanged():
    si = checks_table(_unit_checks(), "Checks", system="SI")
    assert si.cells == checks_table(_unit_checks(), "Checks").cells
    assert _row(si, "displacement capacity")[1:4] == ("0.0254", "0.0508", "m")
    assert _row(si, "net tension (uplift)")[1:4] == ("4.45", "0", "kN")
    assert _row(si, "tension stress")[1:4] == ("689", "1650", "kPa")
    assert _row(si, "shear strain")[1:4] == ("1.80", "2.50", "-")


def test_checks_table_refuses_an_unknown_unit_system():
    with pytest.raises(ValueError, match=r"system = 'imperial' is not allowed: must be one of 'SI', 'US'"):
        checks_table(_unit_checks(), "Checks", system="imperial")


# --- builders over a study's results (hand-made, invented numbers) ---------------------------
def _results(units: str = "SI") -> dict:
    bound = {"displacement": 0.5, "period": 3.0, "damping": 0.2, "damping_coefficient": 1.5,
             "stiffness": 20_000.0, "base_shear": 10_000.0, "weight": 50_000.0}
    alternative = {
        "name": "Invented sliders",
        "bounds": {"lower": bound, "nominal": dict(bound, displacement=0.45),
                   "upper": dict(bound, displacement=0.4, period=2.5)},
        "quantities": {"period_upper": 2.5, "period_lower": 3.0, "fixed_base_period": 0.5,
                       "total_displacement": 0.6, "shear_ratio": 0.4},
        "history": {"summary": {"isolator_displacement_lower": 0.48, "isolator_displacement_upper": 0.38,
                                "isolator_displacement_with_torsion": 0.55, "residual_displacement_lower": 0.01,
                                "floor_acceleration_fixed": 1.2, "floor_acceleration_lower": 0.3,
                                "floor_acceleration_upper": 0.36, "drift_ratio_fixed": 0.012,
                                "drift_ratio_isolated": 0.003, "superstructure_shear_fixed": 40_000.0,
                                "superstructure_shear_upper": 9_000.0, "isolation_shear_upper": 11_000.0,
                                "floor_acceleration_ratio": 0.3}},
        "report": {"quantities": [{"name": "maximum displacement", "symbol": "D_M", "value": 0.5, "unit": "m",
                                   "source": "invented"}]},
        "verdict": {"alternative": "Invented sliders", "outcome": "feasible with conditions",
                    "reasons": [{"topic": "drift", "level": "ok", "message": "fine", "source": "s1"},
                                {"topic": "uplift", "level": "condition", "message": "tension", "source": "s2"}]},
    }
    study = {
        "units": units, "basis": "asce7",
        "site": {"sms": 1.2, "sm1": 0.6, "long_period": 8.0, "site_class": "C", "near_fault": False},
        "building": {"base_weight": 10_000.0, "floor_weights": [20_000.0, 20_000.0], "storey_heights": [4.0, 3.5],
                     "plan_length": 30.0, "plan_width": 20.0, "storeys": 2, "lateral_system": "braced_frame",
                     "response_modification": 6.0, "importance": 1.0},
        "analysis": {"suite_size": 7, "duration": 30.0, "time_step": 0.005},
        "wind_base_shear": 650.0,
        "alternatives": [{"name": "Invented sliders", "lower_factor": 0.85, "upper_factor": 1.2, "moat": 0.5,
                          "bearings": [{"type": "friction_pendulum", "count": 12,
                                        "properties": {"radius": 2.5, "friction": 0.05}}]}],
    }
    return {"study": study, "fixed_base": {"period": 0.5, "period_source": "given"},
            "alternatives": [alternative],
            "suite": {"check": {"band": [0.9, 1.3], "rule": "asce7", "check_range_s": [1.0, 4.0],
                                "required_mean_ratio": 1.1, "lowest_mean_ratio": 1.12, "period_of_lowest_mean_s": 2.0,
                                "mean_ok": True,
                                "records": [{"index": 0, "seed": 11, "lowest_ratio": 0.95, "highest_ratio": 1.2,
                                             "within_band": True, "baseline_ok": True}]}}}


def _row(table, first):
    return next(row for row in table.cells if row[0] == first)


def test_inputs_table_in_si_and_us_units():
    from isolation.output.tables import inputs_table

    si = inputs_table(_results("SI"))
    assert _row(si, "Seismic weight W (base slab included)") == ("Seismic weight W (base slab included)", "50000", "kN")
    assert _row(si, "S_MS (MCE_R, short period)")[1:] == ("1.20", "g")
    us = inputs_table(_results("US"))
    # 1 lbf = 4.4482216 N, 1 in = 0.0254 m (NIST SP 811, Appendix B): 50 000 kN = 11 240 kip,
    # 650 kN = 146 kip, 30 m = 1181 in.
    assert _row(us, "Seismic weight W (base slab included)")[1:] == ("11200", "kip")
    assert _row(us, "Wind base shear")[1:] == ("146", "kip")
    assert _row(us, "Plan length")[1:] == ("1180", "in")
    assert "Fixed-base period: given." == us.notes


def test_bounds_history_and_comparison_tables():
    from isolation.output.tables import bounds_table, comparison_table, history_table

    results = _results()
    bounds = bounds_table(results["alternatives"][0])
    assert [row[0] for row in bounds.cells] == ["lower", "nominal", "upper"]
    assert _row(bounds, "upper")[1:3] == ("0.400", "2.50")
    assert _row(bounds, "lower")[-1] == "0.200"  # V_b/W = 10 000 / 50 000
    history = history_table(results["alternatives"][0])
    assert _row(history, "Largest storey drift ratio [%]")[1:] == ("1.20", "--", "0.300")
    compared = comparison_table(results)
    assert _row(compared, "Period shift T_M/T_fb, upper bound [-]")[1] == "5.00"  # 2.5 s / 0.5 s
    assert _row(compared, "Verdict")[1] == "feasible with conditions"
    us = bounds_table(results["alternatives"][0], "US")
    assert us.columns[1] == "D [in]" and _row(us, "lower")[1] == "19.7"  # 0.5 m / 0.0254 m


def test_code_quantities_table_in_si_and_us_units():
    from isolation.output.tables import code_quantities_table

    alternative = _results()["alternatives"][0]
    alternative["report"]["quantities"] += [
        {"name": "effective stiffness", "symbol": "K_eff", "value": _KIP_PER_IN_KN_M, "unit": "kN/m", "source": "x"},
        {"name": "isolation-system shear", "symbol": "V_b", "value": 250 * _KIP_KN, "unit": "kN", "source": "x"},
        {"name": "reduction factor", "symbol": "R_I", "value": 2.0, "unit": "-", "source": "x"},
        {"name": "fixed-base period", "symbol": "T_fb", "value": 0.5, "unit": "s", "source": "x"},
    ]
    si = code_quantities_table(alternative)
    assert _row(si, "maximum displacement (D_M)")[1:3] == ("0.500", "m")
    assert _row(si, "effective stiffness (K_eff)")[1:3] == ("175", "kN/m")  # 4.4482216 kN / 0.0254 m
    us = code_quantities_table(alternative, "US")
    assert _row(us, "maximum displacement (D_M)")[1:3] == ("19.7", "in")  # 0.5 m / 0.0254 m
    assert _row(us, "effective stiffness (K_eff)")[1:3] == ("1.00", "kip/in")
    assert _row(us, "isolation-system shear (V_b)")[1:3] == ("250", "kip")
    assert _row(us, "reduction factor (R_I)")[1:3] == ("2.00", "-")
    assert _row(us, "fixed-base period (T_fb)")[1:3] == ("0.500", "s")


def test_verdict_suite_and_alternatives_tables():
    from isolation.output.tables import alternatives_table, suite_table, verdict_table

    results = _results()
    verdict = verdict_table(results["alternatives"][0])
    assert verdict.cells[0][:2] == ("uplift", "condition")  # deciding reasons first
    assert verdict.caption.endswith("feasible with conditions")
    suite = suite_table(results)
    assert suite.cells == (("1", "11", "0.950", "1.20", "yes", "yes"),)
    assert "required at least 1.10" in suite.notes and "met" in suite.notes
    alternatives = alternatives_table(results)
    assert alternatives.cells[0][:3] == ("Invented sliders", "friction pendulum", "12")
    # No-break spaces keep each size on one line; LaTeX writes them as ties.
    assert "R\u00a0=\u00a02.50\u00a0m" in alternatives.cells[0][3] and alternatives.cells[0][4] == "0.85 / 1.20"
    assert r"R~=~2.50~m" in alternatives._repr_latex_()


# --- symbols as subscripts (one helper for tables, captions and workbook text) ----------------
@pytest.mark.parametrize(
    "plain, latex",
    [
        ("D_TM = 0.58 m", r"\(D_{\mathrm{TM}}\) = 0.58 m"),         # descriptive subscript upright
        ("T_M/T_fb", r"\(T_{\mathrm{M}}\)/\(T_{\mathrm{fb}}\)"),
        ("S_M1 (MCE_R)", r"\(S_{\mathrm{M1}}\) (\(\mathrm{MCE}_{\mathrm{R}}\))"),
        ("beta_M and β_eff", r"\(\beta_{\mathrm{M}}\) and \(\beta_{\mathrm{eff}}\)"),
        ("V_s,min,wind", r"\(V_{\mathrm{s,min,wind}}\)"),
        ("F_x at level x", r"\(F_{x}\) at level x"),                # index subscript italic
        ("T_C T_D/T^2", r"\(T_{\mathrm{C}}\) \(T_{\mathrm{D}}\)/\(T^{2}\)"),
        ("lead_rubber & 5 %", r"lead\_rubber \& 5 \%"),              # a word, not a symbol: escaped
        ("e_1x2y3z is long", r"e\_1x2y3z is long"),                  # subscript over 5 characters
    ],
)
def test_symbols_as_latex(plain, latex):
    from isolation.output.tables import latex_text

    assert latex_text(plain) == latex


def test_symbols_in_markdown_leave_math_and_code_alone():
    from isolation.output.tables import markdown_text

    assert markdown_text("**A:** D_TM = 0.5 m") == r"**A:** $D_{\mathrm{TM}}$ = 0.5 m"
    assert markdown_text("kept $D_M$ and `T_M`") == "kept $D_M$ and `T_M`"


def test_pandoc_reads_the_markdown_symbols_as_math(tmp_path):
    # pandoc turns markdown cells into the PDF's LaTeX; its tex_math_dollars reading is the outside check.
    import subprocess

    from isolation.output.tables import markdown_text
    from tools import require_tools

    require_tools("pandoc")  # part of the PDF path: fails, not skips, when CI requires TeX
    text = markdown_text("Total D_TM = 0.584 m, T_M/T_fb = 4.6.")
    latex = subprocess.run(["pandoc", "-f", "markdown", "-t", "latex"], input=text, capture_output=True,
                           text=True, check=True).stdout
    assert r"\(D_{\mathrm{TM}}\) = 0.584 m" in latex
    assert r"\(T_{\mathrm{M}}\)/\(T_{\mathrm{fb}}\) = 4.6" in latex


# --- the owner's summary (hand-made, invented numbers; expected values worked by hand) ----------
def _two_alternatives(second_outcome: str, first_outcome: str = "feasible with conditions") -> dict:
    results = _results()
    first = results["alternatives"][0]
    first["verdict"]["outcome"] = first_outcome
    first["quantities"]["moat"] = 0.75
    first["history"]["summary"].update(superstructure_shear_ratio=0.25, floor_acceleration_ratio=0.3)
    second = json.loads(json.dumps(first))
    second["name"] = second["verdict"]["alternative"] = "Invented rubber"
    second["quantities"].update(total_displacement=0.45, period_lower=2.2, period_upper=1.9)
    second["history"]["summary"].update(floor_acceleration_ratio=0.4, drift_ratio_isolated=0.005)
    second["verdict"]["outcome"] = second_outcome
    if second_outcome == "not recommended":
        second["verdict"]["reasons"].append({"topic": "moat", "level": "against",
                                             "message": "moat 0.40 m is narrower than D_TM", "source": "s3"})
    results["alternatives"].append(second)
    return results


def test_summary_table_reads_the_results():
    from isolation.output.tables import summary_table

    table = summary_table(_two_alternatives("not recommended"))
    assert table.columns == ("", "Invented sliders", "Invented rubber")
    assert _row(table, "Verdict")[1:] == ("feasible with conditions", "not recommended")
    assert _row(table, "Isolated period T_M, upper to lower bound [s]")[1:] == ("2.50 – 3.00", "1.90 – 2.20")
    assert _row(table, "Total design displacement D_TM [m]")[1:] == ("0.600", "0.450")
    assert _row(table, "Moat width [m]")[1:] == ("0.750", "0.750")
    assert _row(table, "Base shear above the isolators [% of fixed base]")[1:] == ("25", "25")  # 0.25
    assert _row(table, "Peak floor acceleration [% of fixed base]")[1:] == ("30", "40")  # 0.3, 0.4
    # drift 0.003 and 0.005 isolated, 0.012 fixed base, in %
    assert _row(table, "Peak storey drift ratio, isolated / fixed base [%]")[1:] == ("0.30 / 1.2", "0.50 / 1.2")
    assert "licensed structural engineer" in table.notes
    us = summary_table(_results("US"))
    assert _row(us, "Total design displacement D_TM [in]")[1] == "23.6"  # 0.6 m / 0.0254 m
    assert _row(us, "Moat width [in]")[1] == "not given"


def test_summary_prefers_the_better_verdict_and_names_what_decides():
    from isolation.output.tables import preferred_alternative, summary_text

    results = _two_alternatives("not recommended")
    assert preferred_alternative(results)["name"] == "Invented sliders"
    text = summary_text(results)
    assert text.startswith("**Invented sliders** is the preferred alternative: feasible with conditions, "
                           "the best verdict of the 2 alternatives studied.")
    assert r"$D_{\mathrm{TM}}$ = 0.600 m (moat 0.750 m)" in text
    assert "Its main condition: tension." in text  # the condition of the hand-made verdict
    assert r"**Invented rubber** is not recommended: moat 0.40 m is narrower than $D_{\mathrm{TM}}$." in text
    assert 2 <= text.count(". ") + 1 <= 4  # two to four sentences


def test_summary_between_equal_verdicts_and_when_none_is_recommended():
    from isolation.output.tables import preferred_alternative, summary_text

    # Equal verdicts and conditions: the lower floor acceleration (0.3 against 0.4) decides.
    equal = _two_alternatives("feasible with conditions")
    assert preferred_alternative(equal)["name"] == "Invented sliders"
    assert "with the lower peak floor acceleration" in summary_text(equal)
    # A feasible alternative beats one with conditions even with more floor acceleration.
    better = _two_alternatives("feasible")
    assert preferred_alternative(better)["name"] == "Invented rubber"
    none = _two_alternatives("not recommended", first_outcome="not recommended")
    assert preferred_alternative(none) is None
    assert summary_text(none).startswith("None of the 2 alternatives studied is recommended as designed.")
