"""The clause table: every cited clause has a row, and every row says truly where it is used.

Citations are read from the package's strings, docstrings and comments, from the workbooks,
and at run time from the sources of the code reports' items and checks, the bearing checks
and the verdict's source table. The parser's own examples are the citation forms the package
writes; the clause rows' status and sources are checked for form (what was re-read is named in
each row's source), the data file's loader for the row and field its messages name, and the
values of re-read rows against the package where the package computes them.
"""

import math
from pathlib import Path

import pytest

from isolation.codes.citations import Citation, citations, package_citations
from isolation.codes.clauses import CLAUSES, STATUSES, Clause, find_clause, load_clauses
from isolation.output.tables import clause_table
from tools import LinearSystem

ROOT = Path(__file__).resolve().parents[2]
KEYS = {c.key for c in CLAUSES}
G = 9.80665


@pytest.fixture(scope="module")
def cited():
    return package_citations(ROOT)


def _missing(texts):
    return sorted({c for text in texts for c in citations(text) if c not in KEYS})


# --- the parser -----------------------------------------------------------------------------------

@pytest.mark.parametrize("text, expected", [
    ("ASCE/SEI 7-16 §17.5.4.2, V_b (W_s/W)^(1 - 2.5 beta_M)", [("ASCE/SEI 7", "7-16", "§17.5.4.2")]),
    ("ASCE/SEI 7-16 §17.2.4.4, §17.5 (Eqs. 17.5-1 to 17.5-3 and §17.5.4-17.5.5)",
     [("ASCE/SEI 7", "7-16", c) for c in ("§17.2.4.4", "§17.5", "Eq. 17.5-1", "Eq. 17.5-2", "Eq. 17.5-3",
                                          "§17.5.4", "§17.5.5")]),
    ("EN 1998-1 §4.2.5, 0.8/1.0/1.2/1.4; it scales a_g = gamma_I a_gR, §2.1(3)",
     [("EN 1998-1", "2004", "§4.2.5"), ("EN 1998-1", "2004", "§2.1(3)")]),
    ("EN 1998-1 §3.2.2.5, Eqs. 3.13-3.16", [("EN 1998-1", "2004", c) for c in
                                           ("§3.2.2.5", "Eq. 3.13", "Eq. 3.14", "Eq. 3.15", "Eq. 3.16")]),
    ("Torsion (Eqs. 17.5-3/-4)", [("ASCE/SEI 7", "7-16", "Eq. 17.5-3"), ("ASCE/SEI 7", "7-16", "Eq. 17.5-4")]),
    ("FEMA technical manual (MR5), Tables 5.9a/b", [("FEMA loss estimation technical manual", "MR5 2010", c)
                                                   for c in ("Table 5.9a", "Table 5.9b")]),
    ("EN 1998-1:2004 Section 10", [("EN 1998-1", "2004", "Section 10")]),
    ("ASCE/SEI 7 Ch. 17, from memory", [("ASCE/SEI 7", "7-16", "Chapter 17")]),
    ("ASCE/SEI 7-16 Commentary Table C.1.3.1b", [("ASCE/SEI 7", "7-16", "Table C.1.3.1b")]),
    # Numbers of papers and captions are not code clauses.
    ("power law (Cornell et al. 2002, Eq. 5)", []),
    ('the PDF numbers it ("Table 3: ...")', []),
    # No document named: placed by the number's form.
    ("Table 12.8-2 row 'all other structural systems'", [("ASCE/SEI 7", "7-16", "Table 12.8-2")]),
    ("§4.3.3.2.2(3) 'all other structures' (C_t 0.050)", [("EN 1998-1", "2004", "§4.3.3.2.2(3)")]),
    ("AASHTO Guide Spec. Seismic Isolation Design: gamma_c <= 2.5", [("AASHTO GSID", "4th ed. 2014",
                                                                       "(no article)")]),
])
def test_citations_of_the_forms_the_package_writes(text, expected):
    assert citations(text) == [Citation(*e) for e in expected]


# --- the table against the package -------------------------------------------------------------

def test_every_cited_clause_has_a_row(cited):
    missing = sorted(c for c in cited if c not in KEYS)
    assert not missing, "add a row to isolation/codes/clauses.toml (python -m isolation.codes.clauses): " + "; ".join(
        f"{c.document} {c.edition} {c.clause} (cited in {sorted(cited[c])})" for c in missing)


def test_every_row_says_where_it_is_used(cited):
    wrong = {c.reference: tuple(sorted(cited.get(c.key, ()))) for c in CLAUSES
             if set(c.used_in) != cited.get(c.key, set())}
    assert not wrong, ("used_in should read (empty: no longer cited, remove the row; python -m "
                       f"isolation.codes.clauses lists them): {wrong}")


