"""Headless Chromium for the browser tests, the bench and the screenshots (Debian's chromium + chromedriver)."""

from __future__ import annotations

import os
import shutil

#: The browser binary (Debian's ``chromium``); override with ``MODEHEAT_CHROMIUM``.
CHROMIUM = os.environ.get("MODEHEAT_CHROMIUM", "/usr/bin/chromium")
#: Flags for a quiet headless Chromium in a container (no GPU, no background traffic).
FLAGS = ("--no-sandbox", "--disable-gpu", "--disable-background-networking", "--disable-component-update",
         "--disable-sync", "--disable-dev-shm-usage")


def available() -> bool:
    """True when Chromium and chromedriver are installed."""
    return os.path.exists(CHROMIUM) and shutil.which("chromedriver") is not None


def chrome_options(headless=True, width=1280, height=1000, console_log=False):
    """Selenium options for Debian's Chromium (nothing is downloaded)."""
    from selenium.webdriver.chrome.options import Options
    options = Options()
    if os.path.exists(CHROMIUM):
        options.binary_location = CHROMIUM
    for flag in FLAGS + (f"--window-size={width},{height}",) + (("--headless",) if headless else ()):
        options.add_argument(flag)
    if console_log:
        options.set_capability("goog:loggingPrefs", {"browser": "SEVERE"})
    return options


def start(**kwargs):
    """A Chromium WebDriver with :func:`chrome_options`."""
    from selenium import webdriver
    return webdriver.Chrome(options=chrome_options(**kwargs))
