"""Text rules for PDF lines: list markers, page numbers, final punctuation, line joining.

A PDF keeps lines, not paragraphs; these rules put a paragraph's lines back together the way
a reader sees them (common practice of PDF-to-text tools, not a published standard).
"""

from __future__ import annotations

import re
from collections.abc import Iterable, Sequence
from contextvars import ContextVar

from matcheck.model import Emphasis
from matcheck.readers.builder import NO_EMPHASIS, Run
from matcheck.readers.dictionary import is_word

# Bullet glyphs, including the private-use bullets Word's Symbol/Wingdings fonts leave behind.
BULLETS = "•◦▪▫‣⁃●○■□-–*·\uf0b7\uf0a7"
# A bullet, or "1." / "2)" / "a)" / "(b)", then a space.
_MARKER = re.compile(
    rf"(?:[{re.escape(BULLETS)}]|\d{{1,3}}[.)]|\(?[a-zA-Z][)]|\([a-zA-Z0-9]{{1,3}}\))\s+"
)
_PAGE_NUMBER = re.compile(
    r"(?:page\s+)?\d{1,4}(?:\s*(?:of|/)\s*\d{1,4})?|[-–—]\s*\d{1,4}\s*[-–—]",
    re.IGNORECASE,
)
_FINAL_PUNCTUATION = ".!?:;…"
_CLOSERS = "\"'”’»)]"
# A hyphen, Unicode hyphen, or soft hyphen that ends a line.
_LINE_END_HYPHENS = "-\u2010\u00ad"


def list_marker_length(text: str) -> int:
    """Length of the list marker (and its space) at the start of ``text``; 0 if none."""
    stripped = text.lstrip()
    match = _MARKER.match(stripped)
    if match is None:
        return 0
    return len(text) - len(stripped) + match.end()


def marker_kind(text: str) -> tuple[str, int | None]:
    """A list marker's kind ("bullet", "number", "letter") and its value (1 for "1." or "a)")."""
    stripped = text.lstrip()
    marker = stripped[: list_marker_length(stripped)].strip().strip("().")
    if marker.isdigit():
        return "number", int(marker)
    if len(marker) == 1 and marker.isalpha():
        return "letter", ord(marker.lower()) - ord("a") + 1
    return "bullet", None


def is_page_number(text: str) -> bool:
    """'3', 'Page 3', '3 of 10', '3/10', '- 3 -'."""
    return _PAGE_NUMBER.fullmatch(" ".join(text.split())) is not None


def ends_sentence(text: str) -> bool:
    """Whether ``text`` ends with final punctuation (quotes and brackets after it allowed)."""
    stripped = text.rstrip().rstrip(_CLOSERS)
    return bool(stripped) and stripped[-1] in _FINAL_PUNCTUATION


def plain(runs: Iterable[Run]) -> str:
    return "".join(text for text, _ in runs)


# The words (lower case) of the PDF being read, to tell a word processor's hyphenation
# ("connec-" / "tion") from a real hyphen at a line end ("single-" / "purpose").
DOCUMENT_WORDS: ContextVar[frozenset[str]] = ContextVar("document_words", default=frozenset())
_WORD = re.compile(r"[^\W\d_]+(?:-[^\W\d_]+)*")


def document_words(texts: Iterable[str]) -> frozenset[str]:
    """Every word of the texts, in lower case, hyphenated compounds whole."""
    return frozenset(word.lower() for text in texts for word in _WORD.findall(text))


def _hyphen_join(runs: list[Run], following: Sequence[Run]) -> bool | None:
    """At a line end between two letters: ``True`` drops the hyphen (hyphenation), ``False``
    keeps it and joins without a space (a real hyphen); ``None`` when there is no hyphen.

    A soft hyphen is always hyphenation. A hard one is dropped only when the joined word is a
    word (of the document, else of the dictionary) and the hyphenated form is not a word of
    the document: "indi-" / "cator" is "indicator", "single-" / "purpose" stays
    "single-purpose".
    """
    for index in range(len(runs) - 1, -1, -1):
        text = runs[index][0].rstrip()
        if text:
            break
    else:
        return None
    if text[-1] not in _LINE_END_HYPHENS:
        return None
    next_text = plain(following).lstrip()
    before = text[:-1]
    if text[-1] != "\u00ad":
        if not (before and before[-1].isalpha() and next_text[:1].islower()):
            return None
        head = _WORD.findall(before)
        tail = _WORD.findall(next_text)
        if head and tail:
            words = DOCUMENT_WORDS.get()
            joined, compound = head[-1] + tail[0], f"{head[-1]}-{tail[0]}"
            known = joined.lower() in words or (compound.lower() not in words and is_word(joined))
            if compound.lower() in words or not known:
                del runs[index + 1 :]
                runs[index] = (text, runs[index][1])
                return False
    del runs[index + 1 :]
    runs[index] = (before, runs[index][1])
    return True


def join_lines(lines: Iterable[Sequence[Run]]) -> list[Run]:
    """Join the runs of a paragraph's lines with a space, rejoining hyphenated words."""
    runs: list[Run] = []
    for line in lines:
        if runs:
            if _hyphen_join(runs, line) is not None:
                runs.extend(_lstrip_runs(line))
                continue
            runs.append((" ", NO_EMPHASIS))
        runs.extend(line)
    return runs


def _lstrip_runs(runs: Sequence[Run]) -> list[Run]:
    result = list(runs)
    while result and not result[0][0].strip():
        result.pop(0)
    if result:
        result[0] = (result[0][0].lstrip(), result[0][1])
    return result


def strip_prefix(runs: Sequence[Run], count: int) -> list[Run]:
    """``runs`` without their first ``count`` characters (a list marker)."""
    result: list[Run] = []
    for text, emphasis in runs:
        if count >= len(text):
            count -= len(text)
            continue
        result.append((text[count:], emphasis))
        count = 0
    return result


def all_emphasised(runs: Iterable[Run], kind: Emphasis) -> bool:
    """Whether every visible character of ``runs`` carries ``kind`` (and there is one)."""
    seen = False
    for text, emphasis in runs:
        if text.strip():
            if kind not in emphasis:
                return False
            seen = True
    return seen
