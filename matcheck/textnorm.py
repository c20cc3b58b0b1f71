"""One text normalisation for every format, applied to lesson text as it is read.

Converters and word processors write the same lesson with different characters: curly or
straight quotes and apostrophes ("we'll" / "we’ll"), en and em dashes or hyphens, typographic
ligatures ("ﬁ"), non-breaking, thin and zero-width spaces, soft hyphens. None of these is a
difference a learner reads, so all of them are folded before anything is measured or
compared: Unicode NFKC (compatibility forms: ligatures, full-width letters, non-breaking and
other spaces), then the punctuation table below, then invisible characters removed. Only
the standard library is used; readers and the post-test reader share it.
"""

from __future__ import annotations

import unicodedata

# Characters that are not content: soft hyphen, zero-width space/joiners, word joiner, BOM.
INVISIBLE = "\u00ad\u200b\u200c\u200d\u2060\ufeff"

# Quotes, apostrophes and dashes to their ASCII form. NFKC leaves these alone (they are not
# compatibility characters), so they get a table of their own (Unicode General Punctuation).
_PUNCTUATION = {
    # single quotes and apostrophes: ‘ ’ ‚ ‛ ′ and the modifier letter apostrophe ʼ
    **dict.fromkeys("\u2018\u2019\u201a\u201b\u2032\u02bc", "'"),
    # double quotes: “ ” „ ‟ ″ « » are left as they are (they may be the language's quotes)
    **dict.fromkeys("\u201c\u201d\u201e\u201f\u2033", '"'),
    # hyphen, non-breaking hyphen, figure dash, en dash, em dash, horizontal bar, minus sign
    **dict.fromkeys("\u2010\u2011\u2012\u2013\u2014\u2015\u2212", "-"),
}
_TABLE = str.maketrans({**_PUNCTUATION, **dict.fromkeys(INVISIBLE, None)})


def fold(text: str) -> str:
    """``text`` normalised for comparison: NFKC, ASCII quotes and dashes, no invisibles.

    White space is not collapsed here (the document builder does that per block).
    """
    return unicodedata.normalize("NFKC", text.translate(_TABLE)).translate(_TABLE)
