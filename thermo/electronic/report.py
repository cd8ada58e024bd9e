r"""Tables, key numbers and provenance of the electronic term; adding it to a phonon table.

References
----------
.. [1] N. W. Ashcroft, N. D. Mermin, *Solid State Physics* (Holt, Rinehart and
   Winston, 1976), ch. 2.
.. [2] G. Grimvall, *The Electron-Phonon Interaction in Metals* (North-Holland,
   1981), ch. 6 (the mass enhancement 1 + λ of the measured γ).

Examples
--------
>>> from thermo.electronic.dos import make_electronic_dos
>>> df = electronic_table(make_electronic_dos([-5.0, 5.0], [1.0, 1.0]), [0.0, 100.0])
>>> list(df.columns)[:3]
['temperature_K', 'heat_capacity_electronic_J_per_mol_K', 'entropy_electronic_J_per_mol_K']
"""

from __future__ import annotations

import numpy as np
import pandas as pd

from ..columns import ELECTRONIC, column_name
from ..errors import OptionError
from ..provenance import input_record, provenance_record, temperature_settings
from ..tables import check_temperatures, to_basis
from .thermodynamics import GAMMA_PER_STATE, J_PER_MOL_PER_EV, edge_warnings, fermi_dirac_state, numerical_errors

#: Cautions shown wherever electronic results are (CLI notes, JSON, page).
CAUTIONS = (
    "The electronic DOS is taken at one fixed volume and does not change with temperature: no thermal "
    "broadening or shift of the bands, no magnetic or spin-fluctuation entropy.",
    "No electron–phonon renormalisation: a measured γ is larger than the band value by 1 + λ "
    "(λ ≈ 0.1–1.5 in common metals; common practice), so compare the two with that in mind.",
    "The result is only as good as the DOS near E_F: k-point sampling and smearing of the calculation move "
    "g(E_F) and γ; check convergence before a design decision and defer to validated data.",
)
_ERRORS = ("heat_capacity_electronic", "entropy_electronic", "internal_energy_electronic",
           "helmholtz_energy_electronic")


def _atoms(per, atoms, formula):
    if per == "formula":
        return atoms or 1
    if atoms is None and formula:
        from ..formula import formula_unit
        return formula_unit(formula)[1]
    if atoms is None:
        raise OptionError(f"per {per} needs the atoms per formula unit (or a formula)")
    return atoms


def electronic_table(edos, temperatures, per="formula", atoms=None, formula=None):
    r"""Electronic C_el, S_el, U_el, F_el, μ − E_F and their numerical errors versus temperature.

    Parameters
    ----------
    edos : ElectronicDOS
        Spin-summed DOS per formula unit.
    temperatures : array_like
        T [K], ≥ 0.
    per : {'formula', 'atom', 'gram'}
        Basis of the table (as :func:`thermo.tabulate`).
    atoms : int, optional
        Atoms per formula unit (for 'atom' and 'gram'; taken from ``formula`` when not given).
    formula : str, optional
        Chemical formula (for 'gram').

    Returns
    -------
    pandas.DataFrame
        Columns of :data:`thermo.columns.ELECTRONIC` then the ``…_error_…``
        columns of C_el, S_el, U_el, F_el (see :func:`numerical_errors`);
        ``attrs``: ``per``, ``formula``, ``summary`` (:func:`electronic_summary`)
        and ``warnings`` (input and table-edge warnings).

    Notes
    -----
    See :func:`thermo.electronic.fermi_dirac_state` for the equations.

    Examples
    --------
    >>> from thermo.electronic.dos import make_electronic_dos
    >>> d = make_electronic_dos([-5.0, 5.0], [1.0, 1.0])
    >>> df = electronic_table(d, [10.0])
    >>> round(float(df.heat_capacity_electronic_J_per_mol_K[0]) / 10.0 * 1e3, 4)   # γ in mJ/(mol K²)
    2.3571
    """
    t = check_temperatures(temperatures)
    n = _atoms(per, atoms, formula)
    state = fermi_dirac_state(edos, t)
    errors = numerical_errors(edos, t, state)
    c, s, u, f = to_basis(state.values(), per, n, formula)
    ec, es, eu, ef = to_basis(tuple(errors[k] * J_PER_MOL_PER_EV for k in
                                    ("heat_capacity", "entropy", "internal_energy", "helmholtz_energy")),
                              per, n, formula)
    columns = dict(zip((column_name(k, per) for k in ELECTRONIC),
                       (t, c, s, u, f, state.chemical_potential_ev)))
    columns.update(zip((column_name(f"{k}_error", per) for k in _ERRORS), (ec, es, eu, ef)))
    df = pd.DataFrame(columns)
    df.attrs.update(per=per, formula=formula, summary=electronic_summary(edos, errors),
                    warnings=list(edos.warnings) + edge_warnings(edos, state))
    return df


