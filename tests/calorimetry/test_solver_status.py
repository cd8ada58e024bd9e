"""Every least-squares call in calorimetry and model fits checks its status (issue 25 item 5, issue 26)."""

import json

import numpy as np
import pytest

from thermo.calorimetry import HeatCapacityModel, fit_measured_heat_capacity, read_heat_capacity
from thermo.cli.main import main
from thermo.errors import FitError, OptionError
from thermo.models import fitting as model_fitting

DEMO = "sample_dos/measured/springium_cp.csv"


def _chi2(fit, measured):
    data = measured.restricted(*fit.fit_range_K)
    r = (fit.heat_capacity_p(data.temperature_K) - data.heat_capacity_J_per_mol_K) / data.uncertainty_J_per_mol_K
    return float(r @ r)


def test_demo_over_20_to_350_K_ends_at_a_true_minimum():
    # The fit that ran out of evaluations on main (γ driven towards 0 through |x|·start) must now
    # converge: no move of a free parameter by ±1e-4 (relative) lowers χ² (common practice: a
    # least-squares minimum is stationary).
    measured = read_heat_capacity(DEMO)
    model = HeatCapacityModel(atoms=1, electronic=True)
    fit = fit_measured_heat_capacity(measured, model, fit_range=(20.0, 350.0))
    best = _chi2(fit, measured)
    for name in fit.free:
        for factor in (1 - 1e-4, 1 + 1e-4):
            moved = {**fit.values, name: fit.values[name] * factor}
            shifted = type(fit)(**{**fit.__dict__, "values": moved})
            assert _chi2(shifted, measured) >= best * (1 - 1e-9), name
    # a γ that wants to go below 0 is held at 0 and the result says so
    assert fit.values["gamma_J_per_mol_K2"] > 0 or any("held at 0" in w for w in fit.warnings)


def test_a_fit_that_runs_out_of_evaluations_is_an_error(monkeypatch):
    # Budget of 2 evaluations per parameter: the solver cannot converge; the result must not be printed.
    from thermo.calorimetry import fitting
    monkeypatch.setattr(fitting, "EVALUATIONS_PER_PARAMETER", 2, raising=False)
    measured = read_heat_capacity(DEMO)
    with pytest.raises(FitError, match="did not converge after .* evaluations"):
        fit_measured_heat_capacity(measured, HeatCapacityModel(atoms=1, electronic=True), fit_range=(20.0, 350.0))


def test_cli_reports_non_convergence_in_one_line(monkeypatch, capsys):
    from thermo.calorimetry import fitting
    monkeypatch.setattr(fitting, "EVALUATIONS_PER_PARAMETER", 2, raising=False)
    assert main(["calorimetry", DEMO, "--atoms", "1", "--range", "20:350"]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert err[-1].startswith("error: the fit of") and "did not converge" in err[-1]


def test_model_fit_checks_its_status(monkeypatch):
    # thermo.models.fitting: the same check on the Einstein/Debye θ fits.
    monkeypatch.setattr(model_fitting, "MAX_EVALUATIONS", 1, raising=False)
    t = np.linspace(20.0, 400.0, 30)
    cv = model_fitting.einstein_heat_capacity(t, 250.0, 3)
    with pytest.raises(FitError, match="did not converge"):
        model_fitting.fit_heat_capacity_data("einstein", t * 1.0, cv * 1.01, 3)


@pytest.mark.parametrize("item", ["theta_D=1e300", "theta_D=1e-300", "scale=1e300", "gamma=1e300", "A=1e300",
                                  "gamma=1e-3±1e300", "theta_D=nan"])
def test_held_values_outside_physical_range_are_one_line_errors(item, capsys):
    # `--fix theta_D=1e300` overflowed into an internal error on main.
    assert main(["calorimetry", DEMO, "--atoms", "1", "--fix", item]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert err[-1].startswith("error: --fix") and "internal error" not in err[-1]


def test_demo_range_cli_prints_converged_fit(capsys):
    assert main(["calorimetry", DEMO, "--atoms", "1", "--range", "20:350"]) == 0
    out = json.loads(capsys.readouterr().out)
    assert all(np.isfinite(v["value"]) for v in out["fit"].values())
    with pytest.raises(OptionError):
        from thermo.calorimetry.fitting import parse_fixed
        parse_fixed(["theta_D=1e300"])
