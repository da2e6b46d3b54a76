"""Shared test helper: external programs the PDF path needs.

CI sets ISOLATION_REQUIRE_TEX=1: a missing program then fails the test instead
of skipping it, so a green CI run always includes the PDF checks.
"""

import os
import shutil

import pytest

from isolation.output import report

PDF_READERS = ("pdftotext", "pdfinfo")


def require_tools(*names: str, skip: bool = True) -> list[str]:
    """Fail (CI) or skip when any of ``names`` is not on PATH; return the missing ones.

    With ``skip=False`` the test goes on without them (e.g. to check the HTML
    fallback) unless CI requires them.
    """
    missing = [name for name in names if shutil.which(name) is None]
    if missing:
        message = f"{', '.join(missing)} missing"
        if os.environ.get("ISOLATION_REQUIRE_TEX") == "1":
            pytest.fail(f"ISOLATION_REQUIRE_TEX=1 but {message}")
        if skip:
            pytest.skip(message)
    return missing


def require_pdf_tools() -> None:
    """The report's TeX tools and the PDF readers the tests use."""
    require_tools(*report.missing_tools(), *PDF_READERS)


class LinearSystem:
    """Test double: constant effective stiffness [kN/m] and damping [-]."""

    def __init__(self, stiffness, damping):
        self.stiffness, self.damping = stiffness, damping

    def effective_stiffness(self, d):
        return self.stiffness

    def effective_damping(self, d):
        return self.damping

    def force(self, d):
        return self.stiffness * d
