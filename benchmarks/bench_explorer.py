"""Benchmark of the live explorer: input to updated plot in a real browser.

Run: ``python -m benchmarks explorer`` (needs the Debian package ``chromium``
and the test extra's ``playwright``).

``python -m isolation explore`` serves the page (Voila, 127.0.0.1); headless
Chromium loads it. For each kind of change - a value typed into an entry, a
slider moved one step with the keyboard, the bearing type switched - the page
records when the input event fired (``performance.now()`` in a capturing
listener) and when the last change inside the spectrum and loop figures was
drawn (a MutationObserver); the difference is the latency a person sees.

Target (issue 13): median <= 150 ms per change on the development machine.
Printed: median and max per kind of change, and the ratio of the overall
median to a reference run in this process - the median time of the
callback itself (:func:`isolation.app.explorer.answers.explore`) for the same settings -
i.e. how much the browser, the widget messages and drawing add over the core.
"""

from __future__ import annotations

import statistics
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
if str(ROOT) not in sys.path:
    sys.path.insert(0, str(ROOT))

TARGET_MS = 150.0
REPEATS = 8

_LISTEN = """() => {
  window.__iso = {marks: [], t0: null};
  for (const kind of ['change', 'keydown', 'click']) {
    document.addEventListener(kind, () => { if (window.__iso.t0 === null) window.__iso.t0 = performance.now(); }, true);
  }
  for (const selector of ['.iso-figure-spectrum', '.iso-figure-loops']) {
    new MutationObserver(() => window.__iso.marks.push(performance.now()))
      .observe(document.querySelector(selector),
               {subtree: true, attributes: true, childList: true, characterData: true});
  }
}"""

_SETTLED = """(quiet) => { const m = window.__iso.marks;
  return m.length > 0 && performance.now() - m[m.length - 1] > quiet; }"""


def _measure(page, action) -> float:
    """Latency [ms] of one change: input event to the last redraw of the plots."""
    page.evaluate("() => { window.__iso.marks = []; window.__iso.t0 = null; }")
    action()
    page.wait_for_function(_SETTLED, arg=400, timeout=20_000, polling=50)
    return page.evaluate("() => window.__iso.marks[window.__iso.marks.length - 1] - window.__iso.t0")


def _type(page, field: str, value: str):
    """A value typed and committed (the entry's change event, as Enter or leaving the field fires it)."""
    def action():
        page.locator(f".iso-entry-{field} input").evaluate(
            "(e, v) => { e.value = v; e.dispatchEvent(new Event('change', {bubbles: true})); }", value)
    return action


def _slide(page, field: str, key: str):
    def action():
        page.locator(f".iso-slider-{field} .noUi-handle").focus()
        page.keyboard.press(key)
    return action


def _switch(page, name: str):
    return lambda: page.get_by_role("button", name=name, exact=True).click()


def main() -> None:
    from playwright.sync_api import sync_playwright

    from isolation.app.explorer import answers as explore
    from isolation.app.explorer.browser import ExplorerServer, chromium_path, launch, open_explorer

    if chromium_path() is None:
        print("chromium missing (Debian package 'chromium'): benchmark not run")
        return
    explore.explore()  # warm the caches before the reference
    reference = []
    for friction in (0.05, 0.06, 0.07, 0.08) * 3:
        started = time.perf_counter()
        explore.explore(friction=friction)
        reference.append(1000 * (time.perf_counter() - started))
    core = statistics.median(reference)
    print(f"reference explore() in process: median {core:.1f} ms, max {max(reference):.1f} ms")

    with ExplorerServer() as server, sync_playwright() as playwright:
        browser = launch(playwright)
        try:
            page = open_explorer(browser, server.url)
            page.evaluate(_LISTEN)
            kinds = {
                "type a value (friction)": [_type(page, "friction", f"{0.05 + 0.005 * (i % 4):.3f}")
                                            for i in range(REPEATS)],
                "move a slider (radius)": [_slide(page, "radius", "ArrowRight" if i % 2 == 0 else "ArrowLeft")
                                           for i in range(REPEATS)],
                "switch bearing type": [_switch(page, ("lead rubber", "friction pendulum")[i % 2])
                                        for i in range(REPEATS)],
            }
            everything = []
            for name, actions in kinds.items():
                times = [_measure(page, action) for action in actions]
                everything += times
                print(f"{name:28s} median {statistics.median(times):6.1f} ms  max {max(times):6.1f} ms  "
                      f"(n = {len(times)})")
        finally:
            browser.close()
    median = statistics.median(everything)
    verdict = "meets" if median <= TARGET_MS else "misses"
    print(f"all changes: median {median:.1f} ms, max {max(everything):.1f} ms; {verdict} the "
          f"{TARGET_MS:.0f} ms target; ratio to the in-process callback {median / core:.1f}")


if __name__ == "__main__":
    main()
