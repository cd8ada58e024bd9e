"""The log-grid preparation kept on a DOS: reused, never stale, never pickled.

Reference: the direct pair sums of thermo.kernels.direct (every node × temperature, no grid), an
evaluation independent of the log grid and of anything kept on the DOS.
"""

from __future__ import annotations

import pickle
from dataclasses import replace

import numpy as np

from thermo.kernels.direct import direct_grid_sums
from thermo.kernels.quadrature import mode_weights
from thermo.kernels.sums import thermal_sums
from thermo.spectrum import PhononDOS

T = np.geomspace(2.0, 900.0, 300)


def _dos(top=8.0, points=3001):
    nu = np.linspace(0.0, top, points)
    return PhononDOS(nu, 9.0 * nu ** 2 / top ** 3, atoms=1)


def _worst(a, b):
    return max(float(np.max(np.abs(a[k] / b[k] - 1))) for k in ("heat_capacity", "thermal_energy", "log_partition"))


def _direct(dos, t):
    return direct_grid_sums(dos.frequency_thz, mode_weights(dos.frequency_thz, dos.dos), t)


def test_kept_preparation_serves_other_temperature_grids():
    dos = _dos()
    thermal_sums(dos, T)                              # prepares and keeps
    other = np.linspace(5.0, 1500.0, 400)
    assert _worst(thermal_sums(dos, other), _direct(dos, other)) < 1e-9


def test_a_changed_copy_is_not_served_the_old_preparation():
    dos = _dos()
    thermal_sums(dos, T)
    wider = replace(dos, frequency_thz=dos.frequency_thz * 1.5, dos=dos.dos / 1.5)
    assert _worst(thermal_sums(wider, T), _direct(wider, T)) < 1e-9
    assert _worst(thermal_sums(wider, T), thermal_sums(dos, T)) > 1e-3


def test_pickled_dos_leaves_the_preparation_behind_and_sums_the_same():
    dos = _dos(points=200_001)
    before = len(pickle.dumps(dos))
    first = thermal_sums(dos, T)
    assert len(pickle.dumps(dos)) == before
    back = pickle.loads(pickle.dumps(dos))
    assert _worst(thermal_sums(back, T), first) < 1e-14


def test_a_long_spectrum_at_a_few_temperatures_takes_the_fast_path_to_the_direct_sums():
    from thermo.kernels import loggrid
    nu = np.linspace(0.0, 12.0, 200_001)
    w = mode_weights(nu, 9.0 * nu ** 2 / 12.0 ** 3)
    t = np.array([3.0, 40.0, 300.0, 1200.0])
    assert loggrid.suitable(nu, w, t) and not loggrid.suitable(nu[:40_001], w[:40_001], t)
    assert not loggrid.suitable(nu, w, t[:1])
    fast, direct = loggrid.loggrid_sums(nu, w, t), direct_grid_sums(nu, w, t)
    assert _worst(fast, direct) < 1e-9


def test_the_spectra_a_breakdown_rebuilds_are_kept_but_not_pickled():
    from thermo.accuracy.breakdown import error_breakdown
    dos = _dos()
    before = len(pickle.dumps(dos))
    first = error_breakdown(dos, T)
    assert "_rebuilt" in dos.__dict__
    assert len(pickle.dumps(dos)) == before
    again = error_breakdown(pickle.loads(pickle.dumps(dos)), T)     # rebuilt afresh: the same breakdown
    assert first.equals(again)


def test_kept_kernel_transforms_give_the_sums_of_a_fresh_grid_for_each_range():
    # ranges A, B, then A again (its kept transform), and more ranges than are kept: each equals a
    # DOS prepared for that range alone, and stays within 1e-9 of the direct pair sums
    from thermo.kernels.loggrid import LogGrid
    dos = _dos()
    weights = mode_weights(dos.frequency_thz, dos.dos)
    grid = LogGrid(dos.frequency_thz, weights)
    ranges = [T, np.linspace(5.0, 1500.0, 400), T] + [T * (1.0 + 0.05 * i) for i in range(1, 8)] + [T]
    for t in ranges:
        kept = grid.sums(t)
        fresh = LogGrid(dos.frequency_thz, weights).sums(t)
        for key in ("heat_capacity", "thermal_energy", "log_partition"):
            np.testing.assert_array_equal(kept[key], fresh[key])
        assert _worst(kept, _direct(dos, t)) < 1e-9
