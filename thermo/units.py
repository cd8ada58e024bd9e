"""Frequency units of a phonon DOS and their conversion to THz.

Internally every frequency is an ordinary frequency in THz and every DOS is in
states per THz.  A DOS given per unit ``u`` becomes a DOS per THz by
multiplying with ``thz_to_unit(u)`` (the number of ``u`` in one THz), so that
the number of modes in each interval is unchanged.
"""

from __future__ import annotations

import math
import re

from scipy import constants as sc

from .errors import OptionError

from .unit_names import FREQUENCY_UNITS  # noqa: F401  (re-exported)

_ALIASES = {
    "thz": "THz", "terahertz": "THz",
    "cm-1": "cm-1", "cm^-1": "cm-1", "1/cm": "cm-1", "cm**-1": "cm-1", "cm⁻¹": "cm-1",
    "invcm": "cm-1", "wavenumber": "cm-1", "wavenumbers": "cm-1", "kayser": "cm-1",
    "mev": "meV", "millielectronvolt": "meV",
    "ev": "eV", "electronvolt": "eV",
    "hz": "Hz", "hertz": "Hz", "1/s": "Hz", "s-1": "Hz", "s^-1": "Hz",
    "rad/ps": "rad/ps", "rad ps-1": "rad/ps", "rad.ps-1": "rad/ps", "rad ps^-1": "rad/ps",
    "radps-1": "rad/ps", "rad/ps^-1": "rad/ps",
    "rad/s": "rad/s", "rad s-1": "rad/s", "rad.s-1": "rad/s", "rad s^-1": "rad/s",
    "rads-1": "rad/s", "radps": "rad/s", "angular": "rad/s",
    "k": "K", "kelvin": "K",
}

#: Number of units ``u`` equal to one THz (ordinary frequency).
_PER_THZ = {
    "THz": 1.0,
    "cm-1": 1e12 / (sc.c * 100.0),                    # ν/c in cm⁻¹
    "meV": sc.h * 1e12 / (sc.milli * sc.electron_volt),  # hν in meV
    "eV": sc.h * 1e12 / sc.electron_volt,             # hν in eV
    "Hz": 1e12,                                       # ν in Hz
    "rad/s": 2.0 * math.pi * 1e12,                    # ω = 2πν
    "rad/ps": 2.0 * math.pi,                          # ω = 2πν in rad per picosecond
    "K": sc.h * 1e12 / sc.k,                          # hν/k_B in K
}


def canonical_unit(name: str) -> str:
    """Return the canonical spelling of a frequency unit name.

    Parameters
    ----------
    name : str
        Unit name, case-insensitive (``"thz"``, ``"1/cm"``, ``"MEV"``, ...).

    Returns
    -------
    str
        One of :data:`FREQUENCY_UNITS`.

    Raises
    ------
    OptionError
        If the name is not recognised; the message lists the choices.

    Examples
    --------
    >>> canonical_unit("1/cm")
    'cm-1'
    """
    key = re.sub(r"\s+", " ", str(name).strip()).lower()
    if key in _ALIASES:
        return _ALIASES[key]
    compact = key.replace(" ", "")
    if compact in _ALIASES:
        return _ALIASES[compact]
    raise OptionError(
        f"unknown frequency unit {name!r}; choose one of {', '.join(FREQUENCY_UNITS)}")


def thz_to_unit(unit: str) -> float:
    r"""Number of ``unit`` in one THz of ordinary frequency.

    Parameters
    ----------
    unit : str
        Frequency unit name (see :func:`canonical_unit`).

    Returns
    -------
    float
        Conversion factor [unit / THz].

    Notes
    -----
    With CODATA constants from :mod:`scipy.constants`:
    :math:`\tilde\nu = \nu/c`, :math:`E = h\nu` (meV, eV), :math:`\omega = 2\pi\nu`
    (rad/s, rad/ps),
    :math:`T = h\nu/k_B`.

    References
    ----------
    .. [1] E. Tiesinga, P. J. Mohr, D. B. Newell, B. N. Taylor, "CODATA
       recommended values of the fundamental physical constants: 2018",
       Rev. Mod. Phys. 93, 025010 (2021).

    Examples
    --------
    >>> round(thz_to_unit("cm-1"), 4)
    33.3564
    """
    return _PER_THZ[canonical_unit(unit)]


