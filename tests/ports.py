"""One TCP port per pytest-xdist worker, so servers of tests running side by side never collide.

``make test`` runs the suite on several workers (``pytest -n 2``); a test that serves on a fixed
port would find it taken by the same test on the other worker.  Worker ``gwN`` serves on
``base + 100 * N`` (no offset outside xdist).
"""

from __future__ import annotations

import os


def worker_index() -> int:
    """The pytest-xdist worker number (``gw1`` → 1); 0 when not under xdist."""
    name = os.environ.get("PYTEST_XDIST_WORKER", "gw0")
    return int(name[2:]) if name.startswith("gw") and name[2:].isdigit() else 0


def worker_port(base: int) -> int:
    """The port this worker uses for a server the test would start on ``base``."""
    return base + 100 * worker_index()
