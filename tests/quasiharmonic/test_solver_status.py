"""Every solver in the quasi-harmonic step reports non-convergence: a stated warning and empty rows, never a silent value."""

from __future__ import annotations

import numpy as np

from tests.quasiharmonic import debye_solid as ds
from thermo.quasiharmonic import fit_eos, quasiharmonic_table
from thermo.quasiharmonic.vinet import fit_vinet, vinet_energy


def test_vinet_fit_without_a_minimum_is_empty_and_stated():
    # F(V) curving downwards has no admissible Vinet parameters (B_0 > 0 needs an upward curvature):
    # the fit must return NaN, and the table must say so in one line per kind of failure.
    v = np.linspace(18.0, 22.0, 7)
    fit = fit_eos(v, (-0.05 * (v - 20.0) ** 2)[:, None], "vinet")
    assert np.all(np.isnan(fit.parameters)) and np.isnan(fit.residual_rms[0])
    entries = [(x, float(-0.05 * (x - 20.0) ** 2), dos) for x, (_, _, dos) in zip(v, ds.volume_entries(points=201))]
    table = quasiharmonic_table(entries, [0.0, 300.0], eos="vinet")
    assert table.volume_A3.isna().all()
    warnings = table.attrs["diagnostics"]["warnings"]
    assert any(w.startswith("the vinet fit did not converge at 2 temperatures") for w in warnings)
    assert all("\n" not in w for w in warnings)


def test_vinet_fit_recovers_published_form_from_a_poor_start():
    # Vinet et al., J. Geophys. Res. 92, 9319 (1987) energy, fitted from a start 20 % off in B_0 and V_0.
    v = np.linspace(17.0, 23.0, 9)
    e = vinet_energy(v, -2.0, 20.0, 0.55, 4.7)[:, None]
    params = fit_vinet(v, e, np.array([[-1.5], [16.0], [0.44], [3.0]]))
    np.testing.assert_allclose(params[:, 0], [-2.0, 20.0, 0.55, 4.7], rtol=1e-7)


def test_unconverged_minimum_is_empty_and_stated(monkeypatch):
    # With a single Newton step the polish cannot settle to 1e-12 of V: rows are left empty with a warning.
    import thermo.quasiharmonic.path as path
    monkeypatch.setattr(path, "_NEWTON_STEPS", 1)
    table = quasiharmonic_table(ds.volume_entries(points=201), [100.0, 300.0])
    assert table.volume_A3.isna().all()
    assert any("minimum of F + pV did not converge at 2 temperatures" in w
               for w in table.attrs["diagnostics"]["warnings"])
