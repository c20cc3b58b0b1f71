"""WordprocessingML names and small XML helpers shared by the DOCX reader modules.

Elements are lxml elements as python-docx parses them. lxml ships no type stubs here, so an
element is typed :data:`Element` (``Any``) rather than silencing the import in every module.
"""

from __future__ import annotations

from collections.abc import Iterator
from typing import Any, TypeAlias

Element: TypeAlias = Any

_W = "{http://schemas.openxmlformats.org/wordprocessingml/2006/main}"
_MC = "{http://schemas.openxmlformats.org/markup-compatibility/2006}"
R_NS = "{http://schemas.openxmlformats.org/officeDocument/2006/relationships}"
WP = "{http://schemas.openxmlformats.org/drawingml/2006/wordprocessingDrawing}"
A = "{http://schemas.openxmlformats.org/drawingml/2006/main}"
PIC = "{http://schemas.openxmlformats.org/drawingml/2006/picture}"
VML = "{urn:schemas-microsoft-com:vml}"
OFFICE = "{urn:schemas-microsoft-com:office:office}"
M = "{http://schemas.openxmlformats.org/officeDocument/2006/math}"


def w(name: str) -> str:
    """Clark name of a WordprocessingML element or attribute, e.g. ``w('p')``."""
    return _W + name


MC_ALTERNATE = _MC + "AlternateContent"
MC_CHOICE = _MC + "Choice"
MC_FALLBACK = _MC + "Fallback"
TXBX_CONTENT = w("txbxContent")


def val(element: Element | None, attribute: str = "val") -> str | None:
    """The ``w:val`` (or another ``w:`` attribute) of an optional element."""
    if element is None:
        return None
    value = element.get(w(attribute))
    return None if value is None else str(value)


def on_off(element: Element | None) -> bool | None:
    """An ST_OnOff property: ``None`` when absent; a bare element means on (ECMA-376 17.17.4)."""
    if element is None:
        return None
    value = val(element)
    return value is None or value.lower() not in {"0", "false", "off"}


def alternate(element: Element) -> Element | None:
    """The branch of ``mc:AlternateContent`` to read: the first ``mc:Choice``, else the fallback.

    Reading one branch only keeps a text box or picture from counting twice (Word writes a
    DrawingML choice and a VML fallback of the same content).
    """
    choice = element.find(MC_CHOICE)
    return choice if choice is not None else element.find(MC_FALLBACK)


def belongs_to(descendant: Element, root: Element) -> bool:
    """Whether ``descendant`` is ``root``'s own, not inside a text box or fallback within it."""
    node = descendant.getparent()
    while node is not None and node is not root:
        if node.tag in (TXBX_CONTENT, MC_FALLBACK):
            return False
        node = node.getparent()
    return True


# Block-level wrappers whose children are ordinary paragraphs and tables.
_BLOCK_WRAPPERS = {w("customXml"), w("ins"), w("moveTo")}


def block_children(container: Element) -> Iterator[Element]:
    """The ``w:p`` and ``w:tbl`` of a story in document order, through content controls."""
    for child in container.iterchildren():
        tag = child.tag
        if tag in (w("p"), w("tbl")):
            yield child
        elif tag == w("sdt"):
            content = child.find(w("sdtContent"))
            if content is not None:
                yield from block_children(content)
        elif tag in _BLOCK_WRAPPERS:
            yield from block_children(child)
        elif tag == MC_ALTERNATE:
            branch = alternate(child)
            if branch is not None:
                yield from block_children(branch)
        elif tag == w("altChunk"):
            # Imported foreign content (HTML, RTF) that Word converts only when it opens the
            # file; its text is not WordprocessingML, so the caller reports it.
            yield child


def table_children(element: Element, tag: str) -> Iterator[Element]:
    """Rows of a table or cells of a row (``tag``), through content controls and custom XML."""
    for child in element.iterchildren():
        if child.tag == tag:
            yield child
        elif child.tag == w("sdt"):
            content = child.find(w("sdtContent"))
            if content is not None:
                yield from table_children(content, tag)
        elif child.tag == w("customXml"):
            yield from table_children(child, tag)
