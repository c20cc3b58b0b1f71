"""Turn the stories of a DOCX (body, text boxes, notes) into blocks, in document order.

A story is a sequence of paragraphs and tables. Text boxes are separate stories, read after
the paragraph that anchors them. Tracked changes are read as accepted: deleted text is left
out, inserted text kept. Hidden text (``w:vanish``) is not shown to learners and is skipped.
"""

from __future__ import annotations

import re
from dataclasses import dataclass, field
from typing import TYPE_CHECKING

from matcheck.model import BlockKind, Emphasis
from matcheck.readers.builder import NO_EMPHASIS, DocumentBuilder, Run, normalize_text
from matcheck.readers.docx_code import CodeFonts
from matcheck.readers.docx_figures import FigureInfo, drawing_figures, vml_figures
from matcheck.readers.docx_styles import ListInfo, StyleSheet
from matcheck.readers.docx_xml import (
    MC_ALTERNATE,
    TXBX_CONTENT,
    Element,
    M,
    alternate,
    belongs_to,
    block_children,
    table_children,
    val,
    w,
)

if TYPE_CHECKING:
    from docx.opc.part import Part

# "Figure 3", "Fig. 3": the usual label of a caption typed as a plain paragraph.
_FIGURE_LABEL = re.compile(r"(?:figure|fig\.)\s*\d", re.IGNORECASE)
# A caption labelled "Table N" belongs to a table, not to the last picture.
_TABLE_LABEL = re.compile(r"table\s*\d", re.IGNORECASE)
# Inline containers whose runs are shown: links, insertions, moves' new place, simple fields
# (their runs are the displayed result), smart tags, custom XML, bidi wrappers.
_INLINE_WRAPPERS = {
    w(name)
    for name in ("hyperlink", "ins", "moveTo", "fldSimple", "smartTag", "customXml", "dir", "bdo")
}
_SPACES = {w("tab"), w("ptab")}
# A line break: a space in prose, the end of a line in code.
_BREAKS = {w("br"), w("cr")}


@dataclass
class _Content:
    runs: list[Run] = field(default_factory=list)
    figures: list[FigureInfo] = field(default_factory=list)
    boxes: list[Element] = field(default_factory=list)
    # Visible characters, and those of them set in a monospace font (code).
    characters: int = 0
    monospace: int = 0

    @property
    def text(self) -> str:
        return normalize_text("".join(text for text, _ in self.runs))


@dataclass
class _OpenList:
    group: int
    level: int
    keys: set[str]


