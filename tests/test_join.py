"""A lesson in parts: the parts join into one document in order (matcheck.readers.join)."""

from __future__ import annotations

from pathlib import Path

from matcheck.api import Version, profile_document, read_version
from matcheck.model import BlockKind
from matcheck.settings import Settings


def test_parts_keep_their_lists_tables_and_places_apart(tmp_path: Path) -> None:
    # By construction: each part has one list of two items and one table of four cells.
    part = (
        "# Part {n}\n\nIntro {n}.\n\n- first {n}\n- second {n}\n\n| a | b |\n|---|---|\n| c | d |\n"
    )
    paths = []
    for n in (1, 2):
        path = tmp_path / f"part-{n}.md"
        path.write_text(part.format(n=n), encoding="utf-8")
        paths.append(path)
    document = read_version(Version("lesson", tuple(paths)))
    profile = profile_document(document, Settings())
    assert profile.value("lists") == 2
    assert profile.value("list_items") == 4
    assert profile.value("tables") == 2
    assert profile.value("paragraphs") == 2
    intro_two = next(b for b in document.blocks if b.text == "Intro 2.")
    assert intro_two.location.part == 1 and intro_two.location.line == 3
    assert intro_two.location.paragraph == 2  # paragraph numbers run through the lesson
    assert [b.location.block for b in document.blocks] == list(range(len(document.blocks)))
    assert document.blocks_of(BlockKind.HEADING)[1].location.part == 1
