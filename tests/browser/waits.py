"""The one way browser tests wait: on a state of the page, never on a fixed time.

``until(condition)`` polls ``condition()`` until it returns something true and returns that.
An element that is being redrawn (stale) or not drawn yet counts as "not yet", so a test never
fails on a race with the page re-rendering.  The timeout is generous (a loaded CI machine
draws slowly); it bounds a hang, it is not a speed requirement.
"""

from __future__ import annotations

import time

from selenium.common.exceptions import NoSuchElementException, StaleElementReferenceException

#: Default bound on one wait [s]: reached only when the page never gets to the state.
TIMEOUT = 90.0
_NOT_YET = (StaleElementReferenceException, NoSuchElementException)


def until(condition, timeout: float = TIMEOUT, poll: float = 0.1, msg: str | None = None):
    """Poll ``condition()`` until it is truthy; return its value.

    A ``timeout`` below :data:`TIMEOUT` is raised to it: a short bound only makes a loaded
    machine fail, it proves nothing (a test never asserts that a state is reached quickly).
    Raises ``TimeoutError`` with ``msg`` (or the condition's source name) and the last value seen.
    """
    timeout = max(timeout, TIMEOUT)
    deadline = time.monotonic() + timeout
    last = None
    while True:
        try:
            last = condition()
            if last:
                return last
        except _NOT_YET as exc:      # redrawn or not there yet: try again
            last = exc
        if time.monotonic() > deadline:
            what = msg or getattr(condition, "__qualname__", "condition")
            raise TimeoutError(f"{what} not met within {timeout:g} s (last: {last!r})")
        time.sleep(poll)


def text(driver, css: str) -> str:
    """Text of the element at ``css`` read in one script call ('' when absent): no stale handle."""
    return driver.execute_script(
        "const e = document.querySelector(arguments[0]); return e ? e.innerText : '';", css)


def click(driver, css: str, timeout: float = TIMEOUT):
    """Click the element at ``css`` once it is there, again if it was redrawn between finding and clicking."""
    from selenium.webdriver.common.by import By

    def once():
        driver.find_element(By.CSS_SELECTOR, css).click()
        return True
    return until(once, timeout, msg=f"click on {css}")
