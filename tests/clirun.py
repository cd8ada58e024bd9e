"""The command line run in this process: what ``python -m thermo ARGS`` prints and returns.

A subprocess costs about a second of interpreter start and imports per call; the CLI tests call
:func:`run_main` instead, and one smoke test per command still runs the real ``python -m thermo``
(``tests/cli/test_smoke.py``). The result is a :class:`subprocess.CompletedProcess` (``returncode``,
``stdout``, ``stderr``), so a test reads the same either way.
"""

from __future__ import annotations

import contextlib
import io
import os
import subprocess
import sys
import warnings
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]


def _print_warning(message, category, filename, lineno, file=None, line=None):
    sys.stderr.write(warnings.formatwarning(message, category, filename, lineno, line))


def run_main(*args, cwd=ROOT, env=None) -> subprocess.CompletedProcess:
    """``modeheat ARGS`` in this process, from ``cwd`` with ``env`` added to the environment."""
    from thermo.cli.main import main
    argv = [str(a) for a in args]
    out, err = io.StringIO(), io.StringIO()
    saved_cwd, saved_env = os.getcwd(), {k: os.environ.get(k) for k in (env or {})}
    try:
        os.chdir(cwd)
        os.environ.update(env or {})
        with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err), warnings.catch_warnings():
            # as in a fresh interpreter: a warning is printed once to stderr (pytest would record it)
            warnings.resetwarnings()
            warnings.simplefilter("default")
            warnings.filterwarnings("ignore", category=DeprecationWarning)
            warnings.showwarning = _print_warning
            try:
                code = main(argv)
            except SystemExit as exc:             # argparse: --help exits 0, a usage error 2
                code = exc.code if isinstance(exc.code, int) else (0 if exc.code is None else 1)
    finally:
        os.chdir(saved_cwd)
        for key, value in saved_env.items():
            if value is None:
                os.environ.pop(key, None)
            else:
                os.environ[key] = value
    return subprocess.CompletedProcess(["modeheat", *argv], code, out.getvalue(), err.getvalue())


def run_subprocess(*args, cwd=ROOT, **kwargs) -> subprocess.CompletedProcess:
    """``python -m thermo ARGS`` as a real process (the smoke tests), this tree first on the path."""
    env = {**os.environ, "PYTHONPATH": str(ROOT)}
    return subprocess.run([sys.executable, "-m", "thermo", *map(str, args)], capture_output=True, text=True,
                          env=env, cwd=str(cwd), **kwargs)
