r"""How far a quasi-harmonic row can be trusted: the estimated error of V, α, B_T, C_p, C_v, S, H, G, γ.

Four parts, each an absolute number per row, added (an estimate of the
largest error, not a standard deviation; it may be large, it should never be
smaller than the real error):

*harmonic* — the per-volume error estimates of F, S and C_v
(:func:`thermo.accuracy.rows.harmonic_row_errors`) carried through the
minimisation to first order, each volume and each of F, S, C_v with the
sign that hurts most: :math:`\delta q = \sum_k\sum_y |\partial q/\partial y_k|\,\delta y_k`.
The weights are those of the chosen form (exact for Birch–Murnaghan and
spline, which are linear in the data; to first order for Vinet) and of the
splines that carry S and C_v.

*equation of state* — the largest change when the other forms
(Birch–Murnaghan, Vinet, spline) replace the chosen one.

*volume sampling* — the largest change when one sampled volume is left out
and everything is refitted (leave-one-out, as the jackknife [1]_ resamples).

*edge* — for a minimum beyond the outermost volume, the leave-one-out
change of that volume scaled by how far the minimum lies outside: a fit's
extrapolation error grows with the distance d (in mean volume spacings h)
roughly like the product of the distances to its points; removing the edge
volume moves every distance one spacing further, so the change it causes
understates the error at d by about d/h [2]_.

References
----------
.. [1] B. Efron, C. Stein, "The jackknife estimate of variance", Ann. Statist.
   9, 586-596 (1981).
.. [2] P. J. Davis, *Interpolation and Approximation* (Blaisdell, 1963;
   Dover, 1975), § 3.1 (the remainder of polynomial interpolation).
"""

from __future__ import annotations

import numpy as np

from .eos import EOS_KINDS
from .path import path_values

#: Quantities of the result, in eV, Å³, K units per formula unit.
KEYS = ("volume", "alpha", "bulk_modulus", "entropy", "cv", "cp", "gibbs", "enthalpy", "gamma")
#: Schema quantity (thermo.columns) of each key.
QUANTITY = {"volume": "volume", "alpha": "thermal_expansion", "bulk_modulus": "bulk_modulus_T",
            "entropy": "entropy", "cv": "heat_capacity_v", "cp": "heat_capacity_p", "gibbs": "gibbs_energy",
            "enthalpy": "enthalpy", "gamma": "gruneisen_parameter"}
#: Parts of the estimate.
PARTS = ("harmonic", "equation_of_state", "volume_sampling", "edge")


def derived(path, temperatures):
    """H = G + TS and γ = α B_T V / C_v added to a path (see :func:`~thermo.quasiharmonic.path.path_values`)."""
    with np.errstate(invalid="ignore", divide="ignore"):
        gamma = np.where(path["cv"] > 0, path["alpha"] * path["bulk_modulus"] * path["volume"]
                         / np.where(path["cv"] > 0, path["cv"], 1.0), np.nan)
    return {**{k: path[k] for k in KEYS[:7]}, "enthalpy": path["gibbs"] + temperatures * path["entropy"],
            "gamma": gamma}


