"""From a raw table to a normalised PhononDOS.

:mod:`.validation` (ordering, duplicates, negative DOS), :mod:`.imaginary`
(negative-frequency modes), :mod:`.atoms` (atoms per formula unit),
:mod:`.lowfreq` (ν² treatment), :mod:`.loading` (:func:`~.loading.load_dos`,
the pipeline in named steps).
"""
