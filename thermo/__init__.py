"""modeheat thermo: harmonic thermodynamics from a phonon density of states."""

__version__ = "0.1.0"
