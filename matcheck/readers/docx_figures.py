"""Pictures in a DOCX: DrawingML (inline and floating) and legacy VML.

A picture's bytes come from the part its relationship points to; only the image header is
read (:func:`matcheck.readers.images.image_size`). A linked picture points outside the package
and is counted as remote, never fetched.
"""

from __future__ import annotations

import re
from dataclasses import dataclass, replace
from typing import TYPE_CHECKING

from matcheck.readers.docx_xml import (
    OFFICE,
    PIC,
    R_NS,
    VML,
    WP,
    A,
    Element,
    belongs_to,
)
from matcheck.readers.images import image_size

if TYPE_CHECKING:
    from docx.opc.part import Part

# ECMA-376 20.1.2.1: 914400 EMU per inch, so 360000 EMU per centimetre.
_EMU_PER_CM = 360_000
# CSS/VML length units in centimetres (1 in = 2.54 cm = 72 pt = 96 px, CSS 2.1 §4.3.2).
_CM_PER_UNIT = {"cm": 1.0, "mm": 0.1, "in": 2.54, "pt": 2.54 / 72, "pc": 2.54 / 6, "px": 2.54 / 96}
_VML_LENGTH = re.compile(r"\s*(width|height)\s*:\s*([0-9.]+)\s*([a-z]*)", re.IGNORECASE)


@dataclass(frozen=True, slots=True)
class FigureInfo:
    """What :meth:`DocumentBuilder.add_figure` needs, plus a warning for unreadable bytes."""

    source: str
    width_px: int | None = None
    height_px: int | None = None
    display_width_cm: float | None = None
    display_height_cm: float | None = None
    alt_text: str = ""
    remote: bool = False
    readable: bool = True
    warning: str | None = None


def _image(part: Part, rid: str | None) -> FigureInfo:
    """Source, pixel size and readability of the image a relationship id points to."""
    rel = part.rels.get(rid) if rid else None
    if rel is None:
        return FigureInfo(
            source=rid or "(no image reference)",
            readable=False,
            warning=f"a picture refers to an image that is not in the file ({rid or 'no id'})",
        )
    if rel.is_external:
        return FigureInfo(source=str(rel.target_ref), remote=True)
    target = rel.target_part
    name = str(target.partname)
    size = image_size(target.blob)
    if size is None:
        return FigureInfo(
            source=name, readable=False, warning=f"the picture {name} cannot be read as an image"
        )
    return FigureInfo(source=name, width_px=size[0], height_px=size[1])


def _cm(value: str | None) -> float | None:
    if value is None or not value.isdigit():
        return None
    return int(value) / _EMU_PER_CM


def drawing_figures(drawing: Element, part: Part) -> list[FigureInfo]:
    """Figures of one ``w:drawing`` (each ``wp:inline``/``wp:anchor`` holding a picture)."""
    figures: list[FigureInfo] = []
    for frame in drawing.iterchildren(WP + "inline", WP + "anchor"):
        blips = [blip for blip in frame.iter(A + "blip") if belongs_to(blip, frame)]
        if not blips:
            continue  # a shape or text box, not a picture
        doc_pr = frame.find(WP + "docPr")
        alt = ""
        if doc_pr is not None:
            alt = doc_pr.get("descr") or doc_pr.get("title") or ""
        extent = frame.find(WP + "extent")
        for blip in blips:
            # Several pictures in one group: each has its own extent in its shape properties.
            single = len(blips) == 1 and extent is not None
            size = extent if single else _picture_extent(blip)
            rid = blip.get(R_NS + "embed") or blip.get(R_NS + "link")
            info = _image(part, rid)
            figures.append(
                _with(
                    info,
                    alt,
                    _cm(None if size is None else size.get("cx")),
                    _cm(None if size is None else size.get("cy")),
                )
            )
    return figures


def _picture_extent(blip: Element) -> Element | None:
    for ancestor in blip.iterancestors(PIC + "pic"):
        return ancestor.find(f"{PIC}spPr/{A}xfrm/{A}ext")
    return None


def vml_figures(pict: Element, part: Part) -> list[FigureInfo]:
    """Figures of one legacy ``w:pict`` (``v:imagedata`` inside a VML shape)."""
    figures: list[FigureInfo] = []
    for data in pict.iter(VML + "imagedata"):
        if not belongs_to(data, pict):
            continue
        shape = data.getparent()
        rid = data.get(R_NS + "id") or data.get(R_NS + "href") or data.get(R_NS + "pict")
        info = _image(part, rid)
        lengths = {
            match.group(1).lower(): _css_cm(match.group(2), match.group(3))
            for match in _VML_LENGTH.finditer(shape.get("style") or "")
        }
        alt = shape.get("alt") or data.get(OFFICE + "title") or ""
        figures.append(_with(info, alt, lengths.get("width"), lengths.get("height")))
    return figures


def _css_cm(number: str, unit: str) -> float | None:
    factor = _CM_PER_UNIT.get(unit.lower() or "px")
    try:
        return float(number) * factor if factor is not None else None
    except ValueError:
        return None


def _with(
    info: FigureInfo, alt: str, width_cm: float | None, height_cm: float | None
) -> FigureInfo:
    return replace(info, alt_text=alt, display_width_cm=width_cm, display_height_cm=height_cm)