def path_uncertainty(surface, path, pressure_ev_a3):
    r"""Estimated error of every value along the minimum path.

    Parameters
    ----------
    surface : FreeEnergySurface
        The surface the path came from; with ``errors=True`` (see
        :func:`~thermo.quasiharmonic.surface.free_energy_surface`) the
        harmonic part is included, else it is 0 and a warning says so.
    path : dict
        :func:`~thermo.quasiharmonic.path.path_values` of ``surface``.
    pressure_ev_a3 : float
        Pressure [eV/Å³].

    Returns
    -------
    dict
        For each of :data:`KEYS` the total error (M,) [Å³, 1/K, eV/Å³, eV/K,
        eV, 1]; ``parts`` (part -> key -> (M,)); ``summary`` (JSON-able, by
        schema quantity: the largest relative size of each part and of the
        total); ``warnings``.

    Notes
    -----
    :math:`\delta q = \delta_{harm} + \delta_{eos} + \delta_{loo} + \delta_{edge}`, with
    :math:`\delta_{eos} = \max_f |q_f - q|`, :math:`\delta_{loo} = \max_k |q_{-k} - q|`
    and :math:`\delta_{edge} = (d/h)\,|q_{-e} - q|` for a minimum a distance
    d beyond the edge volume e.

    Examples
    --------
    >>> from thermo.spectrum import PhononDOS
    >>> from thermo.quasiharmonic.eos import birch_murnaghan_energy
    >>> from thermo.quasiharmonic.surface import free_energy_surface
    >>> from thermo.quasiharmonic.volumeset import make_volume_set
    >>> nu = np.linspace(0.0, 1.0, 201)
    >>> vs = make_volume_set([(v, float(birch_murnaghan_energy(v, 0.0, 20.0, 0.6, 4.0)),
    ...      PhononDOS(nu * 6.0 * (20.0 / v) ** 1.5, 9 * nu**2 / (6.0 * (20.0 / v) ** 1.5), atoms=1))
    ...      for v in np.linspace(19.0, 21.0, 7)])
    >>> s = free_energy_surface(vs, [300.0], errors=True)
    >>> u = path_uncertainty(s, path_values(s, 0.0), 0.0)
    >>> bool(0 < u["volume"][0] < 1e-3 * 20.0)
    True
    """
    t = surface.temperatures_k
    main = derived(path, t)
    zero = {k: np.zeros(t.size) for k in KEYS}
    warnings = []
    if surface.errors is None:
        harmonic = zero
        warnings.append("the harmonic error of each volume was not estimated; the uncertainty leaves it out")
    else:
        harmonic = _harmonic(surface, path, main)
    forms = [derived(path_values(surface.refit(kind), pressure_ev_a3), t)
             for kind in EOS_KINDS if kind != surface.fit.kind]
    eos = _spread(forms, main)
    left_out = [derived(path_values(surface.without(k), pressure_ev_a3), t) for k in range(surface.volumes_a3.size)]
    sampling = _spread(left_out, main)
    edge = _edge(surface.volumes_a3, main, left_out)
    parts = {"harmonic": harmonic, "equation_of_state": eos, "volume_sampling": sampling, "edge": edge}
    missing = [np.isfinite(main["volume"]) & ~np.isfinite(v["volume"]) for v in forms + left_out]
    lost = int(np.sum(np.any(missing, axis=0))) if missing else 0
    if lost:
        warnings.append(f"at {lost} temperatures another equation of state or a leave-one-out fit found no "
                        "minimum; their uncertainty is taken from the variants that did")
    total = {k: sum(parts[p][k] for p in PARTS) for k in KEYS}
    total = {k: np.where(np.isfinite(main[k]), v, np.nan) for k, v in total.items()}
    return {**total, "parts": parts, "summary": _summary(parts, main, total), "warnings": warnings}


def _spread(variants, main):
    """max over variants of |q_variant - q| per row (variants without a minimum left out)."""
    out = {}
    for k in KEYS:
        stack = np.array([np.abs(v[k] - main[k]) for v in variants]) if variants else np.zeros((1, main[k].size))
        stack = np.where(np.isfinite(stack), stack, 0.0)
        out[k] = stack.max(axis=0)
    return out


def _edge(volumes, main, left_out):
    """Rows with the minimum beyond an end volume: the change on leaving that volume out, times d/h."""
    v = main["volume"]
    h = float(np.mean(np.diff(volumes)))
    below, above = volumes[0] - v, v - volumes[-1]
    out = {k: np.zeros(v.size) for k in KEYS}
    for distance, variant in ((below, left_out[0]), (above, left_out[-1])):
        spacings = np.where(np.isfinite(distance) & (distance > 0), distance, 0.0) / h
        for k in KEYS:
            out[k] = out[k] + spacings * np.nan_to_num(np.abs(variant[k] - main[k]))
    return out


