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
        The runs (from :func:`thermo.load_dos`), at least one (one run is its own reference).
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
        No run, a reference outside the list, temperatures <= 0.

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
    if not doses:      # one run is its own reference: its values and its error (beside a table run, say)
        raise OptionError("a comparison needs at least one run")
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



#: Quantities of a table that stand for a compared quantity (a calorimetry table's third-law S° is an entropy).
STANDS_FOR = {"heat_capacity_v": ("heat_capacity_v",), "entropy": ("entropy", "entropy_third_law"),
              "internal_energy": ("internal_energy",), "helmholtz_energy": ("helmholtz_energy",)}


def _on_basis(table, key, per, atoms, formula):
    """``(values, errors)`` of the column standing for ``key`` on basis ``per`` (None when the table has none)."""
    from .columns import error_column_for, lookup
    found = [(n, lookup(n)) for n in table.columns if _in_schema(n) and lookup(n).quantity.key in STANDS_FOR[key]]
    if not found:
        return None
    same = [n for n, c in found if c.basis == per]
    name = same[0] if same else next((n for n, c in found if c.basis == "formula"), None)
    if name is None:
        raise OptionError(f"the table's {key} is per {found[0][1].basis}: compare on that basis")
    err = error_column_for(table, name)
    values = table[name].to_numpy(dtype=float)
    errors = table[err].to_numpy(dtype=float) if err is not None else np.full(values.size, np.nan)
    if name in same:
        return values, errors
    energy = lookup(name).quantity.kind == "energy"        # kJ/mol per formula unit → J/mol for to_basis
    if per != "formula" and atoms is None:
        raise OptionError("the table is per formula unit and states no atom count: compare per formula unit")
    out = []
    for v in (values, errors):
        zero = np.zeros_like(v)
        parts = (zero, zero, v * 1e3, zero) if energy else (v, zero, zero, zero)
        out.append(np.asarray(to_basis(parts, per, atoms, formula)[2 if energy else 0], float))
    return tuple(out)


def _in_schema(name):
    from .columns import lookup
    try:
        lookup(name)
    except OptionError:
        return False
    return True


def add_table_run(comparison, table, name, atoms=None, formula=None):
    r"""The comparison with one more run given by a table modeheat wrote (read back), at its temperatures.

    Parameters
    ----------
    comparison : pandas.DataFrame
        A result of :func:`compare_runs`.
    table : pandas.DataFrame
        A thermodynamics, quasi-harmonic or calorimetry table (its third-law S° stands for S).
    name : str
        The run's name (the table's file name).
    atoms : int, optional
        Atoms per formula unit of the table (to compare a per-formula table per atom or per gram).
    formula : str, optional
        Chemical formula (per gram).

    Returns
    -------
    pandas.DataFrame
        ``comparison`` with the table's rows appended: each quantity the table has, at the comparison's
        temperatures inside its rows (NaN outside, and for quantities it lacks), its error and its
        relative difference from the reference run.

    Notes
    -----
    Between rows a value is the monotone cubic (PCHIP) interpolant [1]_; its error is the table's own
    (linear between rows; NaN when the table states none) plus :math:`|Q_{PCHIP} - Q_{linear}|`, an
    over-estimate of the interpolation error that is zero on the rows.

    References
    ----------
    .. [1] F. N. Fritsch and R. E. Carlson, SIAM J. Numer. Anal. 17, 238–246 (1980).

    Examples
    --------
    >>> from thermo.spectrum import PhononDOS
    >>> from thermo.tables import tabulate
    >>> nu = np.linspace(0.0, 5.0, 201)
    >>> a = PhononDOS(nu, 9 * nu**2 / 125, atoms=1)
    >>> df = add_table_run(compare_runs([a, a], [300.0]), tabulate(a, [200.0, 300.0, 400.0]), "t.csv")
    >>> abs(float(df.entropy_relative_difference.iloc[-1])) < 1e-12
    True
    """
    from scipy.interpolate import PchipInterpolator

    from .columns import find
    per = comparison.attrs.get("per", "formula")
    t = np.asarray(comparison.attrs["temperatures_K"], dtype=float)
    rows = table[find(table, "temperature")].to_numpy(dtype=float)
    order = np.argsort(rows, kind="stable")
    base = comparison[comparison["reference"]].drop_duplicates(column_name("temperature")).set_index(
        column_name("temperature"))
    inside = (t >= rows[order][0]) & (t <= rows[order][-1])
    out = {"run": [name] * t.size, "reference": [False] * t.size, column_name("temperature"): t}
    for key in QUANTITIES:
        pair = _on_basis(table, key, per, atoms, formula)
        value = np.full(t.size, np.nan)
        error = np.full(t.size, np.nan)
        if pair is not None:
            v, u = pair[0][order], pair[1][order]
            keep = np.isfinite(v)
            x, v, u = rows[order][keep], v[keep], u[keep]
            if x.size >= 2:
                smooth = PchipInterpolator(x, v)(t[inside])
                linear = np.interp(t[inside], x, v)
                value[inside] = smooth
                error[inside] = np.interp(t[inside], x, u) + np.abs(smooth - linear)
        reference = base.loc[t, column_name(key, per)].to_numpy()
        out[column_name(key, per)] = value
        out[column_name(error_key(key), per)] = error
        with np.errstate(divide="ignore", invalid="ignore"):
            out[column_name(difference_key(key))] = np.where(reference != 0, (value - reference) / np.abs(reference),
                                                             np.nan)
    df = pd.concat([comparison, pd.DataFrame(out)], ignore_index=True)
    df.attrs.update(comparison.attrs)
    return df


def table_run_input(info, name, data, source_provenance=None):
    """``info`` (a :func:`comparison_provenance` record) with a table run added: its input and its name."""
    from .provenance import input_record
    info = dict(info)
    info["inputs"] = list(info["inputs"]) + [input_record(name, data=data, role="table run")]
    info["comparison"] = {**info["comparison"], "runs": list(info["comparison"]["runs"]) + [name],
                          "table_runs": "interpolated between their rows (PCHIP); error: the table's own plus "
                                        "|PCHIP - linear|, blank where the table states none"}
    return info


def with_table_run(comparison, info, raw, name, formula=None):
    """``(comparison, info)`` with the table in ``raw`` (CSV bytes modeheat wrote) as one more run.

    The table's stated ``atoms`` convert a per-formula table to the comparison's basis;
    ``info`` may be None (no provenance wanted).
    """
    from .io.readback import read_exported_csv
    table, record = read_exported_csv(raw)
    from .provenance import stated_atoms
    out = add_table_run(comparison, table, name, stated_atoms(record), formula)
    return out, (None if info is None else table_run_input(info, name, raw))

for _key, _symbol in (("heat_capacity_v", "C_v"), ("entropy", "S"), ("internal_energy", "U"),
                      ("helmholtz_energy", "F")):
    register_quantity(difference_key(_key), f"Δ{_symbol}/{_symbol}", "fixed", "1",
                      description=f"relative difference of {_symbol} from the reference run")
