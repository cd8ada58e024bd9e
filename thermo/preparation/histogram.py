r"""Histograms read as histograms: a DOS of bin centres summed as Σ g·Δν.

A histogram (modes of a q-point mesh counted in bins of width Δ, written at
the bin centres) is not a sampled smooth curve: the trapezoid rule with the
band-edge step rule (:func:`thermo.kernels.quadrature.band_edge_segments`)
drops half a bin beside every empty bin, which loses a few per cent of the
modes of a spiky histogram.  A histogram is recognised

* when a comment states it (a line ``# histogram``, optionally
  ``# histogram: bin centres``), or
* when its grid is uniform and starts half a step above zero (bin centres
  ``(i + ½)Δ``),

and is then summed as what it is: every bin a mode group of weight
:math:`g_i\Delta` at its centre (a :class:`~thermo.spectrum.ModeList`), the
midpoint rule of the step function it stands for.
"""

from __future__ import annotations

import dataclasses
import re

import numpy as np

#: A comment line stating that the table is a histogram of bin centres.
STATEMENT = re.compile(r"^[#%!;/\s]*histogram\b", re.IGNORECASE)


def stated_histogram(comments) -> bool:
    """True when a comment line states ``histogram``.

    Examples
    --------
    >>> stated_histogram(["# histogram: bin centres"]), stated_histogram(["# a histogram-like file"])
    (True, False)
    """
    return any(STATEMENT.match(str(line)) for line in comments or ())


def is_histogram(frequency_thz) -> bool:
    """True when the grid is uniform and starts half a step above zero (bin centres).

    Examples
    --------
    >>> is_histogram(np.arange(10) * 0.05 + 0.025), is_histogram(np.arange(10) * 0.05)
    (True, False)
    """
    nu = np.asarray(frequency_thz, float)
    if nu.size < 4:
        return False
    step = np.diff(nu)
    h = float(np.median(step))
    return bool(h > 0 and np.all(np.abs(step - h) <= 1e-3 * h) and abs(nu[0] - h / 2) <= 1e-3 * h)


def check_bins(frequency_thz, source=None, line_numbers=None):
    """Raise a one-line :class:`~thermo.errors.DosInputError` unless the rows are equally spaced bin centres.

    Examples
    --------
    >>> check_bins(np.arange(5) * 0.05 + 0.025) is None
    True
    """
    from ..errors import DosInputError
    nu = np.asarray(frequency_thz, float)
    step = np.diff(nu)
    if nu.size < 2:
        raise DosInputError("a histogram needs at least two bins", source)
    h = float(np.median(step))
    bad = np.flatnonzero(np.abs(step - h) > 1e-3 * abs(h))
    if h <= 0 or bad.size:
        row = int(bad[0]) + 1 if bad.size else 0
        line = line_numbers[row] if line_numbers is not None and row < len(line_numbers) else None
        raise DosInputError(f"read as a histogram, the rows must be equally spaced bin centres; this row is "
                            f"{float(step[row - 1]) if row else 0.0:.6g} THz from the one before, the bins "
                            f"{h:.6g} THz wide", source, line)
    return None


def bin_width(frequency_thz) -> float:
    """Bin width of a histogram of bin centres [THz] (the median spacing; a single bin: twice its centre)."""
    nu = np.asarray(frequency_thz, float)
    return float(np.median(np.diff(nu))) if nu.size > 1 else 2.0 * float(nu[0])


def bin_modes(frequency_thz, dos):
    r"""Modes in each bin, :math:`g_i\,\Delta` [modes].

    Examples
    --------
    >>> bin_modes([0.025, 0.075, 0.125], [0.0, 20.0, 40.0]).tolist()
    [0.0, 1.0, 2.0]
    """
    return np.asarray(dos, float) * bin_width(frequency_thz)


def merged_bins(frequency_thz, dos, offset=0):
    """Modes of the histogram with its bins merged in pairs from ``offset`` (a leading bin left alone).

    Returns
    -------
    centres : numpy.ndarray
        Centres of the merged bins [THz].
    modes : numpy.ndarray
        Modes in each merged bin (their sum is the histogram's).

    Examples
    --------
    >>> merged_bins([0.5, 1.5, 2.5, 3.5], [1.0, 3.0, 2.0, 2.0])
    (array([1., 3.]), array([4., 4.]))
    """
    nu, modes = np.asarray(frequency_thz, float), bin_modes(frequency_thz, dos)
    h = bin_width(nu)
    head_nu, head = nu[:offset], modes[:offset]
    body_nu, body = nu[offset:], modes[offset:]
    if body.size % 2:
        body = np.append(body, 0.0)
        body_nu = np.append(body_nu, body_nu[-1] + h)
    return (np.concatenate([head_nu, 0.5 * (body_nu[0::2] + body_nu[1::2])]),
            np.concatenate([head, body[0::2] + body[1::2]]))


