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


def test_parts_are_ranked_in_one_outline_as_the_whole_file_is(tmp_path: Path) -> None:
    # A lesson split after its first section: the second part starts at "##". Joined, its
    # headings keep the ranks they have in the one-file lesson (by construction: the same
    # text), and the heading measures are the same.
    first = "# Brewing\n\nIntro.\n\n## Grinding\n\nGrind the beans.\n"
    second = "## Water\n\nHeat the water.\n\n### Temperature\n\nAim for 94 degrees.\n"
    whole = tmp_path / "whole.md"
    whole.write_text(first + "\n" + second, encoding="utf-8")
    parts = [tmp_path / "part-1.md", tmp_path / "part-2.md"]
    parts[0].write_text(first, encoding="utf-8")
    parts[1].write_text(second, encoding="utf-8")
    joined = read_version(Version("parts", tuple(parts)))
    single = read_version(Version("whole", (whole,)))

    def levels(document: object) -> list[tuple[str, int]]:
        return [(b.text, b.level) for b in document.blocks_of(BlockKind.HEADING)]  # type: ignore[attr-defined]

    assert levels(joined) == [("Brewing", 1), ("Grinding", 2), ("Water", 2), ("Temperature", 3)]
    assert levels(joined) == levels(single)
    ids = ("headings_level_1", "headings_level_2", "headings_level_3", "sections")
    joined_profile = profile_document(joined, Settings())
    single_profile = profile_document(single, Settings())
    assert [joined_profile.value(i) for i in ids] == [single_profile.value(i) for i in ids]


def test_docx_parts_are_ranked_in_one_outline(tmp_path: Path) -> None:
    # The same with Word parts (python-docx, Heading 1 / Heading 2 styles).
    import docx

    first, second = docx.Document(), docx.Document()
    first.add_heading("Brewing", level=1)
    first.add_paragraph("Intro.")
    second.add_heading("Water", level=2)
    second.add_paragraph("Heat the water.")
    paths = [tmp_path / "part-1.docx", tmp_path / "part-2.docx"]
    first.save(str(paths[0]))
    second.save(str(paths[1]))
    joined = read_version(Version("parts", tuple(paths)))
    assert [(b.text, b.level) for b in joined.blocks_of(BlockKind.HEADING)] == [
        ("Brewing", 1),
        ("Water", 2),
    ]
