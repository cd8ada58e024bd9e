"""Browser tests: Dash's ``dash_duo`` driving the system Chromium headless.

Run with ``pytest tests/browser --headless``.  Chromium is Debian's
``/usr/bin/chromium`` with ``/usr/bin/chromedriver`` (nothing is downloaded).
"""

import os

import pytest
from dash.testing.application_runners import ThreadedRunner

from tests.ports import worker_port
from webapp.browser import CHROMIUM, available, chrome_options

MISSING = (f"Chromium ({CHROMIUM}) or chromedriver is not installed: run `make test` (it installs them) "
           "or `sudo apt-get install chromium chromium-driver`")

_threaded_start = ThreadedRunner.start


def _start_on_worker_port(self, app, start_timeout=3, **kwargs):
    """``dash_duo.start_server`` on this xdist worker's own port (tests/ports.py)."""
    kwargs["port"] = worker_port(kwargs.get("port", 8050))
    return _threaded_start(self, app, start_timeout, **kwargs)


ThreadedRunner.start = _start_on_worker_port


def pytest_configure(config):
    config.addinivalue_line("markers", "browser: end-to-end test in headless Chromium")


def pytest_setup_options():
    return chrome_options(headless=False)   # dash_duo adds --headless itself (pytest --headless)


@pytest.hookimpl(tryfirst=True)   # before ``-m "not browser"`` deselects by this marker
def pytest_collection_modifyitems(config, items):
    here = os.path.dirname(__file__)
    for item in items:
        if str(item.fspath).startswith(here):
            item.add_marker(pytest.mark.browser)


@pytest.fixture(autouse=True)
def _browser_installed():
    """Without Chromium a browser test fails with one line naming the command (never a skip)."""
    if not available():
        pytest.fail(MISSING, pytrace=False)


@pytest.fixture
def second_browser():
    """A separate headless Chromium session (its own profile and storage)."""
    from selenium import webdriver
    driver = webdriver.Chrome(options=chrome_options())
    yield driver
    driver.quit()
