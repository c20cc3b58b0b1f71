"""Reduce HTML to lesson text: runs with emphasis, blocks of text, and image references.

Markdown lessons carry raw HTML (a ``<div>`` block, an inline ``<u>`` or ``<img>``), and an
HTML or slide reader will meet the same markup; both need the same reading of it:

- :func:`read_html_inline` takes one inline fragment (markdown-it's ``html_inline`` token)
  and returns its line breaks as spaces and its images, opening and closing emphasis on the
  caller's :class:`OpenEmphases` (a tag may open in one fragment and close in another);
- :func:`read_html_block` takes a block of HTML and returns its text, block element by block
  element (``p``, ``li``, ``h1``-``h6``, ``figcaption``, ...), and its images, in order.
  ``script``, ``style`` and ``template`` hold no lesson text.

Emphasis comes from the tags whose meaning holds without CSS (``b``/``strong``,
``i``/``em``, ``u``, ``mark``; HTML Living Standard 4.5, docs/references.md §15). The
standard library's lenient ``html.parser`` does the parsing; nothing is fetched, and images
are only references (see :mod:`matcheck.readers.image_paths` to resolve them).
"""

from __future__ import annotations

from collections import Counter
from dataclasses import dataclass, field
from html.parser import HTMLParser
from typing import NamedTuple

from matcheck.model import Emphasis
from matcheck.readers.builder import NO_EMPHASIS, Run
from matcheck.readers.image_paths import ImageRef

# Inline HTML tags that carry emphasis (their CSS-free meaning in every browser).
HTML_EMPHASIS = {
    "b": Emphasis.BOLD,
    "strong": Emphasis.BOLD,
    "i": Emphasis.ITALIC,
    "em": Emphasis.ITALIC,
    "u": Emphasis.UNDERLINE,
    "mark": Emphasis.HIGHLIGHT,
}
# HTML elements that start a new block of text inside a raw HTML block.
BLOCK_TAGS = frozenset(
    {
        *("address", "article", "aside", "blockquote", "dd", "details", "div", "dl", "dt"),
        *("figcaption", "figure", "footer", "h1", "h2", "h3", "h4", "h5", "h6", "header"),
        *("hr", "li", "main", "nav", "ol", "p", "pre", "section", "summary", "table"),
        *("tbody", "td", "tfoot", "th", "thead", "tr", "ul"),
    }
)
# HTML elements whose content is never lesson text.
HIDDEN_TAGS = frozenset({"script", "style", "template"})


class HtmlUnreadable(ValueError):
    """``html.parser`` gave up on the markup (older versions assert on some malformed HTML)."""


class OpenEmphases:
    """Open emphasis tags, counted so that nested or repeated tags close correctly."""

    def __init__(self) -> None:
        self._open: Counter[Emphasis] = Counter()

    def open(self, kind: Emphasis) -> None:
        self._open[kind] += 1

    def close(self, kind: Emphasis) -> None:
        if self._open[kind]:
            self._open[kind] -= 1

    def current(self) -> frozenset[Emphasis]:
        return frozenset(kind for kind, count in self._open.items() if count)


def html_image(attrs: dict[str, str], line: int | None) -> ImageRef:
    """The reference an ``<img>`` makes, from its attributes."""
    # A stated width and height (attributes in CSS px, or a style in any absolute unit) is a
    # display size: CSS fixes 96 px to the inch (docs/references.md §21).
    from matcheck.readers.markdown_meta import html_display_size

    width, height = html_display_size(attrs)
    return ImageRef(
        attrs.get("src", ""), attrs.get("alt", ""), line, attrs.get("title", ""), width, height
    )


# -- inline fragments ----------------------------------------------------------------------------


@dataclass
class InlineHtml:
    """What one inline fragment adds: spaces for line breaks, and images."""

    runs: list[Run] = field(default_factory=list)
    images: list[ImageRef] = field(default_factory=list)


