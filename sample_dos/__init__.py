"""Invented demo data of modeheat: spring-model phonon DOS files, a volume set, a measured C_p and an electronic DOS.

Nothing here describes a real material.  The files are installed with the
package; find them with :func:`importlib.resources.files`::

    from importlib.resources import files
    springium = files("sample_dos") / "springium_fcc.dat"

``generate.py``, ``volumes/generate_volumes.py``, ``generate_calorimetry.py`` and
``electronic/generate_electronic.py`` rewrite them deterministically (``make demo-data``).
"""