def test_check_rows_names_what_to_change(tmp_path):
    from isolation.codes.clauses import check_rows

    assert check_rows(ROOT) == []
    (tmp_path / "isolation").mkdir()
    (tmp_path / "isolation" / "new.py").write_text('SOURCE = "ASCE/SEI 7-16 §17.5.4.2 and §99.9"\n', encoding="utf-8")
    lines = check_rows(tmp_path)
    assert lines[0] == ('missing row (add to isolation/codes/clauses.toml):\n[[clause]]\ndocument = "ASCE/SEI 7"\n'
                        'edition = "7-16"\nclause = "§99.9"\ntitle = "<subject>"\nstatus = "from memory"\n'
                        'used_in = ["isolation/new.py"]\n')
    # The skeleton is a row the loader takes once its subject is written.
    skeleton = tmp_path / "one.toml"
    skeleton.write_text(lines[0].split("\n", 1)[1], encoding="utf-8")
    assert load_clauses(skeleton)[0].key == ("ASCE/SEI 7", "7-16", "§99.9")
    assert "used_in of ASCE/SEI 7-16 §17.5.4.2: ('isolation/new.py',)" in lines
    assert "used_in of ASCE/SEI 7-16 §17.2.1: () (no longer cited: remove the row)" in lines


def test_used_in_files_exist():
    for clause in CLAUSES:
        assert clause.used_in, clause.reference
        for path in clause.used_in:
            assert (ROOT / path).is_file(), f"{clause.reference}: used_in names {path!r}, which does not exist"


def test_rows_are_unique_and_well_formed():
    assert len(KEYS) == len(CLAUSES)
    for clause in CLAUSES:
        assert clause.status in STATUSES
        assert clause.title
        if clause.status == "re-read":  # each source names a published text read: a title and where it stands
            assert clause.source, clause.reference
            for text in clause.source:
                assert len(text) > 40 and ("http" in text or "ISBN" in text), clause.reference
        else:
            assert clause.source == (), clause.reference


# --- the data file and its loader --------------------------------------------------------------------

_ROW = """[[clause]]
document = "ASCE/SEI 7"
edition = "7-16"
clause = "§17.2.1"
title = "Importance factor"
status = "from memory"
used_in = ["isolation/codes/asce7.py"]
"""


def test_the_data_file_ships_with_the_package():
    import tomllib
    from importlib import resources

    from isolation.codes.clauses import DATA_FILE

    assert "codes/clauses.toml" in (ROOT / "pyproject.toml").read_text(encoding="utf-8")  # package data
    data = tomllib.loads(resources.files("isolation.codes").joinpath(DATA_FILE).read_text(encoding="utf-8"))
    assert len(data["clause"]) == len(CLAUSES)
    assert load_clauses(ROOT / "isolation" / "codes" / DATA_FILE) == CLAUSES


@pytest.mark.parametrize("text, message", [
    (_ROW.replace('status = "from memory"', 'status = "checked"'),
     r"row 1 \(ASCE/SEI 7 7-16 §17.2.1\): status = 'checked' is not allowed: must be one of \('re-read', "
     r"'from memory'\)"),
    (_ROW.replace('title = "Importance factor"\n', ""), r"row 1 \(ASCE/SEI 7 7-16 §17.2.1\): field 'title' is missing"),
    (_ROW + 'page = "12"\n', r"row 1 \(ASCE/SEI 7 7-16 §17.2.1\): field 'page' is not allowed"),
    (_ROW.replace('used_in = ["isolation/codes/asce7.py"]', 'used_in = "isolation/codes/asce7.py"'),
     r"field 'used_in' = 'isolation/codes/asce7.py' is not allowed: must be a list of file paths"),
    (_ROW.replace('used_in = ["isolation/codes/asce7.py"]', "used_in = []"),
     r"field 'used_in' = \[\] is not allowed: must not be empty"),
    (_ROW.replace('edition = "7-16"', "edition = 16"), r"row 1 \(ASCE/SEI 7 §17.2.1\): field 'edition' = 16 is not"),
    (_ROW.replace('document = "ASCE/SEI 7"', 'document = "NZS 1170.5"'),
     r"field 'document' = 'NZS 1170.5' is not allowed: must be one of \['AASHTO GSID'"),
    (_ROW.replace('status = "from memory"', 'status = "re-read"'), r"source = '' is not allowed for a re-read clause"),
    (_ROW + 'source = "a book"\n', r"source = 'a book' is not allowed for a clause from memory"),
    (_ROW + "source = [1]\n", r"field 'source' = \[1\] is not allowed: must be a string or a list of strings"),
    (_ROW + "\n" + _ROW, r"row 2 \(ASCE/SEI 7-16 §17.2.1\): repeats row 1"),
    ('title = "x"\n' + _ROW, r"must hold \[\[clause\]\] tables only, got top-level keys \['clause', 'title'\]"),
    ("[[clause]\n", r"not valid TOML"),
])
def test_the_loader_names_the_row_and_the_field(tmp_path, text, message):
    path = tmp_path / "clauses.toml"
    path.write_text(text, encoding="utf-8")
    with pytest.raises(ValueError, match=message):
        load_clauses(path)


