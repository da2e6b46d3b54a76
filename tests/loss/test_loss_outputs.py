"""The owner's page from results: loss table, sentences and figure (isolation.output.tables.loss,
isolation.output.plots.loss). Values are read back from the results mapping the run wrote, formatted
here by the table's stated convention (k = thousand, M = million, 3 significant figures)."""

import json
from pathlib import Path

import pytest

from isolation.output import plots, tables
from isolation.output.tables.loss import money
from isolation.study import apply_overrides, parse_study, read_study_mapping
from isolation.study.runner import run_study

ROOT = Path(__file__).resolve().parents[2]
DEMO = ROOT / "examples" / "demo_study.toml"


@pytest.fixture(scope="module")
def data():
    mapping = apply_overrides(read_study_mapping(DEMO), {"analysis.suite_size": 7})
    mapping.pop("cost")  # all cost defaults: the page must flag them as invented
    mapping.pop("hazard")  # default hazard: 2 % in 50 years at MCE_R
    return json.loads(json.dumps(run_study(parse_study(mapping, source=str(DEMO)), quick=True).to_dict()))


def test_money_format():
    assert [money(v) for v in (None, 850.0, 39012.0, 1.674e6, -5.76e4, 2.1e9)] == \
        ["--", "850", "39 k", "1.67 M", "-57.6 k", "2.1 bn"]


def test_table_has_one_column_per_case_and_the_annual_loss(data):
    table = tables.loss_table(data)
    assert table.columns == ("", "Fixed base", "Friction pendulum", "Lead-rubber")
    rows = {row[0]: row[1:] for row in table.cells}
    eal = [data["fixed_base"]["loss"]["expected_annual_loss"]] + [
        a["loss"]["expected_annual_loss"] for a in data["alternatives"]]
    assert rows["Expected annual loss [USD/year]"] == tuple(
        f"{v / 1e3:.3g} k" if v < 1e6 else f"{v / 1e6:.3g} M" for v in eal)
    assert rows["Isolation cost [USD]"][0] == "--"


def test_text_flags_invented_defaults_and_cautions(data):
    text = tables.loss_text(data)
    assert "Invented demo values" in text and "replacement cost per area" in text
    for caution in ("cost consultant", "Not an insurance estimate", "Order-of-magnitude screening"):
        assert caution in text
    assert "2 % in 50 years" in text and "k = 3" in text  # the default hazard basis is stated


def test_figure_has_one_line_per_case(data):
    figure = plots.loss_curves(data)
    lines = [line for line in figure.axes[0].get_lines() if line.get_label() and not line.get_label().startswith("_")]
    assert [line.get_label() for line in lines] == ["Fixed base", "Friction pendulum", "Lead-rubber"]
    assert len(lines[0].get_xdata()) == 5


def test_no_loss_study_is_said_plainly(data):
    empty = dict(data, loss={})
    empty["fixed_base"] = dict(data["fixed_base"], loss={})
    empty["alternatives"] = [dict(a, loss={}) for a in data["alternatives"]]
    assert "not run" in tables.loss_text(empty)
    with pytest.raises(ValueError, match="no loss study"):
        tables.loss_table(empty)


def test_batch_rows_carry_the_loss_columns(data, tmp_path):
    from isolation.app.batch.rows import rows_from_results
    from isolation.app.batch.summary import read_summary, write_summary

    rows = rows_from_results(data, 1.0e4, verdict_basis="response histories")
    for row, alternative in zip(rows, data["alternatives"], strict=True):
        loss = alternative["loss"]
        assert row["expected_annual_loss"] == loss["expected_annual_loss"]
        assert row["expected_annual_loss_fixed"] == data["fixed_base"]["loss"]["expected_annual_loss"]
        assert row["net_present_value"] == loss["economics"]["net_present_value"]
        assert row["currency"] == "USD"
    for row in rows:
        row.update(variant="v1", status="done")
    write_summary(rows, tmp_path, [])
    back = read_summary(tmp_path / "summary.csv")
    assert back[0]["currency"] == "USD" and back[0]["net_present_value"] == pytest.approx(rows[0]["net_present_value"])


def test_design_space_map_coloured_by_net_present_value():
    import matplotlib

    matplotlib.use("Agg")
    import matplotlib.pyplot as plt

    from isolation.app.batch.npv_map import plot_npv_map

    rows = [{"status": "done", "alternative": "A", "verdict": "feasible", "x": x, "y": y, "D_M_lower_m": 0.3,
             "base_shear_ratio_upper": 0.5, "net_present_value": npv, "currency": "USD"}
            for (x, y), npv in zip([(1, 1), (1, 2), (2, 1), (2, 2)], [-2e5, 0.0, 1e5, None], strict=True)]
    fig, ax = plt.subplots()
    plot_npv_map(rows, "x", "y", ax=ax)
    colours = [patch.get_facecolor()[:3] for patch in ax.patches]
    # RdYlGn: negative red-ish, positive green-ish, zero the middle; no value grey
    assert colours[0][0] > colours[0][1] and colours[2][1] > colours[2][0]
    assert colours[3][0] == colours[3][1] == colours[3][2]
    assert "net present value [USD]" in fig.axes[-1].get_ylabel()
    assert [t.get_text() for t in ax.texts] == ["-0.20 M", "0.00 M", "0.10 M"]
    plt.close(fig)
