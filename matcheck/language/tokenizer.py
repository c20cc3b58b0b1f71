"""spaCy's English tokenizer, run without importing spaCy.

matcheck tokenises with the rules of spaCy's blank English pipeline: its prefix, suffix and
infix expressions, its URL pattern and its special cases ("don't" -> "do", "n't"; "e.g.").
Importing spaCy to apply them costs ~0.6 s, more than tokenising a long lesson, and a re-check
after one edited file should take less than a second (docs/performance.md). So the rules are
taken from spaCy once per installed spaCy version (:func:`rules_from_spacy`; kept by
:mod:`matcheck.language.tables`) and applied here by a port of spaCy's own algorithm
(``spacy/tokenizer.pyx``: ``_tokenize_affixes``, ``_split_affixes``, ``_attach_tokens`` and
the special-case pass ``_apply_special_cases``), with the same ``re`` expressions. Every
run, cold or cached, uses this port, so a cached and a cold report cannot differ by
tokenisation. tests/test_tokenizer.py checks it token for token against spaCy on every
fixture lesson, on hand-picked hard cases and on generated strings.

If spaCy ever builds its rules from something this port cannot run (a callable that is not a
compiled ``re`` expression), :func:`rules_from_spacy` refuses and the error says so.
"""

from __future__ import annotations

import json
import re
from bisect import bisect_left
from collections.abc import Callable, Sequence
from dataclasses import dataclass, replace
from functools import cache
from pathlib import Path

# Bump when the layout of TokenizerRules changes (it is stored between runs).
RULES_FORMAT = 1
# White-space and non-white-space runs: \s is str.isspace, as spaCy's loop tests each
# character (checked over every code point in tests/test_tokenizer.py).
_RUNS = re.compile(r"\s+|\S+")

Pattern = tuple[str, int]  # an expression's source and its flags


@dataclass(frozen=True, slots=True)
class TokenizerRules:
    """What spaCy's English tokenizer is made of, as plain data that can be stored."""

    format: int
    prefix: Pattern | None
    suffix: Pattern | None
    infix: Pattern | None
    token_match: Pattern | None
    url_match: Pattern | None
    # A chunk -> the texts of its tokens.
    specials: dict[str, tuple[str, ...]]
    # The special cases spaCy also looks for across tokens, with their tokens when split by
    # affixes alone (``Tokenizer.add_special_case``).
    matched: dict[str, tuple[str, ...]]


@dataclass(frozen=True, slots=True)
class Token:
    """A token of a text: ``text`` stands at ``idx`` (spaCy's ``Token.idx``)."""

    idx: int
    text: str


def rules_from_spacy() -> TokenizerRules:
    """The rules of ``spacy.blank("en")``'s tokenizer (imports spaCy: ~0.6 s)."""
    import spacy
    from spacy.attrs import ORTH
    from spacy.tokenizer import Tokenizer as SpacyTokenizer

    tokenizer = spacy.blank("en").tokenizer
    if not isinstance(tokenizer, SpacyTokenizer):
        raise ValueError("spaCy's English pipeline has a tokenizer of another kind")

    def pattern(function: Callable[..., object] | None, name: str) -> Pattern | None:
        if function is None:
            return None
        compiled = getattr(function, "__self__", None)
        if not isinstance(compiled, re.Pattern) or not isinstance(compiled.pattern, str):
            raise ValueError(f"spaCy's tokenizer {name} is not a regular expression")
        return compiled.pattern, compiled.flags

    specials = {
        chunk: tuple(str(token[ORTH]) for token in tokens)
        for chunk, tokens in tokenizer.rules.items()
    }
    rules = TokenizerRules(
        RULES_FORMAT,
        pattern(tokenizer.prefix_search, "prefix_search"),
        pattern(tokenizer.suffix_search, "suffix_search"),
        pattern(tokenizer.infix_finditer, "infix_finditer"),
        pattern(tokenizer.token_match, "token_match"),
        pattern(tokenizer.url_match, "url_match"),
        specials,
        {},
    )
    # add_special_case: a special case is also matched across tokens unless the faster
    # heuristics rule it out (no prefix, suffix or infix in it and no space).
    port = Tokenizer(rules)
    matched = {
        chunk: tuple(token.text for token in port.tokens(chunk, special_cases=False))
        for chunk in sorted(specials)
        if not tokenizer.faster_heuristics
        or port.find_prefix(chunk)
        or port.find_infix(chunk)
        or port.find_suffix(chunk)
        or " " in chunk
    }
    return replace(rules, matched=matched)


def _valid(value: object) -> bool:
    return isinstance(value, TokenizerRules) and value.format == RULES_FORMAT


