"""One pass over a PDF page: its positioned text fragments and the images drawn on it.

pypdf's ``extract_text`` walks the content stream once; its ``visitor_text`` callback gives
each piece of text with the text matrix and CTM where it starts, and ``visitor_operand_before``
sees every operator, so the images are found in the same walk (the page is never parsed twice):

- at ``Do`` of an image XObject the CTM maps the unit square onto the page (PDF 32000-1:2008,
  8.3.4 and 8.9.5), so its scale is the displayed size in points; the pixel size is the
  image dictionary's /Width and /Height, read without decoding the image;
- at ``Do`` of a form XObject the form's /Matrix is composed with the CTM (8.10.1), and the
  text and images inside the form are placed with it (pypdf starts each form at identity);
- an inline image (``BI``/``ID``/``EI``) is the unit square under the CTM as well;
- the marked content (``BDC``/``EMC``) around an image names its structure element, whose
  /Alt is the image's alt text (14.7.4, 14.9.3).

Positions are in PDF user space (points, y upwards).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import TYPE_CHECKING, Any

from matcheck.model import Emphasis

if TYPE_CHECKING:
    from pypdf import PageObject

    from matcheck.readers.pdf_fonts import FontStyles

Matrix = tuple[float, float, float, float, float, float]
IDENTITY: Matrix = (1.0, 0.0, 0.0, 1.0, 0.0, 0.0)
# 1 pt = 1/72 inch (PDF 32000-1:2008, 8.3.2.3) and 1 inch = 2.54 cm.
CM_PER_POINT = 2.54 / 72


def multiply(m: Matrix, n: Matrix) -> Matrix:
    """``m × n`` for PDF's row-vector matrices ``[a b c d e f]`` (apply m, then n)."""
    return (
        m[0] * n[0] + m[1] * n[2],
        m[0] * n[1] + m[1] * n[3],
        m[2] * n[0] + m[3] * n[2],
        m[2] * n[1] + m[3] * n[3],
        m[4] * n[0] + m[5] * n[2] + n[4],
        m[4] * n[1] + m[5] * n[3] + n[5],
    )


def as_matrix(value: Any) -> Matrix:
    """Six numbers as a matrix; anything else is the identity (a broken operand)."""
    try:
        numbers = [float(item) for item in value]
    except (TypeError, ValueError):
        return IDENTITY
    if len(numbers) != 6 or not all(math.isfinite(item) for item in numbers):
        return IDENTITY
    return (numbers[0], numbers[1], numbers[2], numbers[3], numbers[4], numbers[5])


@dataclass(frozen=True, slots=True)
class Fragment:
    """A piece of text as pypdf reports it: one font, starting at (x, y) on its baseline."""

    text: str
    x: float
    y: float
    size: float
    emphasis: frozenset[Emphasis]
    # Set in a monospace font (code).
    monospace: bool = False


@dataclass(frozen=True, slots=True)
class PlacedImage:
    """An image drawn on a page; ``top``/``bottom`` bound it in user space."""

    source: str
    width_px: int | None
    height_px: int | None
    width_cm: float | None
    height_cm: float | None
    top: float
    bottom: float
    alt_text: str = ""

    @property
    def center(self) -> float:
        return (self.top + self.bottom) / 2


@dataclass(slots=True)
class PageContent:
    number: int
    top: float
    bottom: float
    fragments: list[Fragment] = field(default_factory=list)
    images: list[PlacedImage] = field(default_factory=list)


@dataclass(frozen=True, slots=True)
class _Frame:
    """The resources and base CTM of the page or of a form being drawn."""

    resources: Any
    base: Matrix


def _positive_int(value: Any) -> int | None:
    try:
        number = int(value)
    except (TypeError, ValueError):
        return None
    return number if number > 0 else None


def _resolve(value: Any) -> Any:
    return value.get_object() if hasattr(value, "get_object") else value


