"""Per-row error estimate of a harmonic table, as one absolute number per quantity and temperature.

The one entry point other capabilities use (the quasi-harmonic step carries
these errors from every volume into V, α, B_T, C_p, G).  Today it adds the
parts of :func:`thermo.accuracy.breakdown.error_breakdown`; when the
harmonic estimate changes, only this function is re-pointed.
"""

from __future__ import annotations

import numpy as np

from .breakdown import PARTS, QUANTITIES, error_column
from .reuse import table_breakdown

#: Factor from the breakdown's column units to SI (kJ/mol -> J/mol for the energies).
_TO_SI = {"heat_capacity_v": 1.0, "entropy": 1.0, "internal_energy": 1e3, "helmholtz_energy": 1e3}


def harmonic_row_errors(dos, temperatures, breakdown=None):
    r"""Estimated error of C_v, S, U and F of a harmonic table at each temperature.

    Parameters
    ----------
    dos : PhononDOS
        Normalised DOS (from :func:`thermo.load_dos`).
    temperatures : array_like, shape (M,)
        Temperatures [K], >= 0.
    breakdown : pandas.DataFrame, optional
        The :func:`~thermo.accuracy.breakdown.error_breakdown` rows of these temperatures, when the caller
        holds them (by default :func:`~thermo.accuracy.reuse.table_breakdown`).

    Returns
    -------
    dict of str to numpy.ndarray, shape (M,)
        ``heat_capacity_v`` and ``entropy`` [J/(mol·K)], ``internal_energy``
        and ``helmholtz_energy`` [J/mol], per mole of formula units; each
        >= 0, an estimate of the largest error (not a standard deviation).

    Notes
    -----
    :math:`\delta Q = \delta_{num} + \delta_{lf} + \delta_{res} + \delta_{sm}`, the
    numerical (grid-halving), low-frequency, resolution and smearing parts of
    :func:`~thermo.accuracy.breakdown.error_breakdown`.

    Examples
    --------
    >>> from thermo.spectrum import PhononDOS
    >>> nu = np.linspace(0.0, 5.0, 201)
    >>> e = harmonic_row_errors(PhononDOS(nu, 9 * nu**2 / 125, atoms=1), [300.0])
    >>> sorted(e), bool(e["entropy"][0] < 1e-3)
    (['entropy', 'heat_capacity_v', 'helmholtz_energy', 'internal_energy'], True)
    """
    b = table_breakdown(dos, temperatures) if breakdown is None else breakdown
    return {key: _TO_SI[key] * sum(b[error_column(key, p)].to_numpy() for p in PARTS) for key in QUANTITIES}


def add_error_columns(table, dos, formula=None, breakdown=None):
    r"""The table with each quantity's estimated error and the flag of rows over 1 %.

    Parameters
    ----------
    table : pandas.DataFrame
        A harmonic table of ``dos`` (:func:`thermo.tables.tabulate`; its
        ``attrs["per"]`` gives the basis).
    dos : PhononDOS
        The DOS it came from.
    formula : str, optional
        Chemical formula, for the ``gram`` basis.
    breakdown : pandas.DataFrame, optional
        The table's :func:`~thermo.accuracy.breakdown.error_breakdown`, when the caller holds it already
        (by default :func:`~thermo.accuracy.reuse.table_breakdown`).

    Returns
    -------
    pandas.DataFrame
        A copy with ``<quantity>_error_<unit>`` for C_v, S, U and F (names
        from the column schema, same unit as the value), ``error_flag``
        (combined relative error of C_v or S over 1 %) and ``error_reason``
        (its largest part; empty where not flagged); ``attrs["resolution"]``.

    Notes
    -----
    The errors are those of :func:`harmonic_row_errors` on the table's basis.

    Examples
    --------
    >>> from thermo.spectrum import PhononDOS
    >>> from thermo.tables import tabulate
    >>> nu = np.linspace(0.0, 5.0, 201)
    >>> d = PhononDOS(nu, 9 * nu**2 / 125, atoms=1)
    >>> t = add_error_columns(tabulate(d, [300.0]), d)
    >>> "entropy_error_J_per_mol_K" in t.columns, bool(t.error_flag[0])
    (True, False)
    """
    from ..columns import column_name, error_key
    from ..tables import to_basis
    t = table[column_name("temperature")].to_numpy()
    per = table.attrs.get("per", "formula")
    b = table_breakdown(dos, t) if breakdown is None else breakdown
    si = tuple(_TO_SI[k] * sum(b[error_column(k, p)].to_numpy() for p in PARTS) for k in QUANTITIES)
    out = table.copy()
    for key, err in zip(QUANTITIES, to_basis(si, per, dos.atoms, formula)):
        out[column_name(error_key(key), per)] = np.asarray(err, float)
    out[column_name("error_flag")] = b[column_name("error_flag")].to_numpy()
    out[column_name("error_reason")] = b[column_name("error_reason")].to_numpy()
    out.attrs.update(table.attrs)
    out.attrs["resolution"] = b.attrs.get("resolution")
    return out
