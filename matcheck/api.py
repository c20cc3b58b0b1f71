"""The one orchestrator: read → analyse → measure → compare. Returns data, renders nothing.

The CLI and any Python caller use these functions; reports render what they return.
"""

from __future__ import annotations

from collections.abc import Sequence
from contextlib import AbstractContextManager
from dataclasses import dataclass
from pathlib import Path
from typing import TYPE_CHECKING

from matcheck.compare.decide import unapplied
from matcheck.errors import UsageError
from matcheck.findings import CacheUse, Condition, Report
from matcheck.limits import DEFAULT_LIMITS, ReadLimits
from matcheck.measures.base import Profile
from matcheck.model import Document
from matcheck.progress import SILENT, Steps
from matcheck.settings import DEFAULT_COMPARISON, DEFAULT_WPM, ComparisonSettings, Settings
from matcheck.study import Study

if TYPE_CHECKING:
    from matcheck.cache import Cache
    from matcheck.compare.assessment import PostTest
    from matcheck.findings import Finding


@dataclass(frozen=True, slots=True)
class Version:
    """A named lesson version made of one or more files (parts, in order)."""

    name: str
    paths: tuple[Path, ...]


def read_version(version: Version, limits: ReadLimits = DEFAULT_LIMITS) -> Document:
    """Read a version; several parts are joined into one document in order."""
    from matcheck.readers import read
    from matcheck.readers.join import join_documents

    documents = [read(path, limits) for path in version.paths]
    return documents[0] if len(documents) == 1 else join_documents(documents)


def profile_document(document: Document, settings: Settings) -> Profile:
    from matcheck.language.analysis import analyze
    from matcheck.measures import measure

    return measure(analyze(document), settings)


def profile_files(
    paths: Sequence[Path],
    settings: Settings,
    limits: ReadLimits = DEFAULT_LIMITS,
    cache: Cache | None = None,
) -> list[Profile]:
    from matcheck.readers.deadline import deadline

    profiles = []
    for path in paths:
        with deadline(limits.max_read_seconds, str(path), "reading and measuring the lesson"):
            profiles.append(measure_version(Version(str(path), (path,)), settings, limits, cache))
    return profiles


def measure_version(
    version: Version, settings: Settings, limits: ReadLimits, cache: Cache | None = None
) -> Profile:
    """Read and measure a version, or take its profile from ``cache`` (docs/performance.md)."""
    from matcheck.language.tables import use_store

    use_store(cache)  # the language pass keeps its derived tables there too (or nowhere)
    if cache is None:
        return profile_document(read_version(version, limits), settings)

    def compute() -> tuple[Profile, list[Document]]:
        from matcheck.readers import read
        from matcheck.readers.join import join_documents

        parts = [read(path, limits) for path in version.paths]
        document = parts[0] if len(parts) == 1 else join_documents(parts)
        return profile_document(document, settings), parts

    from matcheck.cache import fingerprint

    return cache.version(version.paths, fingerprint(settings, limits), compute)


def version_names(paths: Sequence[Path], names: Sequence[str] | None) -> list[str]:
    """Names for versions given as files: ``--names``, else stems, else file names."""
    if names:
        if len(names) != len(paths):
            raise UsageError(f"--names gives {len(names)} names for {len(paths)} files")
        if len(set(names)) != len(names):
            raise UsageError("--names must be all different")
        return list(names)
    stems = [path.stem for path in paths]
    if len(set(stems)) == len(stems):
        return stems
    files = [path.name for path in paths]
    if len(set(files)) == len(files):
        return files
    full = [str(path) for path in paths]
    if len(set(full)) == len(full):
        return full
    raise UsageError("the same file is given twice; compare needs different versions")


def _comparing(limits: ReadLimits) -> AbstractContextManager[None]:
    """The comparison of the measured versions gets the per-lesson time budget too."""
    from matcheck.readers.deadline import deadline

    return deadline(limits.max_read_seconds, "the lesson versions", "comparing the versions")


