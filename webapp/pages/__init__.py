"""Dashboard pages, one module each: ``dash.register_page`` + ``layout(**query)`` + its ``@callback``s.

The Dash instance (:mod:`webapp.shell`) is imported first: Dash registers
pages only after the app exists.  ``PAGES`` lists the modules in navigation
order.
"""

from .. import shell  # noqa: F401  (the app must exist before register_page)
from . import compare, export, home, modemap, models, spectrum, thermodynamics, workspace

PAGES = tuple(sorted((home, spectrum, thermodynamics, models, modemap, compare, export, workspace), key=lambda m: m.ORDER))
