"""Drive the explorer page in a headless browser (for the browser tests and the latency benchmark).

Uses Playwright from PyPI with the system's Chromium (``shutil.which("chromium")``;
Playwright's own browser download is not used). :class:`ExplorerServer`
starts ``python -m isolation explore`` on a free port and stops it again;
:func:`open_explorer` loads the page and waits for the first answer.
"""

from __future__ import annotations

import os
import re
import shutil
import subprocess
import sys
import time
from pathlib import Path

__all__ = ["LAUNCH_ARGS", "chromium_path", "ExplorerServer", "launch", "open_explorer", "values",
           "OBSERVE_SCRIPT"]

LAUNCH_ARGS = ["--headless", "--no-sandbox", "--disable-gpu", "--disable-background-networking",
               "--disable-component-update", "--disable-sync", "--no-first-run"]
"""Chromium flags: no GPU, no sandbox (root in CI), no network of its own."""


def chromium_path() -> str | None:
    """The system Chromium, or None when it is not installed."""
    return shutil.which("chromium") or shutil.which("chromium-browser")


class ExplorerServer:
    """``python -m isolation explore --port N`` as a context manager; ``url`` once started."""

    def __init__(self, port: int | None = None, timeout: float = 120.0) -> None:
        from isolation.app.explorer.app import free_port

        self.port = port or free_port()
        self.timeout = timeout
        self.url = ""
        self.process: subprocess.Popen | None = None
        self.log: list[str] = []

    def __enter__(self) -> "ExplorerServer":
        env = dict(os.environ, PYTHONUNBUFFERED="1")
        self.process = subprocess.Popen([sys.executable, "-m", "isolation", "explore", "--port", str(self.port)],
                                        stdout=subprocess.PIPE, stderr=subprocess.STDOUT, text=True, env=env)
        deadline = time.monotonic() + self.timeout
        assert self.process.stdout is not None
        while time.monotonic() < deadline:
            line = self.process.stdout.readline()
            if not line:
                break
            self.log.append(line)
            found = re.search(r"(http://127\.0\.0\.1:\d+/)", line)
            if found and not self.url:
                self.url = found.group(1)
            if "is running at" in line or "Voilà is running" in line or "Voila is running" in line:
                break
        if not self.url:
            self.__exit__(None, None, None)
            raise RuntimeError("the explorer server did not start: " + "".join(self.log)[-2000:])
        return self

    def __exit__(self, *exc) -> None:
        if self.process is not None and self.process.poll() is None:
            self.process.terminate()
            try:
                self.process.wait(timeout=15)
            except subprocess.TimeoutExpired:
                self.process.kill()
                self.process.wait(timeout=5)


def launch(playwright):
    """A headless system Chromium through Playwright."""
    path = chromium_path()
    if path is None:
        raise RuntimeError("chromium is not installed (Debian package 'chromium')")
    return playwright.chromium.launch(executable_path=path, args=LAUNCH_ARGS, headless=True)


def open_explorer(browser, url: str, *, width: int = 1280, height: int = 900, timeout: float = 180.0):
    """A page on the explorer, once its first answer is shown."""
    page = browser.new_page(viewport={"width": width, "height": height})
    page.goto(url, timeout=timeout * 1000)
    page.wait_for_selector(".isolation-explorer .iso-quantities td[data-key]", timeout=timeout * 1000)
    return page


def values(page) -> dict:
    """Every ``data-key`` cell's SI ``data-value`` on the page, as floats."""
    return page.evaluate("""() => Object.fromEntries(Array.from(
        document.querySelectorAll('.isolation-explorer td[data-key][data-value]'))
        .map(td => [td.dataset.key, parseFloat(td.dataset.value)]))""")


OBSERVE_SCRIPT = """() => {
  window.__iso = {marks: []};
  const targets = ['.iso-figure-spectrum', '.iso-figure-loops'];
  for (const selector of targets) {
    const node = document.querySelector(selector);
    new MutationObserver(() => window.__iso.marks.push(performance.now()))
      .observe(node, {subtree: true, attributes: true, childList: true, characterData: true});
  }
}"""
"""Page script: timestamps (performance.now) of every change inside the spectrum and loop figures."""


def screenshot(page, folder: str | Path, name: str) -> Path:
    """Save a full-page screenshot as ``folder/name.png``; returns its path."""
    folder = Path(folder)
    folder.mkdir(parents=True, exist_ok=True)
    path = folder / f"{name}.png"
    page.screenshot(path=str(path), full_page=True)
    return path