# The rules of the spaCy release matcheck is tested with, as scripts/build_tokenizer_rules.py
# wrote them: a first run (and every run with --no-cache, as on a CI runner) then needs no
# spaCy import either. Another installed release has its rules taken from spaCy instead.
PACKAGED = Path(__file__).with_name("spacy_en_tokenizer.json")


@cache
def english() -> Tokenizer:
    """The English tokenizer, its rules from the table store, the packaged copy for the
    installed spaCy release, or spaCy itself."""
    from matcheck.language.tables import table

    return Tokenizer(table("spacy-en-tokenizer", "spacy", installed_rules, _valid))


def installed_rules() -> TokenizerRules:
    """The rules of the installed spaCy: the packaged copy when it was made from the same
    release, else from spaCy (:func:`rules_from_spacy`)."""
    from matcheck.language.tables import library_version

    packaged = packaged_rules()
    if packaged is not None and packaged[0] == library_version("spacy"):
        return packaged[1]
    return rules_from_spacy()


def packaged_rules() -> tuple[str, TokenizerRules] | None:
    """The spaCy release the packaged rules were made from, and the rules."""
    try:
        data = json.loads(PACKAGED.read_text(encoding="utf-8"))
    except (OSError, ValueError):
        return None
    if not isinstance(data, dict) or data.get("format") != RULES_FORMAT:
        return None

    def pattern(value: object) -> Pattern | None:
        return None if value is None else (str(value[0]), int(value[1]))  # type: ignore[index]

    rules = TokenizerRules(
        format=RULES_FORMAT,
        prefix=pattern(data["prefix"]),
        suffix=pattern(data["suffix"]),
        infix=pattern(data["infix"]),
        token_match=pattern(data["token_match"]),
        url_match=pattern(data["url_match"]),
        specials={str(k): tuple(map(str, v)) for k, v in data["specials"].items()},
        matched={str(k): tuple(map(str, v)) for k, v in data["matched"].items()},
    )
    return str(data["spacy"]), rules


def rules_json(rules: TokenizerRules, spacy_version: str) -> str:
    """The rules as the packaged file holds them."""
    data = {
        "format": rules.format,
        "spacy": spacy_version,
        "prefix": rules.prefix,
        "suffix": rules.suffix,
        "infix": rules.infix,
        "token_match": rules.token_match,
        "url_match": rules.url_match,
        "specials": rules.specials,
        "matched": rules.matched,
    }
    return json.dumps(data, ensure_ascii=False, indent=0, sort_keys=True) + "\n"


def _compile(pattern: Pattern | None) -> re.Pattern[str] | None:
    return None if pattern is None else re.compile(pattern[0], pattern[1])


