"""Resource limits for reading untrusted lesson files.

Each limit protects time or memory against a broken or hostile file; each is named in the
error a file gets when it exceeds it, and each can be changed through :class:`ReadLimits`.
The defaults are far above any real lesson (a long textbook chapter is ~20,000 words and
~100 pages) and are common practice, not published values. docs/limits.md lists them with
the reason for each.
"""

from __future__ import annotations

from dataclasses import dataclass


@dataclass(frozen=True, slots=True)
class ReadLimits:
    # A lesson file larger than this is refused before it is parsed.
    max_file_bytes: int = 256 * 1024 * 1024
    # PDFs: pages read at most.
    max_pages: int = 5_000
    # Words in one lesson file (500,000 words is ~25 long chapters, or five novels). Markdown
    # and text are counted on the raw text before parsing, so an enormous file costs no parse.
    max_words: int = 500_000
    # Images whose header declares more pixels than this get a warning. No reader ever
    # decodes pixels (sizes come from headers), so this flags a decompression-bomb-sized image
    # rather than guarding a decode; Pillow's own default guard is ~89 million pixels.
    max_image_pixels: int = 90_000_000
    # DOCX (ZIP) archives: total declared uncompressed size, and the compression ratio of any
    # member, above which the archive is refused before extraction (zip-bomb guard).
    # python-docx loads every member into memory, so the total bounds the memory it takes.
    max_zip_uncompressed_bytes: int = 512 * 1024 * 1024
    max_zip_ratio: float = 200.0
    max_zip_members: int = 10_000
    # DOCX: the XML parts (document, styles, notes, ...) together, unpacked. Above it the file
    # is refused before parsing: an XML tree takes many times its text in memory (a 60 MiB
    # document.xml took ~1 GB in python-docx here). A 300-page book has ~10-20 MiB of XML.
    max_xml_bytes: int = 32 * 1024 * 1024
    # The longest run of characters without a space in a lesson's text. The longest English
    # words have a few dozen letters and a long URL a few thousand characters; a 4 MB "word"
    # counts as one word under max_words but costs the analysis minutes and a gigabyte.
    max_token_chars: int = 10_000
    # Wall-clock seconds for one lesson: reading it, analysing and measuring it (and, for a
    # comparison, comparing the versions gets the same budget). Enforced with SIGALRM, which
    # only works in the main thread on POSIX; elsewhere there is no time limit. None: none.
    max_read_seconds: float | None = 120.0
    # Markdown images that resolve outside the lesson's folder (``../``, absolute paths,
    # symlinks pointing out) are counted but not opened unless this is set.
    allow_outside_files: bool = False


DEFAULT_LIMITS = ReadLimits()


def parse_limits(
    overrides: list[str] | tuple[str, ...], base: ReadLimits = DEFAULT_LIMITS
) -> ReadLimits:
    """Apply ``NAME=VALUE`` overrides (``--limit``) to ``base``; ``0`` turns a limit off where
    a limit may be off (the reading time). Raises :class:`UsageError` naming the problem."""
    from dataclasses import fields, replace

    from matcheck.errors import UsageError

    numeric = {f.name: f for f in fields(ReadLimits) if f.name.startswith("max_")}
    changes: dict[str, float | int | None] = {}
    for text in overrides:
        name, _, value = text.partition("=")
        name = name.strip()
        if name not in numeric or not value.strip():
            raise UsageError(
                f"--limit {text!r}: expected NAME=VALUE with NAME one of "
                f"{', '.join(sorted(numeric))}"
            )
        try:
            number = float(value)
        except ValueError:
            raise UsageError(f"--limit {text!r}: {value.strip()!r} is not a number") from None
        if number < 0:
            raise UsageError(f"--limit {text!r}: a limit cannot be negative")
        if name == "max_read_seconds":
            changes[name] = None if number == 0 else number
        elif name == "max_zip_ratio":
            changes[name] = number
        else:
            if not number.is_integer() or number == 0:
                raise UsageError(f"--limit {text!r}: {name} takes a whole number above 0")
            changes[name] = int(number)
    return replace(base, **changes)  # type: ignore[arg-type]
