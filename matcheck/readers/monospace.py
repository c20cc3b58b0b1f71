"""Code is set in a monospace font: which font names are monospace, and which styles are code.

Shared by the DOCX reader (run fonts, paragraph styles) and the PDF reader (font names and the
FixedPitch flag of the font descriptor). The name list is common practice: the monospace
families that word processors, converters and operating systems ship.
"""

from __future__ import annotations

import re

_MONOSPACE_NAME = re.compile(
    r"mono|courier|consolas|menlo|monaco|inconsolata|lucida ?console|lucida ?sans ?typewriter"
    r"|source ?code|fira ?code|cascadia|andale|typewriter|\bfixed|letter ?gothic|ocr[ab]",
    re.IGNORECASE,
)
# Paragraph styles that hold code (lower-case names): pandoc's "Source Code", Word's "HTML
# Preformatted", "Plain Text" and "Macro Text", and the usual hand-made names.
CODE_PARAGRAPH_STYLES = frozenset(
    {
        "source code",
        "sourcecode",
        "code",
        "code block",
        "html preformatted",
        "preformatted text",
        "plain text",
        "macro text",
        "verbatim",
    }
)
# Character styles that mark inline code: pandoc's "Verbatim Char", Word's "HTML Code".
CODE_CHARACTER_STYLES = frozenset(
    {"verbatim char", "verbatimchar", "html code", "source code char", "code char", "code"}
)


def is_monospace_font(name: str) -> bool:
    """Whether a font family or PostScript name is a monospace face."""
    return bool(name) and _MONOSPACE_NAME.search(name) is not None