class StoryReader:
    """Reads stories of one part (``part`` resolves its picture relationships)."""

    def __init__(self, builder: DocumentBuilder, styles: StyleSheet, part: Part) -> None:
        self.builder = builder
        self.styles = styles
        self.code = CodeFonts(styles)
        self.part = part
        # One entry per open complex field: True while in its instructions (not displayed).
        self._fields: list[bool] = []
        self._list: _OpenList | None = None
        self._after_picture = False
        # The group of the code block being read (consecutive code paragraphs are one block).
        self._code: int | None = None

    def read_story(self, container: Element) -> None:
        saved = self._fields, self._list, self._after_picture
        self._fields, self._list, self._after_picture = [], None, False
        for element in block_children(container):
            if element.tag == w("p"):
                self._paragraph(element)
            elif element.tag == w("tbl"):
                self._table(element)
                self._list, self._after_picture, self._code = None, False, None
            else:
                self.builder.warn("imported content (altChunk) in the file was not read")
        self._fields, self._list, self._after_picture = saved

    def read_note(self, note: Element) -> None:
        """A footnote or endnote: one FOOTNOTE block."""
        self._emit(BlockKind.FOOTNOTE, *self._collect(note), None)

    # -- paragraphs -------------------------------------------------------------------------

    def _paragraph(self, paragraph: Element) -> None:
        style_id = self.styles.paragraph_style(paragraph)
        content = _Content()
        self._inline(paragraph, content, style_id)
        text = content.text
        if text and self._is_code(paragraph, style_id, content):
            self._code_lines(content)
        elif text:
            self._code = None
            kind, level, group = self._classify(paragraph, style_id, text)
            block = self.builder.add_block(kind, content.runs, level=level, group=group)
            if block is not None and kind is BlockKind.CAPTION:
                self._caption(block.text)
        self._add_figures(content.figures)
        if text or content.figures:
            self._after_picture = bool(content.figures)
        for box in content.boxes:
            self.read_story(box)

    def _is_code(self, paragraph: Element, style_id: str | None, content: _Content) -> bool:
        """A paragraph in a code style, or with every visible character monospace.

        Headings and list items stay what they are, whatever their font.
        """
        if self.styles.heading_level(paragraph, style_id) is not None:
            return False
        if self.code.is_code_style(style_id):
            return True
        if self.code.body_monospace:
            return False
        return content.characters > 0 and content.monospace == content.characters

    def _code_lines(self, content: _Content) -> None:
        """One code block per run of code paragraphs; one CODE block per line (``w:br``)."""
        if self._code is None:
            self._code = self.builder.new_group()
        self._list = None
        raw = "".join(text for text, _ in content.runs)
        for line in raw.split("\n"):
            # Highlighting inside code (bold keywords) is not emphasis: the line is plain.
            self.builder.add_block(BlockKind.CODE, line, group=self._code)
        self._add_figures(content.figures)

    def _classify(
        self, paragraph: Element, style_id: str | None, text: str
    ) -> tuple[BlockKind, int, int | None]:
        heading = self.styles.heading_level(paragraph, style_id)
        info = None if heading is not None else self.styles.list_info(paragraph, style_id)
        if info is None:
            self._list = None  # a paragraph between list items ends the list
        if heading is not None:
            return BlockKind.HEADING, heading, None
        if self.styles.is_caption(style_id) or (self._after_picture and _FIGURE_LABEL.match(text)):
            return BlockKind.CAPTION, 0, None
        if info is not None:
            return BlockKind.LIST_ITEM, info.level, self._list_group(info)
        return BlockKind.PARAGRAPH, 0, None

    def _list_group(self, info: ListInfo) -> int:
        """One group per list; a deeper item (a nested list) stays in the list around it."""
        current = self._list
        if current is None or not (info.key in current.keys or info.level > current.level):
            current = _OpenList(self.builder.new_group(), info.level, set())
            self._list = current
        current.keys.add(info.key)
        current.level = info.level
        return current.group

    def _caption(self, text: str) -> None:
        if _TABLE_LABEL.match(text):
            return
        self.builder.caption_latest(text)

    def _add_figures(self, figures: list[FigureInfo]) -> None:
        for info in figures:
            self.builder.add_figure(
                info.source,
                width_px=info.width_px,
                height_px=info.height_px,
                display_width_cm=info.display_width_cm,
                display_height_cm=info.display_height_cm,
                alt_text=info.alt_text,
                remote=info.remote,
                readable=info.readable,
            )
            if info.warning:
                self.builder.warn(info.warning)

    # -- runs -------------------------------------------------------------------------------

    def _inline(self, element: Element, content: _Content, style_id: str | None) -> None:
        for child in element.iterchildren():
            tag = child.tag
            if tag == w("r"):
                rpr = child.find(w("rPr"))
                emphasis, hidden = self.styles.emphasis(rpr, style_id)
                self._run(child, content, emphasis, hidden, self.code.monospace(rpr, style_id))
            elif tag in _INLINE_WRAPPERS:
                self._inline(child, content, style_id)
            elif tag == w("sdt"):
                inner = child.find(w("sdtContent"))
                if inner is not None:
                    self._inline(inner, content, style_id)
            elif tag == MC_ALTERNATE:
                branch = alternate(child)
                if branch is not None:
                    self._inline(branch, content, style_id)
            elif tag in (M + "oMath", M + "oMathPara"):
                maths = "".join(node.text or "" for node in child.iter(M + "t"))
                content.runs.append((f" {maths} ", NO_EMPHASIS))
            # w:del and w:moveFrom (deleted text), bookmarks, proofing marks: nothing shown.

    def _run(
        self,
        run: Element,
        content: _Content,
        emphasis: frozenset[Emphasis],
        hidden: bool,
        monospace: bool = False,
    ) -> None:
        for child in run.iterchildren():
            tag = child.tag
            if tag == w("fldChar"):
                self._field(val(child, "fldCharType"))
            elif hidden or any(self._fields):
                continue
            elif tag == w("t"):
                text = child.text or ""
                content.runs.append((text, emphasis))
                visible = len(text) - text.count(" ")
                content.characters += visible
                content.monospace += visible if monospace else 0
            elif tag in _BREAKS:
                content.runs.append(("\n", emphasis))
            elif tag in _SPACES:
                content.runs.append((" ", emphasis))
            elif tag == w("noBreakHyphen"):
                content.runs.append(("-", emphasis))
            elif tag == w("drawing"):
                content.figures += drawing_figures(child, self.part)
                content.boxes += _text_boxes(child)
            elif tag == w("pict"):
                content.figures += vml_figures(child, self.part)
                content.boxes += _text_boxes(child)
            elif tag == MC_ALTERNATE:
                branch = alternate(child)
                if branch is not None:
                    self._run(branch, content, emphasis, hidden, monospace)

    def _field(self, kind: str | None) -> None:
        # Complex fields (ECMA-376 17.16.18): begin, instructions, separate, result, end.
        if kind == "begin":
            self._fields.append(True)
        elif kind == "separate" and self._fields:
            self._fields[-1] = False
        elif kind == "end" and self._fields:
            self._fields.pop()

    # -- tables and notes -------------------------------------------------------------------

    def _table(self, table: Element) -> None:
        group: int | None = None
        for row in table_children(table, w("tr")):
            if row.find(f"{w('trPr')}/{w('del')}") is not None:
                continue  # a row deleted with tracked changes
            for cell in table_children(row, w("tc")):
                if _continues_merge(cell):
                    continue  # a merged cell is counted once, at its first grid cell
                content, nested = self._collect(cell)
                if group is None and content.text:
                    group = self.builder.new_group()
                self._emit(BlockKind.TABLE_CELL, content, nested, group)

    def _collect(self, container: Element) -> tuple[_Content, list[Element]]:
        """All paragraphs of a cell or note as one content; its nested tables apart."""
        content = _Content()
        nested: list[Element] = []
        for element in block_children(container):
            if element.tag == w("p"):
                content.runs.append((" ", NO_EMPHASIS))
                self._inline(element, content, self.styles.paragraph_style(element))
            elif element.tag == w("tbl"):
                nested.append(element)
        return content, nested

    def _emit(
        self, kind: BlockKind, content: _Content, nested: list[Element], group: int | None
    ) -> None:
        self.builder.add_block(kind, content.runs, group=group)
        self._add_figures(content.figures)
        for box in content.boxes:
            self.read_story(box)
        for table in nested:
            self._table(table)


def _continues_merge(cell: Element) -> bool:
    props = cell.find(w("tcPr"))
    if props is None:
        return False
    for tag in ("vMerge", "hMerge"):
        merge = props.find(w(tag))
        if merge is not None and val(merge) in (None, "continue"):
            return True
    return False


def _text_boxes(element: Element) -> list[Element]:
    """Text box stories directly inside a drawing or VML picture (nested ones come later)."""
    return [box for box in element.iter(TXBX_CONTENT) if belongs_to(box, element)]
