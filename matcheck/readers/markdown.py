"""Read a Markdown lesson with a CommonMark parser (markdown-it-py), never with regexes.

The token stream of markdown-it (CommonMark, plus tables, YAML front matter, footnotes and a
small ``==highlight==`` rule) is walked once, in document order:

- headings, paragraphs, list items, table cells and footnotes become blocks;
- code blocks (fenced or indented) are not prose: they are left out and counted;
- raw HTML is reduced to its text, and HTML emphasis tags (``<u>``, ``<mark>``, ...) count;
- every image becomes a figure. Local images are measured from their header only; remote
  ones are never fetched; files outside the lesson's folder are not opened unless allowed.
"""

from __future__ import annotations

import base64
import binascii
from collections import Counter
from collections.abc import Sequence
from dataclasses import dataclass, field
from functools import cache
from html.parser import HTMLParser
from pathlib import Path
from typing import NamedTuple
from urllib.parse import unquote, urlsplit

from markdown_it import MarkdownIt
from markdown_it.rules_inline.state_inline import Delimiter, StateInline
from markdown_it.token import Token

from matcheck.errors import CorruptFile
from matcheck.limits import ReadLimits
from matcheck.model import BlockKind, Document, Emphasis
from matcheck.readers.builder import NO_EMPHASIS, DocumentBuilder, Run
from matcheck.readers.decode import read_lesson_text
from matcheck.readers.images import image_size

# Inline HTML tags that carry emphasis (their CSS-free meaning in every browser).
HTML_EMPHASIS = {
    "b": Emphasis.BOLD,
    "strong": Emphasis.BOLD,
    "i": Emphasis.ITALIC,
    "em": Emphasis.ITALIC,
    "u": Emphasis.UNDERLINE,
    "mark": Emphasis.HIGHLIGHT,
}
# markdown-it token pairs that carry emphasis (``mark`` comes from the rule below).
_TOKEN_EMPHASIS = {"strong": Emphasis.BOLD, "em": Emphasis.ITALIC, "mark": Emphasis.HIGHLIGHT}
# HTML elements that start a new block of text inside a raw HTML block.
_HTML_BLOCK_TAGS = frozenset(
    {
        *("address", "article", "aside", "blockquote", "dd", "details", "div", "dl", "dt"),
        *("figcaption", "figure", "footer", "h1", "h2", "h3", "h4", "h5", "h6", "header"),
        *("hr", "li", "main", "nav", "ol", "p", "pre", "section", "summary", "table"),
        *("tbody", "td", "tfoot", "th", "thead", "tr", "ul"),
    }
)
# HTML elements whose content is never lesson text.
_HTML_HIDDEN_TAGS = frozenset({"script", "style", "template"})
_EQUALS = ord("=")


def read_markdown(path: Path, limits: ReadLimits) -> Document:
    """Read ``path`` as Markdown; ``Location.line`` is the 1-based source line of each block.

    Raises :class:`~matcheck.errors.InputError` if the file cannot be read,
    :class:`~matcheck.errors.LimitExceeded` beyond ``limits.max_words`` (counted on the raw
    text, before parsing) and :class:`~matcheck.errors.CorruptFile` if the parser fails on it.
    """
    text, warnings = read_lesson_text(path, limits, "Markdown file")
    builder = DocumentBuilder(str(path), "markdown")
    for warning in warnings:
        builder.warn(warning)
    try:
        tokens = _parser().parse(text)
    except (RecursionError, RuntimeError, ValueError, IndexError, KeyError) as error:
        # markdown-it accepts any text; a failure here is a parser limit on hostile input.
        raise CorruptFile(
            f"the Markdown could not be parsed ({type(error).__name__})", path=str(path)
        ) from None
    _Walker(builder, path, limits).walk(tokens)
    return builder.build()


