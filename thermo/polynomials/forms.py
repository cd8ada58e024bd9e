"""Published polynomial forms of C_p, H, S and G: Shomate, NASA 7-term, SGTE.

Each ``*_properties`` function evaluates one temperature range of one form
and returns, per mole of formula units, ``heat_capacity_p`` [J/(mol·K)],
``enthalpy`` [J/mol] (on the scale where H(298.15 K) is the enthalpy of
formation), ``entropy`` [J/(mol·K)] and ``gibbs_energy`` = H − TS [J/mol].
Each ``*_basis`` function gives the C_p design matrix that the fits use.

References
----------
.. [1] NIST Chemistry WebBook, NIST Standard Reference Database 69,
   P. J. Linstrom and W. G. Mallard (eds.), "Condensed phase heat capacity
   data / Shomate equation", https://webbook.nist.gov (accessed 2026).
.. [2] B. J. McBride, M. J. Zehe and S. Gordon, "NASA Glenn Coefficients for
   Calculating Thermodynamic Properties of Individual Species",
   NASA/TP-2002-211556 (2002).
.. [3] A. T. Dinsdale, "SGTE data for pure elements", CALPHAD 15, 317-425
   (1991).
"""

from __future__ import annotations

import numpy as np
from scipy import constants as sc

#: Coefficient names of each form, in the order of the published equations.
KEYS = {"shomate": ("A", "B", "C", "D", "E", "F", "G", "H"),
        "nasa7": ("a1", "a2", "a3", "a4", "a5", "a6", "a7"),
        "sgte": ("a", "b", "c", "d", "e", "f")}
#: Standard reference temperature [K] (IUPAC standard state, common practice).
T_STANDARD = 298.15


def _t(temperature):
    return np.asarray(temperature, dtype=float)


def shomate_properties(coefficients, temperature):
    r"""Shomate C_p, H, S, G in the NIST Chemistry WebBook convention.

    Parameters
    ----------
    coefficients : mapping
        ``A``…``H``: C_p coefficients A–E [J/(mol·K)], F and H [kJ/mol]
        (H = Δ_fH°(298.15 K)), G [J/(mol·K)].
    temperature : array_like
        Temperatures [K] (> 0).

    Returns
    -------
    dict of numpy.ndarray
        ``heat_capacity_p`` [J/(mol·K)], ``enthalpy`` [J/mol],
        ``enthalpy_increment`` H − H(298.15) [J/mol], ``entropy``
        [J/(mol·K)], ``gibbs_energy`` [J/mol].

    Notes
    -----
    With :math:`t = T/(1000\,\mathrm{K})` [1]_:

    .. math::
        C_p = A + Bt + Ct^2 + Dt^3 + E/t^2,\quad
        H^\circ - H^\circ_{298.15} = At + Bt^2/2 + Ct^3/3 + Dt^4/4 - E/t + F - H,

        S^\circ = A\ln t + Bt + Ct^2/2 + Dt^3/3 - E/(2t^2) + G.

    Examples
    --------
    >>> p = shomate_properties(dict(A=30.0, B=0, C=0, D=0, E=0, F=-8.9445, G=30.0, H=0), 298.15)
    >>> round(float(p["heat_capacity_p"]), 6), round(float(p["enthalpy_increment"]), 3)
    (30.0, 0.0)
    """
    c = coefficients
    t = _t(temperature) / 1000.0
    cp = c["A"] + c["B"] * t + c["C"] * t ** 2 + c["D"] * t ** 3 + c["E"] / t ** 2
    h_kj = c["A"] * t + c["B"] * t ** 2 / 2 + c["C"] * t ** 3 / 3 + c["D"] * t ** 4 / 4 - c["E"] / t + c["F"]
    s = c["A"] * np.log(t) + c["B"] * t + c["C"] * t ** 2 / 2 + c["D"] * t ** 3 / 3 - c["E"] / (2 * t ** 2) + c["G"]
    h = 1e3 * h_kj
    return {"heat_capacity_p": cp, "enthalpy": h, "enthalpy_increment": h - 1e3 * c["H"],
            "entropy": s, "gibbs_energy": h - 1000.0 * t * s}


def shomate_basis(temperature):
    """C_p design matrix of the Shomate form: columns 1, t, t², t³, 1/t² (t = T/1000 K).

    Examples
    --------
    >>> shomate_basis([1000.0]).tolist()
    [[1.0, 1.0, 1.0, 1.0, 1.0]]
    """
    t = _t(temperature) / 1000.0
    return np.column_stack([np.ones_like(t), t, t ** 2, t ** 3, 1.0 / t ** 2])


