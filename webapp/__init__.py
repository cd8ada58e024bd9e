"""modeheat dashboard: a Dash app over :mod:`thermo` (``python -m webapp``)."""
