"""Tests of the direct sweep's array path (isolation.app.batch.sweep: variant_study, design_rows_many,
validate_direct).

The array path must give what the variant-by-variant path gives: the study the full parse
builds, the summary rows of design_rows (whose equivalent-linear numbers test_design.py checks
against ASCE/SEI 7-16 and EN 1998-1), the input hashes of validate_plan and its messages.
"""

import math
import tomllib
from pathlib import Path

import pytest

from isolation.app.batch.check import validate_plan
from isolation.app.batch.plan import load_batch
from isolation.app.batch.runners import VariantTask, guarded_chunk
from isolation.app.batch.sweep import design_rows, design_rows_many, sweep_runner, validate_direct, variant_study
from isolation.errors import InputError
from isolation.study import StudyError, apply_overrides, parse_study, read_study_mapping

ROOT = Path(__file__).resolve().parents[2]
DEMO = ROOT / "examples" / "demo_study.toml"
RADIUS = "alternative.0.bearings.0.radius"
FRICTION = "alternative.0.bearings.0.friction"


def eurocode_rubber_study(folder: Path) -> Path:
    """The demo study on a Eurocode basis with a high-damping rubber second alternative."""
    text = DEMO.read_text(encoding="utf-8")
    text = text.replace('basis = "asce7"', 'basis = "eurocode"')
    for line in ("sms = 1.50", "sm1 = 0.80", 'long_period = "8 s"', "s1 = 0.53", 'site_class = "C"'):
        text = "\n".join(row for row in text.splitlines() if not row.strip().startswith(line))
    text = text.replace("[site]", '[site]\nag = 0.3\nground_type = "B"\nspectrum_type = 1', 1)
    text = text.replace("importance = 1.5", "importance = 1.2")
    start = text.index('type = "lead_rubber"')
    text = text[:start] + ('type = "high_damping_rubber"\ncount = 30\nouter_diameter = "0.85 m"\n'
                           'layer_thickness = "8 mm"\nlayers = 30\ndisplacement_capacity = "0.6 m"\n')
    path = folder / "ec_study.toml"
    path.write_text(text, encoding="utf-8")
    tomllib.loads(text)
    return path


def same_rows(many, one):
    assert len(many) == len(one)
    for a, b in zip(many, one, strict=True):
        assert a.keys() == b.keys()
        for key in a:
            if isinstance(b[key], float):
                assert a[key] == pytest.approx(b[key], rel=1e-9), key
            else:
                assert a[key] == b[key], key


GRID = [{RADIUS: r, FRICTION: m} for r in (1.8, "3.2 m", 5.5) for m in (0.03, 0.07, 0.11)]


@pytest.mark.parametrize("which", ["demo", "eurocode"])
def test_array_rows_equal_variant_by_variant_rows(tmp_path, which):
    path = DEMO if which == "demo" else eurocode_rubber_study(tmp_path)
    grid = GRID + [{"alternative.1.property_factors.upper": 1.5, "alternative.0.moat": "0.9 m"}]
    base = read_study_mapping(path)
    full = [parse_study(apply_overrides(base, o), source=path.name, base_dir=path.parent) for o in grid]
    quick = [variant_study(path, o) for o in grid]
    for a, b in zip(quick, full, strict=True):
        assert a.to_dict() == b.to_dict()  # the key-by-key path builds the study the full parse builds
    many = design_rows_many(quick)
    for rows, study in zip(many, full, strict=True):
        same_rows(rows, design_rows(study))


def test_quick_validation_names_key_value_and_allowed_range():
    with pytest.raises(StudyError) as quick:
        variant_study(DEMO, {RADIUS: 0.1, FRICTION: 0.05})
    with pytest.raises(StudyError) as full:
        parse_study(apply_overrides(read_study_mapping(DEMO), {RADIUS: 0.1}), source=DEMO.name)
    assert str(quick.value) == str(full.value)
    assert "alternative[0].bearings[0].radius" in str(quick.value) and "0.3" in str(quick.value)
    # a pair of keys judged together (slider height below the radius) and an unknown key
    with pytest.raises(StudyError, match="slider_height"):
        variant_study(DEMO, {RADIUS: 0.4, "alternative.0.bearings.0.slider_height": 0.5})
    with pytest.raises(StudyError, match="not a known key"):
        variant_study(DEMO, {"alternative.0.bearings.0.radiuss": 3.0})


def batch_file(folder: Path, radii, frictions, extra="") -> Path:
    (folder / "study.toml").write_text(DEMO.read_text(encoding="utf-8"), encoding="utf-8")
    path = folder / "batch.toml"
    path.write_text(f'[batch]\nstudy = "study.toml"\n[grid]\n"{RADIUS}" = {radii!r}\n"{FRICTION}" = {frictions!r}\n'
                    + extra, encoding="utf-8")
    return path


def test_validate_direct_gives_validate_plan_hashes_and_errors(tmp_path):
    plan = load_batch(batch_file(tmp_path, [2.0, 3.0, 4.5], [0.04, 0.06]))
    settings = {"mode": "direct", "quick": False}
    assert validate_direct(plan, settings) == validate_plan(plan, settings=settings, model_checks=False)
    bad = load_batch(batch_file(tmp_path, [2.0, 25.0], [0.04, 0.5]))
    with pytest.raises(InputError) as quick:
        validate_direct(bad, settings)
    with pytest.raises(InputError) as full:
        validate_plan(bad, settings=settings, model_checks=False)
    assert "3 of 4 variants are invalid" in str(quick.value)
    assert sorted(str(quick.value).split("; ")) == sorted(str(full.value).split("; "))


def test_chunk_runs_together_and_a_failing_variant_fails_alone(tmp_path):
    path = eurocode_rubber_study(tmp_path)
    tasks = [VariantTask(f"v{i}", str(path), o, str(tmp_path)) for i, o in enumerate(GRID[:4])]
    # a variant the key-by-key check passes but whose design fails: rubber damping no bilinear loop
    # with K_u/K_d = 1.05 reaches ((2/pi)(sqrt(n) - 1)/(sqrt(n) + 1) = 0.008, derived arithmetic)
    tasks.append(VariantTask("soft", str(path), {"alternative.1.bearings.0.stiffness_ratio": 1.05},
                             str(tmp_path)))
    outcomes = guarded_chunk(sweep_runner, tasks)
    assert [o.variant_id for o in outcomes] == [t.variant_id for t in tasks]
    alone = [sweep_runner(t) if t.variant_id != "soft" else None for t in tasks]
    for got, ref in zip(outcomes[:4], alone[:4], strict=True):
        assert got.status == "done"
        same_rows(list(got.rows), list(ref.rows))
    soft = guarded_chunk(sweep_runner, [tasks[-1]])[0]
    assert outcomes[-1].status == soft.status == "failed"
    assert outcomes[-1].error == soft.error and "stiffness_ratio" in soft.error
    assert math.isfinite(sum(o.elapsed for o in outcomes))