def test_the_loader_takes_a_well_formed_row(tmp_path):
    path = tmp_path / "clauses.toml"
    path.write_text(_ROW.replace('status = "from memory"', 'status = "re-read"\nsource = "a published text"'),
                    encoding="utf-8")
    (clause,) = load_clauses(path)
    assert (clause.reference, clause.status, clause.source, clause.used_in, clause.note) == (
        "ASCE/SEI 7-16 §17.2.1", "re-read", ("a published text",), ("isolation/codes/asce7.py",), "")
    path.write_text(_ROW.replace('status = "from memory"', 'status = "re-read"\nsource = ["text A", "text B"]'),
                    encoding="utf-8")
    assert load_clauses(path)[0].source == ("text A", "text B")


def test_clause_rejects_an_unknown_status():
    with pytest.raises(ValueError, match="status = 'checked' is not allowed"):
        Clause("ASCE/SEI 7", "7-16", "§17.2.1", "Importance factor", "checked", ("isolation/__init__.py",))


def test_find_clause_defaults_to_the_edition_followed():
    assert find_clause("ASCE/SEI 7", "§17.5.4.2").edition == "7-16"
    assert find_clause("ASCE/SEI 7", "§17.4.1", edition="7-10").edition == "7-10"
    assert find_clause("EN 1998-1", "§10.10(5)").reference == "EN 1998-1:2004 §10.10(5)"
    with pytest.raises(KeyError, match="clause = '§99.9' of ASCE/SEI 7 7-16 is not in the clause table"):
        find_clause("ASCE/SEI 7", "§99.9")
    with pytest.raises(KeyError, match="document = 'NZS 1170.5' is not in the clause table"):
        find_clause("NZS 1170.5", "§5.2")


# --- run-time sources: report items, checks, verdict sources ----------------------------------------

def _sets(period=3.0, damping=0.2, weight=10000.0):
    # k from T = 2 pi sqrt(W/(k g)) (ASCE/SEI 7-16 Eq. 17.5-2).
    k = 4 * math.pi**2 * weight / (G * period**2)
    return {"lower": LinearSystem(k, damping), "nominal": LinearSystem(k, damping), "upper": LinearSystem(k, damping)}


def _strings(value):
    if isinstance(value, str):
        yield value
    elif isinstance(value, dict):
        for v in value.values():
            yield from _strings(v)
    elif isinstance(value, (list, tuple)):
        for v in value:
            yield from _strings(v)


@pytest.mark.parametrize("kind", ["sliding", "other"])
def test_asce7_report_sources_have_rows(kind):
    from isolation.codes.asce7 import ElfBuilding, asce7_elf
    from isolation.site.spectra import CodeSpectrum

    building = ElfBuilding(base_weight=2000.0, floor_weights=(3000.0, 3000.0, 2000.0),
                           floor_elevations=(4.0, 8.0, 12.0), plan_length=40.0, plan_width=20.0,
                           response_modification=8.0, fixed_base_period=None, wind_base_shear=500.0, s1=0.7,
                           site_class="D", isolator_kind=kind)
    report = asce7_elf(_sets(), building, CodeSpectrum(1.5, 0.9))
    texts = list(_strings(report.to_dict()))
    assert any("§17.5.4.2" in t for t in texts)  # the sources did reach the report
    assert _missing(texts) == []


def test_eurocode_report_sources_have_rows():
    from isolation.codes.eurocode import EurocodeBuilding, eurocode_simplified
    from isolation.site.spectra import EurocodeSpectrum

    building = EurocodeBuilding(10000.0, 0.4, 30.0, 20.0, storeys=3, behaviour_factor=3.9,
                                superstructure_weight=7000.0)
    for damping in (0.2, 0.35):  # 35 %: the equivalent-linear limits fail and cite their clause
        report = eurocode_simplified(_sets(2.0, damping), building, EurocodeSpectrum(0.3, "C"))
        texts = list(_strings(report.to_dict()))
        assert any("§10.9" in t for t in texts)
        assert _missing(texts) == []


