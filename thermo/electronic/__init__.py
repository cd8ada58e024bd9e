"""The electronic term of metals: Fermi–Dirac thermodynamics of an electronic DOS.

Leaf first: ``fermi`` (complete Fermi–Dirac integrals of order 0–2) →
``segments`` (exact sums over a piecewise-linear DOS) → ``dos``
(:class:`ElectronicDOS`, loading) → ``thermodynamics`` (μ(T), C_el, S_el,
U_el, F_el, γ, numerical errors) → ``report`` (tables, key numbers,
provenance, totals with a phonon table).
"""

from .dos import ElectronicDOS, load_electronic_dos, make_electronic_dos
from .report import (CAUTIONS, electronic_details, electronic_input, electronic_provenance, electronic_summary,
                     electronic_table, gamma_comparison, with_electronic)
from .thermodynamics import ElectronicState, fermi_dirac_state, numerical_errors, sommerfeld_gamma

__all__ = ["CAUTIONS", "ElectronicDOS", "ElectronicState", "electronic_details", "electronic_input",
           "electronic_provenance", "electronic_summary",
           "electronic_table", "fermi_dirac_state", "gamma_comparison", "load_electronic_dos", "make_electronic_dos",
           "numerical_errors", "sommerfeld_gamma", "with_electronic"]
