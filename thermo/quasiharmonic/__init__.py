"""Quasi-harmonic step: DOS at several volumes + static energies -> V(T), α, B_T, C_p, G.

:func:`quasiharmonic_table` is the entry point; :func:`read_manifest` reads a
volume set, :mod:`.eos` holds the equations of state, :mod:`.diagnostics`
the checks and cautions, :mod:`.report` the provenance record.
"""

from .diagnostics import CAUTIONS
from .eos import EOS_KINDS, GPA_PER_EV_A3, birch_murnaghan_energy, fit_eos, vinet_energy
from .solve import QUASIHARMONIC, UNCERTAIN, free_energy_curves, quasiharmonic_table, quasiharmonic_tables
from .surface import SurfacePart, free_energy_surface
from .volumeset import MIN_VOLUMES, VolumeSet, make_volume_set, read_manifest

__all__ = ["CAUTIONS", "EOS_KINDS", "GPA_PER_EV_A3", "MIN_VOLUMES", "QUASIHARMONIC", "SurfacePart", "UNCERTAIN",
           "VolumeSet",
           "birch_murnaghan_energy", "fit_eos", "free_energy_curves", "free_energy_surface", "make_volume_set",
           "quasiharmonic_table", "quasiharmonic_tables", "read_manifest", "vinet_energy"]
