"""Data tables derived from installed libraries, kept between runs when a store is given.

The language pass needs a few tables that take longer to build than the work they do: the
syllable counts parsed from the CMU Pronouncing Dictionary, spaCy's English tokenizer rules
(which take spaCy's ~0.6 s import to obtain), the English lemma table. Each is a pure function
of one library's installed version, so it can be built once and stored.

This module knows nothing of where: the orchestrator hands it a store (matcheck's cache, see
:mod:`matcheck.cache`) with :func:`use_store`, or ``None`` to build everything in the process
(``--no-cache``). A stored table that fails its ``check`` is rebuilt, so a damaged or foreign
entry never reaches a result.
"""

from __future__ import annotations

from collections.abc import Callable
from importlib.metadata import PackageNotFoundError, version
from typing import Protocol, TypeVar

T = TypeVar("T")


class TableStore(Protocol):
    def load_table(self, name: str, version: str) -> object | None: ...

    def save_table(self, name: str, version: str, value: object) -> None: ...


_store: TableStore | None = None
_loaded: dict[tuple[str, str], object] = {}


def use_store(store: TableStore | None) -> None:
    """Keep tables in ``store`` from now on in this process (``None``: build them here)."""
    global _store
    _store = store


def library_version(distribution: str) -> str:
    try:
        return version(distribution)
    except PackageNotFoundError:
        return ""


def table(name: str, source: str, build: Callable[[], T], check: Callable[[object], bool]) -> T:
    """The table ``name`` built from the installed ``source`` distribution: from this process,
    else from the store, else ``build()`` (and stored). ``check`` vets a stored value."""
    key = (name, library_version(source))
    if key in _loaded:
        return _loaded[key]  # type: ignore[return-value]
    store = _store
    found = store.load_table(*key) if store is not None else None
    if found is not None and check(found):
        value: T = found  # type: ignore[assignment]
    else:
        value = build()
        if store is not None:
            store.save_table(*key, value)
    _loaded[key] = value
    return value


def is_mapping(value: object, values: type) -> bool:
    """Whether a stored ``value`` is a dict of str to ``values`` (checked on its first 100
    entries: enough to refuse a foreign or damaged table, cheap on a large one)."""
    from itertools import islice

    return isinstance(value, dict) and all(
        isinstance(key, str) and type(item) is values for key, item in islice(value.items(), 100)
    )


def forget() -> None:
    """Drop the tables held by this process (tests)."""
    _loaded.clear()