@cache
def _parser() -> MarkdownIt:
    from mdit_py_plugins.footnote import footnote_plugin
    from mdit_py_plugins.front_matter import front_matter_plugin

    md = MarkdownIt("commonmark").enable("table")
    md.use(front_matter_plugin).use(footnote_plugin)
    # mdit-py-plugins 0.7 ships no ``==mark==`` plugin, so the parser gets a small delimiter
    # rule of its own, run where markdown-it runs its other paired markers.
    md.inline.ruler.before("emphasis", "mark", _mark_tokenize)
    md.inline.ruler2.before("emphasis", "mark", _mark_pair)
    return md


def _mark_tokenize(state: StateInline, silent: bool) -> bool:
    """Record each ``==`` as a delimiter that the pairing step may turn into mark tags."""
    if silent or state.src[state.pos] != "=":
        return False
    scanned = state.scanDelims(state.pos, True)
    if scanned.length < 2:
        return False
    token = state.push("text", "", 0)
    token.content = "=" * scanned.length
    if scanned.length == 2:
        # length=0 turns off the "rule of 3" that applies to * and _ only.
        state.delimiters.append(
            Delimiter(_EQUALS, 0, len(state.tokens) - 1, -1, scanned.can_open, scanned.can_close)
        )
    # Longer runs of "=" stay literal text (a setext-like rule line inside a paragraph).
    state.pos += scanned.length
    return True


def _mark_pair(state: StateInline) -> None:
    """Turn matched ``==`` delimiters (paired by markdown-it's balance step) into tags."""
    lists = [state.delimiters]
    lists += [meta["delimiters"] for meta in state.tokens_meta if meta and "delimiters" in meta]
    for delimiters in lists:
        for delimiter in delimiters:
            if delimiter.marker != _EQUALS or delimiter.end == -1:
                continue
            opener = state.tokens[delimiter.token]
            closer = state.tokens[delimiters[delimiter.end].token]
            opener.type, opener.tag, opener.nesting = "mark_open", "mark", 1
            closer.type, closer.tag, closer.nesting = "mark_close", "mark", -1
            opener.markup = closer.markup = "=="
            opener.content = closer.content = ""


@dataclass
class _Image:
    """An image reference found in inline content or HTML, before it is resolved."""

    source: str
    alt: str
    line: int | None
    title: str = ""


@dataclass
class _Inline:
    """The text runs and images of one inline token."""

    runs: list[Run] = field(default_factory=list)
    images: list[_Image] = field(default_factory=list)

    @property
    def has_text(self) -> bool:
        return any(text.strip() for text, _ in self.runs)


class _Emphases:
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


