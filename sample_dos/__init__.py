"""Invented demo data of modeheat: spring-model phonon DOS files, a volume set and a measured C_p.

Nothing here describes a real material.  The files are installed with the
package; find them with :func:`importlib.resources.files`::

    from importlib.resources import files
    springium = files("sample_dos") / "springium_fcc.dat"

``generate.py``, ``volumes/generate_volumes.py`` and ``generate_calorimetry.py``
rewrite them deterministically (``make demo-data``).
"""