def electronic_summary(edos, errors=None):
    r"""Key numbers of an electronic DOS: γ and g(E_F) with their uncertainties, electron count, gap.

    Returns
    -------
    dict
        ``sommerfeld_gamma_mJ_per_mol_K2`` and ``dos_at_fermi_level_per_eV``
        as ``{"value", "uncertainty"}`` (per mole / per formula unit; the
        uncertainty is the half-grid difference, see :func:`numerical_errors`),
        ``electrons_below_fermi_level`` [per formula unit], ``gap_eV``
        (None or [low, high] relative to E_F), ``fermi_energy_eV`` (absolute,
        when given).

    Notes
    -----
    :math:`\gamma = (\pi^2/3)k_B^2 g(E_F)` (Ashcroft & Mermin, ch. 2).

    Examples
    --------
    >>> from thermo.electronic.dos import make_electronic_dos
    >>> flat = make_electronic_dos([-2.0, -1.0, 0.0, 1.0, 2.0], [2.0] * 5)
    >>> electronic_summary(flat)["dos_at_fermi_level_per_eV"]
    {'value': 2.0, 'uncertainty': 0.0}
    >>> electronic_summary(make_electronic_dos([-1.0, 1.0], [2.0, 2.0]))["dos_at_fermi_level_per_eV"]  # no half grid
    {'value': 2.0, 'uncertainty': 2.0}
    """
    if errors is None:
        errors = numerical_errors(edos, [0.0])
    g, dg = edos.dos_at_fermi_level, float(errors["dos_at_fermi_level"])
    return {
        "sommerfeld_gamma_mJ_per_mol_K2": {"value": GAMMA_PER_STATE * g * 1e3,
                                           "uncertainty": GAMMA_PER_STATE * dg * 1e3},
        "dos_at_fermi_level_per_eV": {"value": g, "uncertainty": dg},
        "electrons_below_fermi_level": edos.electrons_below_fermi,
        "gap_eV": None if edos.gap_ev is None else list(edos.gap_ev),
        "fermi_energy_eV": edos.fermi_energy_ev,
    }


def electronic_input(edos, role=None):
    """The ``inputs`` entry of an :class:`ElectronicDOS` (name, SHA-256, the reading options used).

    Examples
    --------
    >>> from thermo.electronic.dos import make_electronic_dos
    >>> electronic_input(make_electronic_dos([-1.0, 1.0], [1.0, 1.0], source={"name": "e.dat"}))["name"]
    'e.dat'
    """
    src = edos.source
    options = {"energy_unit": src.get("energy_unit"), "fermi_energy_eV": edos.fermi_energy_ev,
               "fermi_energy_from": src.get("fermi_energy_from"), "spin": src.get("spin"),
               "formula_units": src.get("formula_units")}
    if src.get("sheet") is not None:
        options["sheet"] = src["sheet"]
    return input_record(src.get("name"), src.get("sha256"), options, role=role)


def electronic_details(edos, attrs):
    """Capability details of an electronic result: key numbers, grid, notes, cautions, model statement."""
    e = edos.energies_ev
    details = dict(attrs.get("summary") or electronic_summary(edos))
    details.update(energy_range_eV=[float(e[0]), float(e[-1])], points=int(e.size), notes=list(edos.notes),
                   cautions=list(CAUTIONS),
                   model="Fermi–Dirac occupation of a fixed electronic DOS at fixed electron count; "
                         "piecewise-linear DOS integrated exactly")
    return details


def electronic_provenance(edos, attrs, temperatures):
    """Provenance of an electronic table (:func:`thermo.provenance.provenance_record`).

    Parameters
    ----------
    edos : ElectronicDOS
    attrs : dict
        ``attrs`` of :func:`electronic_table` (basis, formula, summary, warnings).
    temperatures : array_like
        Temperatures of the table [K].

    Examples
    --------
    >>> from thermo.electronic.dos import make_electronic_dos
    >>> d = make_electronic_dos([-5.0, 5.0], [1.0, 1.0], source={"name": "flat.dat"})
    >>> electronic_provenance(d, electronic_table(d, [300.0]).attrs, [300.0])["inputs"][0]["name"]
    'flat.dat'
    """
    settings = {"basis": attrs.get("per"), "formula": attrs.get("formula"),
                "temperatures_K": temperature_settings(temperatures)}
    return provenance_record([electronic_input(edos)], settings, attrs.get("warnings", []),
                             **electronic_details(edos, attrs))


