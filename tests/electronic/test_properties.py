"""Properties any electronic DOS must show, on random piecewise-linear DOS (hypothesis, derandomised)."""

from __future__ import annotations

import warnings

import numpy as np
from hypothesis import given, settings
from hypothesis import strategies as st

from thermo.electronic import fermi_dirac_state, make_electronic_dos
from thermo.electronic.thermodynamics import edge_warnings

TEMPERATURES = np.array([0.0, 0.5, 20.0, 300.0, 1500.0, 6000.0])


@st.composite
def dos_tables(draw):
    n = draw(st.integers(3, 40))
    steps = draw(st.lists(st.floats(1e-3, 2.0), min_size=n - 1, max_size=n - 1))
    e = np.concatenate([[0.0], np.cumsum(steps)])
    e = e - draw(st.floats(0.05, 0.95)) * e[-1]                    # E_F somewhere inside
    g = np.array(draw(st.lists(st.one_of(st.just(0.0), st.floats(0.0, 50.0)), min_size=n, max_size=n)))
    g[np.argmin(np.abs(e - e[0]))] = max(g[0], 0.1)               # states at both ends, so E_F has both sides
    g[-1] = max(g[-1], 0.1)
    return e, g


@settings(max_examples=60, deadline=None)
@given(dos_tables())
def test_thermodynamic_inequalities(table):
    # Common practice (no single source): S ≥ 0 and C ≥ 0, S rises with T, F(T) ≤ F(0) (the ground state
    # minimises U − TS), F = U − TS, and nothing overflows from 0.5 K to 6000 K on any grid.
    e, g = table
    d = make_electronic_dos(e, g)
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        with np.errstate(over="raise", invalid="raise", divide="raise"):
            s = fermi_dirac_state(d, TEMPERATURES)
    scale = 1e-12 * max(1.0, float(np.trapezoid(g, e)))
    assert np.all(s.entropy_ev_per_k >= -scale) and np.all(s.heat_capacity_ev_per_k >= -scale)
    assert np.all(np.diff(s.entropy_ev_per_k) >= -scale)
    assert np.all(s.helmholtz_energy_ev <= scale * 1e3)
    np.testing.assert_allclose(s.helmholtz_energy_ev, s.internal_energy_ev - TEMPERATURES * s.entropy_ev_per_k,
                               atol=1e-9)


def test_table_edge_is_reported_from_the_right_temperature():
    # A flat band that ends 0.5 eV above E_F: 20 k_BT reach it at 0.5 eV/(20 k_B) = 290 K (μ stays 0 for a
    # flat band until then only approximately, so the first listed temperature at or above 290 K is named).
    d = make_electronic_dos([-5.0, 0.5], [1.0, 1.0])
    t = np.array([100.0, 250.0, 280.0, 300.0, 400.0])
    notes = edge_warnings(d, fermi_dirac_state(d, t))
    assert len(notes) == 1 and notes[0].startswith("from 300 K the upper end of the table (+0.5 eV")
