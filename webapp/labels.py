"""Words on the pages: axis titles from the column schema and the basis choices."""

from __future__ import annotations

from thermo.columns import label, lookup

PER_CHOICES = [{"label": "per formula unit (mol)", "value": "formula"},
               {"label": "per atom", "value": "atom"}, {"label": "per gram", "value": "gram"}]


def axis_title(column_name: str) -> str:
    """``symbol [unit]`` of a table column, from :mod:`thermo.columns`."""
    return label(column_name)


def unit_of(column_name: str) -> str:
    """The unit of a table column, from :mod:`thermo.columns`."""
    return lookup(column_name).unit


#: How each θ is defined, in words, by the tail of its JSON key.
_THETA_HOW = {"entropy": "entropy match", "fit": "C_v fit", "mean": "mean frequency",
              "low_frequency": "elastic limit, ν² fit"}
_MOMENT = {"m2": "−2", "m1": "−1", "0": "0", "1": "1", "2": "2"}


def theta_label(key: str) -> str:
    """A person's name for a θ key of :func:`thermo.models.theta_definitions` (the keys stay as they are).

    Examples
    --------
    >>> theta_label("einstein_theta_entropy_K"), theta_label("debye_theta_moment_m2_K")
    ('θ_E (entropy match)', 'θ_D (moment n = −2)')
    """
    text = str(key).removesuffix("_K")
    kind, _, how = text.partition("_theta_")
    symbol = {"einstein": "θ_E", "debye": "θ_D"}.get(kind)
    if symbol is None or not how:
        return text.replace("_", " ")
    if how.startswith("moment_"):
        n = how.removeprefix("moment_")
        return f"{symbol} (moment n = {_MOMENT.get(n, n)})"
    return f"{symbol} ({_THETA_HOW.get(how, how.replace('_', ' '))})"
