"""Dashboard pages, one module each, in navigation order.

Each module defines ``WORKSPACE`` (id of the page's copy of the workspace
store), ``PATH``, ``NAME`` (navigation label), ``layout(workspace, prefs=None)``
returning the page's components, and ``register(app)`` adding its callbacks.
"""

from . import compare, export, home, modemap, models, spectrum, thermodynamics

PAGES = (home, spectrum, thermodynamics, models, modemap, compare, export)
