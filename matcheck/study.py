"""The study file: a study's conditions, factors, tolerances and post-test, in TOML.

The format is documented in docs/study-file.md. :func:`load_study` reads and validates it
once; every message names the key and what is wrong. Paths are relative to the study file.
:func:`comparisons` derives, from the design, which pairs of conditions must be compared and
what each pair may differ in.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass
from pathlib import Path
from typing import TYPE_CHECKING, Any

from matcheck.data.spec import DataSpec, parse_data
from matcheck.errors import ConfigError
from matcheck.findings import Accepted
from matcheck.settings import DEFAULT_COMPARISON, ComparisonSettings
from matcheck.valuetypes import got

if TYPE_CHECKING:
    from matcheck.power.study_plan import SamplePlan

_LESSON_SUFFIXES = {".docx", ".pdf", ".md", ".markdown", ".txt", ".doc", ".odt", ".rtf"}
TOP_KEYS = {
    "study",
    "factors",
    "conditions",
    "tolerances",
    "posttest",
    "comparison",
    "data",
    "sample",
    "accepted",
}
STUDY_KEYS = {"title", "reference", "reading_rate", "description"}
FACTOR_KEYS = {"levels", "manipulates", "description"}
CONDITION_KEYS = {"name", "files", "levels", "description"}
POSTTEST_KEYS = {"files", "coverage_threshold"}


@dataclass(frozen=True, slots=True)
class Factor:
    name: str
    levels: tuple[str, ...]
    manipulates: tuple[str, ...]


@dataclass(frozen=True, slots=True)
class StudyCondition:
    name: str
    files: tuple[Path, ...]
    levels: dict[str, str]


@dataclass(frozen=True, slots=True)
class Comparison:
    """One pair to compare: ``condition`` against ``reference``, ``manipulated`` allowed.

    ``factor`` names the factor whose contrast this pair is (``None`` for a design without
    factors, where every condition is compared with the reference).
    """

    reference: str
    condition: str
    manipulated: tuple[str, ...]
    factor: str | None = None


@dataclass(frozen=True, slots=True)
class Study:
    path: Path
    title: str
    reference: str
    conditions: tuple[StudyCondition, ...]
    factors: tuple[Factor, ...]
    tolerances: tuple[str, ...]
    reading_rate: float | None
    posttest: tuple[Path, ...]
    coverage_threshold: float | None
    comparison: ComparisonSettings = DEFAULT_COMPARISON
    # The learners' data ([data], docs/study-data.md); None without it.
    data: DataSpec | None = None
    # The planned sample ([sample], docs/power.md); None when the file has none.
    sample: SamplePlan | None = None
    accepted: tuple[Accepted, ...] = ()  # [[accepted]]: reviewed differences

    def condition(self, name: str) -> StudyCondition:
        return next(c for c in self.conditions if c.name == name)


def _where(path: Path, key: str) -> str:
    return f"{path}: [{key}]" if "." not in key else f"{path}: {key}"


def _check_keys(path: Path, table: Mapping[str, Any], allowed: set[str], where: str) -> None:
    for key in table:
        if key not in allowed:
            raise ConfigError(
                f"{where}: unknown key {key!r}; allowed: {', '.join(sorted(allowed))}",
                path=str(path),
            )


def _strings(path: Path, value: Any, where: str) -> tuple[str, ...]:
    if isinstance(value, str):
        return (value,)
    if not isinstance(value, list) or not all(isinstance(v, str) for v in value) or not value:
        raise ConfigError(
            f"{where} must be a string or a non-empty list of strings, {got(value)}",
            path=str(path),
        )
    return tuple(value)


def load_study(path: Path, *, with_data: bool = True, allow_outside: bool = False) -> Study:
    """Read and validate a study file; raises :class:`ConfigError` naming the key.

    ``with_data=False`` skips the ``[data]`` section: a past revision of the materials is
    read without the learners' data, which are rarely under version control. Every file the
    study names must be a regular file inside the study's folder (links followed) unless
    ``allow_outside`` (matcheck/paths.py).
    """
    from matcheck.compare.tolerances import parse_tolerances
    from matcheck.errors import UsageError
    from matcheck.inputs import note
    from matcheck.intent import expand_manipulated
    from matcheck.paths import parse_study_toml, read_study_text, study_path
    from matcheck.paths import shown as printable

    if path.is_dir():
        raise ConfigError(
            "is a folder; this command takes one study file (TOML); `check` also takes a "
            "folder of studies",
            path=str(path),
        )
    if path.suffix.lower() in _LESSON_SUFFIXES:
        raise ConfigError(
            f"is a lesson ({path.suffix}), not a study file; `compare` takes lesson files, "
            "`check` and `table` a study file (TOML; docs/study-file.md)",
            path=str(path),
        )
    note(path)
    data = parse_study_toml(read_study_text(path), path)
    shown = printable(path)
    _check_keys(path, data, TOP_KEYS, "top level")
    study = data.get("study", {})
    if not isinstance(study, dict):
        raise ConfigError(f"[study] must be a table, {got(study)}", path=shown)
    _check_keys(path, study, STUDY_KEYS, "[study]")
    title = study.get("title", path.stem)
    if not isinstance(title, str):
        raise ConfigError(f"study.title must be a string, {got(title)}", path=shown)

    factors = []
    raw_factors = data.get("factors", {})
    if not isinstance(raw_factors, dict):
        raise ConfigError(f"[factors] must be a table of factors, {got(raw_factors)}", path=shown)
    for name, spec in raw_factors.items():
        where = f"factors.{name}"
        if not isinstance(spec, dict):
            raise ConfigError(f"{where} must be a table, {got(spec)}", path=shown)
        _check_keys(path, spec, FACTOR_KEYS, where)
        if "levels" not in spec:
            raise ConfigError(f"{where}.levels is missing", path=shown)
        if "manipulates" not in spec:
            raise ConfigError(f"{where}.manipulates is missing (a group or measure id)", path=shown)
        levels = _strings(path, spec["levels"], f"{where}.levels")
        if len(levels) < 2 or len(set(levels)) != len(levels):
            raise ConfigError(f"{where}.levels needs two or more different levels", path=shown)
        manipulates = _strings(path, spec["manipulates"], f"{where}.manipulates")
        for item in manipulates:
            try:
                expand_manipulated([item])
            except UsageError as problem:
                raise ConfigError(
                    f"{where}.manipulates: " + problem.message.removeprefix("--manipulated "),
                    path=shown,
                ) from None
        factors.append(Factor(name, levels, manipulates))

    raw_conditions = data.get("conditions")
    if not isinstance(raw_conditions, list) or len(raw_conditions) < 2:
        raise ConfigError(
            "[[conditions]] must list at least two conditions (each a [[conditions]] table)",
            path=shown,
        )
    conditions = []
    for index, spec in enumerate(raw_conditions, 1):
        if not isinstance(spec, dict):
            raise ConfigError(f"conditions #{index} must be a table, {got(spec)}", path=shown)
        name = spec.get("name")
        where = f"conditions.{name}" if isinstance(name, str) else f"conditions #{index}"
        _check_keys(path, spec, CONDITION_KEYS, where)
        if not isinstance(name, str) or not name:
            raise ConfigError(f"{where}.name is missing", path=shown)
        if "files" not in spec:
            raise ConfigError(f"{where}.files is missing", path=shown)
        files = tuple(
            study_path(path, f, f"{where}.files", allow_outside=allow_outside)
            for f in _strings(path, spec["files"], f"{where}.files")
        )
        levels = spec.get("levels", {})
        if not isinstance(levels, dict) or not all(isinstance(v, str) for v in levels.values()):
            raise ConfigError(
                f"{where}.levels must be a table of factor = level (strings), {got(levels)}",
                path=shown,
            )
        for factor in factors:
            if factor.name not in levels:
                raise ConfigError(
                    f"{where}.levels has no level for factor {factor.name!r}", path=shown
                )
            if levels[factor.name] not in factor.levels:
                raise ConfigError(
                    f"{where}.levels.{factor.name} = {levels[factor.name]!r} is not one of "
                    f"{', '.join(factor.levels)}",
                    path=shown,
                )
        for key in levels:
            if key not in {f.name for f in factors}:
                raise ConfigError(f"{where}.levels: unknown factor {key!r}", path=shown)
        conditions.append(StudyCondition(name, files, dict(levels)))
    names = [c.name for c in conditions]
    twice = sorted({n for n in names if names.count(n) > 1})
    if twice:
        raise ConfigError(
            f"conditions: two conditions are named {twice[0]!r}; give each its own name",
            path=shown,
        )
    cells = [tuple(sorted(c.levels.items())) for c in conditions]
    if factors and len(set(cells)) != len(cells):
        same = [c.name for c in conditions if cells.count(tuple(sorted(c.levels.items()))) > 1]
        raise ConfigError(
            f"conditions: {same[0]!r} and {same[1]!r} have the same factor levels", path=shown
        )
    for factor in factors:
        unused = [
            lv for lv in factor.levels if all(c.levels[factor.name] != lv for c in conditions)
        ]
        if unused:
            raise ConfigError(
                f"factors.{factor.name}.levels: {', '.join(map(repr, unused))} is used by no "
                "condition; remove it or add the condition",
                path=shown,
            )
    by_files: dict[tuple[str, ...], str] = {}
    for condition in conditions:
        key = tuple(str(f.resolve()) for f in condition.files)
        if key in by_files:
            raise ConfigError(
                f"conditions {by_files[key]!r} and {condition.name!r} use the same files: a "
                "manipulation between them cannot be in the materials",
                path=shown,
            )
        by_files[key] = condition.name

    reference = study.get("reference", names[0])
    if reference not in names:
        raise ConfigError(
            f"study.reference = {reference!r} is not a condition ({', '.join(names)})", path=shown
        )
    rate = study.get("reading_rate")
    if rate is not None and (isinstance(rate, bool) or not isinstance(rate, int | float)):
        raise ConfigError(
            f"study.reading_rate must be a number (words per minute), {got(rate)}", path=shown
        )
    if rate is not None and not 20 <= rate <= 2000:
        raise ConfigError(
            f"study.reading_rate must be words per minute, 20 to 2000, not {rate!r}", path=shown
        )

    raw_tolerances = data.get("tolerances", {})
    if not isinstance(raw_tolerances, dict):
        raise ConfigError(
            f"[tolerances] must be a table of measure = value, {got(raw_tolerances)}", path=shown
        )
    overrides = []
    for key, value in raw_tolerances.items():
        if isinstance(value, bool) or not isinstance(value, int | float | str):
            raise ConfigError(
                f'tolerances.{key} must be a number or a percentage string like "3%", {got(value)}',
                path=shown,
            )
        overrides.append(f"{key}={value}")
    try:
        parse_tolerances(overrides)
    except UsageError as problem:
        raise ConfigError(
            f"[tolerances]: {problem.message.replace('--tolerance ', '')}", path=shown
        ) from None

    posttest = data.get("posttest", {})
    if not isinstance(posttest, dict):
        raise ConfigError(f"[posttest] must be a table, {got(posttest)}", path=shown)
    _check_keys(path, posttest, POSTTEST_KEYS, "[posttest]")
    post_files = (
        tuple(
            study_path(path, f, "posttest.files", allow_outside=allow_outside)
            for f in _strings(path, posttest["files"], "posttest.files")
        )
        if "files" in posttest
        else ()
    )
    threshold = posttest.get("coverage_threshold")
    if threshold is not None and (
        isinstance(threshold, bool) or not isinstance(threshold, int | float)
    ):
        raise ConfigError(
            f"posttest.coverage_threshold must be a number (a share between 0 and 1), "
            f"{got(threshold)}",
            path=shown,
        )
    if threshold is not None and not 0 < threshold <= 1:
        raise ConfigError(
            f"posttest.coverage_threshold must be a share between 0 and 1, not {threshold!r}",
            path=shown,
        )

    comparison = _comparison(path, data.get("comparison", {}), threshold)
    learners = (
        parse_data(path, data["data"], allow_outside=allow_outside)
        if with_data and "data" in data
        else None
    )
    study_ = Study(
        path=path,
        title=title,
        reference=reference,
        conditions=tuple(conditions),
        factors=tuple(factors),
        tolerances=tuple(overrides),
        reading_rate=float(rate) if rate is not None else None,
        posttest=post_files,
        coverage_threshold=float(threshold) if threshold is not None else None,
        comparison=comparison,
        data=learners,
    )
    if "sample" in data:
        from dataclasses import replace

        from matcheck.power.study_plan import parse_sample, study_design

        plan = parse_sample(data["sample"], shown)
        study_design(study_, plan)  # refuses a design power cannot be computed for
        study_ = replace(study_, sample=plan)
    return _with_accepted(study_, data.get("accepted"))


def _with_accepted(study: Study, raw: object) -> Study:
    """The study with its ``[[accepted]]`` entries, checked against its comparisons."""
    from dataclasses import replace

    from matcheck.measures import registry
    from matcheck.study_accepted import parse_accepted

    pairs = [(c.reference, c.condition) for c in comparisons(study)]
    factors = [f.name for f in study.factors]
    entries = parse_accepted(study.path, raw, pairs, factors, registry.compared())
    return replace(study, accepted=entries) if entries else study


def _comparison(path: Path, table: object, coverage: float | None) -> ComparisonSettings:
    """``[comparison]``: thresholds of the comparison (docs/study-file.md)."""
    from dataclasses import fields

    from matcheck.errors import UsageError

    shown = str(path)
    if not isinstance(table, dict):
        raise ConfigError(
            f"[comparison] must be a table of setting = value, {got(table)}", path=shown
        )
    types = {f.name: f.type for f in fields(ComparisonSettings)}
    _check_keys(path, table, set(types), "[comparison]")
    values: dict[str, Any] = {}
    for key, value in table.items():
        whole = types[key] == "int"
        if (
            isinstance(value, bool)
            or not isinstance(value, int | float)
            or (whole and not isinstance(value, int))
        ):
            kind = "a whole number" if whole else "a number"
            raise ConfigError(f"comparison.{key} must be {kind}, {got(value)}", path=shown)
        values[key] = value
    if coverage is not None:
        values.setdefault("coverage_threshold", float(coverage))
    try:
        return ComparisonSettings(**values)
    except UsageError as problem:
        raise ConfigError(problem.message, path=shown) from None


def comparisons(study: Study) -> tuple[Comparison, ...]:
    """The pairs the design requires.

    Without factors, or with one factor, every condition is compared with the reference and
    may differ in what separates their levels. With several factors, every pair of
    conditions that differs in the level of exactly one factor is compared, and may differ
    only in what that factor manipulates: so each factor's contrast is checked at every level
    of the others, and conditions that share a factor's level must match on what it
    manipulates. Pairs that differ in two factors at once cannot isolate either and are not
    compared directly.
    """
    if len(study.factors) <= 1:
        factor = study.factors[0] if study.factors else None
        pairs = []
        for condition in study.conditions:
            if condition.name == study.reference:
                continue
            manipulated: tuple[str, ...] = ()
            if factor is not None:
                ref_level = study.condition(study.reference).levels[factor.name]
                if condition.levels[factor.name] != ref_level:
                    manipulated = factor.manipulates
            pairs.append(
                Comparison(
                    study.reference, condition.name, manipulated, factor.name if factor else None
                )
            )
        return tuple(pairs)
    order = {c.name: i for i, c in enumerate(study.conditions)}
    ordered = sorted(study.conditions, key=lambda c: (c.name != study.reference, order[c.name]))
    result = []
    for i, first in enumerate(ordered):
        for second in ordered[i + 1 :]:
            differing = [f for f in study.factors if first.levels[f.name] != second.levels[f.name]]
            if len(differing) == 1:
                factor = differing[0]
                result.append(Comparison(first.name, second.name, factor.manipulates, factor.name))
    return tuple(result)
