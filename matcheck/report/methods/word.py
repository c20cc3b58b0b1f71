"""The table as a Word document in APA 7 table style (docs/references.md §11).

APA 7 style: the number in bold, the title in italics, horizontal rules only, a note below.
python-docx is imported inside the functions, so the CLI starts without it.
"""

from __future__ import annotations

import io
from typing import TYPE_CHECKING

from matcheck.report.formatter import RenderOptions
from matcheck.report.methods.model import MethodsTable

if TYPE_CHECKING:
    from docx.document import Document as DocxDocument
    from docx.table import Table as DocxTable
    from docx.table import _Cell

_RULE = {"val": "single", "sz": "4", "space": "0", "color": "auto"}  # 1/2 pt, Word's default
# The elements that may follow w:tblBorders in w:tblPr and w:tcBorders in w:tcPr (ECMA-376).
_AFTER_TBL_BORDERS = (
    "w:shd",
    "w:tblLayout",
    "w:tblCellMar",
    "w:tblLook",
    "w:tblCaption",
    "w:tblDescription",
    "w:tblPrChange",
)
_AFTER_TC_BORDERS = (
    "w:shd",
    "w:noWrap",
    "w:tcMar",
    "w:textDirection",
    "w:tcFitText",
    "w:vAlign",
    "w:hideMark",
    "w:headers",
    "w:cellIns",
    "w:cellDel",
    "w:cellMerge",
    "w:tcPrChange",
)


def _xml_safe(table: MethodsTable) -> MethodsTable:
    """The table without characters a Word document cannot hold (escape.xml_text)."""
    from dataclasses import replace

    from matcheck.report.escape import xml_text

    def clean(texts: tuple[str, ...]) -> tuple[str, ...]:
        return tuple(xml_text(text) for text in texts)

    rows = tuple(
        replace(
            row,
            label=xml_text(row.label),
            values=clean(row.values),
            difference=xml_text(row.difference),
            verdict=xml_text(row.verdict),
            contrasts=clean(row.contrasts),
        )
        for row in table.rows
    )
    return replace(
        table,
        title=xml_text(table.title),
        columns=clean(table.columns),
        contrasts=tuple(
            replace(c, reference=xml_text(c.reference), condition=xml_text(c.condition))
            for c in table.contrasts
        ),
        rows=rows,
        notes=clean(table.notes),
    )


def render_docx(table: MethodsTable, options: RenderOptions | None = None) -> bytes:
    """The table as a Word document (its bytes) in APA 7 table style."""
    from docx import Document
    from docx.enum.text import WD_ALIGN_PARAGRAPH

    table = _xml_safe(table)
    document = Document()
    document.core_properties.title = table.title
    if len(table.header) > _PORTRAIT_COLUMNS:
        _landscape(document)
    document.add_paragraph().add_run(f"Table {table.number}").bold = True
    document.add_paragraph().add_run(table.title).italic = True
    width = len(table.header)
    right = range(1, width - 1)  # condition values and the difference are numbers
    grid = document.add_table(rows=1, cols=width)
    _set_rules(grid)
    _mark_header(grid)
    for index, (cell, text) in enumerate(zip(grid.rows[0].cells, table.header, strict=True)):
        _fill(cell, text, right=index in right)
        _rule_below(cell)
    for _, rows in table.groups():
        cells = grid.add_row().cells
        spanner = cells[0].merge(cells[-1])
        spanner.paragraphs[0].add_run(rows[0].group_label).italic = True
        for row in rows:
            texts = row.cells
            for index, (cell, text) in enumerate(zip(grid.add_row().cells, texts, strict=True)):
                _fill(cell, text, right=index in right)
    note = document.add_paragraph()
    note.add_run("Note.").italic = True
    note.add_run(f" {table.note}")
    note.alignment = WD_ALIGN_PARAGRAPH.LEFT
    for entry in table.accepted:
        accepted = document.add_paragraph()
        accepted.add_run("Accepted.").italic = True
        accepted.add_run(f" {entry.sentence}")
    buffer = io.BytesIO()
    document.save(buffer)
    return buffer.getvalue()


# A column per condition and per contrast: past this many columns the table no longer fits a
# portrait page at a readable size (about 2 cm a column on A4/Letter; a judgment call, common
# practice); APA 7 style lets a wide table stand on a landscape page (from memory).
_PORTRAIT_COLUMNS = 8


def _landscape(document: DocxDocument) -> None:
    from docx.enum.section import WD_ORIENT

    section = document.sections[0]
    width, height = section.page_width, section.page_height
    section.orientation = WD_ORIENT.LANDSCAPE
    if width is not None and height is not None and width < height:
        section.page_width, section.page_height = height, width


def _fill(cell: _Cell, text: str, *, right: bool) -> None:
    from docx.enum.text import WD_ALIGN_PARAGRAPH

    paragraph = cell.paragraphs[0]
    paragraph.add_run(text)
    paragraph.alignment = WD_ALIGN_PARAGRAPH.RIGHT if right else WD_ALIGN_PARAGRAPH.LEFT


def _border(tag: str, rule: dict[str, str] | None) -> object:
    from docx.oxml import OxmlElement
    from docx.oxml.ns import qn

    element = OxmlElement(f"w:{tag}")
    for key, value in (rule or {"val": "nil"}).items():
        element.set(qn(f"w:{key}"), value)
    return element


def _set_rules(grid: DocxTable) -> None:
    """Top and bottom rules only: APA 7 tables have no vertical lines and no inner grid."""
    from docx.oxml import OxmlElement
    from docx.oxml.ns import qn

    properties = grid._tbl.tblPr
    for old in properties.findall(qn("w:tblBorders")):
        properties.remove(old)
    borders = OxmlElement("w:tblBorders")
    # Child order is fixed by the schema (ECMA-376 Part 1, 17.4.39 and 17.4.60); Word
    # rejects a file whose elements are out of order.
    for tag in ("top", "left", "bottom", "right", "insideH", "insideV"):
        borders.append(_border(tag, _RULE if tag in ("top", "bottom") else None))
    properties.insert_element_before(borders, *_AFTER_TBL_BORDERS)


def _rule_below(cell: _Cell) -> None:
    from docx.oxml import OxmlElement

    borders = OxmlElement("w:tcBorders")
    borders.append(_border("bottom", _RULE))
    cell._tc.get_or_add_tcPr().insert_element_before(borders, *_AFTER_TC_BORDERS)


def _mark_header(grid: DocxTable) -> None:
    """Repeat the header row on every page the table spans."""
    from docx.oxml import OxmlElement

    grid.rows[0]._tr.get_or_add_trPr().append(OxmlElement("w:tblHeader"))
