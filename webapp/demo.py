"""The invented demo datasets loaded on a first visit (files of the ``sample_dos`` data package)."""

from __future__ import annotations

import logging
from importlib.resources import files
from pathlib import Path

from . import cache, session
from .reporting import attempt

log = logging.getLogger(__name__)

#: The invented demo files: ``sample_dos/`` of the repository, installed with the package as the
#: data package ``sample_dos`` (found with :mod:`importlib.resources`, so a wheel install has them too).
DEMO_DIR = Path(str(files("sample_dos")))


def demo_file(*parts) -> Path:
    """Path of one demo file, e.g. ``demo_file("volumes", "springium_volumes.csv")``."""
    return DEMO_DIR.joinpath(*parts)


def electronic_demo_entry():
    """The ``mh-electronic`` store entry of the invented demo electronic DOS (read as the file states)."""
    import base64
    return {"name": "springium_edos.dat", "fields": {}, "contents": "data:text/plain;base64,"
            + base64.b64encode(demo_file("electronic", "springium_edos.dat").read_bytes()).decode("ascii")}


DEMO_SUFFIXES = (".dat", ".tsv", ".csv", ".txt", ".xlsx")


def _dataset(path):
    dataset = session.new_dataset(path.name, path.read_bytes())
    cache.load(dataset)
    return dataset


def demo_workspace(directory=None):
    """Workspace with every demo file of ``directory`` that loads.

    A missing directory or a file that does not load is skipped (logged), so
    the app always starts.
    """
    folder = Path(directory) if directory is not None else DEMO_DIR
    ws = session.empty_workspace()
    if not folder.is_dir():
        log.warning("demo directory %s not found; starting empty", folder)
        return ws
    for path in sorted(folder.iterdir()):
        if path.suffix.lower() not in DEMO_SUFFIXES or not path.is_file():
            continue
        dataset, error = attempt(_dataset, path)
        if error:
            log.warning("demo file skipped: %s", error)
            continue
        ws = session.with_dataset(ws, dataset, make_active=not ws["datasets"])
    return ws
