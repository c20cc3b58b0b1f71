"""Code: listings measured on their own, so they never move the prose measures."""

from __future__ import annotations

from collections.abc import Iterator

from matcheck.findings import Tolerance
from matcheck.language.analysis import Analysis
from matcheck.measures.base import EXACT, Group, Measurement, MeasureSpec, Role, causes
from matcheck.model import BlockKind, Capability
from matcheck.settings import Settings

CODE_BLOCKS = MeasureSpec(
    "code_blocks",
    Group.STRUCTURE,
    "blocks",
    "Code blocks (fenced or indented, code styles, monospace paragraphs)",
    Tolerance(reason=EXACT),
    needs=Capability.CODE,
)
CODE_LINES = MeasureSpec(
    "code_lines",
    Group.STRUCTURE,
    "lines",
    "Non-empty lines of code",
    Tolerance(reason=EXACT),
    follows=causes("code_blocks"),
    needs=Capability.CODE,
)
# Found by comparing two versions (matcheck.compare.code), judged from zero.
CODE_CHANGED = MeasureSpec(
    "code_lines_changed",
    Group.CONTENT,
    "lines",
    "Code lines of one version that the other lacks, in order (changed, removed or added)",
    Tolerance(reason="learners copy code as it stands: any changed line is visible"),
    role=Role.PAIRWISE,
    needs=Capability.CODE,
)
SPECS = (CODE_BLOCKS, CODE_LINES, CODE_CHANGED)


def measure_code(analysis: Analysis, settings: Settings) -> Iterator[Measurement]:
    lines = analysis.document.blocks_of(BlockKind.CODE)
    yield Measurement(CODE_BLOCKS, float(len({line.group for line in lines})))
    yield Measurement(CODE_LINES, float(len(lines)))
