"""Turn the bytes of a Markdown or plain-text lesson into text.

Lesson files come from many editors: UTF-8 with or without a byte-order mark, UTF-16 from
Windows tools (always with a BOM), and legacy Windows-1252 files. The encoding is decided
from the bytes alone, never guessed from the language, and every fallback is reported as a
warning so a mis-decoded file does not pass unnoticed.
"""

from __future__ import annotations

import codecs
import re
from pathlib import Path

from matcheck.errors import CorruptFile, InputError
from matcheck.limits import ReadLimits

CP1252_WARNING = "not valid UTF-8; read as Windows-1252 (cp1252)"
LATIN1_WARNING = "not valid UTF-8 or Windows-1252; read as Latin-1 (ISO-8859-1)"

# Byte-order mark -> (codec, name shown). UTF-32 first: the UTF-32-LE mark begins with the
# UTF-16-LE one. A UTF-8 BOM is not listed: it is stripped and the rest decoded as below.
_WIDE_BOMS = (
    (codecs.BOM_UTF32_LE, "utf-32", "UTF-32"),
    (codecs.BOM_UTF32_BE, "utf-32", "UTF-32"),
    (codecs.BOM_UTF16_LE, "utf-16", "UTF-16"),
    (codecs.BOM_UTF16_BE, "utf-16", "UTF-16"),
)


def decode_lesson_text(data: bytes, path: Path) -> tuple[str, list[str]]:
    """Decode a text lesson; return ``(text, warnings)``.

    The text has ``\\n`` line endings (``\\r\\n`` and lone ``\\r`` are converted) and no BOM.
    A UTF-8 BOM is dropped before trying UTF-8, then cp1252, then Latin-1. Raises
    :class:`~matcheck.errors.CorruptFile` when the file starts with a UTF-16 or UTF-32
    byte-order mark but its bytes do not follow that encoding.
    """
    warnings: list[str] = []
    for bom, codec, name in _WIDE_BOMS:
        if data.startswith(bom):
            try:
                # The "utf-16"/"utf-32" codecs read the byte order from the BOM and drop it.
                text = data.decode(codec)
            except UnicodeDecodeError as error:
                raise CorruptFile(
                    f"starts with a {name} byte-order mark but is not valid {name} "
                    f"(at byte {error.start})",
                    path=str(path),
                ) from None
            return _normalize_newlines(text), warnings
    from matcheck.readers.wide import bomless_wide_codec

    wide = bomless_wide_codec(data[:8192])
    if wide is not None:
        try:
            text = data.decode(wide)
        except UnicodeDecodeError as error:
            raise CorruptFile(
                f"looks like {wide.upper()} text without a byte-order mark but is not valid "
                f"{wide.upper()} (at byte {error.start})",
                path=str(path),
            ) from None
        warnings.append(f"no byte-order mark; read as {wide.upper()} (from its zero bytes)")
        return _normalize_newlines(text), warnings
    data = data.removeprefix(codecs.BOM_UTF8)
    try:
        text = data.decode("utf-8")
    except UnicodeDecodeError:
        try:
            text = data.decode("cp1252")
            warnings.append(CP1252_WARNING)
        except UnicodeDecodeError:
            # cp1252 leaves five bytes undefined; Latin-1 maps every byte, so it cannot fail.
            text = data.decode("latin-1")
            warnings.append(LATIN1_WARNING)
    return _normalize_newlines(text), warnings


# Every line break Unicode knows (Unicode Standard 5.8; docs/references.md §22) becomes \n:
# a run of CRs before LF (CR CR LF, from a file converted twice) is one break, a lone CR is
# one, NEL, LS and VT are one; PS (U+2029) separates paragraphs, so it is a blank line. A form
# feed stays: the text reader ends a paragraph there (a page break).
_BREAKS = re.compile("\r+\n|[\r\x0b\x85\u2028]")


def _normalize_newlines(text: str) -> str:
    return _BREAKS.sub("\n", text).replace("\u2029", "\n\n")


def read_lesson_text(path: Path, limits: ReadLimits, label: str) -> tuple[str, list[str]]:
    """Read and decode a text-format lesson, refusing it beyond ``limits.max_words``.

    Words are counted on the raw text before any parsing, so an enormous file costs no parse;
    ``label`` names the format in the refusal ("Markdown file").
    """
    from matcheck.readers.wordlimit import raw_word_count, refuse_words

    try:
        data = path.read_bytes()
    except OSError as error:
        raise InputError(f"cannot be read ({error.strerror})", path=str(path)) from None
    text, warnings = decode_lesson_text(data, path)
    refuse_words(raw_word_count(text), limits, str(path), label, "words and marks")
    return text, warnings
