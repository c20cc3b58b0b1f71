"""Every test gets an empty cache folder of its own, so that no test reads or writes the
user's cache (~/.cache/matcheck) and no test sees another's entries."""

from __future__ import annotations

import pytest


@pytest.fixture(autouse=True)
def _own_cache(tmp_path_factory: pytest.TempPathFactory, monkeypatch: pytest.MonkeyPatch) -> None:
    monkeypatch.setenv("MATCHECK_CACHE_DIR", str(tmp_path_factory.mktemp("cache")))
