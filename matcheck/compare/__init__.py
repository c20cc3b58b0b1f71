"""Compare lesson versions: tolerances, verdicts, content alignment.

The package shares its name with the Python entry point ``matcheck.compare(paths, ...)``
(docs/api.md): once this package is imported, ``matcheck.compare`` *is* the package, so the
package is callable and hands the call to :func:`matcheck.library.compare`.
"""

from __future__ import annotations

import sys
import types
from typing import Any


class _CallablePackage(types.ModuleType):
    def __call__(self, *args: Any, **kwargs: Any) -> Any:
        from matcheck.library import compare

        return compare(*args, **kwargs)


sys.modules[__name__].__class__ = _CallablePackage
