"""Measured heat capacity next to a computed DOS: reader, C_p models, fits, third-law entropy.

- :mod:`.reading`  measured C_p(T) files (units, uncertainties);
- :mod:`.models`   lattice (Debye or scaled DOS) + γT + dilation (Nernst–Lindemann,
  given values, or α²B_T V T) and the low-temperature C/T = γ + βT² analysis;
- :mod:`.fitting`  weighted least squares with held parameters, correlations, residuals;
- :mod:`.entropy`  S°(T) and H°(T) − H°(0) from data (T³ extrapolation) and from the model;
- :mod:`.report`   everything for one data set as one JSON-able dict.
"""

from .entropy import STANDARD_K, third_law_from_data, third_law_from_model
from .fitting import CalorimetryFit, fit_measured_heat_capacity, parse_fixed, residual_table
from .models import (HeatCapacityModel, dilation_from_expansion, low_temperature_analysis,
                     nernst_lindemann_cp, parameter_name)
from .reading import CP_UNITS, MeasuredHeatCapacity, heat_capacity_unit, read_heat_capacity

__all__ = ["CP_UNITS", "CalorimetryFit", "HeatCapacityModel", "MeasuredHeatCapacity", "STANDARD_K",
           "dilation_from_expansion", "fit_measured_heat_capacity", "heat_capacity_unit",
           "low_temperature_analysis", "nernst_lindemann_cp", "parameter_name", "parse_fixed",
           "read_heat_capacity", "residual_table", "third_law_from_data", "third_law_from_model"]
