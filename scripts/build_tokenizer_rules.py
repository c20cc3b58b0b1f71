"""Write matcheck/language/spacy_en_tokenizer.json from the installed spaCy.

matcheck applies spaCy's English tokenizer rules without importing spaCy
(matcheck/language/tokenizer.py). The packaged copy serves the spaCy release it was made
from; run this after changing the spaCy pin, and commit the file:

    python scripts/build_tokenizer_rules.py
"""

from __future__ import annotations

from importlib.metadata import version

from matcheck.language.tokenizer import PACKAGED, rules_from_spacy, rules_json


def main() -> None:
    PACKAGED.write_text(rules_json(rules_from_spacy(), version("spacy")), encoding="utf-8")
    print(f"wrote {PACKAGED} for spaCy {version('spacy')}")


if __name__ == "__main__":
    main()