def to_thz(values, unit: str):
    """Convert frequencies given in ``unit`` to THz.

    Parameters
    ----------
    values : array_like
        Frequencies [unit].
    unit : str
        Frequency unit name.

    Returns
    -------
    numpy.ndarray or float
        Frequencies [THz].

    Examples
    --------
    >>> round(float(to_thz(4.135667696, "meV")), 6)
    1.0
    """
    return values / thz_to_unit(unit)


_UNIT_PATTERNS = (
    ("THz", r"(?<![a-z])thz(?![a-z])"),
    ("cm-1", r"cm\s*(\^|\*\*)?\s*-\s*1|1\s*/\s*cm|cm⁻¹|wavenumber"),
    ("meV", r"(?<![a-z])mev(?![a-z])"),
    ("eV", r"(?<![a-z0-9])ev(?![a-z])"),
    ("Hz", r"(?<![a-z])hz(?![a-z])"),
    ("rad/s", r"rad\s*/\s*s(?![a-z])|rad\s*s\s*\^?-1|rad\.s-1"),
    ("rad/ps", r"rad\s*/\s*ps(?![a-z])|rad\s*ps\s*\^?-1|rad\.ps-1"),
    ("K", r"\(\s*k\s*\)|\[\s*k\s*\]|(?<![a-z])kelvin(?![a-z])|_k(?![a-z0-9])"),
)


def units_in_text(text: str) -> list:
    """Every frequency unit named anywhere in ``text`` (canonical names, in table order).

    Examples
    --------
    >>> units_in_text("sigma = 0.1 meV, range 0-20 THz")
    ['THz', 'meV']
    """
    low = str(text).lower()
    return [unit for unit, pat in _UNIT_PATTERNS if re.search(pat, low)]


def guess_unit_from_text(text: str) -> str | None:
    """Find a frequency unit stated in a header or comment line, if any.

    Parameters
    ----------
    text : str
        Header or comment text.

    Returns
    -------
    str or None
        Canonical unit name, or None when no single unit is stated.

    Examples
    --------
    >>> guess_unit_from_text("# frequency (cm^-1)  dos")
    'cm-1'
    >>> guess_unit_from_text("energy_meV")
    'meV'
    >>> guess_unit_from_text("omega [rad/ps]")
    'rad/ps'
    """
    found = units_in_text(text)
    return found[0] if len(found) == 1 else None


#: eV in one unit of the energy axis of an electronic DOS (CODATA via scipy.constants).
ELECTRON_ENERGY_EV = {
    "eV": 1.0,
    "meV": sc.milli,
    "Ry": sc.physical_constants["Rydberg constant times hc in eV"][0],
    "Ha": sc.physical_constants["Hartree energy in eV"][0],
}
_ENERGY_ALIASES = {"ev": "eV", "electronvolt": "eV", "electronvolts": "eV", "mev": "meV", "ry": "Ry",
                   "rydberg": "Ry", "ha": "Ha", "hartree": "Ha", "eh": "Ha"}


def canonical_energy_unit(name: str) -> str:
    """Canonical name of an electron-energy unit (eV, meV, Ry, Ha).

    Raises
    ------
    OptionError
        If the name is not one of them; the message lists the choices.

    Examples
    --------
    >>> canonical_energy_unit("rydberg"), canonical_energy_unit("MEV")
    ('Ry', 'meV')
    """
    key = str(name).strip().lower().replace(" ", "")
    if key in _ENERGY_ALIASES:
        return _ENERGY_ALIASES[key]
    raise OptionError(f"unknown energy unit {name!r}; choose one of eV, meV, Ry, Ha")
