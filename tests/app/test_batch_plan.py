"""Batch files: variant expansion and validation before anything runs (issue 6).

These tests check the batch machinery against the requirements of issue 6
(grid / list / CSV variants, every problem reported at once); the study
values themselves are validated by isolation.study. Expected values are
written out by hand from the batch files below, not produced by the code.
"""

import shutil
from pathlib import Path

import pytest

from isolation.app.batch.check import validate_plan
from isolation.app.batch.command import main
from isolation.app.batch.plan import load_batch
from isolation.errors import InputError

FIXTURES = Path(__file__).parents[1] / "fixtures" / "batch"


def write_batch(folder: Path, text: str, name: str = "trial_batch.toml") -> Path:
    shutil.copy(FIXTURES / "study.toml", folder / "study.toml")
    path = folder / name
    path.write_text(text, encoding="utf-8")
    return path


RADIUS = "alternative.0.bearings.0.radius"
FRICTION = "alternative.0.bearings.0.friction"


def test_grid_expands_to_every_combination_in_order(tmp_path):
    path = write_batch(tmp_path, f"""
[batch]
study = "study.toml"
[grid]
"{RADIUS}" = [2.0, 3.0]
"{FRICTION}" = [0.04, 0.06, 0.08]
""")
    plan = load_batch(path)
    # requirement (issue 6): a grid gives every combination: 2 x 3 = 6 variants,
    # first key varying slowest (hand-listed below).
    got = [(v.overrides[RADIUS], v.overrides[FRICTION]) for v in plan.variants]
    assert got == [(2.0, 0.04), (2.0, 0.06), (2.0, 0.08), (3.0, 0.04), (3.0, 0.06), (3.0, 0.08)]
    ids = [v.variant_id for v in plan.variants]
    assert len(set(ids)) == 6 and ids[0] == "radius-2_friction-0.04"
    assert plan.study_file == (tmp_path / "study.toml").resolve()
    assert plan.name == "trial_batch" and plan.pdf is False


def test_unquoted_dotted_keys_mean_the_same(tmp_path):
    quoted = load_batch(write_batch(tmp_path, f'[batch]\nstudy = "study.toml"\n[grid]\n"{RADIUS}" = [2.0, 3.0]\n'))
    bare = load_batch(write_batch(tmp_path, f'[batch]\nstudy = "study.toml"\n[grid]\n{RADIUS} = [2.0, 3.0]\n',
                                  "b.toml"))
    assert [v.overrides for v in quoted.variants] == [v.overrides for v in bare.variants]


def test_list_table_and_common_overrides(tmp_path):
    (tmp_path / "variants.csv").write_text(
        f"id,{RADIUS},{FRICTION},site.site_class\nwide,4.0,0.05,\nnarrow,2500 mm,,D\n", encoding="utf-8"
    )
    path = write_batch(tmp_path, f"""
[batch]
study = "study.toml"
table = "variants.csv"
name = "mixed sources"
[common]
analysis.suite_size = 7
[[variant]]
id = "soft"
site.site_class = "D"
[[variant]]
"{FRICTION}" = 0.09
""")
    plan = load_batch(path)
    # requirement (issue 6): explicit variants and a CSV table of variants; empty cells
    # leave the study value; numbers read as numbers, quantities with units as text.
    assert [v.variant_id for v in plan.variants] == ["soft", "variant-02", "wide", "narrow"]
    assert plan.variants[0].overrides == {"site.site_class": "D"}
    assert plan.variants[2].overrides == {RADIUS: 4.0, FRICTION: 0.05}
    assert plan.variants[3].overrides == {RADIUS: "2500 mm", "site.site_class": "D"}
    assert plan.common == {"analysis.suite_size": 7}
    assert plan.overrides_for(plan.variants[1]) == {"analysis.suite_size": 7, FRICTION: 0.09}
    assert plan.name == "mixed-sources"
    validate_plan(plan)


def test_repeated_table_column_is_refused_not_paired_wrongly(tmp_path):
    # requirement (issue 6 and the bad-input rule): a CSV header naming one key path twice would pair the
    # cells of one column with the other's name; it is refused with the name and the columns.
    (tmp_path / "variants.csv").write_text(f"id,{RADIUS},{FRICTION},{RADIUS}\na,4.0,0.05,3.0\n", encoding="utf-8")
    path = write_batch(tmp_path, """
[batch]
study = "study.toml"
table = "variants.csv"
""")
    with pytest.raises(InputError) as caught:
        load_batch(path)
    message = str(caught.value)
    assert f"column name '{RADIUS}' appears more than once (columns 2, 4)" in message
    assert "each key path once" in message


def test_batch_file_problems_reported_together(tmp_path):
    path = write_batch(tmp_path, f"""
[batch]
study = "missing_study.toml"
colour = "blue"
[grid]
"{RADIUS}" = 2.0
[[variant]]
id = "same"
"{FRICTION}" = 0.05
[[variant]]
id = "same"
"{FRICTION}" = 0.06
[extras]
x = 1
""")
    with pytest.raises(InputError) as caught:
        load_batch(path)
    message = str(caught.value)
    # requirement (issue 6): every problem at once, each naming key, value and what is allowed
    for part in ("extras", "batch.colour", "missing_study.toml", f"grid.{RADIUS} = 2.0", "'same'", "already used"):
        assert part in message
    assert "\n" not in message


