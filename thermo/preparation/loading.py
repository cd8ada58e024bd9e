"""From a DOS file to a normalised :class:`~thermo.spectrum.PhononDOS`.

Steps: read and validate the table, convert the frequency axis to THz,
count and treat imaginary modes, find the atoms per formula unit, replace the
lowest frequencies by a fitted ν² form, normalise to 3n modes.
"""

from __future__ import annotations

import dataclasses

import numpy as np
from dataclasses import replace

from ..errors import DosInputError, OptionError
from ..kernels.quadrature import mode_weights
from .imaginary import imaginary_warnings, split_at_zero
from .lowfreq import WINDOW_MODES, blend_low_frequency, fit_low_frequency, window_shares
from .atoms import modes_text
from ..io.readers import read_table
from ..io.modelists import is_mode_list
from ..spectrum import PhononDOS
from ..units import thz_to_unit
from .plausibility import entropy_298_per_atom, partial_sum_warnings, unit_warnings
from .validation import check_spectrum
from .validation import check_magnitudes, check_mode_count
from .options import ReadingOptions, low_frequency_window, as_record
from .modelist import load_mode_list
from .anchor import elastic_anchor
from .layers import chosen_atoms, chosen_unit
from .histogram import bin_modes, check_bins, histogram_dos, is_histogram, stated_histogram


def load_dos(source, freq_unit=None, atoms=None, negative=None, low_frequency=None, name=None,
             sheet=None, *, options=None, fallback=None):
    r"""Read a phonon DOS file and prepare it for thermodynamic integration.

    Parameters
    ----------
    source : str, pathlib.Path or bytes
        File path, file content (bytes), or file text (a str with a newline).
    freq_unit : str, optional
        Unit of the frequency column: ``THz``, ``cm-1``, ``meV``, ``eV``,
        ``Hz``, ``rad/s``, ``rad/ps`` or ``K``; taken from the frequency
        column's header or an explicit unit statement when None (refused
        when absent, never guessed from a comment that merely mentions a unit).
        A unit given here overrides the file's, with a warning.
    atoms : int, optional
        Atoms per formula unit n; inferred when the DOS integrates to 3n.
    negative : {'drop', 'drop-unscaled', 'refuse'}, optional
        Imaginary-mode policy: drop them and renormalise the rest to 3n
        (default), drop them without renormalising (former name
        ``keep-count``, still accepted), or refuse the file.
    low_frequency : 'auto', 'off', 'LOW:HIGH' or (low, high), optional
        ν² treatment below the cut-off: automatic window (default), none, or
        a window in THz.
    name : str, optional
        Display name of the input for messages and provenance.
    sheet : str or int, optional
        Worksheet of an ``.xlsx`` file (name or 1-based number; default the first).
    options : ReadingOptions or dict, optional
        The same options as one record (:mod:`thermo.preparation.options`);
        the keywords above win over it.  Options for this one file.
    fallback : ReadingOptions or dict, optional
        Options carried from elsewhere (many files, another file): used only
        where neither the keywords/``options`` nor the file say anything — a
        unit only when the file states none (``dos.source["stated_unit"]``),
        an atom count only when the integral does not give one.  The result
        equals a load with the unit and count used given as keywords.

    Returns
    -------
    PhononDOS
        DOS in states/THz per formula unit, integrating to 3n.  A mode list
        (a table with a ``weight`` column, :mod:`thermo.io.modelists`) gives a
        DOS whose sums run over its modes (:mod:`thermo.preparation.modelist`).

    Raises
    ------
    DosInputError
        Unreadable or unphysical input (one-line message with file/line).
    OptionError
        Invalid option values.

    Notes
    -----
    The options used (after merging, see :mod:`thermo.preparation.options`)
    are kept in ``dos.source["reading_options"]``.
    The DOS per unit ``u`` becomes a DOS per THz by
    :math:`g_{\mathrm{THz}} = g_u\, d\nu_u/d\nu_{\mathrm{THz}}`.  The
    imaginary share is :math:`\int_{\nu<0} g / \int g`.  The final scale is
    :math:`3n / \int g_{\mathrm{treated}}` (``drop``) or
    :math:`3n(1-f_{\mathrm{imag}}) / \int g_{\mathrm{treated}}` (``drop-unscaled``),
    where "treated" is the real part after the low-frequency treatment.
    Every load runs the plausibility checks of
    :mod:`thermo.preparation.plausibility` (maximum frequency and entropy at
    298.15 K per atom for the chosen unit; partial columns against the total)
    and adds their warnings.

    References
    ----------
    .. [1] A. A. Maradudin et al., *Theory of Lattice Dynamics in the Harmonic
       Approximation*, 2nd ed. (Academic Press, 1971), ch. 4.

    Examples
    --------
    >>> nu = np.linspace(0.0, 5.0, 101)
    >>> text = "# frequency (THz) dos\n" + "\n".join(f"{a} {9*a*a/125}" for a in nu)
    >>> dos = load_dos(text)
    >>> dos.atoms, round(dos.mode_count, 9)
    (1, 3.0)
    """
    explicit = ReadingOptions(freq_unit=freq_unit, atoms=atoms, negative=negative, low_frequency=low_frequency,
                              sheet=sheet).over(as_record(options))
    carried = as_record(fallback)
    chosen = explicit.over(carried).resolved()
    raw = read_table(source, name=name, sheet=chosen.sheet)
    if is_mode_list(raw):
        with np.errstate(over="raise", invalid="raise", divide="raise"):
            return load_mode_list(raw, explicit, carried, chosen)
    clean = check_spectrum(raw)
    try:
        with np.errstate(over="raise", invalid="raise", divide="raise"):
            return _prepared(raw, clean, explicit, carried, chosen)
    except (FloatingPointError, np.linalg.LinAlgError, OverflowError, ZeroDivisionError) as exc:
        # a safety net behind the magnitude checks: never a raw numpy error or warning
        raise DosInputError(f"numbers out of the range this DOS can be prepared in ({exc})",
                            clean.source) from None