def read_html_inline(markup: str, emphases: OpenEmphases, line: int | None) -> InlineHtml:
    """Read one inline fragment; markup the parser rejects adds nothing and changes nothing."""
    parser = _Tags()
    found = InlineHtml()
    try:
        parser.feed(markup)
        parser.close()
    except (AssertionError, ValueError):
        return found
    for name, attrs, closing in parser.tags:
        if name == "img":
            found.images.append(html_image(attrs, line))
        elif name == "br":
            found.runs.append((" ", NO_EMPHASIS))
        elif name in HTML_EMPHASIS:
            if closing:
                emphases.close(HTML_EMPHASIS[name])
            else:
                emphases.open(HTML_EMPHASIS[name])
    return found


class _Tag(NamedTuple):
    name: str
    attrs: dict[str, str]
    closing: bool


class _Tags(HTMLParser):
    """Collect the tags of a fragment of inline HTML."""

    def __init__(self) -> None:
        super().__init__(convert_charrefs=True)
        self.tags: list[_Tag] = []

    def handle_starttag(self, tag: str, attrs: list[tuple[str, str | None]]) -> None:
        self.tags.append(_Tag(tag, {key: value or "" for key, value in attrs}, False))

    def handle_endtag(self, tag: str) -> None:
        self.tags.append(_Tag(tag, {}, True))


# -- blocks --------------------------------------------------------------------------------------


@dataclass
class HtmlPiece:
    """One block of text from a block of HTML."""

    kind: str  # the HTML element that holds it ("p", "h2", "figcaption", ...)
    runs: list[Run]
    line: int | None
    level: int = 0  # heading level for h1..h6


def read_html_block(markup: str, base_line: int | None) -> list[HtmlPiece | ImageRef]:
    """The text blocks and images of ``markup``, in document order.

    ``base_line`` is the 0-based source line the markup starts on (``None`` if unknown); each
    piece gets the 1-based line its text starts on. Raises :class:`HtmlUnreadable` if the
    parser gives up.
    """
    parser = _BlockText(base_line)
    try:
        parser.feed(markup)
        parser.close()
    except (AssertionError, ValueError) as error:
        raise HtmlUnreadable(str(error)) from None
    return parser.items


class _BlockText(HTMLParser):
    """Reduce a block of HTML to blocks of text with emphasis, and images, in order."""

    def __init__(self, base_line: int | None) -> None:
        super().__init__(convert_charrefs=True)
        self.base_line = base_line
        self.items: list[HtmlPiece | ImageRef] = []
        self.emphases = OpenEmphases()
        self.runs: list[Run] = []
        self.line: int | None = None
        self.elements: list[str] = []  # open block elements, innermost last
        self.hidden = 0

    def _source_line(self) -> int | None:
        return None if self.base_line is None else self.base_line + self.getpos()[0]

    def _flush(self) -> None:
        if any(text.strip() for text, _ in self.runs):
            element = self.elements[-1] if self.elements else "p"
            level = int(element[1]) if len(element) == 2 and element[0] == "h" else 0
            self.items.append(HtmlPiece(element, self.runs, self.line, level))
        self.runs, self.line = [], None

    def handle_starttag(self, tag: str, attrs: list[tuple[str, str | None]]) -> None:
        if tag in HIDDEN_TAGS:
            self.hidden += 1
        elif tag == "img":
            values = {key: value or "" for key, value in attrs}
            self.items.append(html_image(values, self._source_line()))
        elif tag == "br":
            self.runs.append((" ", NO_EMPHASIS))
        elif tag in HTML_EMPHASIS:
            self.emphases.open(HTML_EMPHASIS[tag])
        elif tag in BLOCK_TAGS:
            self._flush()
            self.elements.append(tag)

    def handle_endtag(self, tag: str) -> None:
        if tag in HIDDEN_TAGS:
            self.hidden = max(0, self.hidden - 1)
        elif tag in HTML_EMPHASIS:
            self.emphases.close(HTML_EMPHASIS[tag])
        elif tag in BLOCK_TAGS:
            self._flush()
            if tag in self.elements:
                while self.elements.pop() != tag:
                    pass

    def handle_data(self, data: str) -> None:
        if self.hidden:
            return
        if self.line is None and data.strip():
            self.line = self._source_line()
        self.runs.append((data, self.emphases.current()))

    def close(self) -> None:
        super().close()
        self._flush()
