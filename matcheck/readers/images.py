"""Measure an embedded or linked image without decoding its pixels.

``PIL.Image.open`` reads only the header, which is all a size needs, so the pixels of a huge
or hostile image (a decompression bomb) are never decoded. Unreadable images return ``None``
so the caller can count the figure and report it as unreadable.
"""

from __future__ import annotations

import io
import struct
import warnings
from pathlib import Path


def image_size(source: bytes | Path) -> tuple[int, int] | None:
    """Return ``(width_px, height_px)`` from the image header, or ``None`` if unidentifiable."""
    from PIL import Image, UnidentifiedImageError

    stream = io.BytesIO(source) if isinstance(source, bytes) else source
    try:
        with warnings.catch_warnings():
            # Pillow warns (or raises) about pixel counts because it fears a decode; we only
            # read the header, so the size of even a huge image is safe to take.
            warnings.simplefilter("ignore", Image.DecompressionBombWarning)
            with Image.open(stream) as image:
                width, height = image.size
    except Image.DecompressionBombError:
        return None
    except (UnidentifiedImageError, OSError, ValueError, SyntaxError, struct.error):
        return None
    if width <= 0 or height <= 0:
        return None
    return int(width), int(height)
