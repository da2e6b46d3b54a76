"""The explorer page in a real browser: Voila serves it, headless Chromium drives it.

The numbers on the page must equal the core's (:func:`isolation.app.explorer.answers.explore`
run here, in the test process); the plots must change with the input. Screenshots
are saved under records/test-artefacts/explorer/ (git ignores records/).
Skips without Chromium or Playwright, fails instead in CI (ISOLATION_REQUIRE_BROWSER=1).
"""

from __future__ import annotations

import base64
import subprocess
import sys

import pytest

from browser_tools import ARTEFACTS, require_browser
from isolation.app.explorer import answers as explore

pytestmark = pytest.mark.slow

_CHANGED = """([key, old]) => {
  const td = document.querySelector(`.isolation-explorer td[data-key="${key}"]`);
  return td !== null && td.dataset.value !== old;
}"""


def _value(page, key: str) -> str:
    return page.locator(f'.isolation-explorer td[data-key="{key}"]').get_attribute("data-value")


def _wait_changed(page, key: str, old: str) -> None:
    page.wait_for_function(_CHANGED, arg=[key, old], timeout=60_000)
    page.wait_for_timeout(300)  # let the rest of the same update arrive


def _assert_core(page, expected: explore.ExplorerAnswer) -> None:
    from isolation.app.explorer.browser import values

    shown = values(page)
    for key, value in expected.quantities.items():
        if key in shown:
            assert shown[key] == pytest.approx(value, rel=1e-12), key
    for case, result in expected.results.items():
        assert shown[f"{case}-D"] == pytest.approx(result.displacement, rel=1e-12)
        assert shown[f"{case}-T"] == pytest.approx(result.period, rel=1e-12)
        assert shown[f"{case}-Vb"] == pytest.approx(result.base_shear, rel=1e-12)


def _marks(page, figure: str) -> str:
    """The drawn marks of one bqplot figure (their SVG), to see that the plot changed."""
    return page.locator(f".iso-figure-{figure}").evaluate(
        "f => Array.from(f.querySelectorAll('path')).map(p => (p.getAttribute('d') || '') + "
        "(p.parentNode.getAttribute('transform') || '')).join('|')")


def test_explorer_page_follows_input_and_equals_the_core(tmp_path):
    require_browser()
    from playwright.sync_api import sync_playwright

    from isolation.app.explorer.browser import ExplorerServer, launch, open_explorer, screenshot, values

    shots = ARTEFACTS / "explorer"
    with ExplorerServer() as server, sync_playwright() as playwright:
        browser = launch(playwright)
        try:
            page = open_explorer(browser, server.url, width=1280, height=900)
            page.wait_for_timeout(500)
            screenshot(page, shots, "01-start")
            _assert_core(page, explore.explore())
            # Controls and answers side by side on a 1280 px screen: nothing runs off the right edge.
            box = page.locator(".iso-quantities").bounding_box()
            assert box["x"] + box["width"] <= 1280
            entry_box = page.locator(".iso-entry-weight input").bounding_box()
            assert entry_box["x"] + entry_box["width"] <= box["x"]

            # Switch the bearing type: only its controls stay visible.
            spectrum, loops = _marks(page, "spectrum"), _marks(page, "loops")
            old = _value(page, "total_displacement")
            page.get_by_role("button", name="lead rubber", exact=True).click()
            _wait_changed(page, "total_displacement", old)
            assert page.locator(".iso-row-lead_diameter").is_visible()
            assert not page.locator(".iso-row-radius").is_visible()
            assert not page.locator(".iso-row-friction").is_visible()
            _assert_core(page, explore.explore(bearing_type="lead rubber"))
            assert _marks(page, "spectrum") != spectrum and _marks(page, "loops") != loops

            # Type a value: the entry keeps every digit and the answer uses it.
            entry = page.locator(".iso-entry-lead_diameter input")
            old = _value(page, "total_displacement")
            entry.fill("0.145")
            entry.press("Tab")
            _wait_changed(page, "total_displacement", old)
            assert entry.input_value() == "0.145"
            _assert_core(page, explore.explore(bearing_type="lead rubber", lead_diameter=0.145))

            # Move a slider one step with the keyboard; watch for the busy cue meanwhile.
            page.evaluate("""() => { window.__busy = false; const root = document.querySelector('.isolation-explorer');
                new MutationObserver(() => { if (root.classList.contains('iso-busy')) window.__busy = true; })
                  .observe(root, {attributes: true, attributeFilter: ['class']}); }""")
            loops = _marks(page, "loops")
            old = _value(page, "total_displacement")
            handle = page.locator(".iso-slider-layers .noUi-handle")
            handle.focus()
            page.keyboard.press("ArrowRight")
            _wait_changed(page, "total_displacement", old)
            assert page.locator(".iso-entry-layers input").input_value() == "21"
            _assert_core(page, explore.explore(bearing_type="lead rubber", lead_diameter=0.145, layers=21))
            assert _marks(page, "loops") != loops
            assert page.evaluate("() => window.__busy")
            screenshot(page, shots, "02-lead-rubber")

            # An absurd input gets a word: a lead core of 0.35 m in a 0.40 m bearing.
            for field, value in (("outer_diameter", "0.4"), ("lead_diameter", "0.35")):
                old = _value(page, "total_displacement")
                entry = page.locator(f".iso-entry-{field} input")
                entry.fill(value)
                entry.press("Tab")
                _wait_changed(page, "total_displacement", old)
            assert "Lead core" in page.locator(".iso-warnings").inner_text()

            # Export: the downloaded study passes `python -m isolation check`.
            page.get_by_role("button", name="Export study file").click()
            link = page.locator("a.iso-download")
            link.wait_for(timeout=30_000)
            href = link.get_attribute("href")
            study = tmp_path / "exported.toml"
            study.write_bytes(base64.b64decode(href.split(",", 1)[1]))
            done = subprocess.run([sys.executable, "-m", "isolation", "check", str(study)], capture_output=True,
                                  text=True)
            assert done.returncode == 0, done.stderr
            page.set_viewport_size({"width": 1280, "height": 2600})
            screenshot(page, shots, "03-warning-and-export")

            # The bearing layout: a grid of 10 x 2 and an eccentricity change the per-bearing answers, which
            # stay the core's (isolation.study.layout.layout_demands through isolation.app.explorer.answers).
            for field, value, key in (("grid_along", "10", "bearing_axial_min"),
                                      ("eccentricity", "2", "bearing_displacement_max")):
                old = _value(page, key)
                entry = page.locator(f".iso-entry-{field} input")
                entry.fill(value)
                entry.press("Tab")
                _wait_changed(page, key, old)
            layout = {"grid_along": 10, "eccentricity": 2.0}
            assert "10 x 2" in page.locator(".iso-layout").inner_text()
            _assert_core(page, explore.explore(bearing_type="lead rubber", lead_diameter=0.35, outer_diameter=0.4,
                                               layers=21, **layout))

            # US units: every entry converts (none clamped to a slider end), the answer stays.
            page.get_by_role("button", name="US", exact=True).click()
            page.wait_for_function("() => document.querySelector('.iso-summary').innerText.includes('D [in]')",
                                   timeout=60_000)
            page.wait_for_timeout(1500)
            # 40 m = 1574.80 in and 4 m = 157.480 in (1 in = 25.4 mm exactly, NIST SP 811), 6 digits shown.
            assert float(page.locator(".iso-entry-plan_length input").input_value()) == pytest.approx(1574.80, abs=0.01)
            assert float(page.locator(".iso-entry-storey_height input").input_value()) == pytest.approx(157.480,
                                                                                                     abs=0.001)
            assert float(page.locator(".iso-entry-outer_diameter input").input_value()) == pytest.approx(15.748,
                                                                                                      abs=0.001)
            expected = explore.explore(bearing_type="lead rubber", lead_diameter=0.35, outer_diameter=0.4, layers=21,
                                       **layout)
            shown = values(page)
            assert shown["total_displacement"] == pytest.approx(expected.quantities["total_displacement"], rel=1e-4)
            screenshot(page, shots, "04-us-units")
        finally:
            browser.close()


