"""Typed learner records from the study's data files, as the ``[data]`` section names columns.

Every problem is one :class:`~matcheck.errors.DataError` naming the file, the row (as a
spreadsheet numbers it) and the column: ragged rows, scores that are not numbers, conditions
the study does not have, an id given twice, and fewer than ``MIN_LEARNERS`` learners with an
outcome in a condition. The records stay in memory; reports show only aggregates.
"""

from __future__ import annotations

import fnmatch
import math
from collections.abc import Sequence
from dataclasses import dataclass, field

from matcheck.data.spec import DataSpec
from matcheck.data.tables import Table, read_table
from matcheck.errors import DataError

# A standard deviation needs two learners; fewer cannot be compared at all.
MIN_LEARNERS = 2
YES = {"1", "yes", "y", "true", "t", "completed", "done"}
NO = {"0", "no", "n", "false", "f", "dropped", "withdrawn"}


@dataclass(frozen=True, slots=True)
class Learner:
    id: str
    condition: str
    completed: bool
    pretest: float | None
    posttest: tuple[float, ...] | None  # item scores, None without an outcome
    time: float | None
    traits: dict[str, float | None] = field(default_factory=dict)


@dataclass(frozen=True, slots=True)
class LearnerData:
    learners: tuple[Learner, ...]
    items: tuple[str, ...]  # post-test item columns, in order
    traits: tuple[str, ...]
    binary_traits: frozenset[str]
    item_maxima: tuple[float, ...]
    posttest_max: float
    pretest_columns: tuple[str, ...]

    def of(self, condition: str) -> list[Learner]:
        return [learner for learner in self.learners if learner.condition == condition]


@dataclass(frozen=True, slots=True)
class ItemScores:
    """Post-test item scores alone (a pilot, or the study's completers)."""

    source: str
    items: tuple[str, ...]
    scores: tuple[tuple[float, ...], ...]
    item_maxima: tuple[float, ...]
    posttest_max: float


def _resolve(table: Table, patterns: Sequence[str], key: str) -> tuple[str, ...]:
    names: list[str] = []
    for pattern in patterns:
        matched = (
            [h for h in table.header if fnmatch.fnmatchcase(h, pattern)]
            if any(c in pattern for c in "*?[")
            else [pattern]
            if pattern in table.header
            else []
        )
        if not matched:
            raise DataError(
                f"no column {pattern!r} (data.{key}); columns: {', '.join(table.header)}",
                path=str(table.path),
            )
        names += [name for name in matched if name not in names]
    return tuple(names)


def _number(table: Table, row: int, column: str, text: str) -> float | None:
    if text == "" or text.upper() in ("NA", "N/A"):
        return None
    try:
        value = float(text.replace(",", ".") if text.count(",") == 1 and "." not in text else text)
    except ValueError:
        value = math.nan
    if not math.isfinite(value):
        raise DataError(
            f"row {row}, column {column!r}: {text!r} is not a number", path=str(table.path)
        )
    return value


def _yes_no(table: Table, row: int, column: str, text: str) -> bool:
    if text.lower() in YES:
        return True
    if text.lower() in NO:
        return False
    raise DataError(
        f"row {row}, column {column!r}: {text!r} is not yes/no (1/0, yes/no, true/false)",
        path=str(table.path),
    )


def _trait(table: Table, row: int, column: str, text: str) -> float | None:
    if text.lower() in YES - {"1"}:
        return 1.0
    if text.lower() in NO - {"0"}:
        return 0.0
    return _number(table, row, column, text)


