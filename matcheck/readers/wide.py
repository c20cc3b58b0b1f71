"""UTF-16 and UTF-32 text without a byte-order mark, recognised by its zero bytes.

Some tools write UTF-16 without a BOM. In it, every character below U+0100 (all of English,
digits, punctuation, spaces, line ends) has a zero byte on the same side of each two-byte code
unit, and in UTF-32 three zero bytes per four; binary files show no such regular pattern. The
test: in the first bytes, the positions that would be the high bytes are nearly all zero and
the others nearly never are, and the bytes decode strictly in that encoding. Text mostly in a
script beyond U+00FF (Cyrillic, Greek, CJK) has few zero bytes and is not recognised; such
files need a BOM (common practice of encoding detectors; the thresholds are not published).
"""

from __future__ import annotations

# (codec, bytes per unit, positions of the zero bytes within a unit) — UTF-32 first: UTF-32LE
# text also looks like UTF-16LE with every other unit zero.
_LAYOUTS = (
    ("utf-32-le", 4, (1, 2, 3)),
    ("utf-32-be", 4, (0, 1, 2)),
    ("utf-16-le", 2, (1,)),
    ("utf-16-be", 2, (0,)),
)
# Share of zero bytes required where they are expected, and allowed elsewhere.
_ZEROS_EXPECTED = 0.9
_ZEROS_ELSEWHERE = 0.05
_MIN_BYTES = 16


def bomless_wide_codec(head: bytes) -> str | None:
    """The codec of UTF-16/UTF-32 text without a BOM, judged from ``head``; else ``None``."""
    if len(head) < _MIN_BYTES or b"\x00" not in head:
        return None
    for codec, width, zero_positions in _LAYOUTS:
        usable = head[: len(head) - len(head) % width]
        units = len(usable) // width
        expected = [usable[i] for i in range(len(usable)) if i % width in zero_positions]
        elsewhere = [usable[i] for i in range(len(usable)) if i % width not in zero_positions]
        if expected.count(0) < _ZEROS_EXPECTED * len(expected):
            continue
        if elsewhere.count(0) > _ZEROS_ELSEWHERE * len(elsewhere) or units < _MIN_BYTES // 4:
            continue
        try:
            usable.decode(codec)
        except UnicodeDecodeError:
            continue
        return codec
    return None
