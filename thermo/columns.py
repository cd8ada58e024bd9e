"""The one column schema: quantity × basis → column name, unit and label.

Every table modeheat writes (harmonic tables, models, quasi-harmonic,
calorimetry, displacements, …) names its columns through this module, and
every reader of a table (writers, CLI, dashboard) finds a column by its
quantity and basis, never by position and never by parsing a label.

A column name is ``<quantity>_<unit slug>``, e.g.
``heat_capacity_v_J_per_mol_K``; the label shown to people is
``<symbol> [<unit>]``, e.g. ``C_v [J/(mol·K)]``.

Quantities come in three kinds:

- ``entropy`` — heat capacities and entropies: J/(mol·K) per mole of formula
  units, k_B per atom, J/(g·K) per gram;
- ``energy`` — energies: kJ/mol, meV per atom, J/g;
- ``fixed`` — one unit whatever the basis (temperature, volume, …).

Examples
--------
>>> column_name("heat_capacity_v", "atom")
'heat_capacity_v_kB_per_atom'
>>> lookup("entropy_J_per_g_K").label
'S [J/(g·K)]'
>>> table_columns("formula")[:2]
('temperature_K', 'heat_capacity_v_J_per_mol_K')
"""

from __future__ import annotations

from dataclasses import dataclass

from .errors import OptionError

#: Bases of a table: per mole of formula units, per atom, per gram.
BASES = ("formula", "atom", "gram")

#: (unit shown, slug in column names) of each kind and basis.
_UNITS = {
    "entropy": {"formula": ("J/(mol·K)", "J_per_mol_K"), "atom": ("k_B/atom", "kB_per_atom"),
                "gram": ("J/(g·K)", "J_per_g_K")},
    "energy": {"formula": ("kJ/mol", "kJ_per_mol"), "atom": ("meV/atom", "meV_per_atom"),
               "gram": ("J/g", "J_per_g")},
}


@dataclass(frozen=True)
class Quantity:
    """A physical quantity that may appear as a table column.

    Attributes
    ----------
    key : str
        Identifier, the first part of every column name (``heat_capacity_v``).
    symbol : str
        Symbol shown in labels (``C_v``).
    kind : {'entropy', 'energy', 'fixed'}
        How the unit follows the basis (see module notes).
    unit : str
        Unit for ``kind='fixed'`` (shown), e.g. ``K``.
    slug : str
        Unit slug for ``kind='fixed'`` (in the column name), e.g. ``K``.
    description : str
        One line for help texts and provenance.
    """

    key: str
    symbol: str
    kind: str
    unit: str = ""
    slug: str = ""
    description: str = ""


@dataclass(frozen=True)
class Column:
    """One column: a quantity on a basis (None for fixed-unit quantities)."""

    quantity: Quantity
    basis: str | None
    unit: str
    name: str

    @property
    def label(self) -> str:
        """Text for axes and table headers, ``symbol [unit]``."""
        return f"{self.quantity.symbol} [{self.unit}]" if self.unit else self.quantity.symbol


QUANTITIES: dict[str, Quantity] = {}


def register_quantity(key, symbol, kind, unit="", slug="", description=""):
    """Add a quantity to the schema (idempotent for an identical definition).

    Parameters
    ----------
    key, symbol, kind, unit, slug, description
        As the attributes of :class:`Quantity`.

    Returns
    -------
    Quantity

    Raises
    ------
    OptionError
        If ``key`` is already defined differently, or ``kind`` is unknown.
    """
    if kind not in ("entropy", "energy", "fixed"):
        raise OptionError(f"quantity {key}: unknown kind {kind!r}")
    q = Quantity(key, symbol, kind, unit, slug if kind == "fixed" else "", description)
    if key in QUANTITIES and QUANTITIES[key] != q:
        raise OptionError(f"quantity {key} is already defined differently")
    QUANTITIES[key] = q
    _NAMES.clear()
    return q


def column(key, basis="formula") -> Column:
    """The column of quantity ``key`` on ``basis``.

    Raises
    ------
    OptionError
        Unknown quantity or basis.
    """
    q = QUANTITIES.get(key)
    if q is None:
        raise OptionError(f"unknown quantity {key!r}")
    if q.kind == "fixed":
        return Column(q, None, q.unit, f"{key}_{q.slug}" if q.slug else key)
    if basis not in BASES:
        raise OptionError(f"unknown basis {basis!r}; choose formula, atom or gram")
    unit, slug = _UNITS[q.kind][basis]
    return Column(q, basis, unit, f"{key}_{slug}")