class _Walker:
    """Walk the block tokens once and feed the builder."""

    def __init__(self, builder: DocumentBuilder, path: Path, limits: ReadLimits) -> None:
        self.builder = builder
        self.limits = limits
        self.folder = path.absolute().parent
        self.lists: list[int] = []  # group ids of the open lists, outermost first
        self.table: int | None = None
        self.footnote: list[Run] | None = None
        self.footnote_line: int | None = None
        self.code_blocks = 0
        self.consumed: set[int] = set()  # inline tokens already used as captions

    def walk(self, tokens: Sequence[Token]) -> None:
        for index, token in enumerate(tokens):
            kind = token.type
            if kind in ("bullet_list_open", "ordered_list_open"):
                # A nested list belongs to its outer list, as in DOCX numbering and in PDF.
                self.lists.append(self.lists[-1] if self.lists else self.builder.new_group())
            elif kind in ("bullet_list_close", "ordered_list_close"):
                self.lists.pop()
            elif kind == "table_open":
                self.table = self.builder.new_group()
            elif kind == "table_close":
                self.table = None
            elif kind in ("fence", "code_block"):
                self.code_blocks += 1
            elif kind == "html_block":
                self._html_block(token)
            elif kind == "footnote_open":
                self.footnote, self.footnote_line = [], None
            elif kind == "footnote_close" and self.footnote is not None:
                self.builder.add_block(BlockKind.FOOTNOTE, self.footnote, line=self.footnote_line)
                self.footnote = None
            elif kind == "inline" and index not in self.consumed:
                self._inline_block(tokens, index)
        if self.code_blocks:
            plural = "s" if self.code_blocks != 1 else ""
            self.builder.exclude(f"{self.code_blocks} code block{plural}")

    # -- blocks ------------------------------------------------------------------------------

    def _inline_block(self, tokens: Sequence[Token], index: int) -> None:
        token = tokens[index]
        parent = tokens[index - 1].type if index else ""
        line = token.map[0] + 1 if token.map else None
        content = _inline_content(token, line)
        if self.footnote is not None:
            if self.footnote and content.has_text:
                self.footnote.append((" ", NO_EMPHASIS))
            self.footnote.extend(content.runs)
            self.footnote_line = self.footnote_line or line
            for image in content.images:
                self._figure(image, caption=image.title)
            return
        if parent == "heading_open":
            level = int(tokens[index - 1].tag[1:])
            self.builder.add_block(BlockKind.HEADING, content.runs, level=level, line=line)
        elif parent in ("th_open", "td_open"):
            self.builder.add_block(BlockKind.TABLE_CELL, content.runs, group=self.table, line=line)
        elif parent == "paragraph_open" and content.images and not content.has_text:
            self._image_paragraph(tokens, index, content)
            return
        else:
            self._body(content.runs, line)
        self._figures_with_titles(content.images)

    def _body(self, runs: list[Run], line: int | None, level: int = 0) -> None:
        """A paragraph, a list item inside a list, or (from HTML) a heading of ``level``."""
        if level:
            self.builder.add_block(BlockKind.HEADING, runs, level=level, line=line)
        elif self.lists:
            self.builder.add_block(
                BlockKind.LIST_ITEM, runs, level=len(self.lists), group=self.lists[-1], line=line
            )
        else:
            self.builder.add_block(BlockKind.PARAGRAPH, runs, line=line)

    def _image_paragraph(self, tokens: Sequence[Token], index: int, content: _Inline) -> None:
        """A paragraph of images only: no text block; a caption paragraph may follow it."""
        following = index + 3  # inline, paragraph_close, paragraph_open, inline
        if (
            following < len(tokens)
            and tokens[index + 1].type == "paragraph_close"
            and tokens[index + 2].type == "paragraph_open"
            and tokens[following].type == "inline"
        ):
            token = tokens[following]
            line = token.map[0] + 1 if token.map else None
            caption = _inline_content(token, line)
            if _is_caption(caption.runs) and not caption.images:
                # The caption paragraph belongs to the last picture (of a row of pictures).
                self._figures_with_titles(content.images[:-1])
                self._figure(content.images[-1])
                self._caption(caption.runs, line)
                self.consumed.add(following)
                return
        self._figures_with_titles(content.images)

    def _figures_with_titles(self, images: list[_Image]) -> None:
        # A title (![alt](src "title")) is the figure's caption and, like a caption under a
        # picture in a word processor, a CAPTION block.
        for image in images:
            self._figure(image)
            if image.title.strip():
                self._caption([(image.title, NO_EMPHASIS)], image.line)

    def _caption(self, runs: list[Run], line: int | None) -> None:
        block = self.builder.add_block(BlockKind.CAPTION, runs, line=line)
        if block is not None and self.builder.figure_count:
            self.builder.set_caption(self.builder.figure_count - 1, block.text)

    def _html_block(self, token: Token) -> None:
        base = token.map[0] if token.map else None
        parser = _HtmlText(base)
        try:
            parser.feed(token.content)
            parser.close()
        except (AssertionError, ValueError):
            # html.parser is lenient, but older versions assert on some malformed markup.
            self.builder.warn("an HTML block could not be parsed; its text was left out")
            return
        for item in parser.items:
            if isinstance(item, _Image):
                self._figure(item)
            elif item.kind == "figcaption":
                self._caption(item.runs, item.line)
            else:
                self._body(item.runs, item.line, item.level)

    # -- figures -----------------------------------------------------------------------------

    def _figure(self, image: _Image, caption: str = "") -> None:
        found = self._locate(image.source)
        self.builder.add_figure(
            found.source,
            width_px=found.size[0] if found.size else None,
            height_px=found.size[1] if found.size else None,
            alt_text=image.alt,
            caption=caption,
            remote=found.remote,
            readable=found.readable,
            line=image.line,
        )

    def _locate(self, source: str) -> _Found:
        """Find and measure an image; warn about any that cannot be measured."""
        try:
            parts = urlsplit(source)
        except ValueError:
            return self._unreadable(source, "has a malformed address; not read")
        scheme = parts.scheme.lower()
        if scheme == "data":
            return self._inline_data(source)
        # http(s) and any other addressed resource but file: are remote: counted, never
        # fetched. A one-letter "scheme" is a Windows drive (C:\...), so a local path.
        if source.startswith("//") or (len(scheme) > 1 and scheme != "file"):
            return _Found(source, remote=True)
        relative = unquote(source if len(scheme) == 1 else parts.path)
        if not relative:
            return self._unreadable(source, "names no file; not read")
        target = self.folder / relative  # an absolute path replaces the folder
        try:
            real = target.resolve()  # follows symlinks, so a link out of the folder is seen
            inside = real.is_relative_to(self.folder.resolve())
            exists = real.is_file()
        except (OSError, RuntimeError, ValueError):  # symlink loops, NUL bytes, ...
            return self._unreadable(source, "cannot be located; not read")
        if not inside and not self.limits.allow_outside_files:
            return self._unreadable(
                source, "is outside the lesson folder; not read (allow it with --allow-outside)"
            )
        if not exists:
            return self._unreadable(source, "not found")
        return self._measured(source, image_size(real))

    def _inline_data(self, source: str) -> _Found:
        header, _, payload = source.partition(",")
        shown = f"{header},…"  # the payload is the image itself: too long to show
        size = None
        if header.lower().startswith("data:image/") and header.lower().endswith(";base64"):
            try:
                size = image_size(base64.b64decode(unquote(payload)))
            except (binascii.Error, ValueError):
                size = None
        return self._measured(shown, size)

    def _measured(self, source: str, size: tuple[int, int] | None) -> _Found:
        if size is None:
            return self._unreadable(source, "cannot be decoded; its size is unknown")
        return _Found(source, size=size)

    def _unreadable(self, source: str, problem: str) -> _Found:
        self.builder.warn(f"image {source} {problem}")
        return _Found(source, readable=False)


