"""matcheck: check that lesson versions differ only in the intended manipulation."""

__version__ = "0.1.0"
