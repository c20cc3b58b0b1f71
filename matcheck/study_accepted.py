"""The study file's ``[[accepted]]`` tables: differences the team reviewed and accepted.

Validated once, when the study is read; every message names the entry and its key
(``accepted #2.reason is missing``). The format is documented in docs/study-file.md; the
entries are applied by :mod:`matcheck.compare.accept`.
"""

from __future__ import annotations

import datetime
import re
from collections.abc import Collection, Mapping
from pathlib import Path
from typing import Any

from matcheck.errors import ConfigError
from matcheck.findings import Accepted
from matcheck.valuetypes import got

ACCEPTED_KEYS = {
    "reference",
    "condition",
    "contrast",
    "measure",
    "item",
    "id",
    "up_to",
    "reason",
    "by",
    "date",
}
ITEM_MEASURE = "item_coverage"
_ID = re.compile(r"[0-9a-f]{10}")
_PERCENT = re.compile(r"\s*([+-−]?\s*\d+(?:\.\d+)?)\s*%\s*")


def parse_accepted(
    path: Path,
    raw: object,
    pairs: Collection[tuple[str, str]],
    factors: Collection[str],
    measures: Collection[str],
) -> tuple[Accepted, ...]:
    """``[[accepted]]`` as entries; ``pairs`` are the study's comparisons (reference,
    condition), ``factors`` its factor names, ``measures`` the dimension ids a comparison
    reports."""
    shown = str(path)
    if raw is None:
        return ()
    if not isinstance(raw, list):
        raise ConfigError(
            f"accepted must be an array of tables, each written [[accepted]], {got(raw)}",
            path=shown,
        )
    entries = []
    for number, table in enumerate(raw, 1):
        where = f"accepted #{number}"
        if not isinstance(table, dict):
            raise ConfigError(f"{where} must be a table ([[accepted]]), {got(table)}", path=shown)
        entries.append(_entry(shown, where, number, table, pairs, factors, measures))
    return tuple(entries)


def _text(shown: str, table: Mapping[str, Any], key: str, where: str) -> str | None:
    value = table.get(key)
    if value is None:
        return None
    if not isinstance(value, str) or not value.strip():
        raise ConfigError(f"{where}.{key} must be a non-empty string, {got(value)}", path=shown)
    return value.strip()


def _entry(
    shown: str,
    where: str,
    number: int,
    table: Mapping[str, Any],
    pairs: Collection[tuple[str, str]],
    factors: Collection[str],
    measures: Collection[str],
) -> Accepted:
    unknown = sorted(set(table) - ACCEPTED_KEYS)
    if unknown:
        raise ConfigError(
            f"{where}: unknown key {unknown[0]!r}; allowed: {', '.join(sorted(ACCEPTED_KEYS))}",
            path=shown,
        )
    reason = _text(shown, table, "reason", where)
    if reason is None:
        raise ConfigError(
            f"{where}.reason is missing: say why this difference is acceptable", path=shown
        )
    measure = _text(shown, table, "measure", where)
    if measure is None:
        raise ConfigError(f"{where}.measure is missing (a measure id)", path=shown)
    if measure not in measures:
        raise ConfigError(
            f"{where}.measure = {measure!r} is not a measure a comparison reports "
            "(`matcheck measures` lists them)",
            path=shown,
        )
    item = _text(shown, table, "item", where)
    if item is None and measure == ITEM_MEASURE:
        raise ConfigError(f"{where}.item is missing (the post-test item's id)", path=shown)
    if item is not None and measure != ITEM_MEASURE:
        raise ConfigError(
            f'{where}.item goes with measure = "{ITEM_MEASURE}" only (a post-test item)',
            path=shown,
        )
    reference = _text(shown, table, "reference", where)
    condition = _text(shown, table, "condition", where)
    contrast = _text(shown, table, "contrast", where)
    if contrast is not None:
        if reference is not None or condition is not None:
            raise ConfigError(
                f"{where}: give contrast, or reference and condition, not both", path=shown
            )
        if contrast not in factors:
            raise ConfigError(
                f"{where}.contrast = {contrast!r} is not a factor of the study"
                + (f" ({', '.join(factors)})" if factors else ""),
                path=shown,
            )
    else:
        for key, value in (("reference", reference), ("condition", condition)):
            if value is None:
                raise ConfigError(
                    f"{where}.{key} is missing (or give contrast = a factor)", path=shown
                )
        if (reference, condition) not in pairs:
            compared = "; ".join(f"{c} vs {r}" for r, c in pairs)
            raise ConfigError(
                f"{where}: {condition} vs {reference} is not a comparison of the study "
                f"(compared: {compared})",
                path=shown,
            )
    identity = _text(shown, table, "id", where)
    if identity is not None:
        if not _ID.fullmatch(identity):
            raise ConfigError(
                f"{where}.id = {identity!r} is not a finding id (10 hexadecimal digits, "
                "as reports show it)",
                path=shown,
            )
        if contrast is not None:
            raise ConfigError(
                f"{where}.id names one comparison's finding: give reference and condition, "
                "not contrast",
                path=shown,
            )
    up_to, relative = _extent(shown, where, table.get("up_to"))
    by = _text(shown, table, "by", where) or ""
    return Accepted(
        number=number,
        measure=measure,
        up_to=up_to,
        reason=reason,
        relative=relative,
        reference=reference,
        condition=condition,
        contrast=contrast,
        item=item,
        id=identity,
        by=by,
        date=_date(shown, where, table.get("date")),
    )


def _extent(shown: str, where: str, value: object) -> tuple[float, bool]:
    """``up_to``: a signed number in the measure's unit, or a signed ``"N%"`` of the
    reference value."""
    problem = (
        f"{where}.up_to must be the largest difference accepted, with its sign: a number in "
        'the measure\'s unit (-59) or a percentage of the reference value ("-6%")'
    )
    if value is None:
        raise ConfigError(f"{where}.up_to is missing: {problem.split(': ', 1)[1]}", path=shown)
    if isinstance(value, bool):
        raise ConfigError(f"{problem}, {got(value)}", path=shown)
    if isinstance(value, int | float):
        number, relative = float(value), False
    elif isinstance(value, str) and (match := _PERCENT.fullmatch(value)):
        text = match.group(1).replace("−", "-").replace(" ", "")
        number, relative = float(text) / 100, True
    else:
        raise ConfigError(f"{problem}, {got(value)}", path=shown)
    if number == 0 or number != number or abs(number) == float("inf"):
        raise ConfigError(f"{where}.up_to must not be 0: {problem.split(': ', 1)[1]}", path=shown)
    return number, relative


def _date(shown: str, where: str, value: object) -> str:
    if value is None:
        return ""
    if isinstance(value, datetime.datetime):
        return value.date().isoformat()
    if isinstance(value, datetime.date):
        return value.isoformat()
    if isinstance(value, str):
        try:
            return datetime.date.fromisoformat(value.strip()).isoformat()
        except ValueError:
            pass
    raise ConfigError(f"{where}.date must be a date, e.g. 2026-03-14, {got(value)}", path=shown)
