"""The spectra an error breakdown compares a DOS with: re-prepared from every second input row, or with
another low-frequency window; kept on the DOS (a second breakdown, at other temperatures, re-uses them and
their prepared sums).

References
----------
.. [1] L. F. Richardson, "The deferred approach to the limit", Phil. Trans. R. Soc. A 226, 299-361 (1927).
"""

from __future__ import annotations

from dataclasses import replace

import numpy as np

from ..kernels.quadrature import mode_weights
from ..preparation.histogram import merged_bins
from ..preparation.imaginary import split_at_zero
from ..preparation.loading import treat_spectrum
from ..preparation.lowfreq import WINDOW_MODES
from ..spectrum import PhononDOS

#: Rebuilt spectra are kept on a DOS of at most this many input rows (a second breakdown, at other
#: temperatures, then re-uses them and their prepared sums).
KEEP_REBUILT_ROWS = 200_000


def rebuild(dos, every=1, window="same", window_modes=WINDOW_MODES, offset=0):
    """:func:`_rebuilt` of ``dos``, computed once per DOS and arguments (kept on it beside its fields)."""
    held = getattr(dos, "__dict__", None)
    rows = np.size(dos.input_frequency_thz) if dos.input_frequency_thz is not None else np.size(dos.frequency_thz)
    if held is None or rows > KEEP_REBUILT_ROWS:
        return _rebuilt(dos, every, window, window_modes, offset)
    kept = held.setdefault("_rebuilt", {})
    key = (every, window, window_modes, offset)
    if key not in kept:
        kept[key] = _rebuilt(dos, every, window, window_modes, offset)
    return kept[key]


def _rebuilt(dos, every=1, window="same", window_modes=WINDOW_MODES, offset=0):
    """The DOS prepared again from its input rows (every ``every``-th from ``offset``), or None.

    The first and last rows are always kept, so both coarse grids span the
    same frequencies.
    """
    if dos.source.get("histogram") and dos.input_dos is not None:
        return _merged_histogram(dos, offset) if every == 2 else None
    if dos.input_frequency_thz is None or dos.input_dos is None:
        return _halved_table(dos) if every == 2 and offset == 0 else None
    nu_all, g_all = np.asarray(dos.input_frequency_thz), np.asarray(dos.input_dos)
    keep = np.arange(offset, nu_all.size, every)
    if keep.size == 0:
        return None
    if keep[0] != 0:
        keep = np.insert(keep, 0, 0)
    if keep[-1] != nu_all.size - 1:
        keep = np.append(keep, nu_all.size - 1)
    _neg, nu, cols = split_at_zero(nu_all[keep], [g_all[keep]])
    if nu.size < 3:
        return None
    if window == "same":
        window = dos.source.get("low_frequency_option", "auto" if dos.low_frequency is not None else None)
    share = dos.source.get("negative_mode_fraction") or 0.0
    policy = dos.source.get("negative_policy") or "drop"
    grid, cut, fit, scale, _notes = treat_spectrum(nu, cols, [], dos.atoms, share, policy, window,
                                                   window_modes=window_modes)
    return PhononDOS(grid, cut[0] * scale, dos.atoms, low_frequency=fit)


def _merged_histogram(dos, offset):
    """A histogram summed on bins twice as wide (pairs from ``offset``), same modes: its numerical check."""
    nu, g = np.asarray(dos.input_frequency_thz), np.asarray(dos.input_dos)
    real = nu > 0
    centres, modes = merged_bins(nu[real], g[real], offset)
    keep = modes > 0
    listed = replace(dos.modes, frequency_thz=centres[keep], weight=modes[keep] * dos.modes.weight.sum() / modes.sum(),
                     partials={})
    return replace(dos, modes=listed)


def _halved_table(dos):
    """A DOS built without input rows: its tabulated part on every second point, same modes, same fit."""
    nu, g = np.asarray(dos.frequency_thz), np.asarray(dos.dos)
    keep = np.arange(0, nu.size, 2)
    if keep[-1] != nu.size - 1:
        keep = np.append(keep, nu.size - 1)
    if keep.size < 2:
        return None
    full, half = mode_weights(nu, g).sum(), mode_weights(nu[keep], g[keep]).sum()
    factor = full / half if half > 0 else 1.0
    return PhononDOS(nu[keep], g[keep] * factor, dos.atoms, low_frequency=dos.low_frequency)