def _harmonic(surface, path, main):
    """First-order worst case of the per-volume F, S, C_v errors through the chosen fit and the carriers."""
    t = surface.temperatures_k
    ok = np.isfinite(main["volume"])
    v = np.where(ok, main["volume"], np.median(surface.volumes_a3))
    fit = surface.fit
    errors = surface.errors
    b = np.where(ok, main["bulk_modulus"], 1.0)
    step = 1e-4 * v
    b_prime = (fit.bulk_modulus(v + step) - fit.bulk_modulus(v - step)) / (2 * step)
    w0, w1, w2 = fit.weights(v)
    s_carrier, c_carrier = path["carriers"]
    ds0, ds1 = s_carrier.sensitivities(v)
    dc0, _ = c_carrier.sensitivities(v)
    s2 = s_carrier.second_derivative(v)[:, None]
    c1 = c_carrier.derivative(v)[:, None]
    alpha = np.where(ok, main["alpha"], 0.0)[:, None]
    cv = np.where(ok & (main["cv"] > 0), main["cv"], np.inf)[:, None]       # γ is not defined at C_v = 0
    vv, bb = v[:, None], b[:, None]
    d_f, d_s, d_c = (np.nan_to_num(errors[k]).T for k in ("helmholtz", "entropy", "heat_capacity"))   # (M, K)
    dv = -w1 * d_f * vv / bb
    from_f = {"volume": dv, "bulk_modulus": vv * w2 * d_f + b_prime[:, None] * dv, "gibbs": w0 * d_f,
              "entropy": main_slope(main, b)[:, None] * dv, "cv": c1 * dv}
    from_f["alpha"] = s2 * dv / bb - alpha * from_f["bulk_modulus"] / bb
    from_s = {"alpha": ds1 * d_s / bb, "entropy": ds0 * d_s}
    from_c = {"cv": dc0 * d_c}
    total = {k: np.zeros(t.size) for k in KEYS}
    gamma = np.where(np.isfinite(main["gamma"]), main["gamma"], 0.0)[:, None]
    tt = t[:, None]
    for effect in (from_f, from_s, from_c):
        e = {k: effect.get(k, np.zeros_like(w0)) for k in ("volume", "bulk_modulus", "gibbs", "entropy", "cv",
                                                          "alpha")}
        e["cp"] = e["cv"] + tt * (2 * alpha * bb * vv * e["alpha"] + alpha ** 2 * vv * e["bulk_modulus"]
                                   + alpha ** 2 * bb * e["volume"])
        e["gamma"] = (bb * vv * e["alpha"] + alpha * vv * e["bulk_modulus"] + alpha * bb * e["volume"]
                      - gamma * e["cv"]) / cv
        e["enthalpy"] = e["gibbs"] + tt * e["entropy"]
        for k in KEYS:
            total[k] = total[k] + np.sum(np.abs(np.nan_to_num(e[k])), axis=1)
    return total


def main_slope(main, bulk):
    """(∂S/∂V)_T along the path = α B_T [eV/(K Å³)]."""
    return np.where(np.isfinite(main["alpha"]), main["alpha"], 0.0) * bulk


def _summary(parts, main, total):
    """Largest relative size of each part and of the total, per quantity (JSON-able)."""
    out = {}
    for k in KEYS:
        scale = np.abs(main[k])
        entry = {}
        for name, values in list(parts.items()) + [("total", total)]:
            with np.errstate(invalid="ignore", divide="ignore"):
                rel = np.where(scale > 0, values[k] / scale, np.nan)
            entry[name] = float(np.nanmax(rel)) if np.any(np.isfinite(rel)) else None
        out[QUANTITY[k]] = entry
    return out