def column_name(key, basis="formula") -> str:
    """Column name of quantity ``key`` on ``basis`` (see :func:`column`)."""
    return column(key, basis).name


_NAMES: dict[str, Column] = {}


def lookup(name) -> Column:
    """The :class:`Column` a column name stands for.

    Raises
    ------
    OptionError
        If no quantity and basis give this name.
    """
    if not _NAMES:
        for q in QUANTITIES.values():
            for basis in (BASES if q.kind != "fixed" else (None,)):
                c = column(q.key, basis or "formula")
                _NAMES[c.name] = c
    try:
        return _NAMES[name]
    except KeyError:
        raise OptionError(f"column {name!r} is not in the column schema") from None


def label(name) -> str:
    """Label of a column name, ``symbol [unit]``; unknown names are shown as they are."""
    try:
        return lookup(name).label
    except OptionError:
        return str(name)


def find(table, key, basis=None) -> str:
    """Name of the column of quantity ``key`` in ``table`` (any basis unless given).

    Raises
    ------
    OptionError
        If the table has no such column.
    """
    for name in table.columns:
        try:
            c = lookup(name)
        except OptionError:
            continue
        if c.quantity.key == key and (basis is None or c.basis in (basis, None)):
            return name
    raise OptionError(f"the table has no {key} column")


def error_key(key) -> str:
    """Quantity key of the estimated error of quantity ``key``.

    Its column is ``<key>_error_<unit>`` in the unit of the quantity itself
    (registered by :func:`register_error`); a value a user may quote travels
    in tables as the value column beside this one, in JSON as
    ``{"value": x, "uncertainty": u}`` (:func:`quoted`).

    Examples
    --------
    >>> column_name(error_key("heat_capacity_p"))
    'heat_capacity_p_error_J_per_mol_K'
    >>> column_name(error_key("volume"))
    'volume_error_A3'
    """
    return f"{key}_error"


def register_error(key):
    """Register the error quantity of ``key`` (same kind and unit, symbol δ…); returns it."""
    q = QUANTITIES[key]
    return register_quantity(error_key(key), f"δ{q.symbol}", q.kind, q.unit, q.slug,
                             f"estimated error of the {q.description or key}")


def error_column_for(table, name):
    """Name of the error column that accompanies value column ``name`` in ``table``, or None.

    Examples
    --------
    >>> import pandas as pd
    >>> error_column_for(pd.DataFrame(columns=["volume_A3", "volume_error_A3"]), "volume_A3")
    'volume_error_A3'
    """
    try:
        c = lookup(name)
    except OptionError:
        return None
    key = error_key(c.quantity.key)
    if key not in QUANTITIES:
        return None
    wanted = column_name(key, c.basis or "formula")
    return wanted if wanted in table.columns else None


def quoted(value, uncertainty):
    """A value a user may quote, with its uncertainty, as JSON-able ``{"value", "uncertainty"}``.

    Examples
    --------
    >>> quoted(28.2, 0.3)
    {'value': 28.2, 'uncertainty': 0.3}
    """
    return {"value": float(value), "uncertainty": float(uncertainty)}


#: Quantities of the harmonic table, in column order.
HARMONIC = ("temperature", "heat_capacity_v", "entropy", "internal_energy", "helmholtz_energy")


def table_columns(basis="formula", keys=HARMONIC) -> tuple:
    """Column names of a table of ``keys`` on ``basis`` (default: the harmonic table)."""
    return tuple(column_name(k, basis) for k in keys)


register_quantity("temperature", "T", "fixed", "K", "K", "temperature")
register_quantity("heat_capacity_v", "C_v", "entropy", description="heat capacity at constant volume")
register_quantity("heat_capacity_p", "C_p", "entropy", description="heat capacity at constant pressure")
register_quantity("entropy", "S", "entropy", description="entropy")
register_quantity("internal_energy", "U", "energy", description="internal energy, zero-point energy included")
register_quantity("helmholtz_energy", "F", "energy", description="Helmholtz energy, zero-point energy included")
register_quantity("enthalpy", "H", "energy", description="enthalpy")
register_quantity("gibbs_energy", "G", "energy", description="Gibbs energy")
register_quantity("zero_point_energy", "E_0", "energy", description="zero-point energy")

