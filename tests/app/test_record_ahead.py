"""The record command's head start changes nothing a record shows.

A record made with the head start (the study computed, and figures drawn, in a forked process
beside the workbook's kernel) holds the same figures, byte for byte, as the same study's figures
drawn afresh from results computed afresh; the record keeps none of the shared files. No outside
source: a consistency check of the package against itself (requirement: two routes, one answer).
The record is made in a fresh Python process, as the command line makes it: the head start forks
only a process that runs no other thread.
"""

from __future__ import annotations

import json
import subprocess
import sys
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[2]
DEMO = ROOT / "examples" / "demo_study.toml"

SCRIPT = """
import base64, json, sys
from pathlib import Path
import nbformat
from isolation.app import record_ahead
from isolation.app.calc_records import run_record
from isolation.output import figure_sharing

out, demo = Path(sys.argv[1]), sys.argv[2]
assert record_ahead.forking(), "no head start in a fresh command-line process"
draw = figure_sharing.draw_ahead
def counted(shared, figures):  # runs in the forked child, which inherits this patch
    drawn = draw(shared, figures)
    (out / "drawn-ahead").write_text(str(drawn))
    return drawn
figure_sharing.draw_ahead = counted
outcome = run_record(demo, out / "records", pdf=False, quick=True, run_id="ahead")
assert outcome.status == "done", outcome.error
nb = nbformat.read(outcome.path / "feasibility.ipynb", as_version=4)
shown = [(o.metadata["image/png"]["caption"], base64.b64encode(base64.b64decode(o.data["image/png"])).decode())
         for c in nb.cells if c.cell_type == "code" for o in c.outputs if "image/png" in o.get("data", {})]
json.dump({"record": str(outcome.path), "shown": shown,
           "left": sorted(p.name for p in outcome.path.iterdir() if p.name.startswith((".results-ahead", ".figures"))),
           "drawn_ahead": int((out / "drawn-ahead").read_text())}, sys.stdout)
"""


@pytest.mark.slow
@pytest.mark.skipif(not sys.platform.startswith("linux"), reason="the head start runs only where processes fork")
def test_figures_of_a_record_are_those_drawn_afresh(tmp_path):
    done = subprocess.run([sys.executable, "-c", SCRIPT, str(tmp_path), str(DEMO)], capture_output=True,
                          text=True, cwd=ROOT, timeout=600)
    assert done.returncode == 0, done.stderr
    made = json.loads(done.stdout)
    assert made["left"] == []

    import base64

    from isolation.output.plots.report_figures import feasibility_figures
    from isolation.study import load_study
    from isolation.study.runner import run_study

    study = load_study(Path(made["record"]) / "study.toml")
    figures = feasibility_figures(run_study(study, quick=True), study)
    assert [caption for caption, _ in made["shown"]] == [order.caption for order in figures.orders]
    for (caption, png), order in zip(made["shown"], figures.orders, strict=True):
        assert base64.b64decode(png) == order.png(), caption
    assert 0 <= made["drawn_ahead"] <= len(figures)
    # the figures whose drawing computes spectra (the helper draws them first) are the floor spectra
    computing = [order.key for order in figures.orders if order.computes]
    assert computing and all(key[-1] == "floor spectra" for key in computing)
    print(f"figures drawn by the helper: {made['drawn_ahead']} of {len(figures)}")


@pytest.mark.slow
def test_a_record_without_head_start_forks_nothing(tmp_path, monkeypatch):
    from isolation.app import calc_records

    def no_fork(*args, **kwargs):
        raise AssertionError("a head start was asked for")

    monkeypatch.setattr(calc_records, "start_ahead", no_fork)
    outcome = calc_records.run_record(DEMO, tmp_path, pdf=False, quick=True, run_id="alone", head_start=False)
    assert outcome.status == "done", outcome.error
    # the same call with the head start reaches it (and the record then fails with that error)
    asked = calc_records.run_record(DEMO, tmp_path, pdf=False, quick=True, run_id="asked")
    assert asked.status == "failed" and "a head start was asked for" in asked.error