def _prepared(raw, clean, explicit, carried, chosen):
    """The steps after reading: units, magnitudes, imaginary modes, atoms, low-frequency treatment, 3n."""
    src = clean.source
    policy, window = chosen.negative, low_frequency_window(chosen.low_frequency)
    unit, unit_note = chosen_unit(explicit.freq_unit, clean.header_unit, carried and carried.freq_unit, src,
                            raw.unit_mentions)
    notes = list(clean.warnings) + ([unit_note] if unit_note else [])

    factor = thz_to_unit(unit)
    names = list(clean.partials)
    with np.errstate(over="ignore", invalid="ignore"):
        nu_all = np.asarray(clean.frequency, dtype=float) / factor
        cols_all = [np.asarray(clean.total, float) * factor] + [np.asarray(clean.partials[k], float) * factor
                                                              for k in names]
    check_magnitudes(nu_all, cols_all, src, clean.line_numbers)
    histogram = chosen.histogram
    if histogram is None:
        histogram = stated_histogram(raw.comments) or is_histogram(nu_all[nu_all > 0])
    elif histogram:
        check_bins(nu_all, src, clean.line_numbers)
    negative_modes, nu, cols = split_at_zero(nu_all, cols_all)
    with np.errstate(over="ignore", invalid="ignore"):
        if histogram:                    # Σ g·Δ on each side of 0 (see .histogram)
            below = nu_all < 0
            negative_modes = np.array([float(bin_modes(nu_all, c)[below].sum()) for c in cols_all])
            real_integral = float(bin_modes(nu_all, cols_all[0])[nu_all > 0].sum())
        else:
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
    notes += partial_sum_warnings(nu_all, cols_all[0], dict(zip(names, cols_all[1:])))
    n_atoms, inferred = chosen_atoms(raw_integral, explicit.atoms, carried and carried.atoms, src)
    if inferred:
        notes.append(f"atoms per formula unit inferred as {n_atoms} from the DOS integral {raw_integral:.6g}")
    if nu.size < 3 or real_integral <= 0:
        raise DosInputError("no real (positive-frequency) modes left after removing imaginary ones", src)

    if histogram:
        top = float(np.asarray(clean.frequency, float)[np.asarray(clean.total) > 0].max())
        theta = window[1] if isinstance(window, tuple) and window[0] == "elastic" else None
        return _histogram_prepared(nu_all, cols_all, names, n_atoms, share, policy, notes, raw_integral, top, theta, dict(
            name=src, sha256=clean.sha256, freq_unit=unit, stated_unit=clean.header_unit,
            negative_mode_fraction=share, negative_policy=policy, atoms_inferred=inferred,
            columns=list(clean.names), low_frequency_option=None,
            reading_options=chosen.replaced(freq_unit=unit, atoms=n_atoms, sheet=raw.sheet).as_dict(),
            **({"sheet": raw.sheet} if raw.sheet is not None else {})))
    grid, cut, fit, scale, more = treat_spectrum(nu, cols, names, n_atoms, share, policy, window,
                                                 raw_integral, inferred)
    notes += more
    provenance = {
        "name": src, "sha256": clean.sha256, "freq_unit": unit, "stated_unit": clean.header_unit,
        "raw_integral": raw_integral, "scale_factor": scale,
        "negative_mode_fraction": share, "negative_policy": policy,
        "atoms_inferred": inferred, "columns": list(clean.names),
        "low_frequency_option": window,
        "reading_options": chosen.replaced(freq_unit=unit, atoms=n_atoms, sheet=raw.sheet).as_dict(),
    }
    if raw.sheet is not None:
        provenance["sheet"] = raw.sheet
    dos = PhononDOS(
        frequency_thz=grid, dos=cut[0] * scale, atoms=n_atoms,
        partials={k: c * scale for k, c in zip(names, cut[1:])},
        low_frequency=fit, source=provenance, warnings=tuple(notes),
        input_frequency_thz=nu_all, input_dos=cols_all[0] * scale,
        input_partials={k: c * scale for k, c in zip(names, cols_all[1:])},
    )
    top = float(np.asarray(clean.frequency, float)[np.asarray(clean.total) > 0].max())
    checks = unit_warnings(top, unit, entropy_298_per_atom(dos))
    if checks:
        dos = dataclasses.replace(dos, warnings=dos.warnings + tuple(checks))
    return dos