class _Collector:
    def __init__(
        self,
        content: PageContent,
        resources: Any,
        styles: FontStyles,
        alt: dict[int, str],
    ) -> None:
        self.content = content
        self.styles = styles
        self._alt = alt
        # Marked content open around the current operator: its MCID or /Alt, if any.
        self._marked: list[tuple[int | None, str]] = []
        self._frames = [_Frame(resources, IDENTITY)]
        # A form's frame starts with the form's first operator: text pypdf flushes at the
        # ``Do`` itself still belongs to the enclosing content.
        self._pending: _Frame | None = None
        self._entered: list[bool] = []
        self._inline = 0

    def on_text(self, text: Any, cm: Any, tm: Any, font: Any, font_size: Any) -> None:
        if not text:
            return
        text = str(text).rstrip("\n").replace("\n", " ").replace("\r", " ")
        if not text:
            return
        m = multiply(multiply(as_matrix(tm), as_matrix(cm)), self._frames[-1].base)
        try:
            size = float(font_size) * math.hypot(m[2], m[3])
        except (TypeError, ValueError):
            size = 0.0
        if not math.isfinite(size):
            size = 0.0
        fragment = Fragment(
            text, m[4], m[5], size, self.styles.emphasis(font), self.styles.monospace(font)
        )
        self.content.fragments.append(fragment)

    def before(self, operator: Any, operands: Any, cm: Any, tm: Any) -> None:
        if self._pending is not None:
            self._frames.append(self._pending)
            self._entered[-1] = True
            self._pending = None
        if operator == b"Do":
            self._do(operands, as_matrix(cm))
        elif operator == b"INLINE IMAGE":
            self._inline_image(operands, as_matrix(cm))
        elif operator in (b"BDC", b"BMC"):
            self._marked.append(self._marked_content(operands if operator == b"BDC" else []))
        elif operator == b"EMC" and self._marked:
            self._marked.pop()

    def _marked_content(self, operands: Any) -> tuple[int | None, str]:
        """The MCID and /Alt of a BDC property list (inline or named in /Properties)."""
        try:
            properties = _resolve(operands[1]) if len(operands) > 1 else None
            if properties is not None and not hasattr(properties, "get"):
                named = _resolve(_resolve(self._frames[-1].resources).get("/Properties"))
                properties = _resolve(named.get(properties)) if named is not None else None
            if properties is None:
                return None, ""
            mcid = properties.get("/MCID")
            alt = properties.get("/Alt")
        except (AttributeError, TypeError, ValueError, KeyError, IndexError):
            return None, ""
        return (mcid if isinstance(mcid, int) else None), (str(alt) if alt is not None else "")

    def _alt_text(self) -> str:
        for mcid, alt in reversed(self._marked):
            if alt:
                return alt
            if mcid is not None and mcid in self._alt:
                return self._alt[mcid]
        return ""

    def after(self, operator: Any, operands: Any, cm: Any, tm: Any) -> None:
        if operator == b"Do":
            self._pending = None
            if self._entered and self._entered.pop():
                self._frames.pop()

    def _do(self, operands: Any, cm: Matrix) -> None:
        self._entered.append(False)
        frame = self._frames[-1]
        if not operands:
            return
        name = operands[0]
        try:
            xobjects = _resolve(_resolve(frame.resources).get("/XObject"))
            xobject = _resolve(xobjects.get(name)) if xobjects is not None else None
            subtype = xobject.get("/Subtype") if xobject is not None else None
        except (AttributeError, TypeError, ValueError, KeyError):
            return
        if xobject is None:
            return
        ctm = multiply(cm, frame.base)
        if subtype == "/Image":
            self._add_image(
                f"page {self.content.number}, image {name}",
                xobject.get("/Width"),
                xobject.get("/Height"),
                ctm,
            )
        elif subtype == "/Form":
            resources = xobject.get("/Resources")
            self._pending = _Frame(
                resources if resources is not None else frame.resources,
                multiply(as_matrix(_resolve(xobject.get("/Matrix", IDENTITY))), ctm),
            )

    def _inline_image(self, operands: Any, cm: Matrix) -> None:
        try:
            settings = operands["settings"]
            width = settings.get("/W", settings.get("/Width"))
            height = settings.get("/H", settings.get("/Height"))
        except (AttributeError, TypeError, KeyError):
            return
        self._inline += 1
        source = f"page {self.content.number}, inline image {self._inline}"
        self._add_image(source, width, height, multiply(cm, self._frames[-1].base))

    def _add_image(self, source: str, width: Any, height: Any, ctm: Matrix) -> None:
        # The unit square's corners under the CTM bound the image on the page.
        ys = [ctm[5], ctm[1] + ctm[5], ctm[3] + ctm[5], ctm[1] + ctm[3] + ctm[5]]
        shown_w = math.hypot(ctm[0], ctm[1]) * CM_PER_POINT
        shown_h = math.hypot(ctm[2], ctm[3]) * CM_PER_POINT
        self.content.images.append(
            PlacedImage(
                source,
                _positive_int(_resolve(width)),
                _positive_int(_resolve(height)),
                shown_w if shown_w > 0 else None,
                shown_h if shown_h > 0 else None,
                max(ys),
                min(ys),
                self._alt_text(),
            )
        )


def read_page(
    page: PageObject, number: int, styles: FontStyles, alt: dict[int, str] | None = None
) -> PageContent:
    """Extract one page's fragments and images (pypdf errors propagate to the caller).

    ``alt`` maps the page's marked-content ids to the alt text of their structure element.
    """
    box = page.cropbox
    content = PageContent(number, float(box.top), float(box.bottom))
    collector = _Collector(content, page.get("/Resources"), styles, alt or {})
    page.extract_text(
        visitor_text=collector.on_text,
        visitor_operand_before=collector.before,
        visitor_operand_after=collector.after,
    )
    return content
