"""Thermodynamic tables of a phonon DOS: C_v, S, U, F versus temperature."""

from __future__ import annotations

import numpy as np
import pandas as pd
from scipy import constants as sc

from .columns import BASES, table_columns
from .errors import OptionError
from .formula import formula_unit
from .accuracy.breakdown import estimated_relative_error, breakdown_summary
from .accuracy.resolution import analyse_resolution, resolution_note
from .accuracy.reuse import table_digest
from .kernels.sums import ZPE_J_PER_MOL_PER_THZ as _ZPE_J_PER_MOL_PER_THZ
from .kernels.sums import molar_values as _molar_values
from .kernels.sums import thermal_sums
from .provenance import dos_input, provenance_record, temperature_settings

#: Column names of :func:`tabulate` for each ``per`` choice (from :mod:`thermo.columns`).
COLUMNS = {basis: table_columns(basis) for basis in BASES}
#: The same as pandas indexes, built once (a DataFrame given a list builds its index each time).
_COLUMN_INDEX = {basis: pd.Index(names) for basis, names in COLUMNS.items()}


def check_temperatures(temperatures):
    """Validate a list of temperatures.

    Parameters
    ----------
    temperatures : array_like
        Temperatures [K].

    Returns
    -------
    numpy.ndarray, shape (M,)
        The temperatures as floats [K].

    Raises
    ------
    OptionError
        If empty, not finite, negative, or outside 0 and
        :data:`TEMPERATURE_RANGE_K`.

    Examples
    --------
    >>> check_temperatures([0, 300]).tolist()
    [0.0, 300.0]
    """
    try:
        t = np.atleast_1d(np.asarray(temperatures, dtype=float)).ravel()
    except (TypeError, ValueError):
        raise OptionError("temperatures must be numbers in kelvin") from None
    if t.size == 0:
        raise OptionError("no temperatures given")
    low, high = TEMPERATURE_RANGE_K
    lowest, highest = t.min(), t.max()       # NaN spreads to both: one pass each settles the usual table
    if low <= lowest and highest <= high:
        return t
    if not np.all(np.isfinite(t)) or np.any(t < 0):
        raise OptionError("temperatures must be finite and >= 0 K")
    outside = t[(t != 0) & ((t < low) | (t > high))]
    if outside.size:
        raise OptionError(f"temperature {float(outside[0]):.3g} K is outside the accepted 0 or "
                          f"{low:g} … {high:g} K (a harmonic table means nothing far above melting)")
    return t


#: Accepted temperatures besides 0 K [K]: beyond these the Planck kernels leave double precision.
TEMPERATURE_RANGE_K = (1.0e-6, 1.0e10)


def zero_point_energy(dos):
    r"""Zero-point energy of the lattice per mole of formula units.

    Parameters
    ----------
    dos : PhononDOS
        Normalised DOS.

    Returns
    -------
    float
        :math:`E_0` [J/mol].

    Notes
    -----
    .. math:: E_0 = N_A \int g(\nu)\,\frac{h\nu}{2}\,d\nu

    References
    ----------
    .. [1] D. C. Wallace, *Thermodynamics of Crystals* (Wiley, 1972), §4.

    Examples
    --------
    >>> from thermo.spectrum import PhononDOS
    >>> nu = np.linspace(0.0, 1.0, 1001)
    >>> d = PhononDOS(nu, 6.0 * nu, atoms=1)    # 3 modes, mean ν = 2/3 THz
    >>> round(zero_point_energy(d), 2)          # N_A h (1 THz)
    399.03
    """
    return float(thermal_sums(dos, [0.0])["zero_point_thz"] * _ZPE_J_PER_MOL_PER_THZ)


def _convert(values, per, atoms, formula):
    cv, s, u, f = values
    if per == "formula":
        return cv, s, u / 1e3, f / 1e3
    if per == "atom":
        to_mev = 1e3 / (sc.N_A * sc.electron_volt * atoms)
        return cv / (sc.R * atoms), s / (sc.R * atoms), u * to_mev, f * to_mev
    mass, formula_atoms = formula_unit(formula)
    if formula_atoms != atoms:
        raise OptionError(f"formula {formula} has {formula_atoms} atoms but the DOS "
                          f"carries 3n modes for n = {atoms} atoms per formula unit")
    return cv / mass, s / mass, u / mass, f / mass


def to_basis(values, per, atoms, formula=None):
    """(C, S, U, F) per mole of formula units [J/(mol K), J/(mol K), J/mol, J/mol] on the basis ``per``.

    Parameters
    ----------
    values : tuple of array_like
        Heat capacity, entropy [J/(mol·K)], two energies [J/mol], per mole of formula units.
    per : {'formula', 'atom', 'gram'}
        Basis, as in :func:`tabulate`.
    atoms : int
        Atoms per formula unit (for 'atom' and 'gram').
    formula : str, optional
        Chemical formula (for 'gram').

    Returns
    -------
    tuple
        In J/(mol·K) and kJ/mol, k_B and meV per atom, or J/(g·K) and J/g.

    Examples
    --------
    >>> [round(float(v), 6) for v in to_basis((8.314462618, 0.0, 1000.0, 0.0), "atom", 1)]
    [1.0, 0.0, 10.36427, 0.0]
    """
    return _convert(values, per, atoms, formula)


