"""Diagnostics of a quasi-harmonic run: fit quality, range, imaginary modes, cautions."""

from __future__ import annotations

import numpy as np

#: Cautions shown wherever quasi-harmonic results are shown.
CAUTIONS = (
    "quasi-harmonic approximation: phonons depend on volume only; explicit anharmonicity "
    "(phonon-phonon interaction at fixed volume), electrons and defects are neglected",
    "unreliable near melting (roughly above 2/3 of the melting temperature) and for strongly "
    "anharmonic solids; check against validated measured data before any design decision",
)


def _ranges(t, mask):
    """Temperature intervals [(first, last), ...] [K] where ``mask`` is true."""
    out, start = [], None
    for i, flag in enumerate(mask):
        if flag and start is None:
            start = i
        if start is not None and (not flag or i == mask.size - 1):
            end = i if flag else i - 1
            out.append((float(t[start]), float(t[end])))
            start = None
    return out


def _shown(ranges):
    return ", ".join(f"{a:g}-{b:g} K" if a != b else f"{a:g} K" for a, b in ranges)


def diagnose(volume_set, surface, outside, tolerance, unconverged=None):
    """The diagnostics record of a quasi-harmonic table (JSON-able).

    Parameters
    ----------
    volume_set : VolumeSet
    surface : FreeEnergySurface
    outside : numpy.ndarray of bool, shape (M,)
        Rows whose minimum is outside the sampled volumes (or missing).
    tolerance : float
        Imaginary-mode share above which a volume is listed [1].
    unconverged : numpy.ndarray of bool, shape (M,), optional
        Rows whose minimum search did not converge (left empty).

    Returns
    -------
    dict
        ``volumes`` (per volume: V, E, file, imaginary share), ``imaginary_volumes``,
        ``outside_range_K`` (temperature intervals), ``no_minimum_K``,
        ``max_fit_residual_meV``, ``warnings`` (one line each), ``cautions``.

    Examples
    --------
    >>> _ranges(np.array([0., 10, 20, 30]), np.array([False, True, True, False]))
    [(10.0, 20.0)]
    """
    t = surface.temperatures_k
    v = volume_set.volumes_a3
    shares = [float(d.source.get("negative_mode_fraction") or 0.0) for d in volume_set.doses]
    volumes = [{"volume_A3": float(x), "energy_eV": float(e), "dos_file": n, "imaginary_share": s,
                "dos_warnings": list(d.warnings)}
               for x, e, n, s, d in zip(v, volume_set.energies_ev, volume_set.names, shares, volume_set.doses)]
    unstable = [row for row in volumes if row["imaginary_share"] > tolerance]
    residual = surface.fit.residual_rms * 1e3
    warnings = []
    for row in unstable:
        warnings.append(f"volume {row['volume_A3']:g} Å³ ({row['dos_file']}): {100 * row['imaginary_share']:.3g} % "
                        f"of modes are imaginary (tolerance {100 * tolerance:.3g} %); its F_vib is doubtful")
    missing = ~np.isfinite(surface.fit.residual_rms)
    outside_ranges = _ranges(t, np.asarray(outside))
    if outside_ranges:
        shown = _shown(outside_ranges)
        warnings.append(f"the equilibrium volume leaves the sampled range {v.min():g}-{v.max():g} Å³ at {shown}: "
                        f"{int(np.sum(outside))} rows are extrapolated or empty (marked outside_volume_range); "
                        "add volumes there")
    spread = float(np.ptp(surface.helmholtz_ev[:, 0])) * 1e3 if t.size else 0.0
    worst = float(np.nanmax(residual)) if np.any(np.isfinite(residual)) else float("nan")
    if np.isfinite(worst) and spread > 0 and worst > 0.01 * spread:
        warnings.append(f"the equation of state misses F(V) by up to {worst:.3g} meV rms "
                        f"({100 * worst / spread:.2g} % of the F spread); check the volume set or try the other EOS")
    if np.any(missing):
        warnings.append(f"the {surface.fit.kind} fit did not converge at {int(np.sum(missing))} temperatures "
                        f"({_shown(_ranges(t, missing))}); those rows are left empty")
    if unconverged is not None and np.any(unconverged):
        warnings.append(f"the minimum of F + pV did not converge at {int(np.sum(unconverged))} temperatures "
                        f"({_shown(_ranges(t, np.asarray(unconverged)))}); those rows are left empty")
    return {
        "eos": surface.fit.kind, "volume_count": int(v.size),
        "volume_range_A3": [float(v.min()), float(v.max())],
        "volumes": volumes, "imaginary_tolerance": float(tolerance),
        "imaginary_volumes": [row["volume_A3"] for row in unstable],
        "outside_range_K": outside_ranges,
        "max_fit_residual_meV": worst,
        "warnings": warnings, "cautions": list(CAUTIONS),
    }
