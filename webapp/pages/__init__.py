"""Dashboard pages, one module each: ``dash.register_page`` + ``layout(**query)`` + its ``@callback``s.

The Dash instance (:mod:`webapp.shell`) is imported first: Dash registers
pages only after the app exists.  ``PAGES`` lists the modules in navigation
order.
"""

from .. import shell  # noqa: F401  (the app must exist before register_page)
from . import calorimetry
from . import compare
from . import displacements
from . import electronic
from . import export
from . import home
from . import modemap
from . import models
from . import phases
from . import polynomials
from . import quasiharmonic
from . import spectrum
from . import thermodynamics
from . import workspace

PAGES = tuple(sorted((
    home, spectrum, thermodynamics, models, modemap, compare, export,
    quasiharmonic,
    phases,
    calorimetry,
    electronic,
    displacements,
    polynomials,
    workspace,
), key=lambda m: m.ORDER))
