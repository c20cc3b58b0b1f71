"""The two reader parts a Markdown, HTML or slide reader share, used directly.

``image_paths`` resolves image addresses inside the lesson's folder; ``html_text`` reduces
HTML to text runs, blocks and image references. The Markdown reader's own tests cover them
through Markdown; these use the interface as another reader would. Pixel sizes are those the
test writes with Pillow; the HTML element meanings are the HTML Living Standard's
(docs/references.md §15).
"""

from __future__ import annotations

import base64
import io
import os
from pathlib import Path

import pytest

from matcheck.limits import ReadLimits
from matcheck.model import Emphasis
from matcheck.readers.builder import NO_EMPHASIS
from matcheck.readers.html_text import (
    HtmlPiece,
    OpenEmphases,
    read_html_block,
    read_html_inline,
)
from matcheck.readers.image_paths import ImageRef, ImageSandbox


def _png_bytes(width: int, height: int) -> bytes:
    from PIL import Image

    buffer = io.BytesIO()
    Image.new("RGB", (width, height), (40, 120, 200)).save(buffer, format="PNG")
    return buffer.getvalue()


@pytest.fixture
def lesson(tmp_path: Path) -> Path:
    folder = tmp_path / "lesson"
    (folder / "img").mkdir(parents=True)
    (folder / "img" / "valve.png").write_bytes(_png_bytes(30, 20))
    (tmp_path / "private.png").write_bytes(_png_bytes(5, 5))
    return folder / "slides.html"


def test_sandbox_measures_a_local_image_by_relative_path(lesson: Path) -> None:
    sandbox = ImageSandbox.for_lesson(lesson, ReadLimits())
    found = sandbox.locate("img/valve.png")
    assert (found.size, found.readable, found.remote, found.warning) == ((30, 20), True, False, "")
    assert sandbox.locate("img/valve%2Epng").size == (30, 20)  # percent-escapes decoded


def test_sandbox_refuses_a_file_outside_the_folder_unless_allowed(lesson: Path) -> None:
    refused = ImageSandbox.for_lesson(lesson, ReadLimits()).locate("../private.png")
    assert refused.size is None and not refused.readable
    assert refused.warning == (
        "image ../private.png is outside the lesson folder; not read "
        "(allow it with --allow-outside)"
    )
    allowed = ImageSandbox.for_lesson(lesson, ReadLimits(allow_outside_files=True))
    assert allowed.locate("../private.png").size == (5, 5)


@pytest.mark.skipif(not hasattr(os, "symlink"), reason="no symlinks on this system")
def test_sandbox_follows_a_symlink_before_deciding(lesson: Path) -> None:
    link = lesson.parent / "img" / "link.png"
    link.symlink_to(lesson.parent.parent / "private.png")
    found = ImageSandbox.for_lesson(lesson, ReadLimits()).locate("img/link.png")
    assert not found.readable and "outside the lesson folder" in found.warning


def test_sandbox_never_fetches_remote_images(lesson: Path) -> None:
    sandbox = ImageSandbox.for_lesson(lesson, ReadLimits())
    for address in ("https://example.org/a.png", "//cdn.example.org/a.png", "ftp://h/a.png"):
        found = sandbox.locate(address)
        assert (found.remote, found.size, found.warning) == (True, None, "")


def test_sandbox_decodes_data_uris_and_warns_on_missing_files(lesson: Path) -> None:
    sandbox = ImageSandbox.for_lesson(lesson, ReadLimits())
    payload = base64.b64encode(_png_bytes(7, 3)).decode("ascii")
    found = sandbox.locate(f"data:image/png;base64,{payload}")
    assert found.size == (7, 3) and found.source == "data:image/png;base64,…"
    assert sandbox.locate("img/absent.png").warning == "image img/absent.png not found"
    assert sandbox.locate("").warning == "image  names no file; not read"


def test_html_block_gives_text_blocks_headings_and_images_in_order() -> None:
    markup = (
        "<section>\n<h2>Bleeding a <em>radiator</em></h2>\n"
        "<p>Turn the <u>key</u> slowly<br>and wait.</p>\n"
        "<script>var hidden = 1;</script>\n"
        '<img src="img/key.png" alt="A radiator key" title="The key">\n'
        "<figcaption>Figure 1. The key</figcaption>\n</section>\n"
    )
    items = read_html_block(markup, base_line=10)
    heading, paragraph, image, caption = items
    assert isinstance(heading, HtmlPiece) and (heading.kind, heading.level) == ("h2", 2)
    assert heading.runs == [("Bleeding a ", NO_EMPHASIS), ("radiator", {Emphasis.ITALIC})]
    assert heading.line == 12  # 0-based base 10 + the parser's 1-based line 2
    assert isinstance(paragraph, HtmlPiece)
    assert "".join(text for text, _ in paragraph.runs) == "Turn the key slowly and wait."
    assert ("key", {Emphasis.UNDERLINE}) in paragraph.runs
    assert image == ImageRef("img/key.png", "A radiator key", 15, "The key")
    assert isinstance(caption, HtmlPiece) and caption.kind == "figcaption"
    assert all(
        "hidden" not in text for p in items if isinstance(p, HtmlPiece) for text, _ in p.runs
    )


def test_html_inline_emphasis_spans_fragments() -> None:
    # markdown-it gives "<mark>" and "</mark>" as two fragments around plain text tokens.
    emphases = OpenEmphases()
    opened = read_html_inline("<mark>", emphases, line=3)
    assert emphases.current() == {Emphasis.HIGHLIGHT} and opened.runs == []
    found = read_html_inline('</mark><br><img src="a.png" alt="">', emphases, line=4)
    assert emphases.current() == frozenset()
    assert found.runs == [(" ", NO_EMPHASIS)]
    assert found.images == [ImageRef("a.png", "", 4, "")]