def read_learners(spec: DataSpec, conditions: Sequence[str]) -> LearnerData:
    """Read and validate every study data file of ``spec``."""
    learners: list[Learner] = []
    seen: dict[str, str] = {}
    items: tuple[str, ...] = ()
    pretest_columns: tuple[str, ...] = ()
    for path in spec.files:
        table = read_table(path, spec.sheet)
        where = str(path)
        id_col = _resolve(table, [spec.id], "id")[0]
        cond_col = _resolve(table, [spec.condition], "condition")[0]
        file_items = _resolve(table, spec.posttest, "posttest")
        if items and file_items != items:
            raise DataError(f"post-test columns differ from those of {spec.files[0]}", path=where)
        items = file_items
        pre = _resolve(table, spec.pretest, "pretest") if spec.pretest else ()
        pretest_columns = pre
        time_col = _resolve(table, [spec.time], "time")[0] if spec.time else None
        done_col = _resolve(table, [spec.completed], "completed")[0] if spec.completed else None
        trait_cols = _resolve(table, spec.traits, "traits") if spec.traits else ()
        index = {name: i for i, name in enumerate(table.header)}
        for row, cells in table.rows:
            learner_id = cells[index[id_col]]
            if not learner_id:
                raise DataError(f"row {row}, column {id_col!r}: the id is empty", path=where)
            place = f"{path.name} row {row}"
            if learner_id in seen:
                raise DataError(
                    f"row {row}, column {id_col!r}: id {learner_id!r} is already at "
                    f"{seen[learner_id]}",
                    path=where,
                )
            seen[learner_id] = place
            condition = cells[index[cond_col]]
            if condition not in conditions:
                raise DataError(
                    f"row {row}, column {cond_col!r}: {condition!r} is not a condition of the "
                    f"study ({', '.join(conditions)})",
                    path=where,
                )
            scores = [_number(table, row, c, cells[index[c]]) for c in items]
            has_outcome = all(s is not None for s in scores)
            if done_col is not None:
                completed = _yes_no(table, row, done_col, cells[index[done_col]])
                if completed and not has_outcome:
                    column = items[[s is None for s in scores].index(True)]
                    raise DataError(
                        f"row {row}, column {column!r}: the learner completed but the score is "
                        "empty",
                        path=where,
                    )
            else:
                completed = has_outcome
            pre_values = [_number(table, row, c, cells[index[c]]) for c in pre]
            pretest = (
                math.fsum(v for v in pre_values if v is not None)
                if pre and all(v is not None for v in pre_values)
                else None
            )
            learners.append(
                Learner(
                    id=learner_id,
                    condition=condition,
                    completed=completed,
                    pretest=pretest,
                    posttest=tuple(s for s in scores if s is not None) if completed else None,
                    time=_number(table, row, time_col, cells[index[time_col]])
                    if time_col
                    else None,
                    traits={c: _trait(table, row, c, cells[index[c]]) for c in trait_cols},
                )
            )
    for condition in conditions:
        analysed = sum(1 for x in learners if x.condition == condition and x.completed)
        if analysed < MIN_LEARNERS:
            raise DataError(
                f"condition {condition!r} has {analysed} learner{'s' if analysed != 1 else ''} "
                f"with a post-test score; at least {MIN_LEARNERS} are needed",
                path=str(spec.files[0]),
            )
    traits = tuple(dict.fromkeys(t for x in learners for t in x.traits))
    binary = frozenset(
        t
        for t in traits
        if all(x.traits[t] in (0.0, 1.0) for x in learners if x.traits[t] is not None)
    )
    completed_scores = [x.posttest for x in learners if x.posttest is not None]
    maxima = _maxima(completed_scores, len(items))
    return LearnerData(
        learners=tuple(learners),
        items=items,
        traits=traits,
        binary_traits=binary,
        item_maxima=maxima,
        posttest_max=spec.posttest_max or math.fsum(maxima),
        pretest_columns=pretest_columns,
    )


def _maxima(scores: Sequence[Sequence[float]], k: int) -> tuple[float, ...]:
    """Each item's maximum: 1 for 0/1 items, else the highest score observed."""
    result = []
    for j in range(k):
        column = [row[j] for row in scores]
        top = max(column, default=1.0)
        result.append(1.0 if set(column) <= {0.0, 1.0} else top)
    return tuple(result)


def read_pilot(spec: DataSpec) -> ItemScores:
    """Post-test item scores from the pilot files (every item of every row required)."""
    rows: list[tuple[float, ...]] = []
    items: tuple[str, ...] = ()
    for path in spec.pilot:
        table = read_table(path, spec.sheet)
        file_items = _resolve(table, spec.posttest, "posttest")
        if items and file_items != items:
            raise DataError(
                f"post-test columns differ from those of {spec.pilot[0]}", path=str(path)
            )
        items = file_items
        index = {name: i for i, name in enumerate(table.header)}
        for row, cells in table.rows:
            scores = []
            for column in items:
                value = _number(table, row, column, cells[index[column]])
                if value is None:
                    raise DataError(
                        f"row {row}, column {column!r}: the score is empty", path=str(path)
                    )
                scores.append(value)
            rows.append(tuple(scores))
    if len(rows) < MIN_LEARNERS:
        raise DataError(
            f"the pilot has {len(rows)} learners; at least {MIN_LEARNERS} are needed",
            path=str(spec.pilot[0]),
        )
    maxima = _maxima(rows, len(items))
    return ItemScores("pilot", items, tuple(rows), maxima, spec.posttest_max or math.fsum(maxima))


def study_scores(data: LearnerData) -> ItemScores:
    rows = tuple(x.posttest for x in data.learners if x.posttest is not None)
    return ItemScores("study", data.items, rows, data.item_maxima, data.posttest_max)
