"""From a DOS file to a normalised :class:`~thermo.spectrum.PhononDOS`.

Steps: read and validate the table, convert the frequency axis to THz,
count and treat imaginary modes, find the atoms per formula unit, replace the
lowest frequencies by a fitted ν² form, normalise to 3n modes.
"""

from __future__ import annotations

import numpy as np

from ..errors import DosInputError, OptionError
from ..kernels.quadrature import mode_weights
from .imaginary import check_policy, imaginary_warnings, split_at_zero
from .lowfreq import apply_low_frequency, fit_low_frequency
from .atoms import resolve_atoms
from ..io.readers import read_table
from ..spectrum import LowFrequencyFit, PhononDOS
from ..units import FREQUENCY_UNITS, canonical_unit, thz_to_unit
from .validation import MAX_FREQUENCY_THZ, check_magnitudes, check_mode_count, check_spectrum


def _unit(explicit, stated, source):
    if explicit is not None:
        unit = canonical_unit(explicit)
        note = None
        if stated is not None and stated != unit:
            note = f"the file states {stated} but {unit} was chosen; using {unit}"
        return unit, note
    if stated is not None:
        return stated, None
    raise DosInputError("the frequency unit is not stated in the file; choose one of "
                        + ", ".join(FREQUENCY_UNITS), source)


def _low_frequency_option(value):
    """Normalise the low_frequency option to 'auto', None (off) or a window."""
    if value is None or value is False or (isinstance(value, str) and value.lower() in ("off", "none", "no")):
        return None
    if value is True or (isinstance(value, str) and value.lower() == "auto"):
        return "auto"
    if isinstance(value, str):
        try:
            lo, hi = (float(v) for v in value.split(":"))
        except ValueError:
            raise OptionError(f"low-frequency window {value!r} must be 'auto', 'off' or LOW:HIGH in THz") from None
        return _window(lo, hi, value)
    try:
        lo, hi = value
        return _window(float(lo), float(hi), value)
    except (TypeError, ValueError):
        raise OptionError(f"low-frequency window {value!r} must be 'auto', 'off' or (low, high) in THz") from None


def _window(lo, hi, given):
    if not (0.0 <= lo < hi <= MAX_FREQUENCY_THZ):
        raise OptionError(f"low-frequency window {given!r} must have 0 <= low < high <= "
                          f"{MAX_FREQUENCY_THZ:g} THz")
    return (lo, hi)


def load_dos(source, freq_unit=None, atoms=None, negative="drop", low_frequency="auto", name=None):
    """Read a phonon DOS file and prepare it for thermodynamic integration.

    Parameters
    ----------
    source : str, pathlib.Path or bytes
        File path, file content (bytes), or file text (a str with a newline).
    freq_unit : str, optional
        Unit of the frequency column: ``THz``, ``cm-1``, ``meV``, ``rad/s``
        or ``K``; taken from the header when None (refused when absent).
    atoms : int, optional
        Atoms per formula unit n; inferred when the DOS integrates to 3n.
    negative : {'drop', 'keep-count', 'refuse'}
        Imaginary-mode policy: drop them and renormalise the rest to 3n,
        drop them without renormalising, or refuse the file.
    low_frequency : 'auto', 'off' or (low, high)
        ν² treatment below the cut-off: automatic window, none, or a window
        in THz.
    name : str, optional
        Display name of the input for messages and provenance.

    Returns
    -------
    PhononDOS
        DOS in states/THz per formula unit, integrating to 3n.

    Raises
    ------
    DosInputError
        Unreadable or unphysical input (one-line message with file/line).
    OptionError
        Invalid option values.

    Notes
    -----
    The DOS per unit ``u`` becomes a DOS per THz by
    :math:`g_{\\mathrm{THz}} = g_u\\, d\\nu_u/d\\nu_{\\mathrm{THz}}`.  The
    imaginary share is :math:`\\int_{\\nu<0} g / \\int g`.  The final scale is
    :math:`3n / \\int g_{\\mathrm{treated}}` (``drop``) or
    :math:`3n(1-f_{\\mathrm{imag}}) / \\int g_{\\mathrm{treated}}` (``keep-count``),
    where "treated" is the real part after the low-frequency treatment.

    References
    ----------
    .. [1] A. A. Maradudin et al., *Theory of Lattice Dynamics in the Harmonic
       Approximation*, 2nd ed. (Academic Press, 1971), ch. 4.

    Examples
    --------
    >>> import numpy as np
    >>> nu = np.linspace(0.0, 5.0, 101)
    >>> text = "# frequency (THz) dos\\n" + "\\n".join(f"{a} {9*a*a/125}" for a in nu)
    >>> dos = load_dos(text)
    >>> dos.atoms, round(dos.mode_count, 9)
    (1, 3.0)
    """
    policy = check_policy(negative)
    window = _low_frequency_option(low_frequency)
    clean = check_spectrum(read_table(source, name=name))
    try:
        with np.errstate(over="raise", invalid="raise", divide="raise"):
            return _prepared(clean, freq_unit, atoms, policy, window)
    except (FloatingPointError, np.linalg.LinAlgError, OverflowError, ZeroDivisionError) as exc:
        # a safety net behind the magnitude checks: never a raw numpy error or warning
        raise DosInputError(f"numbers out of the range this DOS can be prepared in ({exc})",
                            clean.source) from None


