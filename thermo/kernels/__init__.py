r"""Integrals of a DOS against the Planck kernels.

Modules, each importing only those above it:

- :mod:`.planck` — kernels of :math:`x = h\nu/k_BT`: occupation, c, u, ℓ, s;
- :mod:`.quadrature` — trapezoid mode weights with sharp band edges, nodes of the whole DOS;
- :mod:`.direct` — sums over every pair ν × T;
- :mod:`.nu2` — the one closed-form integral of the :math:`A\nu^2` part (Debye integral);
- :mod:`.loggrid` — the same sums as the direct ones by log-grid FFT correlation (fast path);
- :mod:`.sums` — :func:`~.sums.grid_sums` (direct or log-grid) and
  :func:`~.sums.thermal_sums` (table part + ν² part of a PhononDOS).
"""
