"""The invented demo datasets loaded on a first visit (files of ``sample_dos/``)."""

from __future__ import annotations

import logging
from pathlib import Path

from . import cache, session
from .reporting import attempt

log = logging.getLogger(__name__)

#: Demo files shipped in ``sample_dos/`` beside the package.
DEMO_DIR = Path(__file__).resolve().parent.parent / "sample_dos"
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
