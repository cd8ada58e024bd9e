"""Debye temperature from elastic constants or sound velocities (Anderson's method).

The elastic θ_D is what the acoustic branches of a correct DOS must give at
low frequency; comparing it with the DOS's own low-frequency θ_D tests those
branches.  Elastic constants measured at room temperature give a lower θ_D
than 0 K values (a few per cent); say which were used.

References
----------
.. [1] O. L. Anderson, "A simplified method for calculating the Debye
   temperature from elastic constants", J. Phys. Chem. Solids 24, 909-917
   (1963).
.. [2] R. Hill, "The elastic behaviour of a crystalline aggregate",
   Proc. Phys. Soc. A 65, 349-354 (1952) (Voigt–Reuss–Hill average).
"""

from __future__ import annotations

import numpy as np
from scipy import constants as sc

from ..errors import OptionError


def _positive(value, what):
    try:
        v = float(value)
    except (TypeError, ValueError):
        raise OptionError(f"{what} must be a number") from None
    if not (np.isfinite(v) and v > 0):
        raise OptionError(f"{what} must be finite and > 0, not {v:g}")
    return v


def cubic_vrh_moduli(c11, c12, c44):
    r"""Bulk and shear moduli of a cubic crystal, Voigt, Reuss and Hill [GPa].

    Parameters
    ----------
    c11, c12, c44 : float
        Elastic constants [GPa].

    Returns
    -------
    dict
        ``bulk`` K, ``shear_voigt`` G_V, ``shear_reuss`` G_R, ``shear_hill``
        G_H [GPa].

    Raises
    ------
    OptionError
        If the constants violate the Born stability conditions
        :math:`C_{11} > |C_{12}|`, :math:`C_{11} + 2C_{12} > 0`, :math:`C_{44} > 0`.

    Notes
    -----
    .. math:: K = \frac{C_{11} + 2C_{12}}{3},\quad
              G_V = \frac{C_{11} - C_{12} + 3C_{44}}{5},\quad
              G_R = \frac{5(C_{11} - C_{12})C_{44}}{4C_{44} + 3(C_{11} - C_{12})},\quad
              G_H = \frac{G_V + G_R}{2}

    References
    ----------
    Anderson (1963), eqs. 9-11; Hill (1952).

    Examples
    --------
    >>> m = cubic_vrh_moduli(300.0, 100.0, 100.0)    # isotropic: C44 = (C11 - C12)/2
    >>> m["shear_voigt"], m["shear_reuss"], round(m["bulk"], 6)
    (100.0, 100.0, 166.666667)
    """
    a, b, c = (float(v) for v in (c11, c12, c44))
    if not (a > abs(b) and a + 2 * b > 0 and c > 0):
        raise OptionError(f"C11 = {a:g}, C12 = {b:g}, C44 = {c:g} GPa break the Born stability conditions "
                          "C11 > |C12|, C11 + 2 C12 > 0, C44 > 0")
    gv = (a - b + 3 * c) / 5.0
    gr = 5 * (a - b) * c / (4 * c + 3 * (a - b))
    return {"bulk": (a + 2 * b) / 3.0, "shear_voigt": gv, "shear_reuss": gr, "shear_hill": 0.5 * (gv + gr)}


def sound_velocities(bulk_gpa, shear_gpa, density_g_cm3):
    r"""Longitudinal and transverse sound velocities of an isotropic solid [m/s].

    Parameters
    ----------
    bulk_gpa, shear_gpa : float
        Bulk modulus K and shear modulus G [GPa].
    density_g_cm3 : float
        Density ρ [g/cm³].

    Returns
    -------
    v_l, v_t : float
        :math:`v_l = \sqrt{(K + 4G/3)/\rho}`, :math:`v_t = \sqrt{G/\rho}` [m/s].

    References
    ----------
    Anderson (1963), eqs. 7-8.

    Examples
    --------
    >>> [round(v, 3) for v in sound_velocities(1.0, 0.75, 1.0)]
    [1414.214, 866.025]
    """
    rho = _positive(density_g_cm3, "the density") * 1e3
    k, g = float(bulk_gpa) * 1e9, _positive(shear_gpa, "the shear modulus") * 1e9
    return float(np.sqrt((k + 4.0 * g / 3.0) / rho)), float(np.sqrt(g / rho))