def _measure_versions(
    versions: Sequence[Version],
    reference: str,
    settings: Settings,
    limits: ReadLimits,
    steps: Steps = SILENT,
    cache: Cache | None = None,
) -> tuple[dict[str, Profile], list[Condition]]:
    """Read and measure each version once; the conditions as the report names them."""
    profiles: dict[str, Profile] = {}
    conditions = []
    from matcheck.readers.deadline import deadline

    for version in versions:
        steps.step(f"reading {version.name}")
        # One time budget covers reading, analysing and measuring the lesson (docs/limits.md).
        shown = ", ".join(str(path) for path in version.paths)
        with deadline(limits.max_read_seconds, shown, "reading and measuring the lesson"):
            profiles[version.name] = measure_version(version, settings, limits, cache)
        document = profiles[version.name].document
        conditions.append(
            Condition(
                name=version.name,
                paths=tuple(str(path) for path in version.paths),
                format=document.format,
                is_reference=version.name == reference,
                warnings=document.warnings,
                excluded=document.excluded,
            )
        )
    return profiles, conditions


def compare_versions(
    versions: Sequence[Version],
    *,
    reference: str | None = None,
    manipulated: Sequence[str] = (),
    tolerance_overrides: Sequence[str] = (),
    settings: Settings | None = None,
    limits: ReadLimits = DEFAULT_LIMITS,
    comparison: ComparisonSettings = DEFAULT_COMPARISON,
    steps: Steps = SILENT,
    cache: Cache | None = None,
) -> Report:
    """Compare every version with the reference (the first unless named); ``steps`` hears
    of each version read and of the comparison (``len(versions) + 1`` steps)."""
    from matcheck.compare.engine import compare_profiles
    from matcheck.compare.tolerances import parse_tolerances
    from matcheck.intent import expand_manipulated

    settings = settings or Settings()
    if len(versions) < 2:
        raise UsageError("compare needs at least two lesson versions")
    names = [version.name for version in versions]
    reference = reference or names[0]
    if reference not in names:
        raise UsageError(
            f"--reference {reference!r} is not one of the versions: {', '.join(names)}"
        )
    # Validate options before the (slower) reading.
    expand_manipulated(manipulated)
    tolerances = parse_tolerances(tolerance_overrides)
    counted = _Counted(cache)
    profiles, conditions = _measure_versions(
        versions, reference, settings, limits, steps, cache=cache
    )
    steps.step("comparing")
    with _comparing(limits):
        findings, spreads = compare_profiles(
            profiles, reference, manipulated, tolerances, comparison
        )
    return Report(
        conditions=tuple(conditions),
        reference=reference,
        manipulated=tuple(manipulated),
        findings=findings,
        spreads=spreads,
        words_per_minute=settings.words_per_minute,
        settings=comparison,
        warnings=tuple(unapplied(findings)),
        cache=counted.use(),
    )


class _Counted:
    """The cache's counts over one report's reading."""

    def __init__(self, cache: Cache | None) -> None:
        self.cache = cache
        self.start = (cache.hits, cache.misses) if cache else (0, 0)

    def use(self) -> CacheUse | None:
        if self.cache is None:
            return None
        hits = self.cache.hits - self.start[0]
        return CacheUse(hits + self.cache.misses - self.start[1], hits)


def _study_settings(study: Study) -> Settings:
    return Settings(words_per_minute=study.reading_rate or DEFAULT_WPM)


def _study_versions(study: Study) -> list[Version]:
    return [Version(condition.name, condition.files) for condition in study.conditions]


def check_study(
    study: Study,
    *,
    settings: Settings | None = None,
    limits: ReadLimits = DEFAULT_LIMITS,
    extra_tolerances: Sequence[str] = (),
    steps: Steps = SILENT,
    cache: Cache | None = None,
) -> Report:
    """Compare a study's conditions as its design requires (see :func:`study.comparisons`);
    ``steps`` hears of each condition read and of the comparison (one step more than the
    conditions). With ``cache``, an unchanged study's report comes from it whole."""
    from dataclasses import replace

    settings = settings or _study_settings(study)

    def compute() -> Report:
        counted = _Counted(cache)
        profiles, conditions = _measure_versions(
            _study_versions(study), study.reference, settings, limits, steps, cache=cache
        )
        steps.step("comparing")
        report = _study_report(
            study, profiles, conditions, settings, extra_tolerances, limits, cache
        )
        return replace(report, cache=counted.use())

    if cache is None:
        return compute()
    return cache.report(*_report_key(study, settings, limits, extra_tolerances), compute)


