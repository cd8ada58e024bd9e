"""Security headers and the Content-Security-Policy hold in a real headless Chromium.

The dashboard is served by ``dash_duo`` (the real app); every page is visited and
Chromium's console must stay free of errors (a CSP violation is logged there as SEVERE).
"""

import pytest
import requests
from tests.browser.waits import until
from selenium.webdriver.common.by import By

from webapp.app import create_app
from webapp.pages import PAGES

pytestmark = pytest.mark.browser


def test_every_page_renders_under_the_csp_without_console_errors(dash_duo):
    dash_duo.start_server(create_app())
    r = requests.get(dash_duo.server_url + "/", timeout=10)
    csp = r.headers["Content-Security-Policy"]
    assert "script-src 'self' 'sha256-" in csp and "'unsafe-inline'" not in csp.split("script-src")[1].split(";")[0]
    assert r.headers["X-Content-Type-Options"] == "nosniff" and r.headers["X-Frame-Options"] == "DENY"
    for page in PAGES:
        dash_duo.driver.get(dash_duo.server_url + page.PATH)
        until(lambda: dash_duo.driver.find_elements(By.CSS_SELECTOR, ".mh-main h1"), timeout=20)
        dash_duo.wait_for_no_elements("._dash-loading", timeout=20)
    logs = dash_duo.get_logs()
    assert logs == [], logs
    # the policy is really enforced: an inline script injected into the page is blocked and reported
    dash_duo.driver.execute_script(
        "var s = document.createElement('script'); s.textContent = 'window.__mh_inline = 1;';"
        "document.body.appendChild(s);")
    assert dash_duo.driver.execute_script("return window.__mh_inline === undefined")