def nasa7_properties(coefficients, temperature):
    r"""NASA 7-term C_p, H, S, G of one temperature range.

    Parameters
    ----------
    coefficients : mapping
        ``a1``…``a7`` (dimensionless C_p/R coefficients a1–a5 in powers of
        T/K, a6 [K], a7 [1]).
    temperature : array_like
        Temperatures [K] (> 0).

    Returns
    -------
    dict of numpy.ndarray
        As :func:`shomate_properties` without ``enthalpy_increment``.

    Notes
    -----
    From [2]_, eqs. (1)–(3) in the 7-term form:

    .. math::
        C_p/R = a_1 + a_2T + a_3T^2 + a_4T^3 + a_5T^4,

        H/(RT) = a_1 + a_2T/2 + a_3T^2/3 + a_4T^3/4 + a_5T^4/5 + a_6/T,

        S/R = a_1\ln T + a_2T + a_3T^2/2 + a_4T^3/3 + a_5T^4/4 + a_7.

    Examples
    --------
    >>> p = nasa7_properties(dict(a1=3.0, a2=0, a3=0, a4=0, a5=0, a6=-894.45, a7=0.0), 298.15)
    >>> round(float(p["heat_capacity_p"] / 8.314462618), 6), abs(round(float(p["enthalpy"]), 3))
    (3.0, 0.0)
    """
    a = [coefficients[k] for k in KEYS["nasa7"]]
    t = _t(temperature)
    r = sc.R
    cp = r * (a[0] + a[1] * t + a[2] * t ** 2 + a[3] * t ** 3 + a[4] * t ** 4)
    h = r * (a[0] * t + a[1] * t ** 2 / 2 + a[2] * t ** 3 / 3 + a[3] * t ** 4 / 4 + a[4] * t ** 5 / 5 + a[5])
    s = r * (a[0] * np.log(t) + a[1] * t + a[2] * t ** 2 / 2 + a[3] * t ** 3 / 3 + a[4] * t ** 4 / 4 + a[6])
    return {"heat_capacity_p": cp, "enthalpy": h, "entropy": s, "gibbs_energy": h - t * s}


def nasa7_basis(temperature):
    """C_p/R design matrix of the NASA 7-term form: columns 1, T, T², T³, T⁴ (T in K).

    Examples
    --------
    >>> nasa7_basis([10.0]).tolist()
    [[1.0, 10.0, 100.0, 1000.0, 10000.0]]
    """
    t = _t(temperature)
    return np.column_stack([np.ones_like(t), t, t ** 2, t ** 3, t ** 4])


def sgte_properties(coefficients, temperature):
    r"""SGTE-form Gibbs energy and the C_p, H, S that follow from it.

    Parameters
    ----------
    coefficients : mapping
        ``a`` [J/mol], ``b`` [J/(mol·K)], ``c`` [J/(mol·K)], ``d``
        [J/(mol·K²)], ``e`` [J/(mol·K³)], ``f`` [J·K/mol].
    temperature : array_like
        Temperatures [K] (> 0).

    Returns
    -------
    dict of numpy.ndarray
        As :func:`nasa7_properties`; ``enthalpy`` and ``gibbs_energy`` are
        relative to H_SER, the enthalpy of the elements in their stable
        state at 298.15 K and 1 bar.

    Notes
    -----
    From [3]_:

    .. math::
        G - H^{SER} = a + bT + cT\ln T + dT^2 + eT^3 + f/T,

        S = -b - c - c\ln T - 2dT - 3eT^2 + f/T^2,\quad
        H - H^{SER} = a - cT - dT^2 - 2eT^3 + 2f/T,

        C_p = -c - 2dT - 6eT^2 - 2f/T^2.

    Examples
    --------
    >>> p = sgte_properties(dict(a=-8944.5, b=170.9, c=-30.0, d=0, e=0, f=0), 298.15)
    >>> round(float(p["heat_capacity_p"]), 6), abs(round(float(p["enthalpy"]), 3))
    (30.0, 0.0)
    """
    a, b, c, d, e, f = (coefficients[k] for k in KEYS["sgte"])
    t = _t(temperature)
    g = a + b * t + c * t * np.log(t) + d * t ** 2 + e * t ** 3 + f / t
    s = -b - c - c * np.log(t) - 2 * d * t - 3 * e * t ** 2 + f / t ** 2
    cp = -c - 2 * d * t - 6 * e * t ** 2 - 2 * f / t ** 2
    return {"heat_capacity_p": cp, "enthalpy": g + t * s, "entropy": s, "gibbs_energy": g}


def sgte_basis(temperature):
    """C_p design matrix of the SGTE form: columns 1, T, T², 1/T² (for −c, −2d, −6e, −2f).

    Examples
    --------
    >>> sgte_basis([10.0]).tolist()
    [[1.0, 10.0, 100.0, 0.01]]
    """
    t = _t(temperature)
    return np.column_stack([np.ones_like(t), t, t ** 2, 1.0 / t ** 2])


PROPERTIES = {"shomate": shomate_properties, "nasa7": nasa7_properties, "sgte": sgte_properties}
BASES = {"shomate": shomate_basis, "nasa7": nasa7_basis, "sgte": sgte_basis}
