r"""From a mode list (one row per mode of a q-point mesh) to a :class:`~thermo.spectrum.PhononDOS`.

The sums run over the modes themselves (:class:`~thermo.spectrum.ModeList`);
``frequency_thz``/``dos`` of the result hold a histogram of them for plots
and moment-based models.  Steps: units, magnitudes, q-points and atoms,
the long-wave region (:mod:`.longwave`), imaginary modes, normalisation of
the weights to 3n modes per formula unit.
"""

from __future__ import annotations

import functools

import numpy as np

from ..errors import DosInputError
from ..io.modelists import mode_list_columns
from ..kernels.planck import H_OVER_K_THZ
from ..kernels.quadrature import mode_weights
from ..spectrum import ModeList, PhononDOS
from ..units import thz_to_unit
from .imaginary import imaginary_warnings
from .layers import chosen_atoms, chosen_unit
from .longwave import BLEND, GAMMA_Q, anchored_continuum, long_wave_region
from .options import elastic_theta, low_frequency_window
from .validation import check_magnitudes, check_mode_count

#: Modes below this |frequency| without a wave vector are taken as Γ's acoustic modes [THz].
ZERO_MODE_THZ = 0.005
#: A mode list's table is not determined below h·ν₁/(k_B · this), ν₁ its lowest resolved mode [1].
RESOLVED_DIVISOR = 5.0
#: Bins of the histogram shown for a mode list.
HISTOGRAM_BINS = 200
#: Alternative long-wave treatments kept for the error estimate: the blend moved by these factors ...
BLEND_SPREAD = (1 / 1.4, 1.4)


def _q_points(q, lines, src):
    """(index of each row's q-point, distinct q-points, rows per q-point)."""
    keys = np.round(q, 9)
    distinct, index, counts = np.unique(keys, axis=0, return_inverse=True, return_counts=True)
    index = index.ravel()
    per_row = counts[index]
    odd = np.flatnonzero((per_row != per_row[0]) | (per_row % 3 != 0))
    if odd.size:
        row = int(odd[0])
        raise DosInputError(f"the q-point of this row has {int(per_row[row])} modes; every q-point needs the "
                            "same number, 3 per atom of the cell", src, lines[row])
    return index, distinct, int(counts[0])


def _histogram(nu, w, continuum, total):
    """A DOS view of the modes: bin centres [THz] and states/THz integrating to ``total``."""
    top = float(nu.max()) if nu.size else 1.0
    step = top / HISTOGRAM_BINS
    edges = np.linspace(0.0, top + step, HISTOGRAM_BINS + 2)
    counts = np.histogram(nu, bins=edges, weights=w)[0] / step
    grid = np.r_[0.0, 0.5 * (edges[1:] + edges[:-1])]
    g = np.r_[0.0, counts]
    for fit in continuum:
        g = g + np.where(grid <= fit.cutoff_thz, fit.form(grid), 0.0)
    area = float(mode_weights(grid, g).sum())
    return grid, g * (total / area if area > 0 else 1.0)


