"""Bold and italic from a PDF font resource.

A PDF states no "bold" attribute on text; the font says it. The BaseFont name carries the
style in practice (``Helvetica-Bold``, ``ABCDEF+Calibri-BoldItalic``, ``MinionPro-It``), and a
FontDescriptor may add the weight, the ItalicAngle and the Italic/ForceBold flags
(PDF 32000-1:2008, 9.8.1-9.8.2). A name or descriptor that says neither is plain text.
"""

from __future__ import annotations

import re
from typing import Any

from matcheck.model import Emphasis
from matcheck.readers.monospace import is_monospace_font

# Weight words in font names (common practice of type foundries); "SemiBold" and "ExtraBold"
# contain "bold".
_BOLD_NAME = re.compile(r"bold|black|heavy|demi", re.IGNORECASE)
_ITALIC_NAME = re.compile(r"italic|oblique", re.IGNORECASE)
# Adobe's short style suffix: "MinionPro-It", "MinionPro-BoldIt".
_ITALIC_SUFFIX = re.compile(r"[-,](?:[A-Z][a-z]*)?It$")
# A subset font's name starts with six capitals and a plus (PDF 32000-1:2008, 9.6.4).
_SUBSET_PREFIX = re.compile(r"^[A-Z]{6}\+")
# FontDescriptor flags (PDF 32000-1:2008, table 123): bit 7 Italic, bit 19 ForceBold.
_FLAG_ITALIC = 1 << 6
_FLAG_FORCE_BOLD = 1 << 18
# OS/2 weight classes: 600 is SemiBold, the lightest weight set as bold.
_BOLD_WEIGHT = 600


def base_font_name(font: Any) -> str:
    """The font's BaseFont without the slash and the subset prefix ('' if unknown)."""
    try:
        name = str(font.get("/BaseFont", "")) if font is not None else ""
    except (AttributeError, TypeError, ValueError):
        return ""
    return _SUBSET_PREFIX.sub("", name.lstrip("/"))


def emphasis_from_name(name: str) -> frozenset[Emphasis]:
    kinds: set[Emphasis] = set()
    if _BOLD_NAME.search(name):
        kinds.add(Emphasis.BOLD)
    if _ITALIC_NAME.search(name) or _ITALIC_SUFFIX.search(name):
        kinds.add(Emphasis.ITALIC)
    return frozenset(kinds)


def _descriptor(font: Any) -> Any:
    descriptor = font.get("/FontDescriptor")
    if descriptor is None and "/DescendantFonts" in font:
        # A composite (Type0) font keeps its descriptor in its one descendant font.
        descendants = font["/DescendantFonts"].get_object()
        if descendants:
            descriptor = descendants[0].get_object().get("/FontDescriptor")
    return descriptor.get_object() if descriptor is not None else None


def emphasis_from_descriptor(font: Any) -> frozenset[Emphasis]:
    kinds: set[Emphasis] = set()
    try:
        descriptor = _descriptor(font)
        if descriptor is None:
            return frozenset()
        flags = int(descriptor.get("/Flags", 0))
        weight = float(descriptor.get("/FontWeight", 0))
        angle = float(descriptor.get("/ItalicAngle", 0))
    except (AttributeError, TypeError, ValueError, KeyError, IndexError):
        return frozenset()
    if flags & _FLAG_FORCE_BOLD or weight >= _BOLD_WEIGHT:
        kinds.add(Emphasis.BOLD)
    if flags & _FLAG_ITALIC or angle != 0:
        kinds.add(Emphasis.ITALIC)
    return frozenset(kinds)


# FontDescriptor flag bit 1: FixedPitch, all glyphs the same width (PDF 32000-1:2008, table 123).
_FLAG_FIXED_PITCH = 1


def is_fixed_pitch(font: Any) -> bool:
    try:
        descriptor = _descriptor(font)
        return descriptor is not None and bool(int(descriptor.get("/Flags", 0)) & _FLAG_FIXED_PITCH)
    except (AttributeError, TypeError, ValueError, KeyError, IndexError):
        return False


class FontStyles:
    """Emphasis per font, computed once per font name for the whole document."""

    def __init__(self) -> None:
        self._cache: dict[str, frozenset[Emphasis]] = {}
        self._monospace: dict[str, bool] = {}

    def monospace(self, font: Any) -> bool:
        """Whether the font is monospace: its name, or the descriptor's FixedPitch flag."""
        if font is None:
            return False
        name = base_font_name(font)
        cached = self._monospace.get(name)
        if cached is None:
            cached = is_monospace_font(name) or is_fixed_pitch(font)
            if name:
                self._monospace[name] = cached
        return cached

    def emphasis(self, font: Any) -> frozenset[Emphasis]:
        if font is None:
            return frozenset()
        name = base_font_name(font)
        cached = self._cache.get(name)
        if cached is None:
            cached = emphasis_from_name(name) | emphasis_from_descriptor(font)
            if name:
                self._cache[name] = cached
        return cached
