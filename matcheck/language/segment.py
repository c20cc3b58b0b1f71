"""Sentence boundaries inside one block of text, by rule (docs/measures.md, "Sentences").

The rules are checked against the English Golden Rules (docs/references.md §19).

The rules decide, at every run of ``.``, ``!``, ``?`` or ``…`` followed by white space,
whether a sentence ends there. They work on characters; :mod:`matcheck.language.pipeline`
turns the offsets they return into sentence starts on the spaCy tokens, so the text is
tokenised once. A block boundary always ends a sentence as well; that is not decided here.

A run ends a sentence when the next word starts with a capital letter, a digit or an opening
quote or bracket, except:

- after a title (:data:`TITLES`: "Dr.", "Mt.", "Jan."), an abbreviation of running text
  (:data:`RUNNING`: "etc.", "et al.", "Co.") or a dotted abbreviation ("U.S.", "e.g."), which
  ends a sentence only before a capitalised function word ("etc. The", "Co. It", "U.S. How",
  but not "U.S. Government" or "Dr. Lee");
- after a label, measure or date before a digit (:data:`NUMBER_LABELS`, :data:`DATES`:
  "Fig. 2", "no. 4", "approx. 5", "Jan. 5");
- after a single capital initial: after a name ("Jonas E. Smith") only before a capitalised
  function word ("you and I. Did"), after a lower-case word always ("port B. Do");
- after a step number whose label is capitalised and opens its sentence ("Step 1. Remove the
  wheel", but not "note it beside step 20. If..." or "See Step 3. Then..."), see
  :data:`STEP_LABELS`;
- after a list marker ("1.", "2)", "a.") that opens a block, follows a colon, or belongs to a
  run of consecutive markers in the block ("1. The first item 2. The second item"); such a
  marker *starts* a sentence instead;
- after an editorial ellipsis in brackets ("[...]") or a free-standing three-dot ellipsis
  ("the thing is . . . I didn't"): four dots are an ellipsis and a period.

A run followed by a lower-case word never ends a sentence (quoted "Stop!" inside a sentence,
"Yahoo! in", "... well"). Decimals, version numbers, URLs and e-mail addresses need no rule:
their periods are not followed by white space. A stretch with no letter or digit (a lone
ellipsis) joins the next sentence, or the previous one at the end of the block.
"""

from __future__ import annotations

import re

from matcheck.language.pipeline import stop_words

# Abbreviations, lower case and without their final period (docs/measures.md lists them).
# Titles count only when written with a capital ("Gen." but not "gen."):
# several are ordinary words in lower case ("rep", "sun", "mar"). "st" is also "street".
TITLES = frozenset(
    {"dr", "mr", "mrs", "ms", "prof", "st", "mt", "sr", "jr", "rev", "hon", "capt", "col",
     "gen", "lt", "sgt", "gov", "sen", "rep", "pres", "messrs", "mme", "mlle"}
)  # fmt: skip
# Months and days, with a capital: no sentence ends between them and a digit ("Jan. 5").
DATES = frozenset(
    {"jan", "feb", "mar", "apr", "jun", "jul", "aug", "sep", "sept", "oct", "nov", "dec",
     "mon", "tue", "tues", "wed", "thu", "thurs", "fri", "sat", "sun"}
)  # fmt: skip
_LOWER_CASE_TITLES = frozenset({"st"})
# Latin abbreviations of running text and company suffixes, in any case; "et al." is its "al".
RUNNING = frozenset(
    {"cf", "etc", "al", "vs", "viz", "ibid", "resp", "incl", "excl", "esp",
     "co", "corp", "inc", "ltd", "bros"}
)  # fmt: skip
# Labels and measures before a number: no sentence ends between them and a digit ("Fig. 2",
# "no. 4", "approx. 5 kg"); before anything else they are read as ordinary words, since
# several are words too ("The answer is no. Ask again.", "Bake for 30 min. Remove the tray.").
NUMBER_LABELS = frozenset(
    {"fig", "figs", "eq", "eqs", "no", "nos", "n°", "vol", "vols", "p", "pp", "ch", "chap",
     "sec", "sect", "art", "para", "pt", "ed", "eds", "op", "tab", "ref", "refs", "ex",
     "approx", "ca", "c", "min", "max", "avg", "est"}
)  # fmt: skip

# Words that label a numbered step: "Step 1. Remove the wheel" is one sentence (the number is
# part of the label). "Figure 2." is not a label: "See Figure 2. Then..." ends a sentence.
STEP_LABELS = frozenset(
    {"step", "stage", "phase", "part", "task", "exercise", "activity", "question", "lesson",
     "unit", "chapter", "section", "tip", "rule", "example", "problem", "method", "option"}
)  # fmt: skip

_RUN = re.compile(r"[.!?…]+(?:[ \t]\.(?=[\s.\"'”’)\]]|$))*")
_CLOSERS = "\"'”’)]»"
_OPENERS = "\"'“‘([«"
# A list marker: 1-3 digits or one lower-case letter, then ".", ".)" or ")", optionally after
# a bullet; it must stand alone between white space.
_MARKER = re.compile(r"(?<!\S)([•◦▪‣⁃·*–-]\s?)?(\d{1,3}|[a-z])(\.\)|\.|\))(?=\s)")
# Letters and dots only, with an inner dot: "U.S.", "e.g.", "a.m.", "Ph.D."
_DOTTED = re.compile(r"^(?:[^\W\d_]+\.)+[^\W\d_]+$")
_WORDLIKE = re.compile(r"[^\W_]")