def mean_sound_velocity(v_l, v_t):
    r"""Debye mean sound velocity :math:`v_m` [m/s].

    Parameters
    ----------
    v_l, v_t : float
        Longitudinal and transverse velocities [m/s].

    Returns
    -------
    float
        :math:`v_m = [\tfrac13(2/v_t^3 + 1/v_l^3)]^{-1/3}` [m/s].

    References
    ----------
    Anderson (1963), eq. 6.

    Examples
    --------
    >>> round(mean_sound_velocity(2000.0, 1000.0), 3)
    1121.814
    """
    vl, vt = _positive(v_l, "v_L"), _positive(v_t, "v_T")
    if 3.0 * vl ** 2 <= 4.0 * vt ** 2:
        raise OptionError(f"v_L = {vl:g} m/s must exceed √(4/3) v_T = {np.sqrt(4 / 3) * vt:g} m/s "
                          "(positive bulk modulus)")
    return float(((2.0 / vt ** 3 + 1.0 / vl ** 3) / 3.0) ** (-1.0 / 3.0))


def elastic_debye_temperature(density_g_cm3, molar_mass_g_mol, atoms, c11=None, c12=None, c44=None,
                              v_l=None, v_t=None):
    r"""θ_D from cubic elastic constants (VRH) or from sound velocities [K].

    Parameters
    ----------
    density_g_cm3 : float
        Density ρ [g/cm³].
    molar_mass_g_mol : float
        Molar mass of the formula unit M [g/mol].
    atoms : int
        Atoms per formula unit n.
    c11, c12, c44 : float, optional
        Cubic elastic constants [GPa].
    v_l, v_t : float, optional
        Sound velocities [m/s], instead of the elastic constants.

    Returns
    -------
    dict
        ``theta_K``, ``v_mean_m_per_s``, ``v_l_m_per_s``, ``v_t_m_per_s`` and,
        from elastic constants, the moduli of :func:`cubic_vrh_moduli` [GPa].

    Notes
    -----
    .. math:: \theta_D = \frac{h}{k_B}\left(\frac{3 n N_A \rho}{4\pi M}\right)^{1/3} v_m

    References
    ----------
    Anderson (1963), eq. 5.

    Examples
    --------
    >>> r = elastic_debye_temperature(2.7, 26.98, 1, v_l=6400.0, v_t=3100.0)
    >>> 390 < r["theta_K"] < 410
    True
    """
    rho = _positive(density_g_cm3, "the density")
    mass = _positive(molar_mass_g_mol, "the molar mass")
    n = _positive(atoms, "the number of atoms per formula unit")
    out = {}
    if c11 is not None or c12 is not None or c44 is not None:
        if None in (c11, c12, c44) or v_l is not None or v_t is not None:
            raise OptionError("give either all of C11, C12, C44 or both sound velocities v_L, v_T")
        out = cubic_vrh_moduli(c11, c12, c44)
        v_l, v_t = sound_velocities(out["bulk"], out["shear_hill"], rho)
    elif v_l is None or v_t is None:
        raise OptionError("give either C11, C12, C44 (GPa) or both sound velocities v_L, v_T (m/s)")
    vm = mean_sound_velocity(v_l, v_t)
    number_density = 3.0 * n * sc.N_A * rho * 1e6 / (4.0 * np.pi * mass)     # m^-3
    theta = sc.h / sc.k * number_density ** (1.0 / 3.0) * vm
    out.update({"theta_K": float(theta), "v_mean_m_per_s": vm, "v_l_m_per_s": float(v_l),
                "v_t_m_per_s": float(v_t)})
    return out


def compare_debye_temperatures(elastic_k, dos_k):
    """Difference of the DOS's low-frequency θ_D from the elastic θ_D.

    Parameters
    ----------
    elastic_k : float
        θ_D from elastic data [K].
    dos_k : float or None
        θ_D of the DOS's ν² coefficient [K], None when the DOS has none.

    Returns
    -------
    dict
        ``elastic_K``, ``dos_K``, ``difference_K`` (DOS − elastic) and
        ``relative_difference`` [1] (None without a DOS value), and ``note``.

    Examples
    --------
    >>> compare_debye_temperatures(400.0, 380.0)["relative_difference"]
    -0.05
    """
    if dos_k is None:
        return {"elastic_K": elastic_k, "dos_K": None, "difference_K": None, "relative_difference": None,
                "note": "the DOS has no fitted ν² (acoustic) region to compare"}
    diff = float(dos_k) - float(elastic_k)
    rel = diff / float(elastic_k)
    note = ("the DOS's acoustic branches agree with the elastic data within 5 %" if abs(rel) <= 0.05 else
            f"the DOS's low-frequency θ_D differs from the elastic θ_D by {100 * rel:+.1f} %: check the acoustic "
            "branches (k-mesh, smearing, force constants) and the temperature of the elastic data")
    return {"elastic_K": float(elastic_k), "dos_K": float(dos_k), "difference_K": diff,
            "relative_difference": round(rel, 12), "note": note}
