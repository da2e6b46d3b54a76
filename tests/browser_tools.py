"""Shared test helper for the browser tests: Chromium and Playwright, required in CI.

CI sets ISOLATION_REQUIRE_BROWSER=1 (``.ci/run``): a missing Chromium or
Playwright then fails the test instead of skipping it, so a green CI run
always includes the browser checks. Elsewhere the tests skip.
"""

import os
from pathlib import Path

import pytest

ARTEFACTS = Path(os.environ.get("ISOLATION_ARTEFACTS", Path(__file__).resolve().parent.parent / "records" /
                                "test-artefacts"))
"""Folder for screenshots (under records/, which git ignores); ISOLATION_ARTEFACTS overrides it."""


def require_browser() -> None:
    """Fail (CI) or skip when the system Chromium or the playwright package is missing."""
    from isolation.app.explorer.browser import chromium_path

    missing = []
    if chromium_path() is None:
        missing.append("chromium (Debian package 'chromium')")
    try:
        import playwright.sync_api  # noqa: F401
    except ImportError:
        missing.append("playwright (pip install -e .[test])")
    if missing:
        message = f"{', '.join(missing)} missing"
        if os.environ.get("ISOLATION_REQUIRE_BROWSER") == "1":
            pytest.fail(f"ISOLATION_REQUIRE_BROWSER=1 but {message}")
        pytest.skip(message)
