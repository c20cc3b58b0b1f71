"""Derived tables (matcheck/language/tables.py): built once, kept in the store, vetted on load."""

from __future__ import annotations

from collections.abc import Iterator
from pathlib import Path

import pytest

from matcheck.cache import Cache, Store
from matcheck.language import tables


class MemoryStore:
    def __init__(self) -> None:
        self.saved: dict[tuple[str, str], object] = {}

    def load_table(self, name: str, version: str) -> object | None:
        return self.saved.get((name, version))

    def save_table(self, name: str, version: str, value: object) -> None:
        self.saved[(name, version)] = value


@pytest.fixture(autouse=True)
def _fresh() -> Iterator[None]:
    tables.forget()
    yield
    tables.use_store(None)
    tables.forget()


def test_a_table_is_built_once_stored_and_loaded() -> None:
    store = MemoryStore()
    tables.use_store(store)
    builds: list[int] = []

    def build() -> dict[str, int]:
        builds.append(1)
        return {"valve": 2}

    assert tables.table("t", "pytest", build, lambda v: isinstance(v, dict)) == {"valve": 2}
    assert list(store.saved) == [("t", tables.library_version("pytest"))]
    tables.forget()  # a new process: the store has it
    assert tables.table("t", "pytest", build, lambda v: isinstance(v, dict)) == {"valve": 2}
    assert len(builds) == 1


def test_a_stored_table_that_fails_its_check_is_rebuilt() -> None:
    store = MemoryStore()
    store.saved[("t", tables.library_version("pytest"))] = ["not", "a", "mapping"]
    tables.use_store(store)
    value = tables.table("t", "pytest", lambda: {"pump": 1}, lambda v: isinstance(v, dict))
    assert value == {"pump": 1}
    assert store.saved[("t", tables.library_version("pytest"))] == {"pump": 1}


def test_without_a_store_a_table_is_built_and_nothing_is_kept() -> None:
    # --no-cache: a store used before is dropped, and each new process builds the table.
    store = MemoryStore()
    tables.use_store(store)
    tables.use_store(None)
    builds: list[int] = []

    def build() -> dict[str, int]:
        builds.append(1)
        return {"a": 1}

    assert tables.table("t", "pytest", build, lambda v: True) == {"a": 1}
    tables.forget()
    assert tables.table("t", "pytest", build, lambda v: True) == {"a": 1}
    assert len(builds) == 2 and store.saved == {}


def test_a_stored_table_is_checked_for_its_kind() -> None:
    assert tables.is_mapping({"valve": 2}, int)
    assert not tables.is_mapping({"valve": "2"}, int)
    assert not tables.is_mapping({"valve": True}, int)  # bool is not a syllable count
    assert not tables.is_mapping(["valve"], str)


def test_the_cache_keeps_tables_by_library_version(tmp_path: Path) -> None:
    cache = Cache(Store(tmp_path, 2**30))
    cache.save_table("syllables", "1.0", {"valve": 1})
    assert cache.load_table("syllables", "1.0") == {"valve": 1}
    assert cache.load_table("syllables", "1.1") is None  # a new library release misses
    # A damaged entry is a miss, and the next save replaces it.
    (entry,) = tmp_path.rglob("*.entry")
    entry.write_bytes(entry.read_bytes()[:-3])
    assert cache.load_table("syllables", "1.0") is None
    cache.save_table("syllables", "1.0", {"valve": 1})
    assert cache.load_table("syllables", "1.0") == {"valve": 1}


def test_the_language_tables_are_valid_when_stored(tmp_path: Path) -> None:
    # Each real table passes its own check after a trip through the cache.
    from matcheck.language.pipeline import _lemma_table
    from matcheck.language.syllables import _cmu_syllables, _hyphenator
    from matcheck.language.tokenizer import english

    cache = Cache(Store(tmp_path, 2**30))
    tables.use_store(cache)
    for function in (_lemma_table, _cmu_syllables, _hyphenator, english):
        function.cache_clear()
    english().tokens("Don't.")
    built = (_lemma_table(), _cmu_syllables(), _hyphenator().positions("valves"))
    assert len(list(tmp_path.rglob("*.entry"))) == 4
    tables.forget()
    for function in (_lemma_table, _cmu_syllables, _hyphenator, english):
        function.cache_clear()
    assert (_lemma_table(), _cmu_syllables(), _hyphenator().positions("valves")) == built
    assert [t.text for t in english().tokens("Don't.")] == ["Do", "n't", "."]
