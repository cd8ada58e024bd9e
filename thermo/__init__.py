"""modeheat thermo: harmonic thermodynamics from a phonon density of states.

The public names are imported lazily (PEP 562) so that ``python -m thermo``
starts without loading pandas or scipy until a command needs them.

>>> import thermo
>>> sorted(n for n in thermo.__all__ if n in ("load_dos", "tabulate"))
['load_dos', 'tabulate']
>>> callable(thermo.tabulate)
True
"""

from __future__ import annotations

import importlib

__version__ = "0.3.0"

_EXPORTS = {
    "load_dos": "preparation.loading",
    "tabulate": "tables",
    "zero_point_energy": "tables",
    "estimated_relative_error": "tables",
    "provenance": "tables",
    "provenance_record": "provenance",
    "PhononDOS": "spectrum",
    "LowFrequencyFit": "spectrum",
    "DosInputError": "errors",
    "OptionError": "errors",
    "ModeheatError": "errors",
    "ModeheatWarning": "errors",
}

__all__ = sorted(_EXPORTS) + ["__version__"]


def __getattr__(name):
    if name in _EXPORTS:
        value = getattr(importlib.import_module(f".{_EXPORTS[name]}", __name__), name)
        globals()[name] = value
        return value
    raise AttributeError(f"module 'thermo' has no attribute {name!r}")


def __dir__():
    return __all__