class Tokenizer:
    """spaCy's tokenisation algorithm over :class:`TokenizerRules` (see the module)."""

    def __init__(self, rules: TokenizerRules) -> None:
        self._prefix = _compile(rules.prefix)
        self._suffix = _compile(rules.suffix)
        self._infix = _compile(rules.infix)
        self._token_match = _compile(rules.token_match)
        self._url_match = _compile(rules.url_match)
        self._specials = rules.specials
        self._by_first: dict[str, list[tuple[str, tuple[str, ...]]]] = {}
        for chunk, parts in rules.matched.items():
            if parts:
                self._by_first.setdefault(parts[0], []).append((chunk, parts))
        self._chunks: dict[str, tuple[str, ...]] = {}

    # -- spaCy's find_prefix, find_suffix, find_infix
    def find_prefix(self, text: str) -> int:
        found = self._prefix.search(text) if self._prefix is not None else None
        return found.end() - found.start() if found is not None else 0

    def find_suffix(self, text: str) -> int:
        found = self._suffix.search(text) if self._suffix is not None else None
        return found.end() - found.start() if found is not None else 0

    def find_infix(self, text: str) -> list[re.Match[str]]:
        return list(self._infix.finditer(text)) if self._infix is not None else []

    def tokens(self, text: str, *, special_cases: bool = True) -> list[Token]:
        """The tokens of ``text``, as ``spacy.blank("en")(text)`` gives them; white space
        other than one space after a token is a token, as in spaCy."""
        found: list[Token] = []
        for run in _RUNS.finditer(text):
            start, chunk = run.start(), run.group()
            if chunk[0] == " " and start > 0:
                # One space after a token is that token's trailing white space.
                start, chunk = start + 1, chunk[1:]
                if not chunk:
                    continue
            for part in self._chunk(chunk, special_cases):
                found.append(Token(start, part))
                start += len(part)
        if special_cases and self._by_first:
            found = self._special_spans(text, found)
        return found

    def _chunk(self, chunk: str, special_cases: bool) -> tuple[str, ...]:
        if not special_cases:
            return self._split(chunk, False)
        parts = self._chunks.get(chunk)
        if parts is None:
            special = self._specials.get(chunk)
            parts = special if special is not None else self._split(chunk, True)
            self._chunks[chunk] = parts
        return parts

    def _special(self, text: str, special_cases: bool) -> bool:
        return special_cases and text in self._specials

    def _split(self, text: str, special_cases: bool) -> tuple[str, ...]:
        """``_split_affixes`` and ``_attach_tokens`` of one chunk."""
        prefixes: list[str] = []
        suffixes: list[str] = []
        last_size = 0
        while text and len(text) != last_size:
            if self._token_match is not None and self._token_match.match(text):
                break
            if self._special(text, special_cases):
                break
            last_size = len(text)
            pre_len = self.find_prefix(text)
            prefix = minus_pre = ""
            if pre_len:
                prefix, minus_pre = text[:pre_len], text[pre_len:]
                if minus_pre and self._special(minus_pre, special_cases):
                    text = minus_pre
                    prefixes.append(prefix)
                    break
            suf_len = self.find_suffix(text[pre_len:])
            suffix = minus_suf = ""
            if suf_len:
                suffix, minus_suf = text[-suf_len:], text[:-suf_len]
                if minus_suf and self._special(minus_suf, special_cases):
                    text = minus_suf
                    suffixes.append(suffix)
                    break
            if pre_len and suf_len and pre_len + suf_len <= len(text):
                text = text[pre_len:-suf_len]
                prefixes.append(prefix)
                suffixes.append(suffix)
            elif pre_len:
                text = minus_pre
                prefixes.append(prefix)
            elif suf_len:
                text = minus_suf
                suffixes.append(suffix)
        parts = prefixes
        if text:
            if self._special(text, special_cases):
                parts.extend(self._specials[text])
            elif (self._token_match is not None and self._token_match.match(text)) or (
                self._url_match is not None and self._url_match.match(text)
            ):
                parts.append(text)
            else:
                parts.extend(self._infixes(text))
        parts.extend(reversed(suffixes))
        return tuple(parts)

    def _infixes(self, text: str) -> list[str]:
        matches = self.find_infix(text)
        if not matches:
            return [text]
        parts = []
        start = 0
        for match in matches:
            infix_start, infix_end = match.start(), match.end()
            if infix_start == 0:  # spaCy skips an infix at the very start
                continue
            if infix_start != start:
                parts.append(text[start:infix_start])
            if infix_start != infix_end:
                parts.append(text[infix_start:infix_end])
            start = infix_end
        if text[start:]:
            parts.append(text[start:])
        return parts

    def _special_spans(self, text: str, found: list[Token]) -> list[Token]:
        """``_apply_special_cases``: special cases found across tokens replace them."""
        matches = []
        for index, token in enumerate(found):
            for _, parts in self._by_first.get(token.text, ()):
                end = index + len(parts)
                if end <= len(found) and all(
                    found[index + k].text == part for k, part in enumerate(parts)
                ):
                    matches.append((index, end))
        if not matches:
            return found
        # _filter_special_spans: longest first, then the earliest; a span is kept unless its
        # first or last token belongs to one kept or dropped before it.
        matches.sort(key=lambda match: (match[1] - match[0], -match[0]))
        seen: set[int] = set()
        kept = []
        for start, end in reversed(matches):
            if start not in seen and end - 1 not in seen:
                kept.append((start, end))
            seen.update(range(start, end))
        kept.sort()
        result: list[Token] = []
        position = 0
        for start, end in kept:
            result.extend(found[position:start])
            first, last = found[start], found[end - 1]
            span_text = text[first.idx : last.idx + len(last.text)]
            special = self._specials.get(span_text)
            if special is None:
                result.extend(found[start:end])
            else:
                idx = first.idx
                for part in special:
                    result.append(Token(idx, part))
                    idx += len(part)
            position = end
        result.extend(found[position:])
        return result


def sentence_spans(tokens: Sequence[Token], starts: Sequence[int]) -> list[tuple[int, int]]:
    """Token ranges of the sentences that begin at the character offsets ``starts``.

    A boundary moves to the first token that starts at or after it, and the first token always
    starts a sentence: the same as marking spaCy's ``SENT_START`` on those tokens and reading
    ``Doc.sents``.
    """
    if not tokens:
        return []
    offsets = [token.idx for token in tokens]
    firsts = sorted({0, *(bisect_left(offsets, start) for start in starts)} - {len(tokens)})
    return [(a, b) for a, b in zip(firsts, [*firsts[1:], len(tokens)], strict=True)]
