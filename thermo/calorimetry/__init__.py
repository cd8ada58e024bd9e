"""Measured heat capacity next to a computed DOS: reader, C_p models, fits, third-law entropy.

- :mod:`.reading`  measured C_p(T) files (units, magnitudes, the Dulong–Petit scale check);
- :mod:`.models`   lattice (Debye or scaled DOS) + γT (metals) + dilation (Nernst–Lindemann,
  given values, or α²B_T V T) and the low-temperature C/T = γ + βT² analysis;
- :mod:`.fitting`  weighted least squares (status checked) with held parameters (± propagated),
  correlations, residuals; :mod:`.discrepancy` the residuals' structure;
- :mod:`.integration`, :mod:`.debye_interpolation`  integrals between points, linear in rows;
- :mod:`.extrapolation`, :mod:`.fitted_forms`  S and H below the first point from admissible forms;
- :mod:`.entropy`  S°(T) and H°(T) − H°(0) from data and from the model, with their uncertainties;
- :mod:`.report`   everything for one data set as one JSON-able dict.
"""

from .discrepancy import residual_structure
from .entropy import (STANDARD_K, low_temperature_forms, model_form, third_law_from_data,
                      third_law_from_model)
from .fitting import CalorimetryFit, fit_measured_heat_capacity, parse_fixed, residual_table
from .models import (HeatCapacityModel, dilation_from_expansion, low_temperature_analysis,
                     nernst_lindemann_cp, parameter_name)
from .reading import (CP_UNITS, MeasuredHeatCapacity, check_heat_capacity_scale, heat_capacity_unit,
                      read_heat_capacity)

__all__ = ["CP_UNITS", "CalorimetryFit", "HeatCapacityModel", "MeasuredHeatCapacity", "STANDARD_K",
           "check_heat_capacity_scale", "dilation_from_expansion", "fit_measured_heat_capacity",
           "heat_capacity_unit", "low_temperature_analysis", "low_temperature_forms", "model_form",
           "nernst_lindemann_cp", "parameter_name", "parse_fixed", "read_heat_capacity", "residual_structure",
           "residual_table", "third_law_from_data", "third_law_from_model"]
