"""The ``modeheat`` command line: :mod:`.main` builds the parser, one module per command.

Each command module has ``register(sub)`` (adds its sub-parser and sets
``func=run``) and ``run(args) -> int``; :mod:`.options` holds the options
shared by several commands.
"""

from .main import main

__all__ = ["main"]