def _prepared(clean, freq_unit, atoms, policy, window):
    src = clean.source
    unit, unit_note = _unit(freq_unit, clean.header_unit, src)
    notes = list(clean.warnings) + ([unit_note] if unit_note else [])

    factor = thz_to_unit(unit)
    names = list(clean.partials)
    with np.errstate(over="ignore", invalid="ignore"):
        nu_all = np.asarray(clean.frequency, dtype=float) / factor
        cols_all = [np.asarray(clean.total, float) * factor] + [np.asarray(clean.partials[k], float) * factor
                                                              for k in names]
    check_magnitudes(nu_all, cols_all, src, clean.line_numbers)
    negative_modes, nu, cols = split_at_zero(nu_all, cols_all)
    with np.errstate(over="ignore", invalid="ignore"):
        real_integral = float(mode_weights(nu, cols[0]).sum()) if nu.size > 1 else 0.0
        raw_integral = float(negative_modes[0]) + real_integral
    check_mode_count(raw_integral, src)
    if not raw_integral > 0:
        raise DosInputError(f"the DOS integrates to {raw_integral:.6g}; it must be positive", src)
    share = float(negative_modes[0] / raw_integral)
    if share > 0 and policy == "refuse":
        raise DosInputError(f"{100 * share:.3g} % of modes are imaginary (negative frequencies) "
                            "and the policy is to refuse them", src)
    notes += imaginary_warnings(share, policy)
    n_atoms, inferred = resolve_atoms(raw_integral, atoms, src)
    if inferred:
        notes.append(f"atoms per formula unit inferred as {n_atoms} from the DOS integral {raw_integral:.6g}")
    if nu.size < 3 or real_integral <= 0:
        raise DosInputError("no real (positive-frequency) modes left after removing imaginary ones", src)

    fit, fit_note = (None, None)
    if window is not None:
        fit, fit_note = fit_low_frequency(nu, cols[0], None if window == "auto" else window)
    if fit_note:
        notes.append(fit_note)
    grid, cut = (nu, cols) if fit is None else apply_low_frequency(nu, cols, fit.cutoff_thz)
    treated = float(mode_weights(grid, cut[0]).sum()) + (0.0 if fit is None else fit.coefficient * fit.cutoff_thz ** 3 / 3)
    real_modes = 3 * n_atoms * (1.0 if policy == "drop" else 1.0 - share)
    scale = real_modes / treated
    if not inferred and abs(raw_integral / (3 * n_atoms) - 1) > 0.02:
        notes.append(f"the DOS integrates to {raw_integral:.6g} modes and is rescaled by "
                     f"{scale:.6g} to 3n = {3 * n_atoms}")
    if fit is not None:
        fit = LowFrequencyFit(fit.coefficient * scale, fit.cutoff_thz, fit.window_thz,
                              fit.offset * scale, fit.rms_relative_residual, fit.automatic)
    provenance = {
        "name": src, "sha256": clean.sha256, "freq_unit": unit,
        "raw_integral": raw_integral, "scale_factor": scale,
        "negative_mode_fraction": share, "negative_policy": policy,
        "atoms_inferred": inferred, "columns": list(clean.names),
    }
    return PhononDOS(
        frequency_thz=grid, dos=cut[0] * scale, atoms=n_atoms,
        partials={k: c * scale for k, c in zip(names, cut[1:])},
        low_frequency=fit, source=provenance, warnings=tuple(notes),
        input_frequency_thz=nu_all, input_dos=cols_all[0] * scale,
        input_partials={k: c * scale for k, c in zip(names, cols_all[1:])},
    )