def classical_heat_capacity(atoms, per="formula", formula=None):
    r"""Classical (Dulong–Petit) limit of C_v in the units of the ``per`` basis.

    Parameters
    ----------
    atoms : int
        Atoms per formula unit n.
    per : {'formula', 'atom', 'gram'}
        Basis, as in :func:`tabulate`.
    formula : str, optional
        Chemical formula (needed for ``per='gram'``).

    Returns
    -------
    float
        3nR [J/(mol·K)], 3 [k_B/atom] or 3nR/M [J/(g·K)].

    Notes
    -----
    Every one of the 3n modes holds k_B of heat capacity when k_BT ≫ hν
    (equipartition; the law of Dulong and Petit, common practice), so the
    harmonic C_v rises to :math:`C_v \to 3nR`.

    Examples
    --------
    >>> round(classical_heat_capacity(2), 4)
    49.8868
    >>> classical_heat_capacity(2, per="atom")
    3.0
    """
    limit = 3.0 * atoms * sc.R
    return float(_convert((limit, 0.0, 0.0, 0.0), per, atoms, formula)[0])


def tabulate(dos, temperatures, per="formula", formula=None, method="auto"):
    r"""Harmonic C_v, S, U and F of a phonon DOS at the given temperatures.

    Parameters
    ----------
    dos : PhononDOS
        Normalised DOS (see :func:`thermo.load_dos`).
    temperatures : array_like
        Temperatures [K], >= 0; T = 0 is exact.
    per : {'formula', 'atom', 'gram'}
        Per mole of formula units (J/mol/K, kJ/mol), per atom (k_B, meV) or
        per gram (J/g/K, J/g; needs ``formula``).
    formula : str, optional
        Chemical formula of the formula unit, for ``per='gram'``.
    method : {'auto', 'direct', 'fast'}
        Evaluation of the sums (see :func:`thermo.kernels.sums.grid_sums`).

    Returns
    -------
    pandas.DataFrame
        Columns ``temperature_K``, heat capacity, entropy, internal energy,
        Helmholtz energy (names in :data:`COLUMNS`); ``df.attrs`` holds
        ``per``, ``formula`` and ``zero_point_energy_J_per_mol``.

    Raises
    ------
    OptionError
        Bad temperatures, ``per`` or formula.

    Notes
    -----
    With :math:`x = h\nu/k_BT` and :math:`g` normalised to :math:`3n`:

    .. math::
        C_v = R\int g\,\frac{x^2e^x}{(e^x-1)^2}d\nu,\quad
        S = R\int g\left[\frac{x}{e^x-1} - \ln(1-e^{-x})\right]d\nu,

        U = E_0 + RT\int g\,\frac{x}{e^x-1}d\nu,\quad
        F = E_0 + RT\int g\,\ln(1-e^{-x})\,d\nu,\quad
        E_0 = N_A\int g\,\frac{h\nu}{2}d\nu.

    These are harmonic values at fixed volume: no thermal expansion
    (:math:`C_p - C_v`), anharmonicity, electrons or defects.

    References
    ----------
    .. [1] A. A. Maradudin, E. W. Montroll, G. H. Weiss, I. P. Ipatova,
       *Theory of Lattice Dynamics in the Harmonic Approximation*, 2nd ed.
       (Academic Press, 1971), ch. 4.
    .. [2] D. C. Wallace, *Thermodynamics of Crystals* (Wiley, 1972), §4.

    Examples
    --------
    >>> from thermo.spectrum import PhononDOS
    >>> d = PhononDOS(np.array([0.0, 1.0]), np.array([0.0, 6.0]), atoms=1)
    >>> df = tabulate(d, [5000.0])
    >>> round(float(df.heat_capacity_v_J_per_mol_K[0]) / (3 * 8.314462618), 4)  # Dulong–Petit
    1.0
    """
    if per not in COLUMNS:
        raise OptionError(f"unknown basis {per!r}; choose formula, atom or gram")
    t = check_temperatures(temperatures)
    return _table(thermal_sums(dos, t, method=method), t, per, dos.atoms, formula)


