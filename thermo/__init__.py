"""modeheat thermo: harmonic thermodynamics from a phonon density of states.

>>> from thermo import load_dos, tabulate   # doctest: +SKIP
"""

__version__ = "0.1.0"

from .errors import DosInputError, ModeheatError, ModeheatWarning, OptionError  # noqa: E402
from .loading import load_dos  # noqa: E402
from .spectrum import LowFrequencyFit, PhononDOS  # noqa: E402
from .tables import estimated_relative_error, provenance, tabulate, zero_point_energy  # noqa: E402

__all__ = ["load_dos", "tabulate", "PhononDOS", "LowFrequencyFit", "DosInputError", "OptionError",
           "ModeheatError", "ModeheatWarning", "zero_point_energy", "estimated_relative_error",
           "provenance", "__version__"]
