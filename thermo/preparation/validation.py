"""Sanity checks that turn a :class:`~thermo.io.readers.RawTable` into a spectrum.

The checks are about the shape of the data only (enough points, frequencies
strictly increasing, DOS not negative, total not zero); no unit conversion or
normalisation happens here.  Each failure is a one-line
:class:`thermo.errors.DosInputError` naming the file line and column.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np

from ..errors import DosInputError, OptionError
from ..io.readers import RawTable

#: Fewest data points accepted for a DOS.
MIN_POINTS = 10
#: Largest |frequency| accepted [THz] (about 33,000 cm⁻¹; the stiffest
#: molecular vibrations lie near 130 THz, common practice).
MAX_FREQUENCY_THZ = 1.0e3
#: Smallest accepted highest frequency of a DOS [THz] (about 0.05 K).
MIN_TOP_FREQUENCY_THZ = 1.0e-3
#: Accepted range of the DOS integral as read [modes]; outside it the
#: rescaling to 3n would magnify rounding or lose every digit.
MODE_COUNT_RANGE = (1.0e-30, 1.0e30)


@dataclass(frozen=True)
class CleanSpectrum:
    """DOS columns that passed :func:`check_spectrum`.

    Attributes
    ----------
    frequency : numpy.ndarray, shape (N,)
        Column 1, strictly increasing [file unit; may be negative for
        imaginary modes].
    total : numpy.ndarray, shape (N,)
        Column 2, total DOS, ``>= 0`` [states / file unit].
    partials : dict of str to numpy.ndarray
        Columns 3 and later by column name, ``>= 0`` [states / file unit].
    warnings : tuple of str
        One-line notes (e.g. small negative values clipped to zero).
    source, sha256, names, header_unit
        Copied from the :class:`~thermo.io.readers.RawTable`.
    line_numbers : tuple of int
        File line of each point.
    """

    frequency: np.ndarray
    total: np.ndarray
    partials: dict
    warnings: tuple
    source: str
    sha256: str
    names: list
    header_unit: str | None
    line_numbers: tuple = field(default=())


def check_spectrum(raw: RawTable, negative_noise: float = 1e-3) -> CleanSpectrum:
    r"""Check a raw DOS table and clip negative noise.

    Parameters
    ----------
    raw : RawTable
        Output of :func:`thermo.io.readers.read_table`.
    negative_noise : float, optional
        Negative DOS values with :math:`|g| \le` ``negative_noise`` ×
        max(total DOS) are set to 0 with one warning; larger negative values
        are an error [1].

    Returns
    -------
    CleanSpectrum
        Frequency, total and partial DOS columns plus warnings.

    Raises
    ------
    DosInputError
        Fewer than :data:`MIN_POINTS` points, repeated or decreasing
        frequencies, a total DOS that is zero everywhere, or negative values
        beyond the noise level.
    OptionError
        ``negative_noise`` is negative or not finite.

    Notes
    -----
    A DOS is a density of mode counts, :math:`g(\nu) \ge 0`; small negative
    values come from smearing or interpolation and are clipped when
    :math:`g_i \ge -\epsilon \max_j g_{\mathrm{total}}(\nu_j)` with
    :math:`\epsilon` = ``negative_noise``.  The same threshold, relative to
    the total DOS, is used for partial columns.

    References
    ----------
    .. [1] A. A. Maradudin, E. W. Montroll, G. H. Weiss, I. P. Ipatova,
       *Theory of Lattice Dynamics in the Harmonic Approximation*, 2nd ed.,
       Solid State Physics Suppl. 3 (Academic Press, New York, 1971), ch. 4.

    Examples
    --------
    >>> from thermo.io.readers import read_table
    >>> rows = [f"{0.5 * k} {k * k * 0.01}" for k in range(12)]
    >>> rows[3] = "1.5 -0.0001"
    >>> spec = check_spectrum(read_table("\n".join(rows) + "\n"))
    >>> float(spec.total[3]), spec.warnings
    (0.0, ('clipped 1 small negative DOS value to 0 (|value| <= 0.001 x max total DOS)',))
    """
    if not (isinstance(negative_noise, (int, float)) and math.isfinite(negative_noise)
            and negative_noise >= 0):
        raise OptionError(
            f"negative_noise must be a finite number >= 0, got {negative_noise!r}")
    data = np.array(raw.data, dtype=float)
    lines = list(raw.line_numbers) or list(range(1, len(data) + 1))
    if data.ndim != 2 or data.shape[1] < 2:
        raise DosInputError("need at least 2 columns (frequency, total DOS)", raw.source)
    if len(data) < MIN_POINTS:
        raise DosInputError(
            f"only {len(data)} data points; at least {MIN_POINTS} are needed",
            raw.source)
    _check_frequencies(data[:, 0], lines, raw.source)
    dos = data[:, 1:]
    threshold = negative_noise * max(float(dos[:, 0].max()), 0.0)
    clipped = _clip_negative(dos, threshold, lines, raw.source)
    if not np.any(dos[:, 0] > 0):
        raise DosInputError("total DOS (column 2) is zero everywhere", raw.source)
    warnings = ()
    if clipped:
        plural = "s" if clipped > 1 else ""
        warnings = (f"clipped {clipped} small negative DOS value{plural} to 0 "
                    f"(|value| <= {negative_noise:g} x max total DOS)",)
    warnings += hole_warnings(data[:, 0], dos[:, 0], lines)
    names = list(raw.names)
    partials = {names[k + 1]: dos[:, k].copy() for k in range(1, dos.shape[1])}
    return CleanSpectrum(frequency=data[:, 0].copy(), total=dos[:, 0].copy(),
                         partials=partials, warnings=warnings, source=raw.source,
                         sha256=raw.sha256, names=names, header_unit=raw.header_unit,
                         line_numbers=tuple(lines))


#: A step this many times longer than both neighbouring steps, with DOS > 0 on both sides, is a hole.
HOLE_STEP_RATIO = 10.0


def hole_warnings(frequency, total, lines=None):
    r"""Warnings for rows missing inside the spectrum (a hole in the tabulated grid).

    Parameters
    ----------
    frequency : numpy.ndarray
        Ascending frequencies [file unit].
    total : numpy.ndarray
        Total DOS [states / file unit].
    lines : sequence of int, optional
        File line of each row (for the message).

    Returns
    -------
    tuple of str
        One warning per hole: where it is, how much longer the step is than
        its neighbours, and the share of the modes the straight line across
        it carries (what was done: the DOS is integrated linearly across it).

    Notes
    -----
    A step :math:`h_i = \nu_{i+1} - \nu_i` is a hole when
    :math:`h_i > r\,\max(h_{i-1}, h_{i+1})` with :math:`r` =
    :data:`HOLE_STEP_RATIO` and the DOS is positive at both ends.  A band gap
    (DOS 0 at its edges) and a smoothly varying (e.g. logarithmic) grid are
    not holes.  The test is local, so it does not change when the rest of the
    grid is resampled.

    Examples
    --------
    >>> nu = np.r_[np.arange(0.0, 2.0, 0.1), np.arange(3.0, 5.0, 0.1)]
    >>> hole_warnings(nu, 1.0 + 0 * nu)[0].split(":")[0]
    'rows missing between 1.9 and 3 (file unit)'
    """
    nu, g = np.asarray(frequency, float), np.asarray(total, float)
    if nu.size < 4:
        return ()
    with np.errstate(over="ignore", invalid="ignore"):   # out-of-range magnitudes are refused later
        h = np.diff(nu)
        neighbours = np.maximum(np.r_[h[1:2], h[:-1]], np.r_[h[1:], h[-2:-1]])
        holes = np.flatnonzero((h > HOLE_STEP_RATIO * neighbours) & (g[:-1] > 0) & (g[1:] > 0))
        if holes.size == 0:
            return ()
        area = float(np.sum(0.5 * (g[1:] + g[:-1]) * h))
        if not (np.isfinite(area) and np.isfinite(h).all()):
            return ()
    out = []
    for i in holes:
        where = f" (lines {lines[i]}-{lines[i + 1]})" if lines is not None and len(lines) > i + 1 else ""
        share = 100.0 * 0.5 * (g[i] + g[i + 1]) * h[i] / area if area > 0 else float("nan")
        out.append(f"rows missing between {nu[i]:.6g} and {nu[i + 1]:.6g} (file unit){where}: the step is "
                   f"{h[i] / neighbours[i]:.3g}x its neighbours; the DOS is taken as a straight line across it, "
                   f"which holds {share:.3g} % of the modes")
    return tuple(out)


def _check_frequencies(freq, lines, source):
    bad = np.flatnonzero(freq[1:] <= freq[:-1])
    if bad.size == 0:
        return
    i = int(bad[0]) + 1
    here, before = float(freq[i]), float(freq[i - 1])
    if here == before:
        raise DosInputError(f"frequency {here!r} repeats line {lines[i - 1]}",
                            source, lines[i])
    raise DosInputError(
        f"frequency decreases ({here!r} after {before!r}); sort the file",
        source, lines[i])


def _clip_negative(dos, threshold, lines, source) -> int:
    """Set noise-level negatives of every DOS column to 0 in place; count them."""
    too_negative = dos < -threshold
    if too_negative.any():
        row, col = (int(k) for k in np.argwhere(too_negative)[0])
        raise DosInputError(
            f"negative DOS value {float(dos[row, col])!r} is beyond the "
            f"noise level {threshold:.3g}",
            source, lines[row], col + 2)
    negative = dos < 0
    dos[negative] = 0.0
    return int(negative.sum())


def check_magnitudes(frequency_thz, dos_columns, source, lines=()):
    r"""Refuse frequencies and DOS values outside the ranges a phonon spectrum can have.

    Parameters
    ----------
    frequency_thz : numpy.ndarray, shape (N,)
        Frequencies converted to THz [THz].
    dos_columns : sequence of numpy.ndarray, each shape (N,)
        DOS columns converted to states/THz [states / THz].
    source : str
        File name for messages.
    lines : sequence of int, optional
        File line of each point.

    Raises
    ------
    DosInputError
        A frequency beyond :data:`MAX_FREQUENCY_THZ`, a highest frequency
        below :data:`MIN_TOP_FREQUENCY_THZ`, or a DOS value that is not
        finite after the unit conversion.

    Notes
    -----
    With :math:`|\nu| \le 10^3` THz and finite :math:`g`, every power
    :math:`\nu^k` (k ≤ 4) and the Planck kernels stay finite in double
    precision; the integral range is checked by :func:`check_mode_count`.

    Examples
    --------
    >>> import numpy as np
    >>> check_magnitudes(np.linspace(0, 5, 11), [np.ones(11)], "x.dat")
    >>> check_magnitudes(np.linspace(0, 5e6, 11), [np.ones(11)], "x.dat")
    Traceback (most recent call last):
    ...
    thermo.errors.DosInputError: x.dat, line 2: frequency 5e+05 THz is beyond the accepted 1000 THz; check the frequency unit
    """
    nu = np.asarray(frequency_thz, dtype=float)
    lines = list(lines) or list(range(1, len(nu) + 1))
    with np.errstate(all="ignore"):
        far = np.flatnonzero(~(np.abs(nu) <= MAX_FREQUENCY_THZ))
    if far.size:
        i = int(far[0])
        raise DosInputError(f"frequency {float(nu[i]):.3g} THz is beyond the accepted {MAX_FREQUENCY_THZ:g} THz; "
                            "check the frequency unit", source, lines[i])
    if nu.size and not float(nu.max()) >= MIN_TOP_FREQUENCY_THZ:
        raise DosInputError(f"the highest frequency is {float(nu.max()):.3g} THz, below the accepted "
                            f"{MIN_TOP_FREQUENCY_THZ:g} THz; check the frequency unit", source)
    for k, col in enumerate(dos_columns):
        bad = np.flatnonzero(~np.isfinite(np.asarray(col, dtype=float)))
        if bad.size:
            i = int(bad[0])
            raise DosInputError("DOS value is too large to convert to states/THz (not finite)",
                                source, lines[i], k + 2)


def check_mode_count(integral, source):
    """Refuse a DOS integral [modes] that is not finite or outside :data:`MODE_COUNT_RANGE`.

    Examples
    --------
    >>> check_mode_count(6.0, "x.dat")
    >>> check_mode_count(1e-319, "x.dat")
    Traceback (most recent call last):
    ...
    thermo.errors.DosInputError: x.dat: the DOS integrates to 1e-319 modes; accepted are 1e-30 to 1e+30
    """
    low, high = MODE_COUNT_RANGE
    if not (np.isfinite(integral) and low <= abs(integral) <= high):
        raise DosInputError(f"the DOS integrates to {integral:.3g} modes; accepted are {low:g} to {high:g}",
                            source)
