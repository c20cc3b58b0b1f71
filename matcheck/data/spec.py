"""The study file's ``[data]`` section: which files hold the learners and which column is what.

Documented in docs/study-data.md. Every message names the key (``data.posttest``, ...).
Column lists accept ``*`` patterns (``"Q*"``), matched against the header when the file is
read.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass
from pathlib import Path
from typing import Any

from matcheck.errors import ConfigError
from matcheck.valuetypes import got

DATA_KEYS = {
    "files",
    "pilot",
    "sheet",
    "id",
    "condition",
    "pretest",
    "posttest",
    "posttest_max",
    "time",
    "completed",
    "traits",
    "equivalence_bound",
    "time_bound",
    "smallest_effect",
    "alpha",
    "target_reliability",
    "attrition_boundary",
}

# Defaults, each with its reason (docs/study-data.md):
# the WWC's line beyond which adjustment cannot rescue a baseline difference (§5).
DEFAULT_EQUIVALENCE_BOUND = 0.25
# Cohen's "medium" effect (1988), a common-practice fallback when no smallest effect of
# interest is declared.
DEFAULT_SMALLEST_EFFECT = 0.5
DEFAULT_ALPHA = 0.05
# A common-practice target for a research post-test (docs/references.md §10).
DEFAULT_TARGET_RELIABILITY = 0.80


@dataclass(frozen=True, slots=True)
class DataSpec:
    files: tuple[Path, ...]
    pilot: tuple[Path, ...]
    sheet: str | None
    id: str
    condition: str
    pretest: tuple[str, ...]
    posttest: tuple[str, ...]
    posttest_max: float | None
    time: str | None
    completed: str | None
    traits: tuple[str, ...]
    equivalence_bound: float
    time_bound: float | None
    smallest_effect: float
    alpha: float
    target_reliability: float
    attrition_boundary: str


def _columns(value: Any, key: str, shown: str) -> tuple[str, ...]:
    if isinstance(value, str) and value:
        return (value,)
    if isinstance(value, list) and value and all(isinstance(v, str) and v for v in value):
        return tuple(value)
    raise ConfigError(
        f"{key} must be a column name or a non-empty list of column names, {got(value)}",
        path=shown,
    )


def _number(
    data: Mapping[str, Any], key: str, shown: str, low: float, high: float, default: float | None
) -> float | None:
    value = data.get(key, default)
    if value is None:
        return None
    if isinstance(value, bool) or not isinstance(value, int | float):
        raise ConfigError(
            f"data.{key} must be a number above {low:g} and at most {high:g}, {got(value)}",
            path=shown,
        )
    if not low < value <= high:
        raise ConfigError(
            f"data.{key} must be a number above {low:g} and at most {high:g}, not {value:g}",
            path=shown,
        )
    return float(value)


def parse_data(path: Path, data: Any, *, allow_outside: bool = False) -> DataSpec:
    """Validate the ``[data]`` table of the study file at ``path``; every file must be a
    regular file inside the study's folder unless ``allow_outside`` (matcheck/paths.py)."""
    from matcheck.paths import study_path

    shown = str(path)
    if not isinstance(data, dict):
        raise ConfigError(f"[data] must be a table, {got(data)}", path=shown)
    for key in data:
        if key not in DATA_KEYS:
            raise ConfigError(
                f"[data]: unknown key {key!r}; allowed: {', '.join(sorted(DATA_KEYS))}",
                path=shown,
            )
    if "files" not in data and "pilot" not in data:
        raise ConfigError(
            "[data] needs files (the study's learners) or pilot (item scores)", path=shown
        )
    found: dict[str, tuple[Path, ...]] = {}
    for key in ("files", "pilot"):
        names = _columns(data[key], f"data.{key}", shown) if key in data else ()
        found[key] = tuple(
            study_path(path, name, f"data.{key}", allow_outside=allow_outside) for name in names
        )
    for key in ("id", "condition", "time", "completed", "sheet"):
        if key in data and not (isinstance(data[key], str) and data[key]):
            raise ConfigError(
                f"data.{key} must be a column name (a string), {got(data[key])}", path=shown
            )
    if "posttest" not in data:
        raise ConfigError("data.posttest is missing (the post-test's item columns)", path=shown)
    boundary = data.get("attrition_boundary", "cautious")
    if boundary not in ("cautious", "optimistic"):
        raise ConfigError(
            f'data.attrition_boundary must be "cautious" or "optimistic", {got(boundary)}',
            path=shown,
        )
    bound = _number(data, "equivalence_bound", shown, 0, 5, DEFAULT_EQUIVALENCE_BOUND)
    effect = _number(data, "smallest_effect", shown, 0, 5, DEFAULT_SMALLEST_EFFECT)
    alpha = _number(data, "alpha", shown, 0, 0.5, DEFAULT_ALPHA)
    target = _number(data, "target_reliability", shown, 0, 0.99, DEFAULT_TARGET_RELIABILITY)
    assert bound is not None and effect is not None and alpha is not None and target is not None
    return DataSpec(
        files=found["files"],
        pilot=found["pilot"],
        sheet=data.get("sheet"),
        id=data.get("id", "id"),
        condition=data.get("condition", "condition"),
        pretest=_columns(data["pretest"], "data.pretest", shown) if "pretest" in data else (),
        posttest=_columns(data["posttest"], "data.posttest", shown),
        posttest_max=_number(data, "posttest_max", shown, 0, 1e6, None),
        time=data.get("time"),
        completed=data.get("completed"),
        traits=_columns(data["traits"], "data.traits", shown) if "traits" in data else (),
        equivalence_bound=bound,
        time_bound=_number(data, "time_bound", shown, 0, 1e6, None),
        smallest_effect=effect,
        alpha=alpha,
        target_reliability=target,
        attrition_boundary=boundary,
    )
