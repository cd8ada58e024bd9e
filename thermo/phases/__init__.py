"""Phase comparison: ΔF(T), ΔG(T, p), transition temperatures and pressures with uncertainties.

:class:`Phase` describes one phase (a DOS or a volume set, its static energy
and atoms per formula unit); :func:`compare_phases` gives the table, the
transitions, the closest approach when there is none and the p–T boundary;
:mod:`.reaction` the formation quantities of a compound from its elements.
"""

from .compare import Basis, Comparison, basis_of, compare_phases
from .phase import ENERGY_UNITS, Phase, energy_in_ev, phase_curves
from .reaction import formation_table, parse_reaction

__all__ = ["Basis", "Comparison", "ENERGY_UNITS", "Phase", "basis_of", "compare_phases", "energy_in_ev",
           "formation_table", "parse_reaction", "phase_curves"]
