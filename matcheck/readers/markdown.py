"""Read a Markdown lesson with a CommonMark parser (markdown-it-py), never with regexes.

The syntax is CommonMark 0.31.2 with GFM tables (docs/references.md §15).

The token stream of markdown-it (CommonMark, plus tables, YAML front matter, footnotes and a
small ``==highlight==`` rule) is walked once, in document order:

- headings, paragraphs, list items, table cells and footnotes become blocks;
- code blocks (fenced or indented) become code blocks, one CODE block per non-empty line;
- a ``title:`` in the YAML front matter is the document's title, above every ``#`` heading
  (as pandoc and static-site generators show it);
- raw HTML is reduced to its text, and HTML emphasis tags (``<u>``, ``<mark>``, ...) count
  (:mod:`matcheck.readers.html_text`);
- every image becomes a figure. Local images are measured from their header only; remote
  ones are never fetched; files outside the lesson's folder are not opened unless allowed
  (:mod:`matcheck.readers.image_paths`).
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass, field
from functools import cache
from pathlib import Path

from markdown_it import MarkdownIt
from markdown_it.rules_inline.state_inline import Delimiter, StateInline
from markdown_it.token import Token

from matcheck.errors import CorruptFile
from matcheck.limits import ReadLimits
from matcheck.model import BlockKind, Document, Emphasis
from matcheck.readers.builder import NO_EMPHASIS, DocumentBuilder, Run
from matcheck.readers.decode import read_lesson_text
from matcheck.readers.html_text import (
    HtmlUnreadable,
    OpenEmphases,
    read_html_block,
    read_html_inline,
)
from matcheck.readers.image_paths import ImageRef, ImageSandbox
from matcheck.readers.markdown_meta import front_matter_title

# markdown-it token pairs that carry emphasis (``mark`` comes from the rule below).
_TOKEN_EMPHASIS = {"strong": Emphasis.BOLD, "em": Emphasis.ITALIC, "mark": Emphasis.HIGHLIGHT}
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
class _Inline:
    """The text runs and images of one inline token."""

    runs: list[Run] = field(default_factory=list)
    images: list[ImageRef] = field(default_factory=list)

    @property
    def has_text(self) -> bool:
        return any(text.strip() for text, _ in self.runs)


class _Walker:
    """Walk the block tokens once and feed the builder."""

    def __init__(self, builder: DocumentBuilder, path: Path, limits: ReadLimits) -> None:
        self.builder = builder
        self.images = ImageSandbox.for_lesson(path, limits)
        self.lists: list[int] = []  # group ids of the open lists, outermost first
        self.table: int | None = None
        self.footnote: list[Run] | None = None
        self.footnote_line: int | None = None
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
                self._code(token)
            elif kind == "front_matter":
                self._front_matter(token)
            elif kind == "html_block":
                self._html_block(token)
            elif kind == "footnote_open":
                self.footnote, self.footnote_line = [], None
            elif kind == "footnote_close" and self.footnote is not None:
                self.builder.add_block(BlockKind.FOOTNOTE, self.footnote, line=self.footnote_line)
                self.footnote = None
            elif kind == "inline" and index not in self.consumed:
                self._inline_block(tokens, index)

    # -- blocks ------------------------------------------------------------------------------

    def _code(self, token: Token) -> None:
        """A fenced or indented code block: one CODE block per line, one group per block."""
        group = self.builder.new_group()
        # A fence's content starts on the line after the opening fence.
        first = token.map[0] + 1 + (token.type == "fence") if token.map else None
        for offset, line in enumerate(token.content.splitlines()):
            number = None if first is None else first + offset
            self.builder.add_block(BlockKind.CODE, line, group=group, line=number)

    def _front_matter(self, token: Token) -> None:
        """The front matter's ``title:`` as a heading above the document's ``#`` headings."""
        title = front_matter_title(token.content)
        if title:
            self.builder.add_block(BlockKind.HEADING, title, level=0, line=1)

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

    def _figures_with_titles(self, images: list[ImageRef]) -> None:
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
        try:
            items = read_html_block(token.content, base)
        except HtmlUnreadable:
            self.builder.warn("an HTML block could not be parsed; its text was left out")
            return
        for item in items:
            if isinstance(item, ImageRef):
                self._figure(item)
            elif item.kind == "figcaption":
                self._caption(item.runs, item.line)
            else:
                self._body(item.runs, item.line, item.level)

    # -- figures -----------------------------------------------------------------------------

    def _figure(self, image: ImageRef, caption: str = "") -> None:
        found = self.images.locate(image.source)
        if found.warning:
            self.builder.warn(found.warning)
        self.builder.add_figure(
            found.source,
            width_px=found.size[0] if found.size else None,
            height_px=found.size[1] if found.size else None,
            display_width_cm=image.width_cm,
            display_height_cm=image.height_cm,
            alt_text=image.alt,
            caption=caption,
            remote=found.remote,
            readable=found.readable,
            line=image.line,
        )


# -- inline content ------------------------------------------------------------------------------


def _inline_content(token: Token, line: int | None) -> _Inline:
    """Runs of text with their emphasis, and the images, of one inline token."""
    content = _Inline()
    emphases = OpenEmphases()
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
            content.images.append(ImageRef(shown, _plain_text(child.children), line, title))
        elif kind == "html_inline":
            html = read_html_inline(child.content, emphases, line)
            content.runs.extend(html.runs)
            content.images.extend(html.images)
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
