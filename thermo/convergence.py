"""Convergence studies: the same quantities of several runs side by side, against a reference run.

A run is one prepared DOS (or mode list) of the same solid — a coarser or
finer q-mesh, another smearing, another code setting.  :func:`compare_runs`
gives, at chosen temperatures, each run's C_v, S, U, F, its estimated error
(:func:`thermo.accuracy.rows.harmonic_row_errors`) and its relative
difference from the reference run, so a difference can be read against the
errors the runs themselves claim.
"""

from __future__ import annotations

import numpy as np
import pandas as pd

from .accuracy.breakdown import QUANTITIES
from .accuracy.rows import harmonic_row_errors
from .columns import column_name, error_key, register_quantity
from .errors import OptionError
from .tables import tabulate, to_basis

#: Temperatures of a comparison unless others are given [K].
DEFAULT_TEMPERATURES = (5.0, 20.0, 298.15)


def difference_key(key):
    """Quantity key of the relative difference of ``key`` from the reference run.

    Examples
    --------
    >>> column_name(difference_key("entropy"))
    'entropy_relative_difference'
    """
    return f"{key}_relative_difference"


def compare_runs(doses, temperatures=DEFAULT_TEMPERATURES, reference=0, names=None, per="formula",
                 formula=None):
    r"""C_v, S, U, F of several runs, their error estimates and relative differences from a reference run.

    Parameters
    ----------
    doses : sequence of PhononDOS
        The runs (from :func:`thermo.load_dos`), at least two.
    temperatures : array_like
        Temperatures [K], > 0 (default 5, 20, 298.15 K).
    reference : int
        Index of the reference run in ``doses`` (default the first).
    names : sequence of str, optional
        Run names (default each DOS's source name).
    per : {'formula', 'atom', 'gram'}
        Basis of the values and errors (see :func:`thermo.tables.tabulate`).
    formula : str, optional
        Chemical formula, for ``per='gram'``.

    Returns
    -------
    pandas.DataFrame
        One row per run and temperature: ``run``, ``reference`` (True for
        the reference run), ``temperature_K``; for each quantity its value,
        its estimated error ``<quantity>_error_<unit>`` and
        ``<quantity>_relative_difference`` [1] (names from the column schema).

    Raises
    ------
    OptionError
        Fewer than two runs, a reference outside the list, temperatures <= 0.

    Notes
    -----
    :math:`\Delta_Q = (Q_{run} - Q_{ref}) / |Q_{ref}|`; the error beside it is
    the run's own estimate :math:`\delta Q` (numerical, low-frequency,
    resolution and smearing parts), in the unit of :math:`Q`.

    Examples
    --------
    >>> from thermo.spectrum import PhononDOS
    >>> nu = np.linspace(0.0, 5.0, 201)
    >>> a = PhononDOS(nu, 9 * nu**2 / 125, atoms=1)
    >>> b = PhononDOS(nu * 1.01, 9 * nu**2 / 125 / 1.01, atoms=1)     # every mode 1 % stiffer
    >>> df = compare_runs([a, b], [300.0], names=["fine", "stiffer"])
    >>> round(float(df.entropy_relative_difference.iloc[1]), 4)   # classical limit: -3R ln(1.01)/S = -0.0063
    -0.0061
    """
    doses = list(doses)
    if len(doses) < 2:
        raise OptionError("a comparison needs at least two runs")
    if not 0 <= reference < len(doses):
        raise OptionError(f"reference run {reference + 1} is not among the {len(doses)} runs")
    t = np.atleast_1d(np.asarray(temperatures, dtype=float)).ravel()
    if t.size == 0 or not np.all(np.isfinite(t)) or np.any(t <= 0):
        raise OptionError("comparison temperatures must be finite and above 0 K")
    names = list(names) if names is not None else [d.source.get("name") or f"run {i + 1}"
                                                    for i, d in enumerate(doses)]
    frames = []
    tables = [tabulate(d, t, per=per, formula=formula) for d in doses]
    ref = tables[reference]
    for i, (dos, table) in enumerate(zip(doses, tables)):
        e = harmonic_row_errors(dos, t)
        errors = to_basis(tuple(e[k] for k in QUANTITIES), per, dos.atoms, formula)
        out = {"run": [names[i]] * t.size, "reference": [i == reference] * t.size, column_name("temperature"): t}
        for key, err in zip(QUANTITIES, errors):
            value = table[column_name(key, per)].to_numpy()
            base = ref[column_name(key, per)].to_numpy()
            out[column_name(key, per)] = value
            out[column_name(error_key(key), per)] = np.asarray(err, float)
            with np.errstate(divide="ignore", invalid="ignore"):
                out[column_name(difference_key(key))] = np.where(base != 0, (value - base) / np.abs(base), 0.0)
        frames.append(pd.DataFrame(out))
    df = pd.concat(frames, ignore_index=True)
    df.attrs.update(per=per, reference=names[reference], temperatures_K=[float(v) for v in t])
    return df


def comparison_provenance(doses, temperatures, reference=0, names=None, per="formula", formula=None):
    """The provenance record of :func:`compare_runs` (every run as an input, the reference named).

    Parameters
    ----------
    doses, temperatures, reference, names, per, formula
        As :func:`compare_runs`.

    Returns
    -------
    dict
        :func:`thermo.tables.provenance` of the reference run with ``inputs``
        holding every run and a ``comparison`` detail (reference, runs, what
        the difference and the error are).

    Examples
    --------
    >>> from thermo.spectrum import PhononDOS
    >>> nu = np.linspace(0.0, 5.0, 201)
    >>> a = PhononDOS(nu, 9 * nu**2 / 125, atoms=1)
    >>> comparison_provenance([a, a], [300.0], names=["x", "y"])["comparison"]["runs"]
    ['x', 'y']
    """
    from .tables import provenance
    doses = list(doses)
    t = np.atleast_1d(np.asarray(temperatures, dtype=float)).ravel()
    names = list(names) if names is not None else [d.source.get("name") or f"run {i + 1}"
                                                    for i, d in enumerate(doses)]
    info = provenance(doses[reference], t, per=per, formula=formula)
    info["inputs"] = [provenance(d, t[:1], per=per, formula=formula)["inputs"][0] for d in doses]
    info["comparison"] = {"reference": names[reference], "runs": names,
                          "relative_difference": "(run - reference) / |reference|",
                          "error": "each run's own estimated error (numerical, low-frequency, resolution, smearing)"}
    return info


for _key, _symbol in (("heat_capacity_v", "C_v"), ("entropy", "S"), ("internal_energy", "U"),
                      ("helmholtz_energy", "F")):
    register_quantity(difference_key(_key), f"Δ{_symbol}/{_symbol}", "fixed", "1",
                      description=f"relative difference of {_symbol} from the reference run")
