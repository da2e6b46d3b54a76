"""Evidence inside the repository: tests and package name their published sources directly.

A check's source is a document, table or equation with its edition, or "common practice" /
"from memory", written beside it; never a note or file outside the repository, which a reader
of the repository cannot open.
"""

import importlib
import inspect
import re
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[1]
OUTSIDE = re.compile(r"\.\./shared|shared/reference|shared reference|isolation-formulas\.md|motions-and-dynamics\.md"
                     r"|models-for-the-next-step\.md|/work/")


def test_no_source_points_outside_the_repository():
    offenders = []
    for folder in ("isolation", "tests", "benchmarks", "workbooks", "examples"):
        for path in sorted((ROOT / folder).rglob("*")):
            if path.suffix not in (".py", ".ipynb", ".toml", ".md") or path == Path(__file__).resolve():
                continue
            for number, line in enumerate(path.read_text(encoding="utf-8").splitlines(), 1):
                if OUTSIDE.search(line):
                    offenders.append(f"{path.relative_to(ROOT)}:{number}: {line.strip()}")
    assert not offenders, "name the published source instead:\n" + "\n".join(offenders)


# --- References per function (issue 9: "references per function with DOIs where they exist") ---------------------

# A DOI as the DOI Handbook (International DOI Foundation, section 2.2, from memory) writes it: the directory
# indicator "10.", a registrant code of digits (dot-separated sub-codes allowed), "/", a suffix of printable
# characters; written here as "doi:10.xxxx/...", ending at white space and not in a full stop or comma
# (common practice: a sentence's punctuation is not part of the DOI).
DOI_SHAPE = re.compile(r"^10\.\d{4,9}(\.\d+)*/[-._;()/:A-Za-z0-9]*[A-Za-z0-9)]$")
DOI_WRITTEN = re.compile(r"\bdoi:\s*(\S+)", re.IGNORECASE)

# Functions and classes that implement a published formula or model: each names its source in a numpydoc
# "References" section (author, year; the DOI where one exists and was checked, else "DOI not verified").
MODEL_REFERENCES = {
    "isolation.bearings.laws.BoucWen": ["Wen, Y.-K. (1976)"],
    "isolation.bearings.laws.SmoothLaw": ["Wen, Y.-K. (1976)", "Constantinou, M. C., Mokha, A. & Reinhorn"],
    "isolation.bearings.friction.FrictionPendulum": ["Zayas, V. A., Low, S. S. & Mahin", "Constantinou"],
    "isolation.bearings.double_concave.DoubleConcave": ["Fenz, D. M. & Constantinou, M. C. (2006)",
                                                        "doi:10.1002/eqe.589"],
    "isolation.bearings.triple_pendulum.TripleFrictionPendulum": ["(2008a)", "doi:10.1002/eqe.751", "(2008c)"],
    "isolation.bearings.checks.hole_factor": ["Constantinou, M. C., Kartoum, A. & Kelly"],
    "isolation.bearings.checks.compression_modulus": ["Kelly, J. M. & Konstantinidis", "Kartoum"],
    "isolation.bearings.checks.buckling_load": ["Kelly, J. M. & Konstantinidis, D. A. (2011)"],
    "isolation.motions.spectrum.response_spectrum": ["Nigam, N. C. & Jennings, P. C. (1969)"],
    "isolation.dynamics.oscillator.oscillator_response": ["Nigam, N. C. & Jennings, P. C. (1969)"],
    "isolation.motions.pair_spectra.rotd100_spectrum": ["Boore, D. M. (2010)", "doi:10.1785/0120090400"],
    "isolation.motions.pair_spectra.rotd_spectrum": ["Boore, D. M. (2010)", "doi:10.1785/0120090400"],
    "isolation.motions.matching.matched_suite": ["Gasparini", "Preumont, A. (1984)", "Al Atik"],
    "isolation.motions.wavelets.adjustment_wavelets": ["Al Atik, L. & Abrahamson, N. (2010)",
                                                       "doi:10.1193/1.3459159"],
    "isolation.motions.wavelets.wavelet_step": ["Al Atik, L. & Abrahamson, N. (2010)"],
    "isolation.motions.envelope.intensity_envelope": ["Jennings, P. C., Housner, G. W. & Tsai"],
    "isolation.loss.hazard.annual_rate": ["Cornell, C. A., Jalayer, F., Hamburger"],
    "isolation.dynamics.newmark.simulate": ["Newmark, N. M. (1959)"],
    "isolation.dynamics.plan_bearings.smooth_update": ["Park, Y. J., Wen, Y. K. & Ang"],
}


def _python_files():
    return sorted((ROOT / "isolation").rglob("*.py"))


def test_every_doi_in_the_package_is_well_formed():
    written = []
    for path in _python_files():
        for number, line in enumerate(path.read_text(encoding="utf-8").splitlines(), 1):
            for doi in DOI_WRITTEN.findall(line):
                written.append((f"{path.relative_to(ROOT)}:{number}", doi))
    assert len(written) >= 8  # the package does cite DOIs: an empty search would prove nothing
    bad = [f"{where}: {doi!r}" for where, doi in written if not DOI_SHAPE.match(doi)]
    assert not bad, "malformed DOI (write doi:10.<registrant>/<suffix>, no trailing punctuation):\n" + "\n".join(bad)


def test_the_doi_shape_refuses_what_it_should():
    assert DOI_SHAPE.match("10.1061/(ASCE)0733-9445(1993)119:1(240)")
    assert DOI_SHAPE.match("10.1002/eqe.4290140405")
    for wrong in ("10.1002/eqe.589.", "10.1002/eqe.589,", "11.1002/eqe.589", "10.10/x", "10.1002eqe.589",
                  "https://doi.org/10.1002/eqe.589"):
        assert not DOI_SHAPE.match(wrong), wrong


@pytest.mark.parametrize("dotted", sorted(MODEL_REFERENCES))
def test_a_model_function_names_its_published_source(dotted):
    module, _, name = dotted.rpartition(".")
    doc = inspect.getdoc(getattr(importlib.import_module(module), name)) or ""
    assert "\nReferences\n----------\n" in doc, f"{dotted}: no numpydoc References section"
    section = doc.split("\nReferences\n----------\n", 1)[1]
    for needed in MODEL_REFERENCES[dotted]:
        assert needed in " ".join(section.split()), f"{dotted}: References lacks {needed!r}"
    for doi in DOI_WRITTEN.findall(section):
        assert DOI_SHAPE.match(doi), f"{dotted}: malformed DOI {doi!r}"