def stored_study_report(
    study: Study,
    cache: Cache,
    *,
    limits: ReadLimits = DEFAULT_LIMITS,
    extra_tolerances: Sequence[str] = (),
) -> Report | None:
    """:func:`check_study`'s report when ``cache`` holds it whole, else ``None``: nothing is
    read, measured or compared."""
    return cache.stored_report(
        *_report_key(study, _study_settings(study), limits, extra_tolerances)
    )


def _report_key(
    study: Study, settings: Settings, limits: ReadLimits, extra_tolerances: Sequence[str]
) -> tuple[list[Path], list[Path], dict[str, object]]:
    """What a study's cached report is keyed by: its inputs, its lessons, the parameters."""
    from matcheck.cache import fingerprint

    lessons = [path for condition in study.conditions for path in condition.files]
    parameters = {**fingerprint(settings, limits), "tolerances": list(extra_tolerances)}
    return _study_inputs(study), lessons, parameters


def _study_inputs(study: Study) -> list[Path]:
    """Every file a study's report depends on: the study file, lessons, post-test, data."""
    from dataclasses import fields

    inputs = [study.path, *(p for c in study.conditions for p in c.files), *study.posttest]
    if study.data is not None:
        for item in fields(study.data):
            value = getattr(study.data, item.name)
            values = value if isinstance(value, tuple) else (value,)
            inputs += [v for v in values if isinstance(v, Path)]
    return inputs


def _study_report(
    study: Study,
    profiles: dict[str, Profile],
    conditions: Sequence[Condition],
    settings: Settings,
    extra_tolerances: Sequence[str],
    limits: ReadLimits,
    cache: Cache | None = None,
) -> Report:
    """The study's report from its measured conditions."""
    from matcheck.compare.engine import compare_pairs
    from matcheck.compare.tolerances import parse_tolerances
    from matcheck.findings import Pairing
    from matcheck.study import comparisons

    tolerances = parse_tolerances([*study.tolerances, *extra_tolerances])
    pairs = comparisons(study)
    with _comparing(limits):
        findings, spreads = compare_pairs(
            profiles,
            [(p.reference, p.condition, p.manipulated) for p in pairs],
            tolerances,
            study.comparison,
        )
    warnings: tuple[str, ...] = ()
    if study.posttest:
        from matcheck.compare.assessment import assess_posttest

        extra, warnings = assess_posttest(
            _posttest(study.posttest, limits, cache),
            {name: profile.analysis for name, profile in profiles.items()},
            [(p.reference, p.condition) for p in pairs],
            threshold=study.comparison.coverage_threshold,
            answer_factor=study.comparison.answer_factor,
            tolerances=tolerances,
        )
        findings = (*findings, *extra)
    data = None
    if study.data is not None:
        from matcheck.data.assess import assess_data

        extra, data = assess_data(
            study.data,
            [c.name for c in study.conditions],
            study.reference,
            [(p.reference, p.condition) for p in pairs],
            findings,
        )
        findings = (*findings, *extra)
    if study.sample is not None:
        findings = (*findings, *_design_findings(study, cache))
    if study.accepted:
        from matcheck.compare.accept import ComparedPair, apply_accepted, restate_spreads

        compared = [ComparedPair(p.reference, p.condition, p.factor) for p in pairs]
        findings, stale = apply_accepted(findings, compared, study.accepted)
        spreads = restate_spreads(spreads, findings)
        warnings = (*warnings, *stale)
    manipulated = tuple(dict.fromkeys(m for factor in study.factors for m in factor.manipulates))
    return Report(
        conditions=tuple(conditions),
        reference=study.reference,
        manipulated=manipulated,
        findings=findings,
        spreads=spreads,
        words_per_minute=settings.words_per_minute,
        pairings=tuple(Pairing(p.reference, p.condition, p.manipulated, p.factor) for p in pairs),
        title=study.title,
        warnings=(*unapplied(findings), *warnings),
        settings=study.comparison,
        data=data,
    )


def _posttest(paths: Sequence[Path], limits: ReadLimits, cache: Cache | None) -> PostTest:
    """The post-test's items and their language analysis, from ``cache`` when it has them."""
    from matcheck.compare.assessment import PostTest

    def compute() -> PostTest:
        from matcheck.language.analysis import analyze
        from matcheck.readers.posttest import items_document, read_posttest

        items = tuple(item for path in paths for item in read_posttest(path, limits))
        document, slots = items_document(items)
        return PostTest(items, analyze(document), slots)

    if cache is None:
        return compute()
    from matcheck.cache import fingerprint

    return cache.value("posttest", paths, fingerprint(Settings(), limits)["limits"], compute)


