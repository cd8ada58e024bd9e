"""Invented Debye-like DOS files for the workspace tests (demo-style data, not physics references)."""

import os
import subprocess
import sys
from pathlib import Path

from tests.clirun import run_main

ROOT = Path(__file__).resolve().parents[2]


def debye_text(cutoff_thz=5.0, points=41, tag=0):
    """A ν² DOS integrating to 3 modes up to ``cutoff_thz``; ``tag`` makes the bytes unique."""
    step = cutoff_thz / (points - 1)
    rows = [f"{i * step:.6f} {9 * (i * step) ** 2 / cutoff_thz ** 3:.9f}" for i in range(points)]
    return f"# frequency (THz) dos  sample {tag}\n" + "\n".join(rows) + "\n"


def write_files(folder, count, prefix="f"):
    folder = Path(folder)
    folder.mkdir(parents=True, exist_ok=True)
    paths = []
    for i in range(count):
        p = folder / f"{prefix}{i:04d}.dat"
        p.write_text(debye_text(4.0 + (i % 7) * 0.25, tag=f"{prefix}{i}"))
        paths.append(p)
    return paths


def cli(*args, **kwargs):
    """``modeheat ARGS`` in this process (tests/clirun.py); ``popen`` starts a real process."""
    return run_main(*args, **kwargs)


def popen(*args, quiet=False):
    """Start ``python -m thermo ARGS``; ``quiet`` sends its output nowhere (a pipe nobody reads fills
    at 64 KB and then blocks the program)."""
    env = {**os.environ, "PYTHONPATH": str(ROOT)}
    out = subprocess.DEVNULL if quiet else subprocess.PIPE
    return subprocess.Popen([sys.executable, "-m", "thermo", *map(str, args)], stdout=out,
                            stderr=out, text=True, env=env, cwd=str(ROOT))