def load_mode_list(raw, explicit, carried, chosen):
    """A mode list read by :func:`thermo.io.readers.read_table` as a prepared :class:`PhononDOS`.

    Parameters
    ----------
    raw : RawTable
        The table (it has a ``weight`` column).
    explicit, carried, chosen : ReadingOptions
        Options for this file, carried ones, and the merged record
        (see :func:`thermo.preparation.loading.load_dos`).

    Returns
    -------
    PhononDOS
        With ``modes`` set; ``low_frequency`` None; ``frequency_thz``/``dos``
        and ``input_frequency_thz``/``input_dos`` a histogram of the modes
        (and the continuum) for plots.

    Notes
    -----
    Each mode carries :math:`w_i\\,3n(1-f^{[\\text{drop-unscaled}]}_{\\text{imag}})/\\sum_k w_k`
    modes per formula unit; with wave vectors and a cell volume the acoustic
    modes near Γ are blended into the elastic continuum
    (:func:`thermo.preparation.longwave.replace_inner_shell`) carrying the
    same number of modes.

    References
    ----------
    .. [1] N. W. Ashcroft, N. D. Mermin, *Solid State Physics* (1976), ch. 23.
    .. [2] D. C. Wallace, *Thermodynamics of Crystals* (Wiley, 1972), §4.

    Examples
    --------
    >>> from thermo.preparation.loading import load_dos
    >>> text = "weight frequency_THz\\n" + "\\n".join(f"0.25 {f}" for f in (1, 2, 3) * 4)
    >>> d = load_dos(text)
    >>> d.atoms, round(d.mode_count, 12)
    (1, 3.0)
    """
    table = mode_list_columns(raw)
    src, lines = raw.source, table.line_numbers
    unit, unit_note = chosen_unit(explicit.freq_unit, table.unit, carried and carried.freq_unit, src, raw.unit_mentions)
    notes = [unit_note] if unit_note else []
    nu = table.frequency / thz_to_unit(unit)
    w = table.weight.copy()
    check_magnitudes(nu, [w], src, lines)
    total_raw = float(w.sum())
    check_mode_count(total_raw, src)
    policy, option = chosen.negative, chosen.low_frequency
    share_kept = np.ones(nu.size)          # 1 - W of each mode beside the continuum
    continuum, fit, per_q, zone = (), None, None, 0.0
    if table.q_per_a is not None:
        index, distinct, per_q = _q_points(table.q_per_a, lines, src)
        q_weight = np.bincount(index, weights=w) / per_q
        zone = float(q_weight.sum())
        order = np.lexsort((nu, index))                 # rows by q-point, then frequency
        freqs = nu[order].reshape(-1, per_q)
        kept = np.ones((distinct.shape[0], per_q))
        if option != "off" and table.cell_volume_a3 is not None:
            region = (distinct, freqs, q_weight / zone, table.cell_volume_a3)
            kept[:, :3], continuum, fit = long_wave_region(*region)
        if fit is None:
            kept[np.linalg.norm(distinct, axis=1) <= GAMMA_Q, :3] = 0.0
        share_kept[order] = kept.ravel()
    else:
        share_kept[np.abs(nu) < ZERO_MODE_THZ] = 0.0
    replaced = share_kept == 0.0
    n_atoms, inferred = _atoms(explicit, carried, per_q, total_raw, src, chosen_atoms)
    if inferred:
        how = f"{per_q} modes per q-point" if per_q else f"the sum of the weights {total_raw:.6g}"
        notes.append(f"atoms per formula unit inferred as {n_atoms} from {how}")
    kept = ~replaced
    negative = kept & (nu < 0)
    share = float(w[negative].sum() / total_raw)
    if share > 0 and policy == "refuse":
        raise DosInputError(f"{100 * share:.3g} % of modes are imaginary (negative frequencies) "
                            "and the policy is to refuse them", src)
    notes += imaginary_warnings(share, policy)
    real = kept & ~negative
    if not real.any():
        raise DosInputError("no real (positive-frequency) modes in the list", src)
    real_modes = 3 * n_atoms * (1.0 if policy == "drop" else 1.0 - share)
    extra_nu, extra_w = fit["dispersion_nodes"] if continuum else (np.zeros(0), np.zeros(0))
    theta = elastic_theta(option)
    alternatives = None
    if theta is None:
        w_real = w[real] * share_kept[real]
        scale, continuum, extra_w = _normalised(w_real, continuum, extra_w, zone, real_modes)
        if fit is not None:       # built when an error estimate asks (a load stays fast)
            alternatives = functools.partial(_alternatives, nu, w, order, region, fit["dispersion_corrected"],
                                             fit["richardson_step"], zone, real_modes)
    else:       # the elastic law fixes A absolutely; the mesh modes carry the rest
        law = 9.0 * n_atoms / (theta / H_OVER_K_THZ) ** 3
        if continuum:
            factor = law / sum(f.coefficient for f in continuum)
            continuum, extra_w = tuple(f.scaled(factor) for f in continuum), extra_w * factor
        else:
            q_count = total_raw / float(w.min()) / (per_q or 3 * n_atoms)
            continuum = (anchored_continuum(law, q_count, n_atoms),)
            share_kept[real] *= 1.0 - continuum[0].taper(nu[real])
        w_real = w[real] * share_kept[real]
        scale = (real_modes - sum(f.analytic_moment() for f in continuum) - float(extra_w.sum())) / float(w_real.sum())
        notes.append(f"long-wave limit anchored by the elastic Debye temperature {theta:g} K"
                     + ("" if fit is None else f" (the modes near Γ give "
                        f"{_theta_of(continuum, n_atoms, 3 * n_atoms / per_q / factor):.4g} K)"))
    zero_weight = float(w[replaced].sum())
    if not continuum and zero_weight > 0:
        notes.append(f"{100 * zero_weight / total_raw:.3g} % of the modes are Γ's acoustic modes (frequency 0) "
                     "and were left out; the rest renormalised")
    order = np.argsort(nu[real], kind="stable")
    freq, weight = nu[real][order], w_real[order] * scale
    freq, weight = freq[weight > 0], weight[weight > 0]
    partials = {k: (p[real][order] * w_real[order] * scale)[w_real[order] > 0] for k, p in table.projections.items()}
    resolved = _resolved(nu, real, replaced, table, continuum)
    if not continuum:
        notes.append(_undetermined_note(resolved, table))
    modes = ModeList(frequency_thz=freq, weight=weight, extra=(extra_nu, extra_w), partials=partials,
                     continuum=continuum, alternatives=alternatives,
                     cell_volume_a3=table.cell_volume_a3, resolved_thz=resolved,
                     velocities={} if fit is None else {k: fit[k] for k in ("inverse_cube_mean", "points",
                                                                              "shell_radius_per_A",
                                                                              "dispersion_corrected")})
    grid, g = _histogram(freq, weight, continuum, real_modes)
    provenance = {
        "name": src, "sha256": raw.sha256, "freq_unit": unit, "stated_unit": table.unit,
        "raw_integral": total_raw, "scale_factor": scale, "negative_mode_fraction": share,
        "negative_policy": policy, "atoms_inferred": inferred, "columns": list(raw.names),
        "low_frequency_option": low_frequency_window(option), "kind": "mode list", "modes": int(nu.size),
        "left_out_share": 0.0 if continuum else zero_weight / total_raw,
        "reading_options": chosen.replaced(freq_unit=unit, atoms=n_atoms, sheet=raw.sheet).as_dict(),
    }
    if raw.sheet is not None:
        provenance["sheet"] = raw.sheet
    part_grid = {k: _histogram(freq, p, (), float(p.sum()))[1] for k, p in partials.items()}
    return PhononDOS(frequency_thz=grid, dos=g, atoms=n_atoms, partials=part_grid, low_frequency=None,
                     source=provenance, warnings=tuple(n for n in notes if n), modes=modes,
                     input_frequency_thz=grid, input_dos=g, input_partials=dict(part_grid))


