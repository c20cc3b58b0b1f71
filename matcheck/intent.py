"""The declared manipulation: which measures a design varies on purpose.

A name is a group (``figures``) or a measure id; a measure id brings along every measure its
spec says is implied by it (figure areas by figures). Unknown names are a usage error with the
closest valid names.
"""

from __future__ import annotations

from collections.abc import Iterable

from matcheck.errors import UsageError
from matcheck.findings import Group
from matcheck.measures import registry
from matcheck.measures.base import Role
from matcheck.suggest import closest


def expand_manipulated(names: Iterable[str]) -> dict[str, str]:
    """Measure id -> the declared name that makes it intended. Unknown names raise."""
    import matcheck.measures  # noqa: F401  (registers the built-in measures)

    dims = registry.compared()
    # A design manipulates the materials: the groups that measure them, not the study's data,
    # power or post-test findings.
    material = (Role.MEASURED, Role.PAIRWISE)
    groups = [
        g.value for g in Group if any(s.group == g and s.role in material for s in dims.values())
    ]
    intended: dict[str, str] = {}
    for name in names:
        if name in groups:
            for dimension, spec in dims.items():
                if spec.group == name:
                    intended.setdefault(dimension, name)
        elif name in dims:
            intended.setdefault(name, name)
            for implied in registry.implied_by(name):
                intended.setdefault(implied, name)
        else:
            raise UsageError(
                f"--manipulated {name!r} is neither a group "
                f"({', '.join(sorted(groups))}) nor a measure id"
                f"{closest(name, [*groups, *dims])} (see `matcheck measures`)"
            )
    return intended
