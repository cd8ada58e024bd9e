"""Every characteristic temperature of a DOS, labelled, and the models report.

References
----------
.. [1] T. H. K. Barron, W. T. Berg, J. A. Morrison, "On the heat capacity of
   crystalline magnesium oxide", Proc. R. Soc. Lond. A 242, 478-492 (1957).
.. [2] G. Grimvall, *Thermophysical Properties of Materials*, enlarged ed.
   (Elsevier, Amsterdam, 1999), ch. 6.
.. [3] A. Einstein, Ann. Phys. 327, 180-190 (1907); P. Debye, Ann. Phys. 344,
   789-839 (1912).
"""

from __future__ import annotations

import math

import numpy as np

from ..columns import column_name
from .composite import composite_model
from .equivalent_debye import equivalent_debye_temperature
from .fitting import check_fit_range, default_fit_range, fit_debye_theta, fit_einstein_theta
from .moments import debye_moment_temperature, einstein_entropy_temperature, einstein_mean_temperature

_BARRON = ("T. H. K. Barron, W. T. Berg, J. A. Morrison, Proc. R. Soc. Lond. A 242, 478-492 (1957); "
           "G. Grimvall, Thermophysical Properties of Materials (Elsevier, 1999), ch. 6")
_MOMENT_TEXT = "Debye temperature of the frequency moment n = {n}: (h/k_B)[(n+3)/3 <nu^n>]^(1/n); {why}"
#: (key, order n, what the moment governs) of the moment Debye temperatures.
_MOMENTS = (
    ("debye_theta_moment_m2_K", -2, "weights the soft modes (mean-square displacement at high T)"),
    ("debye_theta_moment_m1_K", -1, "weights low frequencies"),
    ("debye_theta_moment_0_K", 0, None),
    ("debye_theta_moment_1_K", 1, "same zero-point energy as the DOS"),
    ("debye_theta_moment_2_K", 2, "same leading high-T deviation of C_v from 3nR"),
)

#: Keys of :func:`theta_definitions`, in order.
THETA_KEYS = ("einstein_theta_entropy_K", "einstein_theta_fit_K", "einstein_theta_mean_K",
              "debye_theta_low_frequency_K") + tuple(k for k, _, _ in _MOMENTS) + ("debye_theta_fit_K",)

#: Cautions shown with every models result.
CAUTIONS = (
    "harmonic approximation at fixed volume: C_v, not C_p; no thermal expansion or anharmonicity",
    "the Einstein and Debye models are summaries of the spectrum; quote the DOS results for numbers "
    "and defer to validated data for design work",
)


def _finite(value):
    return None if value is None or not math.isfinite(value) else float(value)


def _json_safe(value):
    """Nested lists/dicts with non-finite floats replaced by None."""
    if isinstance(value, dict):
        return {k: _json_safe(v) for k, v in value.items()}
    if isinstance(value, (list, tuple)):
        return [_json_safe(v) for v in value]
    if isinstance(value, (float, np.floating)):
        return _finite(float(value))
    return value


#: Why a θ can be undefined, by key.
_UNDEFINED = {
    "debye_theta_low_frequency_K": "undefined: no low-frequency nu^2 fit (treatment off or no nu^2-like region)",
    "debye_theta_moment_m2_K": "undefined: the DOS does not vanish at nu = 0, so <nu^-2> diverges",
    "debye_theta_moment_m1_K": "undefined: the DOS does not vanish at nu = 0, so <nu^-1> diverges",
}


def _entry(key, value, definition, reference, uncertainty=None, fit_range=None):
    value = _finite(value)
    return {"key": key, "value_K": value, "uncertainty_K": _finite(uncertainty),
            "fit_range_K": None if fit_range is None else [float(v) for v in fit_range],
            "definition": definition, "reference": reference,
            "note": _UNDEFINED.get(key, "undefined for this spectrum") if value is None else None}