def _marker_value(token: str) -> tuple[str, int]:
    return ("n", int(token)) if token.isdigit() else ("a", ord(token))


def _list_markers(text: str) -> dict[int, tuple[int, int]]:
    """Accepted list markers: start of the marker (bullet included) -> (period index, end)."""
    found = []
    for match in _MARKER.finditer(text):
        before = text[: match.start()].rstrip()
        previous = before.rsplit(None, 1)[-1] if before else ""
        if previous[:1].isupper() and previous[-1:].isalnum():
            continue  # "Step 2." or "Figure 2." labels a number, it is not a list marker
        found.append((match, previous))
    values = {_marker_value(match.group(2)) for match, _ in found}
    accepted: dict[int, tuple[int, int]] = {}
    for match, previous in found:
        kind, value = _marker_value(match.group(2))
        in_run = (kind, value - 1) in values or (kind, value + 1) in values
        if match.start() == 0 or previous.endswith(":") or in_run:
            accepted[match.start()] = (match.start(3), match.end())
    return accepted


def _previous_word(text: str, end: int) -> str:
    start = end
    while start > 0 and not text[start - 1].isspace():
        start -= 1
    return text[start:end]


def _next_word(text: str, start: int) -> str:
    index = start
    while index < len(text) and text[index] in _OPENERS:
        index += 1
    end = index
    while end < len(text) and not text[end].isspace():
        end += 1
    return text[index:end].rstrip(".,;:!?" + _CLOSERS)


def _period_ends(text: str, run_start: int, following: str) -> bool:
    """Whether a run that starts with a period at ``run_start`` ends its sentence."""
    word = _previous_word(text, run_start)
    core = word.lstrip(_OPENERS)
    lower = core.lower()
    starts_sentence = following[:1].isupper() and following.lower() in stop_words()
    title = lower in TITLES and (core[:1].isupper() or lower in _LOWER_CASE_TITLES)
    if title or lower in RUNNING or _DOTTED.match(core):
        return starts_sentence
    date = lower in DATES and core[:1].isupper()
    if (lower in NUMBER_LABELS or date) and following[:1].isdigit():
        return False
    if len(core) == 1 and core.isupper():  # an initial
        before = text[: run_start - len(word)].rstrip()
        previous = before.rsplit(None, 1)[-1] if before else ""
        after_name = not previous or previous[:1].isupper()
        return starts_sentence if after_name else True
    if core.isdigit():
        label_end = len(text[: run_start - len(word)].rstrip())
        label = _previous_word(text, label_end)
        before = text[: label_end - len(label)].rstrip()
        opens = not before or before[-1] in ".!?:;)"
        if label[:1].isupper() and label.lower() in STEP_LABELS and opens:
            return False  # "Step 1. Remove the wheel"; not "beside step 20. If in doubt"
    return True


def _is_inner_ellipsis(text: str, start: int, run: str) -> bool:
    """A free-standing three-dot ellipsis ("is . . . I didn't") marks an omission inside a
    sentence; a fourth dot (". . . .") is the sentence's own period."""
    detached = start == 0 or text[start - 1].isspace()
    return detached and run.replace(" ", "").replace("\t", "") in ("...", "…")


def sentence_starts(text: str) -> list[int]:
    """Character offsets where the sentences of ``text`` start (the first is always 0).

    ``text`` is one block; see the module docstring for the rules.
    """
    if not text.strip():
        return [0]
    markers = _list_markers(text)
    marker_periods = {period for period, _ in markers.values()}
    starts = [0]
    starts.extend(start for start in markers if start > 0)
    for run in _RUN.finditer(text):
        end = run.end()
        while end < len(text) and text[end] in _CLOSERS:
            end += 1
        if end < len(text) and not text[end].isspace():
            continue  # "3.5", "example.com", "Jr.'s": no white space after the run
        if run.start() in marker_periods or text[run.start() - 1 : run.start()] == "[":
            continue
        if _is_inner_ellipsis(text, run.start(), run.group()):
            continue
        nxt = end
        while nxt < len(text) and text[nxt].isspace():
            nxt += 1
        if nxt >= len(text):
            continue
        first = text[nxt]
        if not (first.isupper() or first.isdigit() or first in _OPENERS or nxt in markers):
            continue
        following = _next_word(text, nxt)
        if text[run.start()] == "." and not _period_ends(text, run.start(), following):
            continue
        spaced = run.group()
        if spaced.startswith(". ") and run.start() > 0 and not text[run.start() - 1].isspace():
            # "compounds. . . . The practice": the period ends the sentence, the spaced
            # ellipsis opens the next one (an omission at the start of a quotation).
            starts.append(run.start() + 2)
            continue
        starts.append(nxt)
    return _merge_wordless(text, sorted(set(starts)))


def _merge_wordless(text: str, starts: list[int]) -> list[int]:
    """Drop boundaries so that every sentence has a letter or a digit in it."""
    bounds = [*starts, len(text)]
    kept: list[int] = []
    merge_next = False
    for index, start in enumerate(starts):
        wordless = _WORDLIKE.search(text[start : bounds[index + 1]]) is None
        last = index == len(starts) - 1
        if merge_next:  # the wordless piece before opens this sentence
            merge_next = wordless and not last
            continue
        if wordless and last and kept:
            continue  # a trailing piece joins the previous sentence
        kept.append(start)
        merge_next = wordless and not last
    return kept