def _histogram_prepared(nu_all, cols_all, names, atoms, share, policy, notes, raw_integral, top, theta, source):
    """A histogram of bin centres summed as Σ g·Δ (see :mod:`.histogram`), with the usual checks and notes."""
    dos = histogram_dos(nu_all, cols_all, names, atoms, share, policy, theta_k=theta,
                        source=dict(source, raw_integral=raw_integral, low_frequency_option=(
                            None if theta is None else ("elastic", theta))),
                        input_frequency_thz=nu_all, warnings=())
    scale = dos.source["scale_factor"]
    notes = notes + [f"read as a histogram of bin centres ({dos.source['histogram_bin_THz']:.4g} THz bins): "
                     "summed bin by bin as Σ g·Δν, " + ("below its resolved limit the elastic law" if theta
                                                       else "without the ν² treatment")] + list(dos.warnings)
    if abs(scale - 1.0) > 1e-6:
        notes.append(f"the histogram holds {modes_text(raw_integral)}; rescaled by ×{scale:.6g} to "
                     f"{3 * atoms * (1.0 if policy == 'drop' else 1.0 - share):.6g} modes (3n with n = {atoms})")
    dos = dataclasses.replace(dos, input_dos=cols_all[0] * scale, warnings=tuple(notes),
                              input_partials={k: c * scale for k, c in zip(names, cols_all[1:])})
    checks = unit_warnings(top, source["freq_unit"], entropy_298_per_atom(dos))
    return dataclasses.replace(dos, warnings=dos.warnings + tuple(checks)) if checks else dos


def _start_note(first, fit, modes_below, total):
    """The one warning about a DOS whose rows start above zero (None if they do not)."""
    if first <= 0:
        return None
    pct = 100.0 * modes_below / total
    if fit is not None:
        return (f"the DOS starts at {first:.4g} THz, not 0: the fitted ν² law implies {pct:.3g} % of the "
                f"modes below it, which were extrapolated with that law")
    return (f"the DOS starts at {first:.4g} THz, not 0: about {pct:.3g} % of the modes (a ν² law through "
            "the first row) lie below it and were left out; low-temperature values are too low")


