"""Design-space views of a batch: readable key labels with units, the sign of reductions in
words, variants named, contours on grids larger than 2 x 2, ranks in the right cells, the
bound colour code, and the workbook without a summary.

Fixture: tests/fixtures/batch/design_space/summary.csv (a direct sweep of the invented demo
study, radius 1.5-6 m x friction 0.03-0.1). Expected values are read from the CSV with the
csv module here, not from the code under test.
"""

from __future__ import annotations

import csv
import json
from pathlib import Path

import matplotlib

matplotlib.use("Agg")
import matplotlib.pyplot as plt  # noqa: E402
import pytest  # noqa: E402

from isolation.app.batch.maps import (  # noqa: E402
    best_alternatives,
    completed_rows,
    key_label,
    missing_summary_text,
    plot_displacement_vs_reduction,
    plot_verdict_map,
    reduction_text,
    variant_text,
)
from isolation.app.batch.summary import read_summary  # noqa: E402
from isolation.output.plots import COLOURS  # noqa: E402

FIXTURE = Path(__file__).parents[1] / "fixtures" / "batch" / "design_space" / "summary.csv"
WORKBOOK = Path(__file__).resolve().parents[2] / "workbooks" / "design_space.ipynb"
X, Y = "alternative.0.bearings.0.radius", "alternative.0.bearings.0.friction"


def test_key_labels_are_readable_with_units():
    assert key_label(X) == "curvature radius R [m] (alternative 1, bearings 1)"
    assert key_label(X, "US") == "curvature radius R [in] (alternative 1, bearings 1)"
    assert key_label(Y) == "friction coefficient μ [-] (alternative 1, bearings 1)"
    assert key_label("site.sms") == "S_MS [g] (site)"
    assert key_label("alternative.1.bearings.0.shear_modulus") == \
        "rubber shear modulus G [kPa] (alternative 2, bearings 1)"


def test_reduction_sign_in_words():
    assert reduction_text(0.24) == "24% below fixed base"
    assert reduction_text(-0.05) == "5% above fixed base"
    assert reduction_text(0.001) == "same as fixed base"
    assert reduction_text(None) == "-"


def test_ranked_unchanged_alternative_names_all_variants():
    base = {"status": "done", "verdict": "feasible", "D_M_lower_m": 0.3, "D_M_upper_m": 0.25,
            "base_shear_ratio_lower": 0.3, "base_shear_ratio_upper": 0.35}
    rows = [dict(base, variant=v, alternative="B") for v in "xyz"]
    rows.append(dict(base, variant="w", alternative="A", D_M_lower_m=0.2))
    best = best_alternatives(rows, top=5)
    b = next(r for r in best if r["alternative"] == "B")
    assert b["variants"] == ["x", "y", "z"] and b["same_in"] == 3
    assert variant_text(b, total=4) == "x, y, z"
    assert variant_text(b, total=3) == "all 3 variants (not varied)"
    a = next(r for r in best if r["alternative"] == "A")
    assert variant_text(a, total=4) == "w"


def test_verdict_map_labels_contours_and_ranks():
    rows = read_summary(FIXTURE)
    with FIXTURE.open(newline="") as handle:
        table = [r for r in csv.DictReader(handle) if r["status"] == "done"]
    radii, frictions = {r[X] for r in table}, {r[Y] for r in table}
    assert len(radii) > 2 and len(frictions) > 2  # a grid larger than 2 x 2
    best = best_alternatives(rows, top=3)
    fig, ax = plt.subplots()
    plot_verdict_map(completed_rows(rows), X, Y, ax=ax, ranking=best)
    assert ax.get_xlabel() == "curvature radius R [m] (alternative 1, bearings 1)"
    assert "friction coefficient" in ax.get_ylabel()
    assert ax.collections, "contour lines expected on a grid larger than 2 x 2"
    texts = [t.get_text() for t in ax.texts]
    # The rank-1 alternative's cell holds its own numbers (read from the CSV) and "rank 1".
    top = best[0]
    row = next(r for r in table if r["variant"] == top["variant"])
    cell = next(t for t in texts if "rank 1" in t)
    assert f"D {float(row['D_M_lower_m']):.2f} m" in cell
    share = 1 - float(row["base_shear_ratio_upper"])
    assert f"{abs(share):.0%} {'below' if share > 0 else 'above'} fixed base" in cell
    plt.close(fig)


def test_verdict_map_of_a_2x2_grid_has_no_contours():
    rows = [{"status": "done", "alternative": "A", "variant": f"{x}-{y}", X: x, Y: y, "verdict": "feasible",
             "D_M_lower_m": 0.1 * x + y, "base_shear_ratio_upper": 0.3} for x in (1.0, 2.0) for y in (0.03, 0.06)]
    fig, ax = plt.subplots()
    plot_verdict_map(rows, X, Y, ax=ax)
    assert not ax.collections
    plt.close(fig)


def test_scatter_uses_the_bound_colours_and_names_variants():
    rows = completed_rows(read_summary(FIXTURE))
    fig, ax = plt.subplots()
    plot_displacement_vs_reduction(rows, ax=ax)
    colours = {line.get_color() for line in ax.get_lines() if line.get_marker() not in ("None", "")}
    assert colours == {COLOURS["lower"], COLOURS["upper"]}
    labels = {t.get_text() for t in ax.texts}
    assert {r["variant"] for r in rows} <= labels
    assert "above 0: isolated shear smaller" in ax.get_ylabel()
    plt.close(fig)


def test_missing_summary_says_what_to_run():
    text = missing_summary_text("nowhere/summary.csv")
    assert "python -m isolation batch" in text and "summary_path" in text


@pytest.mark.slow
def test_design_space_workbook_without_summary_says_what_to_run(tmp_path):
    import papermill

    out = tmp_path / "design_space.ipynb"
    papermill.execute_notebook(str(WORKBOOK), str(out), kernel_name="python3", progress_bar=False,
                               parameters={"summary_path": str(tmp_path / "missing.csv")})
    notebook = json.loads(out.read_text())
    outputs = [o for c in notebook["cells"] for o in c.get("outputs", [])]
    assert not [o for o in outputs if o.get("output_type") == "error"]
    text = json.dumps(outputs)
    assert "No batch summary" in text and "python -m isolation batch" in text
