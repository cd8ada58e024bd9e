"""Temperature grids typed by users: ``START:STOP:STEP`` specs, comma lists and ranges."""

from __future__ import annotations

import numpy as np

from .errors import OptionError
from .tables import check_temperatures

#: Default temperature grid of tables and exports [K]: 0 to 1500 K every 5 K, plus the
#: standard reference temperature 298.15 K (IUPAC standard conditions for
#: thermodynamic tables; common practice in thermochemistry).
DEFAULT_TEMPERATURES = "0:1500:5,298.15"
#: Standard reference temperature of thermochemical tables [K].
STANDARD_TEMPERATURE = 298.15
#: Largest number of temperatures one grid may hold.
MAX_TEMPERATURES = 1_000_000


def describe_temperatures(spec: str) -> str:
    """A temperature spec in words, for help texts.

    Examples
    --------
    >>> describe_temperatures("0:1500:5,298.15")
    '0 to 1500 K every 5 K plus 298.15 K'
    """
    words = []
    for item in str(spec).split(","):
        parts = [p.strip() for p in item.split(":")]
        words.append(f"{parts[0]} to {parts[1]} K every {parts[2]} K" if len(parts) == 3 else f"{parts[0]} K")
    return " plus ".join(words)


def _range(text):
    try:
        parts = [float(p) for p in text.split(":")]
    except ValueError:
        raise OptionError(f"temperatures {text!r}: use START:STOP:STEP or a comma list of numbers") from None
    if len(parts) != 3:
        raise OptionError(f"temperature range {text!r} must be START:STOP:STEP")
    start, stop, step = parts
    if not step > 0:
        raise OptionError(f"temperature range {text!r}: STEP must be > 0 K, not {step:g}")
    if stop < start:
        raise OptionError(f"temperature range {text!r}: STOP {stop:g} K is below START {start:g} K; "
                          "swap them")
    count = int(np.floor((stop - start) / step + 1e-9)) + 1
    if count > MAX_TEMPERATURES:
        raise OptionError(f"temperature range {text!r} has more than a million points")
    return start + step * np.arange(count)


def parse_temperatures(spec: str):
    """Temperatures [K] from ``START:STOP:STEP`` (STOP included), ``a,b,c`` or both mixed.

    Items are separated by commas; each is a number or a range.  When more
    than one item is given the result is sorted and repeats are removed, so
    ``0:1500:5,298.15`` is the 5 K grid with 298.15 K put in its place.

    Raises
    ------
    OptionError
        One line naming the spec when it is not a range or a list of numbers,
        or when a value is negative or not finite.

    Examples
    --------
    >>> parse_temperatures("0:20:10").tolist()
    [0.0, 10.0, 20.0]
    >>> parse_temperatures("5, 298.15").tolist()
    [5.0, 298.15]
    >>> parse_temperatures("290:300:5,298.15").tolist()
    [290.0, 295.0, 298.15, 300.0]
    """
    text = str(spec).strip()
    items = [p.strip() for p in text.split(",") if p.strip()]
    if not items:
        raise OptionError(f"temperatures {text!r}: use START:STOP:STEP or a comma list of numbers")
    parts = []
    for item in items:
        if ":" in item:
            parts.append(_range(item))
            continue
        try:
            parts.append(np.array([float(item)]))
        except ValueError:
            raise OptionError(f"temperatures {text!r}: {item!r} is not a number; "
                              "use START:STOP:STEP or a comma list of numbers") from None
    values = np.concatenate(parts)
    if any(":" in item for item in items) and len(items) > 1:
        values = np.unique(values)
    if values.size > MAX_TEMPERATURES:
        raise OptionError(f"temperatures {text!r} hold more than a million points")
    return check_temperatures(values)


def with_standard_temperature(temperatures):
    """The grid [K] with the standard 298.15 K put in its place when it lies inside the range.

    Examples
    --------
    >>> with_standard_temperature(np.array([0.0, 100.0, 200.0, 300.0])).tolist()
    [0.0, 100.0, 200.0, 298.15, 300.0]
    >>> with_standard_temperature(np.array([0.0, 100.0])).tolist()
    [0.0, 100.0]
    """
    t = np.asarray(temperatures, dtype=float)
    if t.size and t.min() <= STANDARD_TEMPERATURE <= t.max():
        return np.union1d(t, [STANDARD_TEMPERATURE])
    return t


def temperature_range(t_min, t_max, step):
    """Temperatures [K] from ``t_min`` to ``t_max`` (included) every ``step``.

    Each problem of a typed range gets its own one-line message: a blank or
    non-numeric field, a negative temperature, an upper end below the lower
    one, a step that is not positive.

    Raises
    ------
    OptionError
        Naming the field ("lowest", "highest", "step") and its value.

    Examples
    --------
    >>> temperature_range(0, 300, 100).tolist()
    [0.0, 100.0, 200.0, 300.0]
    >>> temperature_range(0, -5, 10)
    Traceback (most recent call last):
    ...
    thermo.errors.OptionError: the highest temperature -5 K is below 0 K; temperatures are absolute (>= 0 K)
    """
    bounds = []
    for label, value in (("lowest temperature", t_min), ("highest temperature", t_max),
                         ("temperature step", step)):
        try:
            number = float(value)
        except (TypeError, ValueError):
            raise OptionError(f"the {label} is missing or not a number; give it in kelvin") from None
        if not np.isfinite(number):
            raise OptionError(f"the {label} must be a finite number of kelvin")
        bounds.append(number)
    lo, hi, dt = bounds
    for label, value in (("lowest", lo), ("highest", hi)):
        if value < 0:
            raise OptionError(f"the {label} temperature {value:g} K is below 0 K; "
                              "temperatures are absolute (>= 0 K)")
    if hi < lo:
        raise OptionError(f"the highest temperature {hi:g} K is below the lowest {lo:g} K; swap them")
    if not dt > 0:
        raise OptionError(f"the temperature step must be > 0 K, not {dt:g} K")
    return parse_temperatures(f"{lo!r}:{hi!r}:{dt!r}")
