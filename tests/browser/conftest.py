"""Browser tests: Dash's ``dash_duo`` driving the system Chromium headless.

Run with ``pytest tests/browser --headless``.  Chromium is Debian's
``/usr/bin/chromium`` with ``/usr/bin/chromedriver`` (nothing is downloaded).
"""

import os
import shutil

import pytest
from selenium.webdriver.chrome.options import Options

CHROMIUM = os.environ.get("MODEHEAT_CHROMIUM", "/usr/bin/chromium")


def pytest_configure(config):
    config.addinivalue_line("markers", "browser: end-to-end test in headless Chromium")


def chrome_options():
    """Chromium options shared by the fixtures and the second, isolated browser."""
    options = Options()
    if os.path.exists(CHROMIUM):
        options.binary_location = CHROMIUM
    for flag in ("--no-sandbox", "--disable-gpu", "--disable-background-networking",
                 "--disable-component-update", "--disable-sync", "--disable-dev-shm-usage",
                 "--window-size=1280,1000"):
        options.add_argument(flag)
    return options


def pytest_setup_options():
    return chrome_options()


def pytest_collection_modifyitems(config, items):
    here = os.path.dirname(__file__)
    for item in items:
        if str(item.fspath).startswith(here):
            item.add_marker(pytest.mark.browser)
    if not (os.path.exists(CHROMIUM) and shutil.which("chromedriver")):
        skip = pytest.mark.skip(reason="Chromium or chromedriver not installed")
        for item in items:
            if str(item.fspath).startswith(here):
                item.add_marker(skip)


@pytest.fixture
def second_browser():
    """A separate headless Chromium session (its own profile and storage)."""
    from selenium import webdriver
    options = chrome_options()
    options.add_argument("--headless")
    driver = webdriver.Chrome(options=options)
    yield driver
    driver.quit()
