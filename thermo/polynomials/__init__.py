"""Database-ready polynomials: Shomate, NASA 7-term and SGTE fits of any heat-capacity source.

:mod:`.forms` (the published equations), :mod:`.sources` (harmonic table or
any (T, C_p) table -> C_p, S, H − H(298.15)), :mod:`.fitting`
(:func:`fit_polynomial`), :mod:`.result` (:class:`PolynomialFit`:
coefficients, ``evaluate(T)``, errors).  Files: :mod:`.cantera_yaml`.
"""

from .fitting import DEFAULT_RANGE, fit_polynomial
from .forms import KEYS, nasa7_properties, sgte_properties, shomate_properties
from .result import FitRange, PolynomialFit
from .sources import HeatCapacityData, harmonic_source, heat_capacity_source, source_from_table

__all__ = ["DEFAULT_RANGE", "FitRange", "HeatCapacityData", "KEYS", "PolynomialFit",
           "fit_polynomial", "harmonic_source", "heat_capacity_source", "nasa7_properties",
           "sgte_properties", "shomate_properties", "source_from_table"]
