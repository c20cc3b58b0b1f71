"""matcheck: check that lesson versions differ only in the intended manipulation.

From Python (docs/api.md)::

    import matcheck
    result = matcheck.compare(["a.docx", "b.docx"], manipulated=["figures"])
    result.to_frame()

The entry points are loaded on first use, so ``import matcheck`` (and ``matcheck --help``)
stays light.
"""

from __future__ import annotations

from typing import TYPE_CHECKING, Any

__version__ = "0.1.0"

if TYPE_CHECKING:
    from matcheck.library import check, compare
    from matcheck.result import FolderResult, Result

# Public name -> the module that defines it, imported when the name is first used.
_LAZY = {
    "compare": "matcheck.library",
    "check": "matcheck.library",
    "Result": "matcheck.result",
    "FolderResult": "matcheck.result",
}

__all__ = ["FolderResult", "Result", "__version__", "check", "compare"]


def __getattr__(name: str) -> Any:
    module = _LAZY.get(name)
    if module is None:
        raise AttributeError(f"module 'matcheck' has no attribute {name!r}")
    import importlib

    if name == "compare":
        # The package matcheck.compare is callable (see its docstring): whether it was
        # imported before or not, matcheck.compare is the package and calling it compares.
        value = importlib.import_module("matcheck.compare")
    else:
        value = getattr(importlib.import_module(module), name)
    globals()[name] = value
    return value


def __dir__() -> list[str]:
    return sorted({*globals(), *_LAZY})