def _design_findings(study: Study, cache: Cache | None) -> tuple[Finding, ...]:
    """The planned sample's findings; they depend on the study file alone, so the cache keeps
    them (the power solvers import statsmodels, ~1 s, for a few milliseconds of work)."""

    def compute() -> tuple[Finding, ...]:
        from matcheck.power.study_plan import design_findings

        assert study.sample is not None
        return tuple(design_findings(study, study.sample))

    if cache is None:
        return compute()
    return cache.value("design", [study.path], {}, compute)


def check_against(
    study_path: Path,
    revision: str,
    *,
    limits: ReadLimits = DEFAULT_LIMITS,
    extra_tolerances: Sequence[str] = (),
    cache: Cache | None = None,
) -> Report:
    """Check a study now, and report what changed since ``revision`` and what it broke.

    Each condition is read once as it is now and once as it was at ``revision``; those two
    sets of profiles serve the study's report then and now and the comparison of each
    condition with itself.
    """
    import tempfile
    from dataclasses import replace

    from matcheck.compare.engine import compare_pairs
    from matcheck.compare.tolerances import parse_tolerances
    from matcheck.findings import Regression, RegressionKind, Status
    from matcheck.revision import load_study_at
    from matcheck.study import load_study

    study = load_study(study_path, allow_outside=limits.allow_outside_files)
    settings = _study_settings(study)
    counted = _Counted(cache)
    profiles, conditions = _measure_versions(
        _study_versions(study), study.reference, settings, limits, cache=cache
    )
    now = _study_report(study, profiles, conditions, settings, extra_tolerances, limits, cache)
    with tempfile.TemporaryDirectory(prefix="matcheck-rev-") as folder:
        # The learners' data belong to now, not to the materials' past revision.
        old_study = load_study_at(study_path, revision, Path(folder), limits)
        old_settings = _study_settings(old_study)
        old_profiles, old_conditions = _measure_versions(
            _study_versions(old_study), old_study.reference, old_settings, limits, cache=cache
        )
        before = _study_report(
            old_study, old_profiles, old_conditions, old_settings, extra_tolerances, limits, cache
        )
    summaries: list[Regression] = []
    both: dict[str, Profile] = dict(profiles)
    pairs: list[tuple[str, str, tuple[str, ...]]] = []
    for condition in study.conditions:
        if condition.name not in old_profiles:
            summaries.append(Regression(RegressionKind.NEW, condition.name, revision))
            continue
        label = f"{condition.name}@{revision}"
        both[label] = old_profiles[condition.name]
        pairs.append((label, condition.name, ()))
    tolerances = parse_tolerances([*study.tolerances, *extra_tolerances])
    changes, _ = compare_pairs(both, pairs, tolerances, study.comparison)
    for _label, name, _ in pairs:
        changed = tuple(
            f
            for f in changes
            if f.condition == name and f.status is Status.DIFFERS and f.caused_by is None
        )
        if changed:
            summaries.append(Regression(RegressionKind.CHANGED, name, revision, changes=changed))
    held = {
        (f.reference, f.condition, f.key)
        for f in before.findings
        if f.status in (Status.MATCHED, Status.INTENDED)
    }
    broken: dict[tuple[str, str], list[str]] = {}
    for finding in now.root_findings(Status.DIFFERS):
        if finding.group == "design":  # the planned sample, not the materials, changed
            continue
        if (finding.reference, finding.condition, finding.key) in held:
            broken.setdefault((finding.condition, finding.reference), []).append(finding.key)
    regressions = [
        Regression(
            RegressionKind.BROKEN,
            condition,
            revision,
            reference=reference,
            dimensions=tuple(dict.fromkeys(keys)),
        )
        for (condition, reference), keys in broken.items()
    ]
    from matcheck.compare.review import preexisting

    return replace(
        now,
        revision=revision,
        changes=tuple(changes),
        regressions=(*summaries, *regressions),
        preexisting=preexisting(before.findings, now.findings),
        cache=counted.use(),
    )