def table_from_sums(sums, temperatures, per="formula", atoms=1, formula=None):
    r"""Thermodynamic table from mode-weighted kernel sums.

    Parameters
    ----------
    sums : dict
        As returned by :func:`thermo.kernels.sums.thermal_sums` (or a model's
        equivalent): ``heat_capacity``, ``thermal_energy``, ``log_partition``,
        ``entropy`` [1] per formula unit and ``zero_point_thz`` [THz].
    temperatures : array_like
        Temperatures [K] the sums were evaluated at.
    per : {'formula', 'atom', 'gram'}
        Basis of the table (see :func:`tabulate`).
    atoms : float
        Atoms per formula unit.
    formula : str, optional
        Chemical formula, for ``per='gram'``.

    Returns
    -------
    pandas.DataFrame
        Columns :data:`COLUMNS` ``[per]``; ``attrs`` as in :func:`tabulate`.

    Notes
    -----
    :math:`C_v = R\Sigma_c`, :math:`S = R\Sigma_s`,
    :math:`U = E_0 + RT\Sigma_u`, :math:`F = E_0 - RT\Sigma_\ell`,
    :math:`E_0 = N_A h \Sigma_{\nu/2}`.

    References
    ----------
    .. [1] D. C. Wallace, *Thermodynamics of Crystals* (Wiley, 1972), §4.

    Examples
    --------
    >>> s = {"heat_capacity": np.array([3.0]), "thermal_energy": np.array([3.0]),
    ...      "log_partition": np.array([0.0]), "entropy": np.array([3.0]), "zero_point_thz": 0.0}
    >>> round(float(table_from_sums(s, [100.0]).heat_capacity_v_J_per_mol_K[0]), 6)
    24.943388
    """
    if per not in COLUMNS:
        raise OptionError(f"unknown basis {per!r}; choose formula, atom or gram")
    return _table(sums, check_temperatures(temperatures), per, atoms, formula)


def _table(sums, t, per, atoms, formula):
    """:func:`table_from_sums` of checked temperatures and basis."""
    values = _convert(_molar_values(sums, t), per, atoms, formula)
    block = np.empty((t.size, 5))          # one float block: no per-column consolidation by pandas
    for i, column in enumerate((t,) + tuple(values)):
        block[:, i] = column
    df = pd.DataFrame(block, columns=_COLUMN_INDEX[per], copy=False)
    df.attrs.update(per=per, formula=formula,
                    zero_point_energy_J_per_mol=float(sums["zero_point_thz"] * _ZPE_J_PER_MOL_PER_THZ))
    return df


def provenance(dos, temperatures, per="formula", formula=None, breakdown=None):
    """Provenance record written beside every exported harmonic table.

    Parameters
    ----------
    dos : PhononDOS
        The DOS the table came from.
    temperatures : array_like
        Temperatures of the table [K].
    per : str
        Basis of the table.
    formula : str, optional
        Chemical formula, when given.
    breakdown : pandas.DataFrame, optional
        The table's :func:`thermo.accuracy.breakdown.error_breakdown`; by default the one kept on
        the DOS for these temperatures (:func:`thermo.accuracy.reuse.table_breakdown`: computed
        once, reused by every later provenance, page and row-error call).

    Returns
    -------
    dict
        :func:`thermo.provenance.provenance_record`: the input with its
        SHA-256 and reading options, the settings (basis, formula,
        temperature grid) and the DOS warnings; as details the raw integral,
        scale factor, imaginary share, low-frequency settings and fit, error
        estimate and its breakdown
        (:func:`thermo.accuracy.breakdown.breakdown_summary`), zero-point
        energy and the model statement.

    Examples
    --------
    >>> from thermo.spectrum import PhononDOS
    >>> d = PhononDOS(np.linspace(0, 5, 51), np.linspace(0, 5, 51) ** 2 * 0.072, atoms=1)
    >>> provenance(d, [300.0])["inputs"][0]["options"]["atoms"]
    1
    """
    fit = dos.low_frequency
    src = dos.source
    if breakdown is None:          # the kept breakdown's digest (thermo.accuracy.reuse): computed once
        estimate, summary, note = table_digest(dos, temperatures)
    else:
        estimate, summary = estimated_relative_error(dos, temperatures, breakdown), breakdown_summary(breakdown)
        note = resolution_note(analyse_resolution(dos), temperatures)
    return provenance_record(
        [dos_input(dos)], {"basis": per, "formula": formula, "temperatures_K": temperature_settings(temperatures)},
        tuple(dos.warnings) + ((note,) if note else ()),
        raw_integral=src.get("raw_integral"), scale_factor=src.get("scale_factor"),
        negative_mode_fraction=src.get("negative_mode_fraction"),
        low_frequency="off" if fit is None else ("auto" if fit.automatic else "manual"),
        low_frequency_window_THz=None if fit is None else list(fit.window_thz),
        low_frequency_cutoff_THz=None if fit is None else fit.cutoff_thz,
        low_frequency_fit=None if fit is None else {
            "coefficient_per_THz3": fit.coefficient, "coefficient_std_error": fit.coefficient_uncertainty,
            "curvature_per_THz2": fit.curvature, "offset": fit.offset,
            "rms_relative_misfit": fit.rms_relative_residual, "blend_top_THz": fit.blend_top_thz,
            "species_shares": dict(fit.species_shares)},
        low_frequency_debye_temperature_K=dos.low_frequency_debye_temperature_k(),
        **({} if dos.modes is None else {"mode_list": dos.modes.summary()}),
        estimated_relative_error=estimate,
        error_breakdown=summary,
        zero_point_energy_kJ_per_mol=zero_point_energy(dos) / 1e3,
        model="harmonic, fixed volume (C_v); no anharmonic, electronic or C_p - C_v terms",
    )