def _normalised(w_real, continuum, extra_w, zone, real_modes):
    """(scale of the mesh weights, continuum and dispersion weights per formula unit): 3n modes in all."""
    in_continuum = zone * (sum(f.analytic_moment() for f in continuum) + float(extra_w.sum()))
    scale = real_modes / (float(w_real.sum()) + in_continuum)
    return scale, tuple(f.scaled(scale * zone) for f in continuum), extra_w * scale * zone


def _alternatives(nu, w, order, region, corrected, step, zone, real_modes):
    """((factor, ModeList), …) of the other plausible long-wave treatments, for the error estimate.

    The blend moved by :data:`BLEND_SPREAD` (factor 1), and the raw speeds without the Richardson step,
    whose difference is k² − 1 times the step's own error estimate (factor 1/(k² − 1), Richardson 1927).
    """
    out = []
    variants = [(1.0, dict(blend=(BLEND[0] * f, BLEND[1] * f))) for f in BLEND_SPREAD]
    if corrected:
        variants.append((1.0 / (step ** 2 - 1), dict(corrected=False)))
    for factor, how in variants:
        kept = np.ones((region[0].shape[0], region[1].shape[1]))
        kept[:, :3], continuum, other = long_wave_region(*region, **how)
        if other is None:
            continue
        share = np.ones(nu.size)
        share[order] = kept.ravel()
        use = (share > 0) & (nu >= 0)
        extra_nu, extra_w = other["dispersion_nodes"]
        scale, continuum, extra_w = _normalised(w[use] * share[use], continuum, extra_w, zone, real_modes)
        i = np.argsort(nu[use], kind="stable")
        out.append((factor, ModeList(nu[use][i], (w[use] * share[use])[i] * scale, extra=(extra_nu, extra_w),
                                     continuum=continuum)))
    return tuple(out)


def _theta_of(continuum, atoms, factor=1.0):
    """Debye temperature [K] of the continuum's summed A (times ``factor``)."""
    a = factor * sum(f.coefficient for f in continuum)
    return float(H_OVER_K_THZ * (9.0 * atoms / a) ** (1 / 3))


def _atoms(explicit, carried, per_q, total_raw, src, atom_count):
    """(n, inferred): given > the modes per q-point > the weights' sum as for a DOS integral > carried."""
    if explicit.atoms is None and per_q:
        return per_q // 3, True
    return atom_count(total_raw, explicit.atoms, carried and carried.atoms, src)


def _resolved(nu, real, replaced, table, continuum):
    """Lowest frequency the list resolves [THz]: the continuum's reach, else the lowest real mode."""
    if continuum:
        return float(min(f.cutoff_thz for f in continuum))
    return float(nu[real].min())


def _undetermined_note(resolved_thz, table):
    """The warning of a list without a long-wave continuum: below which temperature it says nothing."""
    t_limit = H_OVER_K_THZ * resolved_thz / RESOLVED_DIVISOR
    why = ("it has no wave vectors (qx_per_A qy_per_A qz_per_A)" if table.q_per_a is None
           else "it states no cell volume ('# cell volume: V A^3')" if table.cell_volume_a3 is None
           else "its shells near Γ give no sound velocities")
    return (f"the mode list's long-wave region is not resolved ({why}): below {t_limit:.3g} K "
            f"(h·{resolved_thz:.4g} THz/{RESOLVED_DIVISOR:g}k_B, its lowest mode) the table is not "
            "determined by the data")