# --- displacements (thermo/vibration) ---
register_quantity("species", "species", "fixed", description="atomic species (or the mass-weighted mean)")
register_quantity("mean_square_displacement", "⟨u²⟩", "fixed", "Å²", "A2",
                  "total mean-square displacement of an atom (sum of three directions)")
register_quantity("isotropic_displacement", "U_iso", "fixed", "Å²", "A2",
                  "isotropic displacement parameter, ⟨u²⟩/3 (per direction)")
register_quantity("debye_waller_b", "B", "fixed", "Å²", "A2", "isotropic Debye–Waller factor 8π²U_iso")
register_quantity("classical_mean_square_displacement", "⟨u²⟩ classical", "fixed", "Å²", "A2",
                  "high-temperature limit k_BT/(m n) ∫ g/ω² of ⟨u²⟩")
register_quantity("debye_waller_temperature", "θ_M", "fixed", "K", "K",
                  "Debye temperature giving the same ⟨u²⟩ at T")
register_quantity("lindemann_ratio", "√⟨u²⟩/d", "fixed", description="rms displacement over nearest-neighbour distance")
# --- polynomials (issue 14) ---
register_quantity("enthalpy_increment", "H − H°(298.15 K)", "energy",
                  description="enthalpy relative to its value at 298.15 K")
# --- quasi-harmonic step (thermo.quasiharmonic) ---
register_quantity("volume", "V", "fixed", "Å³", "A3", "volume per formula unit")
register_quantity("thermal_expansion", "α", "fixed", "1/K", "per_K", "volumetric thermal expansion (1/V) dV/dT")
register_quantity("bulk_modulus_T", "B_T", "fixed", "GPa", "GPa", "isothermal bulk modulus")
register_quantity("gruneisen_parameter", "γ", "fixed", description="mean Grüneisen parameter α B_T V / C_v")
register_quantity("eos_fit_residual", "ΔF_rms", "fixed", "meV", "meV",
                  "rms misfit of the equation of state to F(V), per formula unit")
register_quantity("outside_volume_range", "outside", "fixed",
                  description="True where the minimum lies outside the sampled volumes (extrapolated)")
for _key in ("volume", "thermal_expansion", "bulk_modulus_T", "heat_capacity_p", "heat_capacity_v", "entropy",
             "internal_energy", "helmholtz_energy",
             "enthalpy", "gibbs_energy", "gruneisen_parameter"):
    register_error(_key)
# --- calorimetry (measured heat capacity, thermo/calorimetry) ---
register_quantity("heat_capacity_p_measured", "C_p,meas", "entropy", description="measured heat capacity at constant pressure")
register_quantity("heat_capacity_p_uncertainty", "u(C_p)", "entropy", description="standard uncertainty of the measured C_p")
register_quantity("heat_capacity_p_model", "C_p,model", "entropy", description="fitted model heat capacity at constant pressure")
register_quantity("heat_capacity_lattice", "C_lat", "entropy", description="lattice (phonon) part of the model heat capacity")
register_quantity("heat_capacity_electronic", "C_el", "entropy",
                  description="electronic heat capacity (from an electronic DOS; γT in a calorimetry model)")
register_quantity("heat_capacity_dilation", "C_p−C_v", "entropy", description="dilation term C_p − C_v of the model")
register_quantity("heat_capacity_p_residual", "ΔC_p", "entropy", description="model minus measured C_p")
register_quantity("relative_residual", "ΔC_p/C_p", "fixed", description="(model − measured)/measured C_p")
register_quantity("entropy_third_law", "S°", "entropy", description="third-law entropy ∫₀ᵀ C_p/T dT")
register_quantity("entropy_third_law_error", "u(S°)", "entropy",
                  description="standard uncertainty of the third-law entropy (points, interpolation, below the first point)")
register_quantity("enthalpy_from_zero", "H°−H°(0)", "energy", description="enthalpy increment from 0 K, ∫₀ᵀ C_p dT")
register_quantity("enthalpy_from_zero_error", "u(H°−H°(0))", "energy",
                  description="standard uncertainty of the enthalpy increment from 0 K")
# ---- error breakdown (thermo.accuracy.breakdown): numerical and low-frequency parts
for _key, _symbol, _kind in (("heat_capacity_v", "C_v", "entropy"), ("entropy", "S", "entropy"),
                             ("internal_energy", "U", "energy"), ("helmholtz_energy", "F", "energy")):
    for _part, _what in (("numerical", "numerical (grid-halving) error"),
                         ("low_frequency", "low-frequency (ν² treatment) error")):
        register_quantity(f"{_key}_{_part}_error", f"δ{_symbol} {_part}", _kind,
                          description=f"{_what} of {_symbol}")
        register_quantity(f"{_key}_{_part}_relative_error", f"δ{_symbol}/{_symbol} {_part}", "fixed", "1",
                          description=f"{_what} of {_symbol}, relative to |{_symbol}|")
