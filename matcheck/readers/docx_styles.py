"""Resolve what a DOCX paragraph or run means through its style chain.

Styles are read from ``word/styles.xml`` (python-docx's styles part). A style inherits from the
one named in ``w:basedOn``; the chain is walked nearest first and guarded against cycles.
Built-in styles keep their English ``w:name`` ("heading 1", "caption") in every UI language,
so names, not the localised style ids, decide what a style is.
"""

from __future__ import annotations

import re
from dataclasses import dataclass

from matcheck.model import Emphasis
from matcheck.readers.docx_xml import Element, on_off, val, w

_HEADING_NAME = re.compile(r"heading\s*([1-9])")
_LIST_NAME = re.compile(r"list (?:bullet|number)(?: ([2-9]))?|list paragraph")
# Headings deeper than this are kept at it: the document model knows levels 1..6.
_MAX_HEADING = 6
# Outline level 9 marks body text (ECMA-376 17.3.1.20: levels 0-8 are headings).
_BODY_OUTLINE = 9


@dataclass(frozen=True, slots=True)
class ListInfo:
    """A list paragraph: ``key`` tells lists apart (numbering id or list style), ``level`` >= 1."""

    key: str
    level: int


def _run_props(rpr: Element | None) -> dict[str, bool]:
    """The emphasis-related properties a ``w:rPr`` sets explicitly (absent ones are left out)."""
    props: dict[str, bool] = {}
    if rpr is None:
        return props
    for name, tag in (("bold", "b"), ("italic", "i"), ("hidden", "vanish")):
        value = on_off(rpr.find(w(tag)))
        if value is not None:
            props[name] = value
    underline = rpr.find(w("u"))
    if underline is not None:
        props["underline"] = (val(underline) or "single") != "none"
    marker = rpr.find(w("highlight"))
    if marker is not None:
        props["highlight"] = (val(marker) or "none") != "none"
    shading = rpr.find(w("shd"))
    if shading is not None and "highlight" not in props:
        fill = (val(shading, "fill") or "auto").lower()
        props["highlight"] = fill != "auto" and val(shading) != "nil"
    return props


_EMPHASIS = {
    "bold": Emphasis.BOLD,
    "italic": Emphasis.ITALIC,
    "underline": Emphasis.UNDERLINE,
    "highlight": Emphasis.HIGHLIGHT,
}


