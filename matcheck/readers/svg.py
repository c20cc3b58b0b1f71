"""SVG images measured without rendering: the size the root element states.

An SVG is vector art, so its "pixel size" is its CSS size: ``width`` and ``height`` of the
root ``<svg>`` element, in any absolute CSS unit, converted at CSS's fixed 96 px per inch
(CSS Values and Units Level 3, 5.2; docs/references.md §21). A missing or relative
(percentage) width or height falls back to the ``viewBox`` (its user units are CSS px),
keeping the aspect ratio when only one of the two is given (SVG 1.1, 7.7). Only the start tag
of the root element is parsed, so a hostile SVG (entities, huge paths) costs nothing.
"""

from __future__ import annotations

import re

# CSS absolute units in CSS px (1in = 2.54cm = 96px = 72pt = 6pc).
_PX_PER = {"": 1.0, "px": 1.0, "in": 96.0, "cm": 96 / 2.54, "mm": 96 / 25.4, "pt": 96 / 72}
_PX_PER["pc"] = 16.0
_LENGTH = re.compile(r"^\s*([0-9]*\.?[0-9]+(?:e[+-]?[0-9]+)?)\s*(px|in|cm|mm|pt|pc)?\s*$", re.I)
_ROOT = re.compile(rb"<svg\b([^>]*)>", re.IGNORECASE)
_ATTRIBUTE = re.compile(r"""([a-zA-Z:-]+)\s*=\s*(?:"([^"]*)"|'([^']*)')""")
# Only the head of a file is searched for the root element.
_HEAD = 64 * 1024
# Larger than any real picture; a stated size beyond it is not believed.
_MAX_PX = 100_000.0


def css_px(text: str | None) -> float | None:
    """A CSS/SVG length in CSS px; ``None`` for a relative, malformed or absurd length."""
    if not text:
        return None
    match = _LENGTH.match(text)
    if match is None:
        return None
    value = float(match.group(1)) * _PX_PER[(match.group(2) or "").lower()]
    return value if 0 < value <= _MAX_PX else None


def looks_like_svg(head: bytes) -> bool:
    return _ROOT.search(head[:_HEAD]) is not None


def svg_size(data: bytes) -> tuple[int, int] | None:
    """``(width, height)`` in CSS px from the root element, or ``None`` if it states none."""
    match = _ROOT.search(data[:_HEAD])
    if match is None:
        return None
    attributes = {
        name.lower(): first or second
        for name, first, second in _ATTRIBUTE.findall(match.group(1).decode("utf-8", "replace"))
    }
    width, height = css_px(attributes.get("width")), css_px(attributes.get("height"))
    box = _view_box(attributes.get("viewbox"))
    if box is not None:
        box_width, box_height = box
        if width is None and height is None:
            width, height = box_width, box_height
        elif width is None and height is not None:
            width = height * box_width / box_height
        elif height is None and width is not None:
            height = width * box_height / box_width
    if width is None or height is None:
        return None
    return max(1, round(width)), max(1, round(height))


def _view_box(text: str | None) -> tuple[float, float] | None:
    if not text:
        return None
    try:
        numbers = [float(part) for part in re.split(r"[\s,]+", text.strip())]
    except ValueError:
        return None
    if len(numbers) != 4 or not (0 < numbers[2] <= _MAX_PX and 0 < numbers[3] <= _MAX_PX):
        return None
    return numbers[2], numbers[3]
