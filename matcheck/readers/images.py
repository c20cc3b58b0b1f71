"""Measure an embedded or linked image without decoding its pixels.

``PIL.Image.open`` reads only the header, which is all a size needs, so the pixels of a huge
or hostile image (a decompression bomb) are never decoded. Pillow refuses to even open an
image whose header declares more than twice ``Image.MAX_IMAGE_PIXELS``, fearing a decode that
never comes here; such a size is then read by the format's plugin directly, still from the
header alone. Unreadable images return ``None`` so the caller can count the figure and report
it as unreadable. Nothing here changes Pillow's global settings.
"""

from __future__ import annotations

import io
import struct
import warnings
from pathlib import Path
from typing import IO

# What Pillow's plugins raise on a header they cannot make sense of.
_HEADER_ERRORS = (OSError, ValueError, SyntaxError, IndexError, TypeError, struct.error, EOFError)


def image_size(source: bytes | Path) -> tuple[int, int] | None:
    """Return ``(width_px, height_px)`` from the image header, or ``None`` if unidentifiable.

    An SVG gives the CSS size its root element states (:mod:`matcheck.readers.svg`).
    """
    from matcheck.readers.svg import looks_like_svg, svg_size

    try:
        if isinstance(source, bytes):
            head = source[: 64 * 1024]
            size = _size(io.BytesIO(source))
        else:
            with source.open("rb") as stream:
                head = stream.read(64 * 1024)
                stream.seek(0)
                size = _size(stream)
    except OSError:
        return None
    if size is None and looks_like_svg(head):
        return svg_size(head)
    return size


def _size(stream: IO[bytes]) -> tuple[int, int] | None:
    from PIL import Image, UnidentifiedImageError

    try:
        with warnings.catch_warnings():
            # Pillow warns about pixel counts (DecompressionBombWarning) and about odd headers
            # (truncated chunks, bad EXIF); neither matters for a size, and a warning printed
            # to stderr would break the CLI's one-line contract.
            warnings.simplefilter("ignore")
            try:
                with Image.open(stream) as image:
                    width, height = image.size
            except Image.DecompressionBombError:
                size = _unguarded_size(stream)
                if size is None:
                    return None
                width, height = size
    except (UnidentifiedImageError, *_HEADER_ERRORS):
        return None
    if width <= 0 or height <= 0:
        return None
    return int(width), int(height)


def _unguarded_size(stream: IO[bytes]) -> tuple[int, int] | None:
    """The header size as the first plugin that accepts the stream reads it.

    This is what ``Image.open`` does, through the registry plugins fill with
    ``Image.register_open`` (``Image.ID`` in order, ``Image.OPEN``), minus the pixel-count
    check that only protects a decode. The image object is closed unread.
    """
    from PIL import Image

    stream.seek(0)
    prefix = stream.read(16)
    for name in list(Image.ID):
        factory, accept = Image.OPEN[name]
        verdict = accept(prefix) if accept else True
        if isinstance(verdict, str) or not verdict:  # a string is a reason it does not fit
            continue
        stream.seek(0)
        try:
            with factory(stream, "") as image:
                width, height = image.size
        except _HEADER_ERRORS:
            continue
        return int(width), int(height)
    return None
