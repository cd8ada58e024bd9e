"""The persistent workspace: one SQLite file holding datasets (file bytes + load settings), sets and notes.

``Workspace(path)`` opens (and creates or migrates) the file; a workspace holds
several *spaces* (one per browser, named ones opened with a key, and the
command line's ``main``); :class:`~thermo.workspace.store.Space` adds, lists,
annotates and removes datasets.  Results are never stored as truth: they are
recomputed from the bytes and the settings.
"""

from .location import default_path
from .store import Space, Workspace

__all__ = ["Workspace", "Space", "default_path"]
