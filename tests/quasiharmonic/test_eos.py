"""Equations of state against their published forms."""

from __future__ import annotations

import mpmath as mp
import numpy as np
import pytest

from thermo.errors import OptionError
from thermo.quasiharmonic.eos import birch_murnaghan_energy, check_eos, fit_eos, vinet_energy

V0, B0, BP = 20.0, 0.55, 4.7          # invented parameters [Å³, eV/Å³, 1]
VOLUMES = np.linspace(17.0, 23.5, 9)


def birch_pressure(v):
    # Birch, Phys. Rev. 71, 809 (1947), third-order form:
    # P = 3B0/2 [(V0/V)^(7/3) - (V0/V)^(5/3)] {1 + 3/4 (B0' - 4) [(V0/V)^(2/3) - 1]}
    r = V0 / v
    return 1.5 * B0 * (r ** (7 / 3) - r ** (5 / 3)) * (1 + 0.75 * (BP - 4) * (r ** (2 / 3) - 1))


def vinet_pressure(v):
    # Vinet et al., J. Geophys. Res. 92, 9319 (1987): P = 3B0 (1-η)/η² exp[3/2 (B0'-1)(1-η)], η = (V/V0)^(1/3)
    eta = (v / V0) ** (1 / 3)
    return 3 * B0 * (1 - eta) / eta ** 2 * np.exp(1.5 * (BP - 1) * (1 - eta))


@pytest.mark.parametrize("kind, energy, pressure", [
    ("birch-murnaghan", birch_murnaghan_energy, birch_pressure),
    ("vinet", vinet_energy, vinet_pressure)])
def test_fit_reproduces_published_pressure_and_bulk_modulus(kind, energy, pressure):
    e = np.stack([energy(VOLUMES, -1.0, V0, B0, BP), energy(VOLUMES, -0.5, V0, B0, BP)], axis=1)
    fit = fit_eos(VOLUMES, e, kind)
    v = np.array([18.0, 21.5])
    np.testing.assert_allclose(fit.pressure(v), pressure(v), rtol=1e-8)
    # B = -V dP/dV of the published P(V), differentiated by mpmath
    mp.mp.dps = 30
    b_ref = [float(-x * mp.diff(lambda w: _mp_pressure(kind, w), x)) for x in v]
    np.testing.assert_allclose(fit.bulk_modulus(v), b_ref, rtol=1e-7)
    assert np.all(fit.residual_rms < 1e-10)
    np.testing.assert_allclose(fit.energy(np.array([V0, V0])), [-1.0, -0.5], atol=1e-10)


def _mp_pressure(kind, v):
    v0, b0, bp = mp.mpf(V0), mp.mpf(B0), mp.mpf(BP)
    if kind == "vinet":
        eta = (v / v0) ** (mp.mpf(1) / 3)
        return 3 * b0 * (1 - eta) / eta ** 2 * mp.exp(mp.mpf(3) / 2 * (bp - 1) * (1 - eta))
    r = v0 / v
    return mp.mpf(3) / 2 * b0 * (r ** (mp.mpf(7) / 3) - r ** (mp.mpf(5) / 3)) * (
        1 + mp.mpf(3) / 4 * (bp - 4) * (r ** (mp.mpf(2) / 3) - 1))


def test_vinet_fit_recovers_parameters():
    e = vinet_energy(VOLUMES, -2.0, V0, B0, BP)[:, None]
    fit = fit_eos(VOLUMES, e, "vinet")
    np.testing.assert_allclose(fit.parameters[:, 0], [-2.0, V0, B0, BP], rtol=1e-7)


def test_energy_is_minus_integral_of_pressure():
    # E(V) - E(V0) = -∫_{V0}^{V} P dV (definition of pressure), mpmath quadrature of the published P.
    for energy, kind in ((birch_murnaghan_energy, "birch-murnaghan"), (vinet_energy, "vinet")):
        work = -mp.quad(lambda w: _mp_pressure(kind, w), [V0, 22.5])
        assert float(energy(22.5, 0.0, V0, B0, BP)) == pytest.approx(float(work), rel=1e-10)


def test_unknown_eos_refused():
    with pytest.raises(OptionError, match="birch-murnaghan, vinet or spline"):
        check_eos("murnaghan")
