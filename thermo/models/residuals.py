"""Model-minus-DOS residuals and the C_v/T³ low-temperature diagnostic.

References
----------
.. [1] G. Grimvall, *Thermophysical Properties of Materials*, enlarged ed.
   (Elsevier, Amsterdam, 1999), ch. 6.
"""

from __future__ import annotations

import numpy as np
import pandas as pd

from ..columns import column_name, find
from ..errors import OptionError


def residual_table(reference, model):
    r"""Model minus reference, column by column, at the same temperatures.

    Parameters
    ----------
    reference : pandas.DataFrame
        Table of the DOS (from :func:`thermo.tables.tabulate`).
    model : pandas.DataFrame
        Model table with the same columns and temperatures.

    Returns
    -------
    pandas.DataFrame
        ``temperature_K`` and, for every other column, model − reference
        (same names and units).

    Raises
    ------
    OptionError
        Columns or temperatures differ.

    Notes
    -----
    :math:`\Delta X(T) = X_{model}(T) - X_{DOS}(T)` for C_v, S, U, F.

    Examples
    --------
    >>> a = pd.DataFrame({"temperature_K": [1.0, 2.0], "entropy_J_per_mol_K": [1.0, 2.0]})
    >>> b = pd.DataFrame({"temperature_K": [1.0, 2.0], "entropy_J_per_mol_K": [1.5, 1.0]})
    >>> residual_table(a, b).entropy_J_per_mol_K.tolist()
    [0.5, -1.0]
    """
    if list(reference.columns) != list(model.columns):
        raise OptionError("model and DOS tables have different columns: "
                          f"{list(model.columns)} vs {list(reference.columns)}")
    t_name = column_name("temperature")
    t_ref, t_mod = reference[t_name].to_numpy(float), model[t_name].to_numpy(float)
    if t_ref.shape != t_mod.shape or not np.allclose(t_ref, t_mod, rtol=1e-12, atol=0):
        raise OptionError("model and DOS tables are at different temperatures")
    values = [c for c in reference.columns if c != t_name]
    df = pd.DataFrame({c: model[c].to_numpy(float) - reference[c].to_numpy(float) for c in values})
    df.insert(0, t_name, t_ref)
    return df


def largest_deviations(residuals):
    """Largest absolute residual of each quantity and where it occurs.

    Parameters
    ----------
    residuals : pandas.DataFrame
        Output of :func:`residual_table`.

    Returns
    -------
    dict
        Column name -> ``{"deviation": signed value at the worst point,
        "abs_max": |value|, "temperature_K": T}`` (units of the column).

    Examples
    --------
    >>> r = pd.DataFrame({"temperature_K": [1.0, 2.0], "entropy_J_per_mol_K": [0.5, -1.0]})
    >>> largest_deviations(r)["entropy_J_per_mol_K"]
    {'deviation': -1.0, 'abs_max': 1.0, 'temperature_K': 2.0}
    """
    t_name = column_name("temperature")
    t = residuals[t_name].to_numpy(float)
    out = {}
    for name in (c for c in residuals.columns if c != t_name):
        values = residuals[name].to_numpy(float)
        if not np.isfinite(values).any():
            out[name] = {"deviation": None, "abs_max": None, "temperature_K": None}
            continue
        k = int(np.nanargmax(np.abs(values)))
        out[name] = {"deviation": float(values[k]), "abs_max": float(abs(values[k])), "temperature_K": float(t[k])}
    return out


def cv_over_t3(tables):
    r"""C_v/T³ of several tables (DOS and models) for the low-T diagnostic.

    Parameters
    ----------
    tables : dict of str to pandas.DataFrame
        Name -> table with ``temperature_K`` and a C_v column; all at
        the same temperatures.

    Returns
    -------
    pandas.DataFrame
        ``temperature_K`` (T > 0 only) and one column per name:
        :math:`C_v/T^3` [C_v unit / K³, e.g. J/(mol K⁴)].

    Notes
    -----
    A Debye solid tends to the constant :math:`\frac{12\pi^4}{5}nR/\theta_D^3`;
    an Einstein solid falls to 0 (:math:`C_v \propto x^2e^{-x}`); a real DOS
    shows a plateau at the elastic limit and a peak from low-lying
    transverse modes (the boson-peak-like bump).

    References
    ----------
    .. [1] P. Debye, Ann. Phys. 344, 789 (1912).
    .. [2] G. Grimvall, *Thermophysical Properties of Materials* (Elsevier,
       1999), ch. 6.

    Examples
    --------
    >>> a = pd.DataFrame({"temperature_K": [0.0, 2.0], "heat_capacity_v_J_per_mol_K": [0.0, 8.0]})
    >>> cv_over_t3({"dos": a}).to_dict("list")
    {'temperature_K': [2.0], 'dos': [1.0]}
    """
    if not tables:
        raise OptionError("no tables given")
    first = next(iter(tables.values()))
    t_name = column_name("temperature")
    t = first[t_name].to_numpy(float)
    hot = t > 0
    out = pd.DataFrame({t_name: t[hot]})
    for name, table in tables.items():
        tt = table[t_name].to_numpy(float)
        if tt.shape != t.shape or not np.allclose(tt, t, rtol=1e-12, atol=0):
            raise OptionError(f"table {name!r} is at different temperatures")
        out[name] = table[find(table, "heat_capacity_v")].to_numpy(float)[hot] / t[hot] ** 3
    return out
