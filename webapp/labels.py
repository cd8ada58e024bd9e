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
