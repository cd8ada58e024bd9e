"""Browser tests: Dash's ``dash_duo`` driving the system Chromium headless.

Run with ``pytest tests/browser --headless``.  Chromium is Debian's
``/usr/bin/chromium`` with ``/usr/bin/chromedriver`` (nothing is downloaded).
"""

import os

import pytest

from webapp.browser import available, chrome_options


def pytest_configure(config):
    config.addinivalue_line("markers", "browser: end-to-end test in headless Chromium")


def pytest_setup_options():
    return chrome_options(headless=False)   # dash_duo adds --headless itself (pytest --headless)


def pytest_collection_modifyitems(config, items):
    here = os.path.dirname(__file__)
    for item in items:
        if str(item.fspath).startswith(here):
            item.add_marker(pytest.mark.browser)
    if not available() and any(str(item.fspath).startswith(here) for item in items):
        if os.environ.get("MODEHEAT_NO_BROWSER"):
            skip = pytest.mark.skip(reason="MODEHEAT_NO_BROWSER is set")
            for item in items:
                if str(item.fspath).startswith(here):
                    item.add_marker(skip)
        else:
            raise pytest.UsageError("Chromium or chromedriver is not installed (apt-get install chromium "
                                    "chromium-driver); set MODEHEAT_NO_BROWSER=1 to skip the browser tests")


@pytest.fixture
def second_browser():
    """A separate headless Chromium session (its own profile and storage)."""
    from selenium import webdriver
    driver = webdriver.Chrome(options=chrome_options())
    yield driver
    driver.quit()
