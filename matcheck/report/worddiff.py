"""Two passages side by side with their removed, added and changed words marked (HTML).

For display only: the comparison itself aligns passages by TF-IDF (compare/content.py); this
marks the words a reader should look at, with :mod:`difflib` on whitespace-separated words
(docs/references.md §27).
Every word is escaped. Marks read without colour: a removed word is struck through, an added
word underlined, a changed word boxed with a dotted line (docs/html-report.md).
"""

from __future__ import annotations

import difflib
import re
from html import escape

# The comparison's own marks around changed words (compare/edits.py: «…»), where it has them.
MARKED = re.compile("«([^«»]*)»")


def word_diff(left: str, right: str) -> tuple[str, str]:
    """The HTML of ``left`` and of ``right`` with the words that differ marked."""
    a, b = left.split(), right.split()
    matcher = difflib.SequenceMatcher(a=a, b=b, autojunk=False)
    out_a: list[str] = []
    out_b: list[str] = []
    for op, i1, i2, j1, j2 in matcher.get_opcodes():
        old = escape(" ".join(a[i1:i2]))
        new = escape(" ".join(b[j1:j2]))
        if op == "equal":
            out_a.append(old)
            out_b.append(new)
        elif op == "delete":
            out_a.append(f'<del class="removed" title="removed">{old}</del>')
        elif op == "insert":
            out_b.append(f'<ins class="added" title="added">{new}</ins>')
        else:
            out_a.append(f'<del class="changed" title="changed">{old}</del>')
            out_b.append(f'<ins class="changed" title="changed">{new}</ins>')
    return " ".join(out_a), " ".join(out_b)


def counts(left: str, right: str) -> dict[str, int]:
    """How many words were removed, added and changed (the words of ``left`` replaced)."""
    a, b = left.split(), right.split()
    result = {"removed": 0, "added": 0, "changed": 0}
    for op, i1, i2, j1, j2 in difflib.SequenceMatcher(a=a, b=b, autojunk=False).get_opcodes():
        if op == "delete":
            result["removed"] += i2 - i1
        elif op == "insert":
            result["added"] += j2 - j1
        elif op == "replace":
            result["changed"] += i2 - i1
    return result


def marked_pair(left: str, right: str) -> tuple[str, str] | None:
    """The HTML of two excerpts whose changed words the comparison marked with «…»: those
    words marked as changed on both sides. None when neither excerpt carries the marks."""
    if not (MARKED.search(left) or MARKED.search(right)):
        return None
    return (
        MARKED.sub(r'<del class="changed" title="changed">\1</del>', escape(left, quote=False)),
        MARKED.sub(r'<ins class="changed" title="changed">\1</ins>', escape(right, quote=False)),
    )