def histogram_dos(nu_all, cols_all, names, atoms, share=0.0, policy="drop", theta_k=None, **fields):
    r"""The prepared DOS of a histogram: its bins as modes, normalised to 3n.

    Parameters
    ----------
    nu_all : numpy.ndarray, shape (N,)
        Bin centres [THz], ascending (negative ones are imaginary modes).
    cols_all : list of numpy.ndarray
        Total, then partial columns [states/THz, any scale].
    names : list of str
        Partial column names.
    atoms : int
        Atoms per formula unit.
    share : float
        Imaginary share of the modes [1].
    policy : str
        Imaginary-mode policy (``drop`` renormalises the real modes to 3n).
    theta_k : float or None
        Elastic Debye temperature θ [K] of ``--low-frequency elastic:θ``: below
        the histogram's resolved limit (:func:`thermo.preparation.anchor.elastic_anchor`)
        the bins give way to the law :math:`A\nu^2` with a smooth step, as for
        a mode list without wave vectors; the bins carry the remaining modes.
    **fields
        Further :class:`~thermo.spectrum.PhononDOS` fields (source, warnings, inputs).

    Returns
    -------
    PhononDOS
        ``modes`` holds every non-empty real bin (centre, :math:`g_i\Delta` scaled);
        ``frequency_thz``/``dos`` the histogram itself; ``source["scale_factor"]``.

    Notes
    -----
    :math:`\text{scale} = 3n(1-f^{[\text{drop-unscaled}]}_{imag}) / \sum_{\nu_i>0} g_i\Delta`;
    with an anchor, :math:`\text{scale} = (3n(\ldots) - \int A\nu^2 W) / \sum g_i\Delta(1-W_i)`.

    Examples
    --------
    >>> d = histogram_dos(np.array([0.5, 1.5, 2.5]), [np.array([0.0, 2.0, 4.0])], [], 1)
    >>> d.modes.frequency_thz.tolist(), d.modes.weight.tolist()
    ([1.5, 2.5], [1.0, 2.0])
    """
    from ..spectrum import ModeList, PhononDOS
    nu_all = np.asarray(nu_all, float)
    real = nu_all > 0
    h = bin_width(nu_all[real]) if real.sum() > 1 else bin_width(nu_all)
    modes = [np.asarray(c, float)[real] * h for c in cols_all]
    real_modes = 3 * atoms * (1.0 if policy == "drop" else 1.0 - share)
    nu = nu_all[real]
    total = float(modes[0].sum())
    scale = real_modes / total if total > 0 else 1.0
    continuum, kept, note = (), np.ones(nu.size), None
    if theta_k is not None and total > 0:
        from .anchor import elastic_anchor
        fit, note = elastic_anchor(nu, modes[0] * scale / h, theta_k, atoms, real_modes, histogram=True)
        law = dataclasses.replace(fit, smooth_taper=True)
        continuum, kept = (law,), 1.0 - law.taper(nu)
        scale = (real_modes - law.analytic_moment()) / float((modes[0] * kept).sum())
    keep = modes[0] * kept > 0
    listed = ModeList(nu[keep], (modes[0] * kept)[keep] * scale,
                      partials={k: (m * kept)[keep] * scale for k, m in zip(names, modes[1:])},
                      continuum=continuum,
                      resolved_thz=(continuum[0].cutoff_thz if continuum else float(nu[keep][0]) if keep.any()
                                    else 0.0))
    source = dict(fields.pop("source", {}))
    source.update(histogram=True, histogram_bin_THz=h, scale_factor=scale)
    if note:
        fields["warnings"] = tuple(fields.get("warnings", ())) + (note,)
    return PhononDOS(frequency_thz=nu, dos=np.asarray(cols_all[0], float)[real] * scale, atoms=atoms,
                     partials={k: np.asarray(c, float)[real] * scale for k, c in zip(names, cols_all[1:])},
                     modes=listed, source=source, **fields)