def theta_definitions(dos, fit_range=None):
    r"""All characteristic temperatures of a DOS with their definitions.

    Parameters
    ----------
    dos : PhononDOS
        Normalised DOS.
    fit_range : tuple of float, optional
        (T_min, T_max) of the C_v fits [K]; default
        :func:`thermo.models.fitting.default_fit_range`.

    Returns
    -------
    list of dict
        One dict per definition (keys in :data:`THETA_KEYS`):
        ``key``, ``value_K`` (None when undefined), ``uncertainty_K``
        (fits only), ``fit_range_K`` (fits only), ``definition``,
        ``reference``, ``note`` (why the value is undefined, else None).

    Notes
    -----
    - Einstein, entropy: :math:`\theta_E = (h/k_B)e^{\langle\ln\nu\rangle}`.
    - Einstein, fit: least squares on :math:`C_v(T)`.
    - Einstein, mean: :math:`\theta_E = (h/k_B)\langle\nu\rangle`.
    - Debye, low frequency: :math:`(h/k_B)(9n/A)^{1/3}`, :math:`g\to A\nu^2`.
    - Debye, moments: :math:`\theta_D(n) = (h/k_B)[(n+3)\langle\nu^n\rangle/3]^{1/n}`,
      :math:`\theta_D(0) = (h/k_B)e^{1/3+\langle\ln\nu\rangle}`.
    - Debye, fit: least squares on :math:`C_v(T)`.

    All coincide for a Debye spectrum (Barron et al. 1957); their spread
    measures how far the spectrum is from Debye's.

    References
    ----------
    .. [1] T. H. K. Barron, W. T. Berg, J. A. Morrison, Proc. R. Soc. Lond.
       A 242, 478-492 (1957).
    .. [2] G. Grimvall, *Thermophysical Properties of Materials* (Elsevier,
       1999), ch. 6.

    Examples
    --------
    >>> from thermo.models.debye import debye_spectrum
    >>> from thermo.kernels.planck import H_OVER_K_THZ
    >>> d = debye_spectrum(2 * H_OVER_K_THZ)     # ν_D = 2 THz
    >>> rows = theta_definitions(d)
    >>> sorted({round(r["value_K"] / (2 * H_OVER_K_THZ), 6) for r in rows if r["key"].startswith("debye")})
    [1.0]
    """
    fit_range = check_fit_range(default_fit_range(dos) if fit_range is None else fit_range)
    einstein_fit = fit_einstein_theta(dos, fit_range)
    debye_fit = fit_debye_theta(dos, fit_range)
    rows = [
        _entry("einstein_theta_entropy_K", einstein_entropy_temperature(dos),
               "Einstein temperature with the same high-T entropy as the DOS: (h/k_B) exp<ln nu>", _BARRON),
        _entry("einstein_theta_fit_K", einstein_fit.value,
               "Einstein temperature fitted by least squares to the DOS C_v(T) over the fit range (3n modes)",
               "W. H. Press et al., Numerical Recipes, 3rd ed. (2007), 15.4; A. Einstein, Ann. Phys. 327, 180 (1907)",
               einstein_fit.uncertainty, einstein_fit.fit_range_K),
        _entry("einstein_theta_mean_K", einstein_mean_temperature(dos),
               "Einstein temperature of the mean frequency, (h/k_B)<nu>: same zero-point energy as the DOS",
               "G. Grimvall, Thermophysical Properties of Materials (Elsevier, 1999), ch. 6"),
        _entry("debye_theta_low_frequency_K", dos.low_frequency_debye_temperature_k(),
               "Debye temperature of the elastic limit, (h/k_B)(9n/A)^(1/3) with g -> A nu^2 at low frequency; "
               "sets the T^3 law (undefined without a low-frequency nu^2 fit)",
               "P. Debye, Ann. Phys. 344, 789 (1912)"),
    ]
    for key, n, why in _MOMENTS:
        text = (_MOMENT_TEXT.format(n=n, why=why) if n else
                "Debye temperature of the logarithmic moment, (h/k_B) exp(1/3 + <ln nu>): "
                "same high-T entropy as the DOS")
        rows.append(_entry(key, debye_moment_temperature(dos, n), text, _BARRON))
    rows.append(_entry("debye_theta_fit_K", debye_fit.value,
                       "Debye temperature fitted by least squares to the DOS C_v(T) over the fit range (3n modes)",
                       "W. H. Press et al., Numerical Recipes, 3rd ed. (2007), 15.4; P. Debye, Ann. Phys. 344, 789 (1912)",
                       debye_fit.uncertainty, debye_fit.fit_range_K))
    return rows


