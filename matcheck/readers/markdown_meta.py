"""Small facts a Markdown file states outside its text: the front matter's title, and the
display size of an HTML ``<img>``."""

from __future__ import annotations

import re

from matcheck.readers.svg import css_px

# A top-level ``title:`` key of YAML front matter, with its value on the same line.
_TITLE = re.compile(r"^title\s*:\s*(.+?)\s*$", re.MULTILINE)
_STYLE_SIZE = re.compile(r"(?:^|;)\s*(width|height)\s*:\s*([^;]+)", re.IGNORECASE)
_CM_PER_PX = 2.54 / 96


def front_matter_title(yaml: str) -> str:
    """The ``title:`` of YAML front matter (quotes removed), or '' when there is none.

    Only a one-line scalar is read; front matter is otherwise not lesson text.
    """
    match = _TITLE.search(yaml)
    if match is None:
        return ""
    value = match.group(1)
    if len(value) >= 2 and value[0] == value[-1] and value[0] in "'\"":
        value = value[1:-1]
    return "" if value in ("|", ">", "") else value


def html_display_size(attrs: dict[str, str]) -> tuple[float | None, float | None]:
    """Width and height in cm from an ``<img>``'s style, else its attributes (CSS px)."""
    sizes = {name.lower(): value for name, value in _STYLE_SIZE.findall(attrs.get("style", ""))}
    width = css_px(sizes.get("width") or attrs.get("width"))
    height = css_px(sizes.get("height") or attrs.get("height"))
    if width is None or height is None:
        return None, None
    return width * _CM_PER_PX, height * _CM_PER_PX