def test_bearing_check_and_verdict_sources_have_rows():
    from isolation.bearings.checks import LIMITS
    from isolation.verdict import sources

    texts = [source for _, source in LIMITS.values()]
    for topic in sources._SOURCES:
        texts += [sources.source(topic, basis) for basis in sources.BASES]
    texts += [sources.drift_limit(basis)[1] for basis in sources.BASES]
    texts += [sources.drift_limit("eurocode", kind, gamma)[1] for kind in sources.NONSTRUCTURAL for gamma in (1.0, 1.4)]
    assert _missing(texts) == []


# --- the report's appendix -----------------------------------------------------------------------

def test_clause_table_prints_every_row_with_its_status():
    table = clause_table()
    assert table.columns == ("Code", "Clause", "Subject", "Status", "Used in")
    assert len(table.rows) == len(CLAUSES)
    assert table.label == "tab-clauses"
    reread = [c for c in CLAUSES if c.status == "re-read"]
    memory = len(CLAUSES) - len(reread)
    # The split stands in the caption and the notes, counted.
    assert f"({len(reread)} re-read, {memory} from memory)" in table.caption
    assert f"{len(CLAUSES)} clauses: {len(reread)} re-read" in table.notes and f"{memory} from memory" in table.notes
    # Down the column: "from memory", or "re-read [n]" with n the text read, listed under the table.
    for clause, row in zip(CLAUSES, table.rows, strict=True):
        if clause.status == "re-read":
            numbers = [int(n) for n in row[3].removeprefix("re-read [").removesuffix("]").split(", ")]
            assert len(numbers) == len(clause.source)
            for n, text in zip(numbers, clause.source, strict=True):
                assert f"[{n}] {text}" in table.notes
        else:
            assert row[3] == "from memory"
    typst = table._repr_typst_()
    assert "<tab-clauses>" in typst and "breakable: true" in typst  # a long table may run over pages


# --- values of the re-read rows against the code ------------------------------------------------------

def test_clause_table_numbers_each_text_read_once():
    rows = [Clause("ASCE/SEI 7", "7-16", c, "subject", "re-read", ("isolation/codes/asce7.py",), source=s)
            for c, s in (("§17.2.1", "text A"), ("§17.5.4.3", ("text B", "text C")), ("§17.5.6", ("text C", "text A")))]
    rows.insert(1, Clause("EN 1998-1", "2004", "§10.3", "subject", "from memory", ("isolation/codes/eurocode.py",)))
    table = clause_table(rows)
    assert [row[3] for row in table.rows] == ["re-read [1]", "from memory", "re-read [2, 3]", "re-read [3, 1]"]
    assert "Texts read: [1] text A | [2] text B | [3] text C." in table.notes
    assert "(3 re-read, 1 from memory)" in table.caption


def test_risk_categories_follow_table_1_5_2():
    # ASCE/SEI 7-16 Table 1.5-2 (re-read; tests/data names the text read): I_e -> risk category; the loss
    # study's collapse target follows the category (I_e 1.0 is taken as category II, the common case).
    from check_values import read

    from isolation.loss.fragility import COLLAPSE_AT_MCE, collapse_probability_at_mce

    table = read("asce7_16_table_1_5_2.csv")
    assert table.status == find_clause("ASCE/SEI 7", "Table 1.5-2").status == "re-read"
    for row in table.rows:
        if row["risk_category"] != "I":
            assert collapse_probability_at_mce(float(row["I_e"])) == COLLAPSE_AT_MCE[row["risk_category"]]


def test_design_spectrum_is_two_thirds_of_mce_r():
    # ASCE/SEI 7-16 §11.4.5 (from memory): S_DS = 2/3 S_MS and S_D1 = 2/3 S_M1; the design spectrum is
    # the MCE_R one scaled by 2/3 at every period.
    import numpy as np

    from isolation.site.spectra import CodeSpectrum

    assert find_clause("ASCE/SEI 7", "§11.4.5").status == "from memory"
    mce = CodeSpectrum(1.5, 0.9, long_period=8.0)
    periods = np.array([0.0, 0.1, 0.5, 1.0, 3.0, 10.0])
    np.testing.assert_allclose(mce.design().sa(periods), 2.0 / 3.0 * mce.sa(periods), rtol=1e-12)
    design = CodeSpectrum.from_design_values(1.0, 0.6)  # S_DS 1.0, S_D1 0.6 -> S_MS 1.5, S_M1 0.9
    assert (design.sms, design.sm1) == pytest.approx((1.5, 0.9))


def test_site_class_f_cites_the_site_specific_clause_as_re_read():
    # ASCE/SEI 7-16 Table 11.4-2 (re-read) sends site class F to §11.4.8, site-specific procedures.
    from isolation.verdict.sources import source

    assert find_clause("ASCE/SEI 7", "§11.4.8").status == "re-read"
    assert source("soft soil class F", "asce7").startswith("ASCE/SEI 7-16 §11.4.8 (re-read")