class _Found(NamedTuple):
    """Where an image reference led: the source shown, its pixel size if measured."""

    source: str
    size: tuple[int, int] | None = None
    remote: bool = False
    readable: bool = True


# -- inline content ------------------------------------------------------------------------------


def _inline_content(token: Token, line: int | None) -> _Inline:
    """Runs of text with their emphasis, and the images, of one inline token."""
    content = _Inline()
    emphases = _Emphases()
    for child in token.children or ():
        kind = child.type
        if kind in ("text", "code_inline"):
            content.runs.append((child.content, emphases.current()))
        elif kind in ("softbreak", "hardbreak"):
            content.runs.append((" ", NO_EMPHASIS))
            line = line + 1 if line is not None else None
        elif kind.endswith(("_open", "_close")) and kind.rpartition("_")[0] in _TOKEN_EMPHASIS:
            emphasis = _TOKEN_EMPHASIS[kind.rpartition("_")[0]]
            if kind.endswith("_open"):
                emphases.open(emphasis)
            else:
                emphases.close(emphasis)
        elif kind == "image":
            source = str(child.attrs.get("src", ""))
            title = str(child.attrs.get("title", "") or "")
            shown = _parser().normalizeLinkText(source)
            content.images.append(_Image(shown, _plain_text(child.children), line, title))
        elif kind == "html_inline":
            _inline_html(child.content, content, emphases, line)
            if line is not None:
                line += child.content.count("\n")
        # link_open/close keep their text; footnote references are not text.
    return content


