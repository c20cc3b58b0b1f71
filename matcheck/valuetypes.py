"""How a message names a wrong value of the study file: its TOML type and the value itself.

A study file is TOML (docs/study-file.md), so a researcher reads "string" and "integer", not
Python's ``str`` and ``int``. A number written in quotes is the commonest slip, so its
message says to drop the quotes.
"""

from __future__ import annotations

import datetime

_TYPES: tuple[tuple[type, str], ...] = (
    # bool before int: True is an int in Python. Names from the TOML 1.0 specification.
    (bool, "boolean"),
    (int, "integer"),
    (float, "float"),
    (str, "string"),
    (list, "array"),
    (dict, "table"),
    (datetime.datetime, "date-time"),
    (datetime.date, "date"),
    (datetime.time, "time"),
)


def toml_type(value: object) -> str:
    """The TOML name of the type of a value read by ``tomllib``."""
    return next((name for kind, name in _TYPES if isinstance(value, kind)), type(value).__name__)


def got(value: object) -> str:
    """``not the string '238'; write it without quotes`` — what a message says it found."""
    shown = repr(value)
    if len(shown) > 40:
        shown = shown[:37] + "..."
    text = f"not the {toml_type(value)} {shown}"
    if isinstance(value, str) and _is_number(value):
        text += "; write it without quotes"
    return text


def _is_number(text: str) -> bool:
    try:
        float(text)
    except ValueError:
        return False
    return True
