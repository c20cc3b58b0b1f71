"""Run sentence segmenters on the Golden Rules and the lesson cases (docs/measures.md).

Usage: python scripts/compare_segmenters.py [--show]. pySBD is optional (pip install pysbd);
without it only matcheck's rules and spaCy's sentencizer run.
"""

from __future__ import annotations

import itertools
import json
import sys
from collections.abc import Callable
from pathlib import Path

DATA = Path(__file__).resolve().parent.parent / "tests" / "data"


def matcheck_rules(text: str) -> list[str]:
    from matcheck.language.segment import sentence_starts

    starts = [*sentence_starts(text), len(text)]
    return [text[a:b].strip() for a, b in itertools.pairwise(starts)]


def spacy_sentencizer() -> Callable[[str], list[str]]:
    import spacy

    pipeline = spacy.blank("en")
    pipeline.add_pipe("sentencizer")
    return lambda text: [span.text.strip() for span in pipeline(text).sents]


def pysbd_segmenter() -> Callable[[str], list[str]] | None:
    try:
        import pysbd  # type: ignore[import-not-found]
    except ImportError:
        return None
    segmenter = pysbd.Segmenter(language="en", clean=False)
    return lambda text: [s.strip() for s in segmenter.segment(text) if s.strip()]


def main() -> None:
    show = "--show" in sys.argv
    sets = {
        name: json.loads((DATA / f"{name}.json").read_text(encoding="utf-8"))["cases"]
        for name in ("golden_rules_en", "lesson_sentences_en")
    }
    candidates = {"matcheck": matcheck_rules, "sentencizer": spacy_sentencizer()}
    sbd = pysbd_segmenter()
    if sbd is not None:
        candidates["pysbd"] = sbd
    for name, segment in candidates.items():
        scores = []
        for set_name, cases in sets.items():
            passed = 0
            for case in cases:
                got = segment(case["text"])
                passed += got == case["sentences"]
                if show and got != case["sentences"]:
                    print(f"  {name} misses: {case['text']!r} -> {got!r}")
            scores.append(f"{set_name} {passed}/{len(cases)}")
        print(f"{name}: " + ", ".join(scores))


if __name__ == "__main__":
    main()