def test_every_invalid_variant_reported_before_any_run(tmp_path):
    path = write_batch(tmp_path, f"""
[batch]
study = "study.toml"
[[variant]]
id = "good"
"{RADIUS}" = 3.0
[[variant]]
id = "negative-radius"
"{RADIUS}" = -1.0
[[variant]]
id = "sticky"
"{FRICTION}" = 0.9
[[variant]]
id = "typo"
"site.smx" = 1.0
""")
    plan = load_batch(path)
    with pytest.raises(InputError) as caught:
        validate_plan(plan)
    message = str(caught.value)
    # requirement (issue 6): all bad variants at once; the study's own allowed ranges
    # (radius 0.3..20 m, friction 0..0.3) and unknown-key rule name the field and value.
    assert "3 of 4 variants are invalid" in message
    assert "[negative-radius]" in message and "radius" in message and "-1.0" in message
    assert "[sticky]" in message and "0.9" in message
    assert "[typo]" in message and "smx" in message
    assert "[good]" not in message


def test_hash_follows_the_input_not_its_spelling(tmp_path):
    path = write_batch(tmp_path, f"""
[batch]
study = "study.toml"
[[variant]]
id = "metres"
"{RADIUS}" = 2.5
[[variant]]
id = "millimetres"
"{RADIUS}" = "2500 mm"
[[variant]]
id = "larger"
"{RADIUS}" = 2.6
""")
    hashes = validate_plan(load_batch(path))
    # 2500 mm is 2.5 m (SI definition of the millimetre): same input, same hash
    assert hashes["metres"] == hashes["millimetres"]
    assert hashes["metres"] != hashes["larger"]
    assert validate_plan(load_batch(path), settings={"mode": "direct"})["metres"] != hashes["metres"]


def test_command_exits_2_with_one_line(tmp_path, capsys):
    path = write_batch(tmp_path, f'[batch]\nstudy = "study.toml"\n[grid]\n"{FRICTION}" = [0.05, -0.1, 0.5]\n')
    code = main([str(path), "--out", str(tmp_path / "out"), "--no-progress"])
    err = capsys.readouterr().err
    # requirement (issue 5/6): bad input -> exit 2, one line, no traceback, nothing written
    assert code == 2
    assert len(err.strip().splitlines()) == 1 and "Traceback" not in err
    assert "2 of 3 variants are invalid" in err
    assert not (tmp_path / "out").exists()


def test_command_check_only_and_bad_option(tmp_path, capsys):
    path = write_batch(tmp_path, f'[batch]\nstudy = "study.toml"\n[grid]\n"{FRICTION}" = [0.05, 0.06]\n')
    assert main([str(path), "--check"]) == 0
    assert "2 variants valid" in capsys.readouterr().out
    assert main([str(path), "--workers", "0"]) == 2
    assert main([str(tmp_path / "absent.toml")]) == 2
    assert "absent.toml" in capsys.readouterr().err


def test_unreachable_scheduler_is_bad_input(tmp_path, capsys, monkeypatch):
    monkeypatch.setattr("isolation.app.batch.executors.CONNECT_TIMEOUT", 1.0)
    path = write_batch(tmp_path, f'[batch]\nstudy = "study.toml"\n[grid]\n"{FRICTION}" = [0.05, 0.06]\n')
    # port 9 (discard) has no dask scheduler listening on this machine
    code = main([str(path), "--direct", "--scheduler", "tcp://127.0.0.1:9", "--out", str(tmp_path / "o")])
    err = capsys.readouterr().err
    assert code == 2 and "--scheduler = 'tcp://127.0.0.1:9' is not allowed" in err
    assert len(err.strip().splitlines()) == 1


def test_grid_ids_stay_distinct_as_folder_names(tmp_path):
    path = write_batch(tmp_path, '[batch]\nstudy = "study.toml"\n[grid]\n"building.eccentricity" = [-1.0, 1.0]\n'
                                 '"site.site_class" = ["C", "c "]\n')
    ids = [v.variant_id for v in load_batch(path).variants]
    # -1 and 1 must not share a folder; 'C' and 'c ' read alike once lower-cased: numbered
    assert len(set(ids)) == 4 and ids == ["grid-0001", "grid-0002", "grid-0003", "grid-0004"]
    path = write_batch(tmp_path, '[batch]\nstudy = "study.toml"\n[grid]\n"building.eccentricity" = [-1.0, 1.0]\n')
    assert [v.variant_id for v in load_batch(path).variants] == ["eccentricity-m1", "eccentricity-1"]
    path = write_batch(tmp_path,
                       '[batch]\nstudy = "study.toml"\n[[variant]]\nid = "Soft Site"\nsite.site_class = "D"\n')
    with pytest.raises(InputError, match="e.g. 'soft-site'"):
        load_batch(path)


def test_variant_checked_against_its_own_models(tmp_path, monkeypatch):
    # a building too stiff for the time step (more sub-steps than allowed, here at most 1) is
    # caught before anything runs (the study's own model check), named with its keys
    import isolation.study.checks as model

    monkeypatch.setattr(model, "MAX_SUBSTEPS", 1)
    monkeypatch.setattr(model, "_REMEMBERED", {})
    path = write_batch(tmp_path, '[batch]\nstudy = "study.toml"\n[[variant]]\nid = "coarse"\n'
                                 '"analysis.time_step" = 0.02\n"building.fixed_base_period" = 0.05\n')
    with pytest.raises(InputError, match=r"\[coarse\].*building.fixed_base_period"):
        validate_plan(load_batch(path))
