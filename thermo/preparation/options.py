r"""Reading options: how a DOS file is read, as one record with its defaults written once.

A :class:`ReadingOptions` holds the seven things a user may say about a DOS
file: the frequency unit, the atoms per formula unit, the imaginary-mode
policy, the low-frequency form, the worksheet of an ``.xlsx`` file, the
chemical formula and whether its rows are histogram bins.  A field that was
not given is ``None`` — never a copy of its default — so that layers of
options can be merged without mistaking "the user chose the default" for
"the user said nothing".

Layers, highest first (see :func:`merged`):

1. an option given *for this one file* (a command-line option beside one
   input, the Spectrum page's controls applied to the active dataset, a
   keyword of :func:`~thermo.preparation.loading.load_dos`) — it overrides
   even what the file states, with a warning;
2. what the file states itself: the unit of its frequency column's header
   (or an explicit unit line), the atom count its integral gives;
3. options *carried* from elsewhere (``batch`` options for many files, the
   page's controls at the next upload, a dataset's stored settings under the
   options typed now) — ``fallback`` of :func:`load_dos`, used only where the
   file says nothing;
4. :data:`DEFAULTS`.

The same record travels as a dict (:meth:`ReadingOptions.as_dict`) in the
dashboard's browser state, in the workspace store and in the provenance of
every export (``dos.source["reading_options"]``).

Examples
--------
>>> typed = ReadingOptions(negative="drop")                 # typed now: the default, but given
>>> stored = ReadingOptions.from_mapping({"negative": "refuse", "freq_unit": "meV"})
>>> typed.over(stored).resolved().as_dict()["negative"]
'drop'
>>> ReadingOptions().over(stored).resolved().freq_unit
'meV'
"""

from __future__ import annotations

import dataclasses
import math

from ..errors import OptionError

#: The fields of the record, in the order they are shown.
FIELDS = ("freq_unit", "atoms", "negative", "low_frequency", "formula", "sheet", "histogram")
#: What each field means when it is not given (the one place defaults are written).
#: ``None`` here: decided from the file (unit, atoms), the first sheet, no formula.
DEFAULT_VALUES = {"freq_unit": None, "atoms": None, "negative": "drop", "low_frequency": "auto",
                  "formula": None, "sheet": None, "histogram": None}
#: The defaults in words, for help texts and page hints.
DEFAULT_TEXT = {"freq_unit": "as the file's frequency header or unit line states (never guessed)",
                "atoms": "inferred when the DOS integrates to 3n", "negative": DEFAULT_VALUES["negative"],
                "low_frequency": DEFAULT_VALUES["low_frequency"], "sheet": "the first sheet",
                "formula": "none",
                "histogram": "when a '# histogram' line states it or the rows are bin centres (i + ½)Δ"}
#: Words meaning "no low-frequency treatment".
_OFF_WORDS = ("off", "none", "no", "false")


def low_frequency_setting(value):
    """Canonical text of a low-frequency option: ``'auto'``, ``'off'``, ``'LOW:HIGH'`` [THz] or ``'elastic:THETA'`` [K].

    Accepts the text forms, ``True``/``False`` and a ``(low, high)`` pair;
    None stays None (not given).  ``elastic:THETA`` anchors the long-wave
    limit with an elastic Debye temperature θ (e.g. from ``modeheat elastic``).

    Raises
    ------
    OptionError
        For anything else, a window outside 0 <= low < high <= the largest
        accepted frequency, or θ not in (0, :data:`MAX_ELASTIC_THETA_K`].

    Examples
    --------
    >>> low_frequency_setting("AUTO"), low_frequency_setting(False), low_frequency_setting((0.2, 0.6))
    ('auto', 'off', '0.2:0.6')
    >>> low_frequency_setting(" Elastic: 343 ")
    'elastic:343.0'
    """
    if value is None:
        return None
    if isinstance(value, str) and value.strip().lower().startswith("elastic"):
        return f"elastic:{elastic_theta(value)!r}"
    if value is True or (isinstance(value, str) and value.strip().lower() == "auto"):
        return "auto"
    if value is False or (isinstance(value, str) and value.strip().lower() in _OFF_WORDS):
        return "off"
    if isinstance(value, str):
        parts = value.split(":")
    else:
        try:
            parts = list(value)
        except TypeError:
            parts = []
    try:
        lo, hi = (float(v) for v in parts)
    except (TypeError, ValueError):
        raise OptionError(f"low-frequency window {value!r} must be 'auto', 'off' or LOW:HIGH in THz") from None
    from .validation import MAX_FREQUENCY_THZ
    if not (0.0 <= lo < hi <= MAX_FREQUENCY_THZ):
        raise OptionError(f"low-frequency window {value!r} must have 0 <= low < high <= "
                          f"{MAX_FREQUENCY_THZ:g} THz")
    return f"{lo!r}:{hi!r}"