def test_explore_workbook_in_jupyterlab_fits_and_saves_no_outputs(tmp_path):
    """Open the workbook in JupyterLab (file browser open, 1366 px), run it, save it: the explorer's
    entries and answers stay on screen, and the file on disk is byte for byte what it was."""
    require_browser()
    import shutil
    import socket
    import time
    from pathlib import Path

    from playwright.sync_api import sync_playwright

    from isolation.app.explorer.app import free_port
    from isolation.app.explorer.browser import launch, screenshot

    source = Path(__file__).resolve().parents[2] / "workbooks" / "explore.ipynb"
    (tmp_path / "isolation").mkdir()
    (tmp_path / "isolation" / "__init__.py").write_text("")  # the layout of the repository
    (tmp_path / "workbooks").mkdir()
    workbook = tmp_path / "workbooks" / "explore.ipynb"
    shutil.copyfile(source, workbook)
    before = workbook.read_bytes()
    stamp = workbook.stat().st_mtime_ns
    port = free_port()
    server = subprocess.Popen(
        [sys.executable, "-m", "jupyter", "lab", "--no-browser", f"--port={port}", "--ServerApp.ip=127.0.0.1",
         "--IdentityProvider.token=", "--ServerApp.password=", f"--ServerApp.root_dir={tmp_path}",
         "--LabApp.expose_app_in_browser=True", "--allow-root"],
        stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    try:
        deadline = time.monotonic() + 120
        while time.monotonic() < deadline:
            try:
                socket.create_connection(("127.0.0.1", port), timeout=1).close()
                break
            except OSError:
                time.sleep(0.5)
        with sync_playwright() as playwright:
            browser = launch(playwright)
            try:
                page = browser.new_page(viewport={"width": 1366, "height": 900})
                page.goto(f"http://127.0.0.1:{port}/lab/tree/workbooks/explore.ipynb", timeout=180_000)
                page.wait_for_function("() => window.jupyterapp && document.querySelector('.jp-Notebook')",
                                       timeout=180_000)
                page.wait_for_timeout(3000)
                page.evaluate("() => window.jupyterapp.commands.execute('notebook:run-all-cells')")
                page.wait_for_selector(".isolation-explorer .iso-quantities td[data-key]", timeout=180_000)
                page.wait_for_timeout(1500)
                _assert_core(page, explore.explore())
                panel = page.locator(".jp-NotebookPanel").bounding_box()
                for selector in (".iso-entry-friction input", ".iso-quantities", ".iso-summary"):
                    element = page.locator(selector)
                    element.scroll_into_view_if_needed()
                    box = element.bounding_box()
                    assert box["x"] >= panel["x"] and box["x"] + box["width"] <= panel["x"] + panel["width"], selector
                page.locator(".isolation-explorer").scroll_into_view_if_needed()
                screenshot(page, ARTEFACTS / "explorer", "05-jupyterlab-1366")
                page.evaluate("() => window.jupyterapp.commands.execute('docmanager:save')")
                page.wait_for_timeout(3000)
            finally:
                browser.close()
    finally:
        server.terminate()
        try:
            server.wait(timeout=15)
        except subprocess.TimeoutExpired:
            server.kill()
    assert workbook.stat().st_mtime_ns != stamp  # JupyterLab did write the file ...
    assert workbook.read_bytes() == before  # ... and it is byte for byte what it was
