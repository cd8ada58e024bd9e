"""Names of the frequency units (kept free of heavy imports for the CLI)."""

#: Canonical unit names accepted everywhere (CLI, web, Python).
FREQUENCY_UNITS = ("THz", "cm-1", "meV", "eV", "Hz", "rad/s", "rad/ps", "K")

#: Units of the energy axis of an electronic DOS (its DOS column is in states per the same unit).
ELECTRON_ENERGY_UNITS = ("eV", "meV", "Ry", "Ha")