class StyleSheet:
    """Heading, caption, list and emphasis facts of the styles in one document."""

    def __init__(self, styles: Element | None) -> None:
        self._styles: dict[str, Element] = {}
        self._default_paragraph: str | None = None
        self._default_props: dict[str, bool] = {}
        self._emphasis_cache: dict[tuple[str | None, str | None], dict[str, bool]] = {}
        self._chains: dict[str | None, list[Element]] = {}
        if styles is None:
            return
        for style in styles.iterchildren(w("style")):
            style_id = style.get(w("styleId"))
            if style_id is None:
                continue
            self._styles[style_id] = style
            if style.get(w("type")) == "paragraph" and on_off_attr(style.get(w("default"))):
                self._default_paragraph = style_id
        defaults = styles.find(w("docDefaults"))
        if defaults is not None:
            self._default_props = _run_props(defaults.find(f"{w('rPrDefault')}/{w('rPr')}"))

    def chain(self, style_id: str | None) -> list[Element]:
        """The style and its ``basedOn`` ancestors, nearest first."""
        cached = self._chains.get(style_id)
        if cached is not None:
            return cached
        key = style_id
        found: list[Element] = []
        seen: set[str] = set()
        while style_id is not None and style_id not in seen and style_id in self._styles:
            seen.add(style_id)
            style = self._styles[style_id]
            found.append(style)
            style_id = val(style.find(w("basedOn")))
        self._chains[key] = found
        return found

    @property
    def default_paragraph(self) -> str | None:
        """The document's default paragraph style id ("Normal" in practice)."""
        return self._default_paragraph

    def paragraph_style(self, paragraph: Element) -> str | None:
        """The paragraph's style id (the document's default paragraph style when unset)."""
        style_id = val(paragraph.find(f"{w('pPr')}/{w('pStyle')}"))
        return style_id if style_id in self._styles else self._default_paragraph

    @staticmethod
    def _name(style: Element) -> str:
        return (val(style.find(w("name"))) or "").strip().lower()

    def heading_level(self, paragraph: Element, style_id: str | None) -> int | None:
        """Heading level 0..6 (0: Title), or ``None`` for a paragraph that is not a heading.

        A direct outline level wins (Word lets it override the style); otherwise the nearest
        style that is named "Heading N"/"Title" or sets an outline level decides.
        """
        direct = val(paragraph.find(f"{w('pPr')}/{w('outlineLvl')}"))
        if direct is not None:
            return _outline(direct)
        for style in self.chain(style_id):
            name = self._name(style)
            match = _HEADING_NAME.fullmatch(name)
            if match:
                return min(int(match.group(1)), _MAX_HEADING)
            if name == "title":
                # Above Heading 1 in the outline; the builder turns levels into ranks.
                return 0
            level = val(style.find(f"{w('pPr')}/{w('outlineLvl')}"))
            if level is not None:
                return _outline(level)
        return None

    def is_caption(self, style_id: str | None) -> bool:
        return any(self._name(style) == "caption" for style in self.chain(style_id))

    def list_info(self, paragraph: Element, style_id: str | None) -> ListInfo | None:
        """List membership from ``w:numPr`` (direct, then style chain) or a list style name."""
        num_id: str | None = None
        ilvl: str | None = None
        sources = [paragraph.find(w("pPr"))]
        sources += [style.find(w("pPr")) for style in self.chain(style_id)]
        for ppr in sources:
            numpr = None if ppr is None else ppr.find(w("numPr"))
            if numpr is None:
                continue
            num_id = num_id or val(numpr.find(w("numId")))
            ilvl = ilvl or val(numpr.find(w("ilvl")))
        if num_id == "0":
            return None  # numId 0 removes numbering the style would give (ECMA-376 17.9.18)
        named_level: int | None = None
        named: str | None = None
        for style in self.chain(style_id):
            match = _LIST_NAME.fullmatch(self._name(style))
            if match:
                named = self._name(style).rstrip(" 23456789")
                named_level = int(match.group(1) or 1)
                break
        if num_id is None and named is None:
            return None
        # "List Bullet 2" carries no w:ilvl; its number is its depth.
        level = int(ilvl) + 1 if ilvl is not None and ilvl.isdigit() else named_level or 1
        key = f"num:{num_id}" if num_id is not None else f"style:{named}"
        return ListInfo(key, level)

    def emphasis(
        self, rpr: Element | None, paragraph_style: str | None
    ) -> tuple[frozenset[Emphasis], bool]:
        """The emphasis of a run and whether it is hidden.

        Precedence, weakest first: document defaults, paragraph style chain, character style
        chain, direct formatting. (Word toggles bold/italic between style levels rather than
        overriding; lessons practically never rely on that, so plain overriding is used.)
        """
        char_style = val(rpr.find(w("rStyle"))) if rpr is not None else None
        key = (paragraph_style, char_style)
        inherited = self._emphasis_cache.get(key)
        if inherited is None:
            inherited = dict(self._default_props)
            for style_id in (paragraph_style, char_style):
                for style in reversed(self.chain(style_id)):
                    props = _run_props(style.find(w("rPr")))
                    if self._name(style).lower() in _LINK_STYLES:
                        # A link's underline is decoration, not emphasis: Markdown and PDF
                        # versions of the same lesson carry none.
                        props.pop("underline", None)
                    inherited.update(props)
            self._emphasis_cache[key] = inherited
        props = {**inherited, **_run_props(rpr)}
        kinds = frozenset(kind for name, kind in _EMPHASIS.items() if props.get(name))
        return kinds, props.get("hidden", False)


_LINK_STYLES = frozenset({"hyperlink", "followedhyperlink", "followed hyperlink"})


def on_off_attr(value: str | None) -> bool:
    """An ST_OnOff attribute value (``w:default="1"``)."""
    return value is not None and value.lower() in {"1", "true", "on"}


def _outline(value: str) -> int | None:
    if not value.isdigit() or int(value) >= _BODY_OUTLINE:
        return None
    return min(int(value) + 1, _MAX_HEADING)
