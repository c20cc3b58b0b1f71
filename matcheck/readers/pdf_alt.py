"""Alt text of PDF figures from the logical structure tree (tagged PDF).

A structure element with an /Alt entry (PDF 32000-1:2008, 14.9.3; a /Figure in practice) owns
marked-content sequences on a page, named by their MCID (14.7.4): an integer kid is an MCID
on the element's page (/Pg, inherited from the nearest ancestor that has one), a marked-content
reference dictionary (/Type /MCR) gives its own /MCID and maybe /Pg. The page reader looks up
the MCID around each image it meets. An untagged or broken tree simply gives no alt text.

Some producers (LibreOffice among them) write a /Figure element with /Alt and /Pg but no
content at all (no /K). Such alt texts are kept per page in document order
(:attr:`Tags.unattached`); the reader gives them to the page's images that have none, in
drawing order.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import TYPE_CHECKING, Any

from matcheck.readers.builder import normalize_text

if TYPE_CHECKING:
    from pypdf import PdfReader

# Structure elements visited at most: a lesson has a few thousand; a hostile tree gets cut.
_MAX_ELEMENTS = 200_000

# Page object number -> MCID -> alt text.
AltTexts = dict[int, dict[int, str]]


@dataclass
class Tags:
    """What the structure tree says: whether there is one, and the alt texts it holds."""

    tagged: bool = False
    by_mcid: AltTexts = field(default_factory=dict)
    # Page object number -> alt texts of elements with no marked content, in order.
    unattached: dict[int, list[str]] = field(default_factory=dict)


def _page_id(value: Any) -> int | None:
    return getattr(value, "idnum", None)


def alt_texts(reader: PdfReader) -> Tags:
    """Alt text per page object number and MCID, for every tagged element with /Alt."""
    tags = Tags()
    found = tags.by_mcid
    try:
        catalog: Any = reader.trailer["/Root"].get_object()
        root = catalog.get("/StructTreeRoot")
        if root is None:
            return tags
        tags.tagged = True
        stack: list[tuple[Any, int | None, str]] = [(root, None, "")]
        seen: set[int] = set()
        visited = 0
        while stack and visited < _MAX_ELEMENTS:
            visited += 1
            node, page, alt = stack.pop()
            if isinstance(node, int):
                if alt and page is not None:
                    found.setdefault(page, {}).setdefault(node, alt)
                continue
            reference = _page_id(node)
            if reference is not None:
                if reference in seen:
                    continue  # a cycle, or an element reached twice
                seen.add(reference)
            node = node.get_object()
            if isinstance(node, list):
                stack.extend((kid, page, alt) for kid in reversed(node))
                continue
            if not hasattr(node, "get"):
                continue
            page = _page_id(node.get("/Pg")) or page
            own = node.get("/Alt")
            if own is not None:
                alt = normalize_text(str(own)) or alt
                if node.get("/K") is None and alt and page is not None:
                    tags.unattached.setdefault(page, []).append(alt)
            if node.get("/Type") == "/MCR":
                mcid = node.get("/MCID")
                if isinstance(mcid, int) and alt and page is not None:
                    found.setdefault(page, {}).setdefault(mcid, alt)
                continue
            kids = node.get("/K")
            if kids is not None:
                stack.append((kids, page, alt))
    except Exception:
        # Whatever a broken tree raises (pypdf's own errors included): alt text is optional.
        return tags
    return tags
