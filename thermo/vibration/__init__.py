"""Atomic vibration amplitudes from a phonon DOS and Debye temperatures from elastic data.

:mod:`.debye_waller` (Debye-model ⟨u²⟩ in closed form, the Debye–Waller
temperature θ_M), :mod:`.displacements` (⟨u²⟩, U_iso and B per species from
the partial DOS; :mod:`.species` holds the per-species parts and integrals),
:mod:`.lindemann` (nearest-neighbour distance, the
Lindemann ratio and its caution), :mod:`.elastic` (θ_D from elastic
constants or sound velocities, Anderson's method with the Voigt–Reuss–Hill
average).
"""

from .debye_waller import debye_mean_square_displacement, debye_waller_temperature
from .displacements import displacement_summary, displacement_table, mean_square_displacement
from .elastic import elastic_debye_temperature
from .lindemann import lindemann_warnings, nearest_neighbour_distance

__all__ = ["debye_mean_square_displacement", "debye_waller_temperature", "displacement_summary",
           "displacement_table", "mean_square_displacement", "elastic_debye_temperature",
           "lindemann_warnings", "nearest_neighbour_distance"]
