"""Temperature grids typed by users: ``START:STOP:STEP`` specs, comma lists and ranges."""

from __future__ import annotations

import numpy as np

from .errors import OptionError
from .tables import check_temperatures

#: Default temperature grid of tables and exports [K].
DEFAULT_TEMPERATURES = "0:1000:10"
#: Largest number of temperatures one grid may hold.
MAX_TEMPERATURES = 1_000_000


def parse_temperatures(spec: str):
    """Temperatures [K] from ``START:STOP:STEP`` (STOP included) or ``a,b,c``.

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
    """
    text = str(spec).strip()
    try:
        if ":" in text:
            parts = [float(p) for p in text.split(":")]
            if len(parts) != 3:
                raise ValueError
            start, stop, step = parts
            if step <= 0 or stop < start:
                raise OptionError(f"temperature range {text!r} needs STEP > 0 and STOP >= START")
            count = int(np.floor((stop - start) / step + 1e-9)) + 1
            if count > MAX_TEMPERATURES:
                raise OptionError(f"temperature range {text!r} has more than a million points")
            values = start + step * np.arange(count)
        else:
            values = np.array([float(p) for p in text.split(",") if p.strip()])
    except ValueError:
        raise OptionError(f"temperatures {text!r}: use START:STOP:STEP or a comma list of numbers") from None
    return check_temperatures(values)


def temperature_range(t_min, t_max, step):
    """Temperatures [K] from ``t_min`` to ``t_max`` (included) every ``step``.

    Blank fields count as 0, so an empty form gives the one-line range error
    of :func:`parse_temperatures`.

    Examples
    --------
    >>> temperature_range(0, 300, 100).tolist()
    [0.0, 100.0, 200.0, 300.0]
    """
    try:
        bounds = [float(v or 0) for v in (t_min, t_max, step)]
    except (TypeError, ValueError):
        raise OptionError("the temperature range needs three numbers in kelvin") from None
    return parse_temperatures("{}:{}:{}".format(*bounds))
