"""Which DOCX paragraphs are code: a code paragraph style, or every character monospace."""

from __future__ import annotations

from matcheck.readers.docx_styles import StyleSheet
from matcheck.readers.docx_xml import Element, w
from matcheck.readers.monospace import (
    CODE_CHARACTER_STYLES,
    CODE_PARAGRAPH_STYLES,
    is_monospace_font,
)


class CodeFonts:
    """Code styles and monospace run fonts of one document (style chains resolved once)."""

    def __init__(self, styles: StyleSheet) -> None:
        self._styles = styles
        self._cache: dict[tuple[str | None, str | None], bool] = {}
        # A lesson whose body text is itself monospace (a typewriter look) marks no code by
        # font: only code styles then say what is code.
        self.body_monospace = self._inherited(styles.default_paragraph, None)

    def is_code_style(self, style_id: str | None) -> bool:
        return any(_name(style) in CODE_PARAGRAPH_STYLES for style in self._styles.chain(style_id))

    def monospace(self, rpr: Element | None, paragraph_style: str | None) -> bool:
        """Whether a run is set in a monospace font or an inline-code character style."""
        direct = _font(rpr)
        if direct is not None:
            return is_monospace_font(direct)
        char_style = rpr.find(w("rStyle")) if rpr is not None else None
        char_id = char_style.get(w("val")) if char_style is not None else None
        key = (paragraph_style, char_id)
        cached = self._cache.get(key)
        if cached is None:
            cached = self._inherited(paragraph_style, char_id)
            self._cache[key] = cached
        return cached

    def _inherited(self, paragraph_style: str | None, char_id: str | None) -> bool:
        # The nearest style that names a font decides: character style first.
        for style_id in (char_id, paragraph_style):
            for style in self._styles.chain(style_id):
                if _name(style) in CODE_CHARACTER_STYLES | CODE_PARAGRAPH_STYLES:
                    return True
                font = _font(style.find(w("rPr")))
                if font is not None:
                    return is_monospace_font(font)
        return False


def _name(style: Element) -> str:
    name = style.find(w("name"))
    return (name.get(w("val")) or "").strip().lower() if name is not None else ""


def _font(rpr: Element | None) -> str | None:
    """The Latin font a ``w:rPr`` names (``w:rFonts/@w:ascii``, else ``@w:hAnsi``)."""
    if rpr is None:
        return None
    fonts = rpr.find(w("rFonts"))
    if fonts is None:
        return None
    name = fonts.get(w("ascii")) or fonts.get(w("hAnsi"))
    return str(name) if name is not None else None
