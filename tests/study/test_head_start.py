"""Results computed ahead of the workbook's kernel (isolation.study.head_start): read only when made
for the same study file, option and package version; otherwise computed again.

These are wiring checks of a cache (requirement: the record command's head start must never
change what a workbook shows); the numbers themselves are checked by the study tests.
"""

from pathlib import Path

import pytest

from isolation.study import head_start

DEMO = Path(__file__).resolve().parents[2] / "examples" / "demo_study.toml"


@pytest.fixture
def computed_here(monkeypatch):
    """run_study replaced by a marker, so a test sees whether results_of computed."""
    calls = []

    def fake_run_study(study, *, quick=False):
        calls.append((study, quick))
        return "computed here"

    import isolation.study.runner as runner

    monkeypatch.setattr(runner, "run_study", fake_run_study)
    return calls


def test_pickle_of_the_same_study_and_option_is_read(tmp_path, computed_here):
    study_file = tmp_path / "study.toml"
    study_file.write_bytes(DEMO.read_bytes())
    head_start.save_ahead({"stands for": "results"}, tmp_path / head_start.AHEAD_FILE, study_file, quick=True)
    found = head_start.results_of("study", study_path=study_file, quick=True,
                                  precomputed=tmp_path / head_start.AHEAD_FILE)
    assert found == {"stands for": "results"} and computed_here == []


def test_other_study_bytes_option_or_a_missing_file_compute_again(tmp_path, computed_here):
    study_file = tmp_path / "study.toml"
    study_file.write_bytes(DEMO.read_bytes())
    ahead = tmp_path / head_start.AHEAD_FILE
    head_start.save_ahead({"stands for": "results"}, ahead, study_file, quick=False)
    # another option
    assert head_start.results_of("s", study_path=study_file, quick=True, precomputed=ahead) == "computed here"
    # the study file changed by one byte after the pickle was made
    study_file.write_bytes(DEMO.read_bytes() + b"\n")
    assert head_start.results_of("s", study_path=study_file, quick=False, precomputed=ahead) == "computed here"
    # no pickle (a workbook run again later, or by hand), and no pickle asked for
    assert head_start.results_of("s", study_path=study_file, precomputed=tmp_path / "gone.pickle") == "computed here"
    assert head_start.results_of("s", study_path=study_file) == "computed here"
    assert len(computed_here) == 4


def test_compute_ahead_that_fails_leaves_nothing_and_lets_the_workbook_run(tmp_path, monkeypatch):
    import isolation.study.runner as runner
    from isolation.app import record_kernel

    (tmp_path / "study.toml").write_bytes(DEMO.read_bytes())

    def failing(study, *, quick=False):
        raise RuntimeError("no memory left")

    monkeypatch.setattr(runner, "run_study", failing)
    assert record_kernel.compute_ahead(tmp_path, "study.toml", quick=True) == ""
    assert not (tmp_path / head_start.AHEAD_FILE).exists()