def treat_spectrum(nu, cols, names, atoms, share=0.0, policy="drop", window="auto",
                   raw_integral=None, inferred=False, window_modes=WINDOW_MODES):
    r"""Low-frequency treatment and normalisation of the real (ν >= 0) part.

    Parameters
    ----------
    nu : numpy.ndarray, shape (N,)
        Ascending frequencies >= 0 [THz].
    cols : list of numpy.ndarray
        Total DOS, then partials [states / THz, any scale].
    names : list of str
        Names of the partial columns.
    atoms : int
        Atoms per formula unit n.
    share : float
        Imaginary share of the modes [1].
    policy : str
        Imaginary-mode policy (``drop`` or ``keep-count``).
    window : 'auto', None, (low, high) or ('elastic', θ)
        Low-frequency option as normalised by :func:`load_dos`; an elastic
        anchor (:mod:`.anchor`) is absolute and the data carry the other modes.
    raw_integral : float, optional
        Integral of the DOS as read, for the rescale report.
    inferred : bool
        Whether n was inferred from the integral (said in the rescale report).
    window_modes : float
        Modes below the automatic window's top (see :mod:`.lowfreq`).

    Returns
    -------
    grid, columns, fit, scale, notes
        Tabulated part, the fit scaled to 3n (or None), the factor applied
        to the DOS [1] and the warnings.

    Notes
    -----
    :math:`\text{scale} = 3n(1 - f_{\text{imag}}^{[\text{keep-count}]}) /
    (\int g_{\text{treated}} + \int_0^{\nu_c} A\nu^2(1+b\nu^2+c\nu^4)d\nu)`.

    Examples
    --------
    >>> nu = np.linspace(0.0, 5.0, 101)
    >>> grid, cols, fit, scale, notes = treat_spectrum(nu, [9 * nu**2 / 125], [], 1)
    >>> round(scale, 4), fit.cutoff_thz > 0, len(notes)   # trapezoid excess of ∫ν², reported
    (1.0, True, 1)
    """
    notes = []
    real_modes = 3 * atoms * (1.0 if policy == "drop" else 1.0 - share)
    fit, fit_note = (None, None)
    anchored = isinstance(window, tuple) and window[0] == "elastic"
    if anchored:
        fit, fit_note = elastic_anchor(nu, cols[0], window[1], atoms, real_modes)
    elif window is not None:
        fit, fit_note = fit_low_frequency(nu, cols[0], None if window == "auto" else window,
                                          total_modes=real_modes, window_modes=window_modes)
    if fit_note:
        notes.append(fit_note)
    if fit is not None and names:
        shares = window_shares(nu, cols[1:], fit.window_thz)
        fit = replace(fit, species_shares=dict(zip(names, shares)))
    if fit is None:
        grid, cut = nu, cols
    else:
        grid, cut = blend_low_frequency(nu, cols, fit)
    tabulated = float(mode_weights(grid, cut[0]).sum())
    analytic = 0.0 if fit is None else fit.analytic_moment()
    if anchored and not analytic < 0.5 * real_modes:
        raise OptionError(f"the elastic Debye law puts {analytic:.3g} of the {real_modes:.3g} modes below the data's "
                          f"resolved limit {fit.cutoff_thz:.4g} THz; check θ")
    scale = (real_modes - analytic) / tabulated if anchored else real_modes / (tabulated + analytic)
    first = float(nu[0])
    if fit is None:
        below = float(cols[0][0]) * first / 3.0
        note = _start_note(first, None, below * scale, real_modes) if cols[0][0] > 0 else None
    else:
        below = fit.coefficient * first ** 3 * (1 / 3 + first ** 2 * (fit.curvature / 5 + fit.quartic * first ** 2 / 7))
        note = _start_note(first, fit, below * (1.0 if anchored else scale), real_modes)
    if note:
        notes.append(note)
    if abs(scale - 1.0) > 1e-6:
        read = "" if raw_integral is None else f"the DOS as read integrates to {modes_text(raw_integral)}; "
        why = f"3n with n = {atoms}{' (inferred)' if inferred else ''}"
        if policy != "drop" and share > 0:
            why += f" less the {100 * share:.3g} % imaginary modes"
        notes.append(f"{read}after the low-frequency treatment it is rescaled by ×{scale:.6g} to "
                     f"{real_modes:.6g} modes ({why})")
    if fit is not None and not anchored:      # an elastic anchor is per formula unit already
        fit = fit.scaled(scale)
    return grid, cut, fit, scale, notes
