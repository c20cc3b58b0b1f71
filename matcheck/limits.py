"""Resource limits for reading untrusted lesson files.

Each limit protects time or memory against a broken or hostile file; each is named in the
error a file gets when it exceeds it, and each can be changed through :class:`ReadLimits`.
The defaults are far above any real lesson (a long textbook chapter is ~20,000 words and
~100 pages) and are common practice, not published values.
"""

from __future__ import annotations

from dataclasses import dataclass


@dataclass(frozen=True, slots=True)
class ReadLimits:
    # A lesson file larger than this is refused before it is parsed.
    max_file_bytes: int = 256 * 1024 * 1024
    # PDFs: pages read at most.
    max_pages: int = 5_000
    # Words in one lesson (a million words is ~10 novels).
    max_words: int = 1_500_000
    # Images whose pixel count is above this are never decoded (Pillow's own default guard
    # is ~89 million pixels; we keep that order).
    max_image_pixels: int = 90_000_000
    # DOCX (ZIP) archives: total declared uncompressed size, and the compression ratio of any
    # member, above which the archive is refused before extraction (zip-bomb guard).
    max_zip_uncompressed_bytes: int = 1024 * 1024 * 1024
    max_zip_ratio: float = 200.0
    max_zip_members: int = 10_000
    # Markdown images that resolve outside the lesson's folder (``../``, absolute paths,
    # symlinks pointing out) are counted but not opened unless this is set.
    allow_outside_files: bool = False


DEFAULT_LIMITS = ReadLimits()