def _plain_text(children: list[Token] | None) -> str:
    """The text of an image's alt content (emphasis dropped, nested images' alt kept)."""
    parts: list[str] = []
    for child in children or ():
        if child.type in ("text", "code_inline"):
            parts.append(child.content)
        elif child.type in ("softbreak", "hardbreak"):
            parts.append(" ")
        elif child.type == "image":
            parts.append(_plain_text(child.children))
    return "".join(parts)


def _inline_html(markup: str, content: _Inline, emphases: _Emphases, line: int | None) -> None:
    parser = _Tag()
    try:
        parser.feed(markup)
        parser.close()
    except (AssertionError, ValueError):
        return
    for name, attrs, closing in parser.tags:
        if name == "img":
            content.images.append(_html_image(attrs, line))
        elif name == "br":
            content.runs.append((" ", NO_EMPHASIS))
        elif name in HTML_EMPHASIS:
            if closing:
                emphases.close(HTML_EMPHASIS[name])
            else:
                emphases.open(HTML_EMPHASIS[name])


def _html_image(attrs: dict[str, str], line: int | None) -> _Image:
    # HTML width/height are in CSS px; a display size in cm would need a DPI we do not know.
    return _Image(attrs.get("src", ""), attrs.get("alt", ""), line, attrs.get("title", ""))


def _is_caption(runs: list[Run]) -> bool:
    """Whether a paragraph after an image reads as its caption.

    Common practice in lesson layouts: it starts "Figure N" / "Fig. N", or it is set entirely
    in emphasis (``*A compost bin in layers*``).
    """
    pieces = [(text, emphasis) for text, emphasis in runs if text.strip()]
    if not pieces:
        return False
    if all(emphasis for _, emphasis in pieces):
        return True
    text = "".join(text for text, _ in runs).strip()
    for prefix in ("figure", "fig."):
        if text.lower().startswith(prefix):
            return text[len(prefix) :].lstrip()[:1].isdigit()
    return False


# -- HTML ----------------------------------------------------------------------------------------


class _Tag(HTMLParser):
    """Collect the tags of a fragment of inline HTML (one ``html_inline`` token)."""

    def __init__(self) -> None:
        super().__init__(convert_charrefs=True)
        self.tags: list[tuple[str, dict[str, str], bool]] = []

    def handle_starttag(self, tag: str, attrs: list[tuple[str, str | None]]) -> None:
        self.tags.append((tag, {key: value or "" for key, value in attrs}, False))

    def handle_endtag(self, tag: str) -> None:
        self.tags.append((tag, {}, True))


@dataclass
class _HtmlPiece:
    """One block of text from a raw HTML block."""

    kind: str  # the HTML element that holds it ("p", "h2", "figcaption", ...)
    runs: list[Run]
    line: int | None
    level: int = 0  # heading level for h1..h6


class _HtmlText(HTMLParser):
    """Reduce a raw HTML block to blocks of text with emphasis, and images, in order."""

    def __init__(self, base_line: int | None) -> None:
        super().__init__(convert_charrefs=True)
        self.base_line = base_line
        self.items: list[_HtmlPiece | _Image] = []
        self.emphases = _Emphases()
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
            self.items.append(_HtmlPiece(element, self.runs, self.line, level))
        self.runs, self.line = [], None

    def handle_starttag(self, tag: str, attrs: list[tuple[str, str | None]]) -> None:
        if tag in _HTML_HIDDEN_TAGS:
            self.hidden += 1
        elif tag == "img":
            values = {key: value or "" for key, value in attrs}
            self.items.append(_html_image(values, self._source_line()))
        elif tag == "br":
            self.runs.append((" ", NO_EMPHASIS))
        elif tag in HTML_EMPHASIS:
            self.emphases.open(HTML_EMPHASIS[tag])
        elif tag in _HTML_BLOCK_TAGS:
            self._flush()
            self.elements.append(tag)

    def handle_endtag(self, tag: str) -> None:
        if tag in _HTML_HIDDEN_TAGS:
            self.hidden = max(0, self.hidden - 1)
        elif tag in HTML_EMPHASIS:
            self.emphases.close(HTML_EMPHASIS[tag])
        elif tag in _HTML_BLOCK_TAGS:
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
