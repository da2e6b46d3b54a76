"""Design-space maps from history sweeps (isolation.app.batch.maps: history part).

Hand-made rows with values chosen so that every expected result follows by inspection
(dominance, feasibility against capacity, grid layout); the workbook runs on the summary of
a real (quick) history sweep.
"""

import json
import sys
from pathlib import Path

import numpy as np
import pytest

from isolation.app.batch.maps import (
    best_history_alternatives,
    best_history_table,
    feasible,
    grid_field,
    history_front,
    history_rows,
    plot_history_maps,
)

X, Y = "alternative.0.bearings.0.radius", "alternative.0.bearings.0.friction"


def row(x, y, d, red_lower, red_upper, verdict="feasible", capacity=0.6, torsion=1.1, alternative="pendulum"):
    return {"variant": f"r{x}-m{y}", "status": "done", X: x, Y: y, "alternative": alternative, "verdict": verdict,
            "D_M_lower_m": d, "base_shear_ratio_upper": 0.3, "displacement_capacity_m": capacity,
            "history_displacement_lower_m": d, "history_displacement_upper_m": 0.8 * d,
            "history_displacement_torsion_m": torsion * d,
            "floor_acceleration_reduction_lower": red_lower, "floor_acceleration_reduction_upper": red_upper}


ROWS = [
    row(2.0, 0.04, 0.50, 0.80, 0.70),
    row(2.0, 0.06, 0.40, 0.75, 0.72),
    row(3.0, 0.04, 0.60, 0.85, 0.80),  # 0.66 m with torsion > 0.6 m capacity: not feasible
    row(3.0, 0.06, 0.45, 0.70, 0.60),  # dominated by (2.0, 0.06): larger D, smaller reductions
    row(4.0, 0.04, 0.30, 0.90, 0.85, verdict="not recommended"),
    row(4.0, 0.06, 0.35, 0.78, 0.74, verdict="feasible with conditions"),
    {"variant": "bad", "status": "failed", X: 5.0, Y: 0.04, "alternative": None},
]


def test_grid_field_lays_values_out_on_the_keys():
    xs, ys, values = grid_field(ROWS, X, Y, "history_displacement_lower_m", "pendulum")
    assert xs == [2.0, 3.0, 4.0] and ys == [0.04, 0.06]
    np.testing.assert_array_equal(values, [[0.50, 0.60, 0.30], [0.40, 0.45, 0.35]])


def test_feasibility_uses_verdict_and_capacity_with_torsion():
    by = {(r[X], r[Y]): r for r in history_rows(ROWS)}
    assert len(by) == 6
    assert feasible(by[(2.0, 0.04)])  # 0.55 m <= 0.6 m
    assert not feasible(by[(3.0, 0.04)])  # 0.66 m > 0.6 m
    assert feasible(by[(3.0, 0.04)], torsion=False)  # 0.60 m <= 0.6 m
    assert not feasible(by[(4.0, 0.04)])  # not recommended


def test_front_and_best_alternatives():
    front = {(r[X], r[Y]) for r in history_front(ROWS)}
    # (displacement with torsion, worse-bound reduction): (2,.04)=(.55,.70) (2,.06)=(.44,.72)
    # (3,.04)=(.66,.80) (3,.06)=(.495,.60) (4,.04)=(.33,.85) (4,.06)=(.385,.74):
    # (4,.04) has the smallest displacement and the largest reduction, so it dominates every other
    assert front == {(4.0, 0.04)}
    best = best_history_alternatives(ROWS, top=10)
    # feasible only: (2,.04), (2,.06), (3,.06) feasible and (4,.06) with conditions; verdict first,
    # then the front among them ((4,.06), but its verdict ranks it last), then the worse-bound
    # reduction, largest first: .72, .70, .60
    assert [(r[X], r[Y]) for r in best] == [(2.0, 0.06), (2.0, 0.04), (3.0, 0.06), (4.0, 0.06)]
    assert all(r["same_in"] == 1 for r in best)
    table = best_history_table(ROWS, top=2)
    assert table.count("\n") == 3 and "r2.0-m0.06" in table


def test_history_maps_figure_has_four_panels_and_marks_infeasible_cells():
    fig = plot_history_maps(ROWS, X, Y)
    panels = [ax for ax in fig.axes if ax.get_title()]
    assert len(panels) == 4
    assert {ax.get_title().split(",")[0] for ax in panels} == {"peak isolator displacement",
                                                                "floor-acceleration reduction"}
    with pytest.raises(ValueError, match="x_key"):
        plot_history_maps(ROWS[:2], X, Y)  # one radius only


@pytest.mark.slow
def test_design_space_workbook_shows_history_maps(tmp_path):
    import papermill

    from isolation.app.batch.summary import read_summary

    sys.path.insert(0, str(Path(__file__).parent))
    from test_batch_histories import make_batch, sweep

    out = tmp_path / "out"
    report = sweep(make_batch(tmp_path, radii=(2.0, 3.0), frictions=(0.04, 0.07)), out)
    assert report.exit_code == 0
    assert len(history_rows(read_summary(out))) == 4
    papermill.execute_notebook(
        str(Path(__file__).resolve().parents[2] / "workbooks" / "design_space.ipynb"),
        str(tmp_path / "design_space.ipynb"), kernel_name="python3", progress_bar=False,
        parameters={"summary_path": str(out / "summary.csv")})
    notebook = json.loads((tmp_path / "design_space.ipynb").read_text())
    pictures = sum("image/png" in o.get("data", {}) for c in notebook["cells"] for o in c.get("outputs", []))
    assert pictures == 3  # scatter, verdict map, history maps (one alternative, varied)
    cell = next(c for c in notebook["cells"] if c.get("id") == "history-maps")
    assert sum("image/png" in o.get("data", {}) for o in cell["outputs"]) == 1
    table = "".join("".join(o["data"]["text/markdown"]) for o in cell["outputs"]
                    if "text/markdown" in o.get("data", {}))
    best = best_history_alternatives(read_summary(out))
    assert ("peak displacement lower / upper" in table) == bool(best)
