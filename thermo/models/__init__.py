"""Einstein, Debye and composite models of a phonon DOS.

Model tables have exactly the columns of :func:`thermo.tables.tabulate` so
they overlay the DOS table; characteristic temperatures are labelled by
definition (:func:`theta_definitions`); see the module docstrings for the
equations and references.
"""

from .tabulation import model_table
from .composite import CompositeModel, composite_initial, composite_model, composite_sums, composite_table
from .debye import (debye_coefficient, debye_spectrum, debye_heat_capacity, debye_heat_capacity_fraction, debye_sums,
                    debye_table)
from .catalogue import CAUTIONS, THETA_KEYS, model_tables, models_report, side_by_side, theta_definitions
from .einstein import einstein_heat_capacity, einstein_sums, einstein_table
from .equivalent_debye import debye_y_from_fraction, equivalent_debye_temperature, invert_debye_heat_capacity
from .fitting import (FitResult, default_fit_range, fit_debye_theta, fit_dos_theta, fit_einstein_theta,
                      fit_heat_capacity_data, least_squares_fit)
from .modemap import mode_share_map
from .moments import (debye_moment_temperature, einstein_entropy_temperature, einstein_mean_temperature,
                      frequency_moment, log_frequency_moment)
from .occupation import occupation_explorer
from .residuals import cv_over_t3, largest_deviations, residual_table

__all__ = [
    "model_table", "CompositeModel", "composite_initial", "composite_model", "composite_sums",
    "composite_table", "debye_coefficient", "debye_heat_capacity", "debye_heat_capacity_fraction",
    "debye_sums", "debye_table", "debye_spectrum", "fit_dos_theta", "CAUTIONS", "THETA_KEYS", "models_report", "theta_definitions",
    "model_tables", "side_by_side",
    "einstein_heat_capacity", "einstein_sums", "einstein_table", "debye_y_from_fraction",
    "equivalent_debye_temperature", "invert_debye_heat_capacity", "FitResult", "default_fit_range",
    "fit_debye_theta", "fit_einstein_theta", "fit_heat_capacity_data", "least_squares_fit",
    "mode_share_map", "debye_moment_temperature", "einstein_entropy_temperature",
    "einstein_mean_temperature", "frequency_moment", "log_frequency_moment", "occupation_explorer",
    "cv_over_t3", "largest_deviations", "residual_table",
]
