"""Save a PNG of every dashboard page with headless Chromium (selenium).

Usage: start the server (``python -m webapp``), then
``python -m webapp.screenshots [--url http://127.0.0.1:8050] [--out docs/screenshots]``.
Also prints any browser console error, one per line.
"""

from __future__ import annotations

import argparse
import sys
import time
from pathlib import Path


def browser(width=1280, height=1000):
    """Headless Chromium for the screenshots (shared options of :mod:`webapp.browser`)."""
    from .browser import start
    driver = start(width=width, height=height, console_log=True)
    return driver


def wait_for_plots(driver, timeout=30.0):
    """Wait until no loading indicator shows and every graph has drawn."""
    deadline = time.time() + timeout
    script = ("return document.querySelectorAll('.js-plotly-plot .main-svg').length >= "
              "document.querySelectorAll('.dash-graph').length && "
              "!document.querySelector('[data-dash-is-loading=\"true\"]') && "
              "!document.querySelector('._dash-loading');")
    while time.time() < deadline:
        if driver.execute_script(script):
            time.sleep(0.8)
            return True
        time.sleep(0.2)
    return False


def main(argv=None) -> int:
    """Save a PNG of every page of a running dashboard; returns the exit code."""
    from .pages import PAGES
    p = argparse.ArgumentParser(prog="python -m webapp.screenshots")
    p.add_argument("--url", default="http://127.0.0.1:8050")
    p.add_argument("--out", default="docs/screenshots")
    args = p.parse_args(argv)
    out = Path(args.out)
    out.mkdir(parents=True, exist_ok=True)
    driver = browser()
    errors = 0
    try:
        for module in PAGES:
            driver.get(args.url.rstrip("/") + module.PATH)
            if not wait_for_plots(driver):
                print(f"{module.PATH}: plots did not finish", file=sys.stderr)
            height = driver.execute_script("return document.body.scrollHeight")
            driver.set_window_size(1280, min(max(height + 40, 900), 4000))
            wait_for_plots(driver, 10)
            name = (module.PATH.strip("/") or "overview") + ".png"
            driver.save_screenshot(str(out / name))
            driver.set_window_size(1280, 1000)
            for entry in driver.get_log("browser"):
                errors += 1
                print(f"{module.PATH}: console: {entry['message'][:300]}", file=sys.stderr)
            print(out / name)
    finally:
        driver.quit()
    return 1 if errors else 0


if __name__ == "__main__":
    sys.exit(main())