#: Largest elastic Debye temperature accepted [K] (diamond's is about 2,200 K, common practice).
MAX_ELASTIC_THETA_K = 1.0e4


def elastic_theta(setting):
    """θ [K] of an ``elastic:THETA`` setting, None for any other.

    Examples
    --------
    >>> elastic_theta("elastic:343"), elastic_theta("auto")
    (343.0, None)
    """
    if not (isinstance(setting, str) and setting.strip().lower().startswith("elastic")):
        return None
    text = setting.strip()[len("elastic"):].strip().lstrip(":").strip()
    try:
        theta = float(text)
    except ValueError:
        raise OptionError(f"low-frequency anchor {setting!r} must be elastic:THETA with θ in kelvin") from None
    if not (math.isfinite(theta) and 0 < theta <= MAX_ELASTIC_THETA_K):
        raise OptionError(f"elastic Debye temperature {text} K must lie in (0, {MAX_ELASTIC_THETA_K:g}] K")
    return theta


def low_frequency_window(setting):
    """The treatment a canonical setting asks for: ``'auto'``, None (off), ``(low, high)`` [THz] or ``('elastic', θ)``.

    Examples
    --------
    >>> low_frequency_window("auto"), low_frequency_window("off"), low_frequency_window("0.2:0.6")
    ('auto', None, (0.2, 0.6))
    >>> low_frequency_window("elastic:300")
    ('elastic', 300.0)
    """
    setting = low_frequency_setting(setting)
    if setting in ("auto", None):
        return "auto"
    if setting == "off":
        return None
    if setting.startswith("elastic:"):
        return ("elastic", elastic_theta(setting))
    lo, hi = (float(v) for v in setting.split(":"))
    return (lo, hi)


def _atoms(value):
    if value is None or (isinstance(value, str) and not value.strip()):
        return None
    from .atoms import MAX_ATOMS
    try:
        number = float(value)
    except (TypeError, ValueError):
        raise OptionError(f"atoms per formula unit must be a whole number, not {value!r}") from None
    if not math.isfinite(number) or number != int(number) or number < 1:
        raise OptionError(f"atoms per formula unit must be a whole number >= 1, not {value!r}")
    if number > MAX_ATOMS:
        raise OptionError(f"atoms per formula unit must be at most {MAX_ATOMS:,}, not {value!r}")
    return int(number)


def _sheet(value):
    if value is None or isinstance(value, bool):
        return None
    if isinstance(value, int):
        if value < 1:
            raise OptionError(f"sheet numbers start at 1, not {value}")
        return value
    text = str(value).strip()
    return text or None


_TRUE, _FALSE = ("true", "yes", "1", "on", "histogram"), ("false", "no", "0", "off")


def _flag(value):
    """True/False of a yes-no option (None or a blank: not given)."""
    if value is None or isinstance(value, bool):
        return value
    text = str(value).strip().lower()
    if not text:
        return None
    if text in _TRUE or text in _FALSE:
        return text in _TRUE
    raise OptionError(f"histogram must be true or false, not {value!r}")


def _text(value):
    text = "" if value is None else " ".join(str(value).split())
    return text or None