register_quantity("low_frequency_flag", "flag", "fixed", "",
                  description="low-frequency spread of C_v or S over 1 %")
# --- electronic term of metals (thermo.electronic) ---
register_quantity("entropy_electronic", "S_el", "entropy", description="electronic entropy from an electronic DOS")
register_quantity("internal_energy_electronic", "U_el", "energy",
                  description="electronic internal energy relative to the electronic ground state (0 K)")
register_quantity("helmholtz_energy_electronic", "F_el", "energy",
                  description="electronic Helmholtz energy U_el − T S_el, relative to the electronic ground state (0 K)")
register_quantity("chemical_potential_shift", "μ − E_F", "fixed", "eV", "eV",
                  description="electron chemical potential relative to the Fermi level at fixed electron count")
for _key, _symbol, _kind in (("heat_capacity_electronic", "C_el", "entropy"), ("entropy_electronic", "S_el", "entropy"),
                             ("internal_energy_electronic", "U_el", "energy"),
                             ("helmholtz_energy_electronic", "F_el", "energy")):
    register_quantity(f"{_key}_error", f"δ{_symbol}", _kind,
                      description=f"numerical error estimate of {_symbol} (interleaved half grids of the DOS)")
register_quantity("heat_capacity_v_total", "C_v,vib+el", "entropy",
                  description="heat capacity at constant volume, vibrational plus electronic")
register_quantity("entropy_total", "S_vib+el", "entropy", description="entropy, vibrational plus electronic")
register_quantity("internal_energy_total", "U_vib+el", "energy",
                  description="internal energy, vibrational (zero-point included) plus electronic (from 0 K)")
register_quantity("helmholtz_energy_total", "F_vib+el", "energy",
                  description="Helmholtz energy, vibrational (zero-point included) plus electronic (from 0 K)")
#: Quantities of the electronic table, in column order.
ELECTRONIC = ("temperature", "heat_capacity_electronic", "entropy_electronic", "internal_energy_electronic",
              "helmholtz_energy_electronic", "chemical_potential_shift")
# --- phase comparison (thermo.phases) ---
register_quantity("phase", "phase", "fixed", description="name of a phase")
register_quantity("reference_phase", "reference", "fixed", description="phase the differences are taken against")
register_quantity("pressure", "p", "fixed", "GPa", "GPa", "pressure")
register_quantity("helmholtz_energy_difference", "ΔF", "energy",
                  description="Helmholtz energy of the phase minus the reference phase (fixed volumes)")
register_quantity("gibbs_energy_difference", "ΔG", "energy",
                  description="Gibbs energy of the phase minus the reference phase")
register_quantity("entropy_difference", "ΔS", "entropy", description="entropy of the phase minus the reference phase")
register_quantity("enthalpy_difference", "ΔH", "energy",
                  description="enthalpy (ΔG + TΔS) of the phase minus the reference phase")
register_quantity("volume_difference", "ΔV", "fixed", "Å³", "A3",
                  description="volume of the phase minus the reference phase (per atom or per common formula unit)")
register_quantity("stable_phase", "stable", "fixed", description="phase with the lowest G (F) at this row")
register_quantity("stable_phase_decided", "decided", "fixed",
                  description="False where the lowest G is within the estimated errors of another phase's")
for _key in ("helmholtz_energy_difference", "gibbs_energy_difference"):
    register_error(_key)
register_quantity("helmholtz_energy_formation", "ΔF_f", "energy",
                  description="Helmholtz energy of formation of a compound from the phases of its reaction")
register_quantity("gibbs_energy_formation", "ΔG_f", "energy",
                  description="Gibbs energy of formation of a compound from the phases of its reaction")
register_quantity("entropy_formation", "ΔS_f", "entropy",
                  description="entropy of formation of a compound (vibrational, plus electronic when given)")
register_quantity("enthalpy_formation", "ΔH_f", "energy", description="enthalpy of formation ΔF_f + TΔS_f")
for _key in ("helmholtz_energy_formation", "gibbs_energy_formation"):
    register_error(_key)