def models_report(dos, temperatures=None, fit_range=None, optical_terms=1):
    """JSON-able record of every θ, the composite model and θ_D(T).

    Parameters
    ----------
    dos : PhononDOS
        Normalised DOS.
    temperatures : array_like, optional
        Temperatures for θ_D(T) [K]; omitted from the record when None.
    fit_range : tuple of float, optional
        (T_min, T_max) of the C_v fits [K].
    optical_terms : int
        Einstein terms of the composite model.

    Returns
    -------
    dict
        One key per θ of :data:`THETA_KEYS` [K] (None when undefined),
        ``einstein_theta_fit_uncertainty_K``, ``debye_theta_fit_uncertainty_K``,
        ``fit_range_K``, ``composite_debye_theta_K``,
        ``composite_einstein_theta_K`` (number for one optical term, list for
        several, None for one atom per formula unit), ``composite`` (all
        parameters), ``definitions`` (see :func:`theta_definitions`),
        ``atoms``, ``cautions``; with temperatures also ``temperature_K``
        and ``equivalent_debye_temperature_K`` (None where undefined).

    Examples
    --------
    >>> from thermo.models.debye import debye_spectrum
    >>> from thermo.kernels.planck import H_OVER_K_THZ
    >>> d = debye_spectrum(2 * H_OVER_K_THZ)     # ν_D = 2 THz
    >>> r = models_report(d, temperatures=[0.0, 50.0])
    >>> theta_d = r["equivalent_debye_temperature_K"]
    >>> theta_d[0] is None, round(theta_d[1] / (2 * H_OVER_K_THZ), 6)    # undefined at 0 K; flat
    (True, 1.0)
    """
    fit_range = check_fit_range(default_fit_range(dos) if fit_range is None else fit_range)
    rows = theta_definitions(dos, fit_range)
    report = {row["key"]: row["value_K"] for row in rows}
    by_key = {row["key"]: row for row in rows}
    report["einstein_theta_fit_uncertainty_K"] = by_key["einstein_theta_fit_K"]["uncertainty_K"]
    report["debye_theta_fit_uncertainty_K"] = by_key["debye_theta_fit_K"]["uncertainty_K"]
    report["fit_range_K"] = [float(v) for v in fit_range]
    composite = composite_model(dos, optical_terms, fit_range)
    thetas = [float(v) for v in composite.einstein_thetas_K]
    report["composite_debye_theta_K"] = _finite(composite.debye_theta_K)
    report["composite_einstein_theta_K"] = (None if not thetas else thetas[0] if len(thetas) == 1 else thetas)
    report["composite"] = _json_safe(composite.as_dict())
    report["atoms"] = int(dos.atoms)
    if temperatures is not None:
        t = np.atleast_1d(np.asarray(temperatures, dtype=float))
        report["temperature_K"] = [float(v) for v in t]
        report["equivalent_debye_temperature_K"] = [_finite(v) for v in equivalent_debye_temperature(dos, t)]
    report["definitions"] = rows
    report["cautions"] = list(CAUTIONS) + list(dos.warnings)
    return report


def model_tables(dos, temperatures, einstein_theta_K, debye_theta_K, composite=None, per="formula",
                 formula=None):
    """The DOS table and the model tables at the same temperatures.

    Parameters
    ----------
    dos : PhononDOS
        Normalised DOS (n atoms; the Einstein and Debye models carry 3n modes).
    temperatures : array_like
        Temperatures [K], >= 0.
    einstein_theta_K, debye_theta_K : float
        θ_E and θ_D of the single-term models [K].
    composite : CompositeModel, optional
        Composite model to include.
    per, formula
        Basis, as in :func:`thermo.tables.tabulate`.

    Returns
    -------
    dict of str to pandas.DataFrame
        ``dos``, ``einstein``, ``debye`` and (if given) ``composite``, all
        with the columns of :func:`thermo.tables.tabulate`.

    Examples
    --------
    >>> from thermo.spectrum import PhononDOS
    >>> d = PhononDOS(np.array([0.0, 1.0]), np.array([0.0, 6.0]), atoms=1)
    >>> sorted(model_tables(d, [10.0], 30.0, 40.0))
    ['debye', 'dos', 'einstein']
    """
    from ..tables import tabulate
    from .composite import composite_table
    from .debye import debye_table
    from .einstein import einstein_table
    modes = 3 * dos.atoms
    tables = {"dos": tabulate(dos, temperatures, per=per, formula=formula),
              "einstein": einstein_table(einstein_theta_K, modes, temperatures, per, dos.atoms, formula),
              "debye": debye_table(debye_theta_K, modes, temperatures, per, dos.atoms, formula)}
    if composite is not None:
        tables["composite"] = composite_table(composite, temperatures, per, dos.atoms, formula)
    return tables


def side_by_side(tables):
    """One table with the columns of several tables, prefixed by their names.

    Parameters
    ----------
    tables : dict of str to pandas.DataFrame
        Tables with the same first column (``temperature_K``) and values.

    Returns
    -------
    pandas.DataFrame
        ``temperature_K`` then ``<name>_<column>`` for every table and column.

    Examples
    --------
    >>> import pandas as pd
    >>> a = pd.DataFrame({"temperature_K": [1.0], "entropy_J_per_mol_K": [2.0]})
    >>> list(side_by_side({"dos": a, "debye": a}).columns)
    ['temperature_K', 'dos_entropy_J_per_mol_K', 'debye_entropy_J_per_mol_K']
    """
    import pandas as pd
    first = next(iter(tables.values()))
    t_name = column_name("temperature")
    parts = [first[[t_name]].reset_index(drop=True)]
    for name, table in tables.items():
        parts.append(table.drop(columns=t_name).add_prefix(f"{name}_").reset_index(drop=True))
    return pd.concat(parts, axis=1)