@dataclasses.dataclass(frozen=True)
class ReadingOptions:
    """How to read one DOS file; every field None when not given.

    Attributes
    ----------
    freq_unit : str or None
        Unit of the frequency column (a name of :data:`thermo.units.FREQUENCY_UNITS`).
    atoms : int or None
        Atoms per formula unit n.
    negative : str or None
        Imaginary-mode policy (``drop``, ``drop-unscaled``, ``refuse``).
    low_frequency : str or None
        ``auto``, ``off`` or ``LOW:HIGH`` [THz] (see :func:`low_frequency_setting`).
    formula : str or None
        Chemical formula of the formula unit (values per gram, masses).
    sheet : str, int or None
        Worksheet of an ``.xlsx`` file: name or 1-based number.
    histogram : bool or None
        True: the rows are histogram bins (centres, summed as Σ g·Δν,
        :mod:`thermo.preparation.histogram`); False: a sampled curve even when
        the file looks like bins; None: decided from the file.

    Values are checked and written canonically on construction
    (:class:`~thermo.errors.OptionError` for a bad one).
    """

    freq_unit: str | None = None
    atoms: int | None = None
    negative: str | None = None
    low_frequency: str | None = None
    formula: str | None = None
    sheet: str | int | None = None
    histogram: bool | None = None

    def __post_init__(self):
        unit = self.freq_unit
        if unit is not None:
            if not str(unit).strip():
                unit = None
            else:
                from ..units import canonical_unit
                unit = canonical_unit(unit)
        negative = self.negative
        if negative is not None:
            from .imaginary import check_policy
            negative = check_policy(negative)
        for name, value in (("freq_unit", unit), ("atoms", _atoms(self.atoms)), ("negative", negative),
                            ("low_frequency", low_frequency_setting(self.low_frequency)),
                            ("formula", _text(self.formula)), ("sheet", _sheet(self.sheet)),
                            ("histogram", _flag(self.histogram))):
            object.__setattr__(self, name, value)

    # ------------------------------------------------------------------ construction
    @classmethod
    def from_mapping(cls, mapping=None):
        """The record of a dict (browser state, workspace settings, provenance); blanks are not given.

        Raises
        ------
        OptionError
            For a key that is not a reading option, or a bad value.
        """
        mapping = dict(mapping or {})
        unknown = sorted(set(mapping) - set(FIELDS))
        if unknown:
            raise OptionError(f"unknown reading option(s): {', '.join(unknown)}")
        return cls(**{k: (None if isinstance(v, str) and not v.strip() else v) for k, v in mapping.items()})

    @classmethod
    def from_args(cls, args):
        """The options given on a command line (parsed ``argparse`` namespace; absent ones are None)."""
        return cls(**{k: getattr(args, k, None) for k in FIELDS})

    @classmethod
    def of(cls, dos):
        """The options a :class:`~thermo.spectrum.PhononDOS` was read with (from its provenance)."""
        return cls.from_mapping((getattr(dos, "source", None) or {}).get("reading_options"))

    # ------------------------------------------------------------------ merging and views
    def over(self, *lower):
        """This record with its gaps filled from ``lower`` records, first one first."""
        values = self.as_dict()
        for layer in lower:
            if layer is None:
                continue
            for key, value in dataclasses.asdict(layer).items():
                if values[key] is None:
                    values[key] = value
        return ReadingOptions(**values)

    def resolved(self):
        """This record with :data:`DEFAULT_VALUES` for what is not given."""
        return self.over(DEFAULTS)

    def replaced(self, **changes):
        """A copy with some fields changed (None: not given)."""
        return dataclasses.replace(self, **changes)

    def as_dict(self) -> dict:
        """All fields (None when not given), JSON-able."""
        return dataclasses.asdict(self)

    def given(self) -> dict:
        """Only the fields that were given."""
        return {k: v for k, v in self.as_dict().items() if v is not None}

    def stored(self) -> dict:
        """The form kept by the workspace store and the dashboard's datasets: resolved, formula ``""`` when none.

        Stored settings are the file's own (a layer below options given
        later); the blank formula, and no ``histogram`` key unless it was
        given, keep the form of files written before, so identical settings
        compare equal.
        """
        values = self.resolved().as_dict()
        values["formula"] = values["formula"] or ""
        if values["histogram"] is None:
            del values["histogram"]
        return values

    def differs_from_default(self) -> dict:
        """Given fields whose value is not the default (for short listings)."""
        return {k: v for k, v in self.given().items() if v != DEFAULT_VALUES[k]}


#: The defaults as a record.
DEFAULTS = ReadingOptions(**DEFAULT_VALUES)


def as_record(options) -> ReadingOptions | None:
    """``options`` as a record (a dict is read with :meth:`ReadingOptions.from_mapping`; None stays None)."""
    return options if isinstance(options, ReadingOptions) or options is None else ReadingOptions.from_mapping(options)


def merged(*layers) -> ReadingOptions:
    """First given value per field over ``layers`` (highest first; None layers skipped), then defaults.

    Examples
    --------
    >>> merged(ReadingOptions(atoms=2), {"atoms": 4, "negative": "refuse"}).as_dict()["atoms"]
    2
    """
    records = [as_record(layer) for layer in layers if layer is not None]
    return ReadingOptions().over(*records).resolved()
