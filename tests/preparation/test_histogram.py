"""Histograms read as histograms (issue 23): a DOS of bin centres integrates to Σ g·Δν.

Checks against sums computed here with numpy over the bins (midpoint rule of a step function,
common practice) and against the exact C_v of the spring-model crystal (tests/crystal.py).
"""

import numpy as np
import pytest
from scipy import constants as sc

from tests import crystal as C
from thermo import load_dos
from thermo.tables import tabulate

K_PER_THZ = sc.h * 1e12 / sc.k


def test_mesh_histogram_in_mev_is_read_with_all_its_modes():
    # failed on main: "integrates to 2.9155 modes" (the band-edge rule dropped half a bin beside empty ones)
    nu, g = C.histogram_dos(C.BCC, 16, 0.05)
    dos = load_dos(C.dos_text(nu, g, unit="meV"))
    assert dos.atoms == 1 and dos.mode_count == pytest.approx(3.0, rel=1e-12)
    assert any("histogram" in w for w in dos.warnings)


def test_spiky_histogram_is_summed_bin_by_bin():
    h = 0.1
    centres = (np.arange(60) + 0.5) * h
    g = np.zeros(60)
    g[[5, 9, 10, 23, 40, 41, 57]] = [2.0, 5.0, 1.0, 7.0, 3.0, 3.0, 9.0]       # isolated spikes beside empty bins
    g *= 3.0 / (g.sum() * h)
    dos = load_dos(C.dos_text(centres, g))
    t = np.array([5.0, 50.0, 300.0])
    x = K_PER_THZ * centres[:, None] / t[None, :]
    cv = sc.R * np.sum((g * h)[:, None] * x ** 2 * np.exp(x) / np.expm1(x) ** 2, axis=0)
    assert tabulate(dos, t).heat_capacity_v_J_per_mol_K.to_numpy() == pytest.approx(cv, rel=1e-10)


def test_a_stated_histogram_is_summed_as_one_even_when_its_grid_does_not_say_so():
    centres = np.arange(1, 41) * 0.1            # not (i + ½)Δ: only the statement tells
    g = np.full(40, 3.0 / 4.0)
    text = "# histogram: bin centres\n" + C.dos_text(centres, g)
    dos = load_dos(text)
    assert dos.source["histogram"] and dos.mode_count == pytest.approx(3.0)
    assert dos.modes.frequency_thz[0] == pytest.approx(0.1)


def test_histogram_table_is_closer_to_the_exact_crystal_than_the_band_edge_reading():
    t = np.array([50.0, 298.15])
    exact = C.reference(C.FCC, t)
    dos = load_dos(C.dos_text(*C.histogram_dos(C.FCC, 8, 0.05), unit="meV"), atoms=1)
    table = tabulate(dos, t)
    # zero-point energy of the bins within 0.05 % of the exact one (the band-edge reading was 1 % off)
    assert table.attrs["zero_point_energy_J_per_mol"] / 1e3 == pytest.approx(exact["zero_point_kJ_per_mol"], rel=5e-4)
    assert table.entropy_J_per_mol_K.to_numpy() == pytest.approx(exact["entropy"], rel=2e-3)