def gamma_comparison(edos, measured_gammas):
    r"""The band γ of an electronic DOS beside γ values fitted to a measured heat capacity.

    Parameters
    ----------
    edos : ElectronicDOS
        Electronic DOS per formula unit (the same formula unit as the measurement).
    measured_gammas : dict of str to dict
        ``{"label": {"value": γ, "uncertainty": u}}`` [J/(mol K²)]; entries whose value is None are skipped.

    Returns
    -------
    dict
        ``gamma_from_electronic_dos_J_per_mol_K2`` (value, uncertainty), ``electronic_input``, and
        ``ratios``: for each label the ratio measured/band with its uncertainty (the enhancement 1 + λ
        when the rest of the model is right), and ``notes``.

    Notes
    -----
    :math:`\gamma_{meas} = (1+\lambda)\,\gamma_{band}`, :math:`\gamma_{band} = (\pi^2/3)k_B^2 g(E_F)`;
    :math:`u(r)/r = \sqrt{(u_m/\gamma_m)^2 + (u_b/\gamma_b)^2}`.

    References
    ----------
    G. Grimvall (1981), ch. 6 (see the module references).

    Examples
    --------
    >>> from thermo.electronic.dos import make_electronic_dos
    >>> band = make_electronic_dos([-2.0, -1.0, 0.0, 1.0, 2.0], [0.5] * 5)        # γ_band = 1.1785 mJ/(mol K²)
    >>> c = gamma_comparison(band, {"fit": {"value": 1.65e-3, "uncertainty": 0.05e-3}})
    >>> round(c["ratios"]["fit"]["value"], 3), round(c["ratios"]["fit"]["uncertainty"], 3)
    (1.4, 0.042)
    """
    summary = electronic_summary(edos)
    band = {k: v * 1e-3 for k, v in summary["sommerfeld_gamma_mJ_per_mol_K2"].items()}
    out = {"gamma_from_electronic_dos_J_per_mol_K2": band, "electronic_input": edos.source.get("name"),
           "ratios": {}, "notes": []}
    for label, pair in measured_gammas.items():
        value, u = pair.get("value"), pair.get("uncertainty") or 0.0
        if value is None or not band["value"] > 0:
            continue
        ratio = value / band["value"]
        spread = ratio * float(np.hypot(u / value if value else 0.0, band["uncertainty"] / band["value"]))
        out["ratios"][label] = {"value": ratio, "uncertainty": spread}
        if ratio + 2 * spread < 1.0:
            out["notes"].append(f"the {label} γ is {ratio:.3g} ± {spread:.2g} times the band γ of "
                                f"{out['electronic_input']}: below 1, which no electron–phonon coupling gives; check "
                                "that both are per the same formula unit, the DOS at E_F and the low-temperature data")
        else:
            out["notes"].append(f"the {label} γ is {ratio:.3g} ± {spread:.2g} times the band γ of "
                                f"{out['electronic_input']}: an enhancement 1 + λ with λ ≈ {ratio - 1:.2g} if the "
                                "rest of the model is right")
    if not band["value"] > 0:
        out["notes"].append(f"{out['electronic_input']} has no states at E_F (γ_band = 0): no ratio")
    return out


_TOTALS = (("heat_capacity_v", "heat_capacity_electronic", "heat_capacity_v_total"),
           ("entropy", "entropy_electronic", "entropy_total"),
           ("internal_energy", "internal_energy_electronic", "internal_energy_total"),
           ("helmholtz_energy", "helmholtz_energy_electronic", "helmholtz_energy_total"))


def with_electronic(table, edos, atoms=None):
    r"""A harmonic table with the electronic columns and the vibrational + electronic totals added.

    Parameters
    ----------
    table : pandas.DataFrame
        From :func:`thermo.tabulate` (its ``attrs`` give the basis and formula).
    edos : ElectronicDOS
        Electronic DOS per formula unit of the same solid.
    atoms : int, optional
        Atoms per formula unit (needed for the 'atom' and 'gram' bases).

    Returns
    -------
    pandas.DataFrame
        The table, then the electronic columns, their errors and the
        ``…_total_…`` columns (C_v, S, U, F).

    Notes
    -----
    :math:`F = F_{vib} + F_{el}` with :math:`F_{el}` counted from the
    electronic ground state, so totals add to a static 0 K energy unchanged.

    Examples
    --------
    >>> from thermo.spectrum import PhononDOS
    >>> from thermo.tables import tabulate
    >>> from thermo.electronic.dos import make_electronic_dos
    >>> ph = tabulate(PhononDOS(np.array([0.0, 1.0]), np.array([0.0, 6.0]), atoms=1), [300.0])
    >>> both = with_electronic(ph, make_electronic_dos([-5.0, 5.0], [1.0, 1.0]))
    >>> bool(both.heat_capacity_v_total_J_per_mol_K[0] > ph.heat_capacity_v_J_per_mol_K[0])
    True
    """
    per = table.attrs.get("per", "formula")
    formula = table.attrs.get("formula")
    t = table[column_name("temperature")].to_numpy()
    el = electronic_table(edos, t, per=per, atoms=atoms, formula=formula)
    out = table.copy()
    for name in el.columns[1:]:
        out[name] = el[name].to_numpy()
    for vib, elec, total in _TOTALS:
        out[column_name(total, per)] = out[column_name(vib, per)] + out[column_name(elec, per)]
    out.attrs = dict(table.attrs)
    out.attrs["electronic"] = el.attrs
    return out
