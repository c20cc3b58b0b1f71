"""``matcheck accept``: the ``[[accepted]]`` entry for a finding, and appending it.

The entry is printed for the user to paste into the study file; only with ``--write`` is it
appended, and then the study file's existing bytes are kept exactly (comments, order,
spacing): the entry is text added at the end, the TOML is never re-serialised. The write is
refused when the file changed while the study was being checked, and it is atomic
(:func:`matcheck.output.write_output`), so a crash leaves the old file whole.
"""

from __future__ import annotations

import math
from collections.abc import Collection, Sequence
from pathlib import Path

from matcheck.errors import ConfigError, UsageError
from matcheck.findings import Accepted, Finding, Report, Status
from matcheck.identity import ID_LENGTH, finding_id
from matcheck.measures import registry

MIN_PREFIX = 6  # an id may be shortened to a unique prefix of at least this many digits


def find_finding(report: Report, wanted: str, study: Path) -> Finding:
    """The finding whose id is ``wanted`` (or starts with it); a difference to accept."""
    wanted = wanted.strip().lower()
    if not MIN_PREFIX <= len(wanted) <= ID_LENGTH:
        raise UsageError(
            f"FINDING-ID {wanted!r}: give the id a report shows ({ID_LENGTH} hexadecimal "
            f"digits, or its first {MIN_PREFIX} or more)"
        )
    found = [f for f in report.findings if finding_id(f).startswith(wanted)]
    if not found:
        raise UsageError(
            f"no finding of {study} has the id {wanted!r}; the reports show ids in their Id "
            f"column (matcheck check {study})"
        )
    if len({finding_id(f) for f in found}) > 1:
        raise UsageError(f"{wanted!r} starts several ids; give all {ID_LENGTH} digits")
    finding = found[0]
    if finding.dimension not in registry.compared():
        raise UsageError(
            f"{wanted} ({finding.name}) is about the learners' data or the study's design, "
            "not the lesson versions: only a difference between versions can be accepted"
        )
    if finding.status is Status.ACCEPTED:
        entry = finding.accepted
        number = f" by accepted #{entry.number}" if entry else ""
        raise UsageError(f"{wanted} is already accepted{number}")
    if finding.status is not Status.DIFFERS:
        raise UsageError(
            f"{wanted} ({finding.name}, {finding.condition} vs {finding.reference}) is "
            f"{finding.status.value}: only a difference beyond tolerance is accepted"
        )
    return finding


def overlapping(
    entries: Sequence[Accepted], finding: Finding, factor: str | None
) -> list[Accepted]:
    """The study's entries that name the same comparison (``factor``: the one whose contrast
    it is), measure and item as ``finding``: it grew beyond them, or its evidence changed."""
    return [
        e
        for e in entries
        if e.measure == finding.dimension
        and e.item == finding.item
        and (
            (e.contrast is not None and e.contrast == factor)
            or (e.reference, e.condition) == (finding.reference, finding.condition)
        )
    ]


def toml_string(text: str) -> str:
    """A TOML basic string (the escapes of TOML 1.0, docs/references.md §23)."""
    escaped = []
    for char in text:
        if char == "\\":
            escaped.append("\\\\")
        elif char == '"':
            escaped.append('\\"')
        elif char in "\b\t\n\f\r":
            escaped.append({"\b": "\\b", "\t": "\\t", "\n": "\\n", "\f": "\\f", "\r": "\\r"}[char])
        elif ord(char) < 0x20 or ord(char) == 0x7F:
            escaped.append(f"\\u{ord(char):04X}")
        else:
            escaped.append(char)
    return '"' + "".join(escaped) + '"'


def _outward(value: float, decimals: int) -> float:
    """Rounded away from zero, so the accepted extent covers the difference as measured."""
    scale = 10**decimals
    return math.copysign(math.ceil(abs(value) * scale - 1e-9) / scale, value)


def extent_literal(finding: Finding) -> str:
    """``up_to`` as a TOML value: a percentage of the reference where the tolerance is
    relative (as the reports show it), else a number in the measure's unit."""
    relative = finding.relative_difference
    tolerance = finding.tolerance
    if finding.unit != "share" and tolerance and tolerance.relative and relative is not None:
        return f'"{_outward(relative * 100, 1):+.1f}%"'
    difference = finding.difference or 0.0
    spec = registry.spec(finding.dimension)
    decimals = 3 if finding.unit == "share" else spec.shown_decimals if spec else 2
    rounded = _outward(difference, decimals)
    return f"{int(rounded)}" if decimals == 0 else f"{rounded:.{decimals}f}"


def _comment(text: str) -> str:
    return "# " + " ".join(text.split())


def entry_text(finding: Finding, reason: str, by: str | None, date: str) -> str:
    """The ``[[accepted]]`` table for ``finding``, with comments saying what it accepts."""
    from matcheck.report.common import describe_evidence, format_difference

    if not reason.strip():
        raise UsageError("--reason must say why the difference is acceptable")
    pair = (finding.reference, finding.condition)
    lines = [
        _comment(
            f"{finding.condition} vs {finding.reference}: {finding.name} differs "
            f"({format_difference(finding)})"
        )
    ]
    lines += [_comment(describe_evidence(e, pair)) for e in finding.evidence[:3]]
    if len(finding.evidence) > 3:
        lines.append(_comment(f"… and {len(finding.evidence) - 3} more"))
    lines += [
        "[[accepted]]",
        f"id = {toml_string(finding_id(finding))}",
        f"reference = {toml_string(finding.reference)}",
        f"condition = {toml_string(finding.condition)}",
        f"measure = {toml_string(finding.dimension)}",
    ]
    if finding.item is not None:
        lines.append(f"item = {toml_string(finding.item)}")
    lines += [
        f"up_to = {extent_literal(finding)}",
        f"reason = {toml_string(reason.strip())}",
    ]
    if by:
        lines.append(f"by = {toml_string(by.strip())}")
    lines.append(f"date = {date}")
    return "\n".join(lines) + "\n"


def appended(original: bytes, entry: str) -> bytes:
    """The study file's bytes with ``entry`` after them, a blank line between, in the file's
    own line ending."""
    newline = b"\r\n" if b"\r\n" in original else b"\n"
    body = entry.encode("utf-8").replace(b"\n", newline)
    if not original:
        return body
    separator = newline if original.endswith(newline) or original.endswith(b"\n") else newline * 2
    return original + separator + body


def append_entry(
    study: Path,
    original: bytes,
    entry: str,
    pairs: Collection[tuple[str, str]],
    factors: Sequence[str],
) -> int:
    """Append ``entry`` to the study file; returns the entry's number. Refuses when the file
    changed since ``original`` was read, or when the result would not load."""
    import tomllib

    from matcheck.output import write_output
    from matcheck.study_accepted import parse_accepted

    combined = appended(original, entry)
    try:
        data = tomllib.loads(combined.decode("utf-8"))
    except (UnicodeDecodeError, tomllib.TOMLDecodeError) as problem:
        raise ConfigError(
            f"the entry cannot be appended: the result would not be valid TOML ({problem})",
            path=str(study),
        ) from None
    entries = parse_accepted(study, data.get("accepted"), pairs, factors, registry.compared())
    try:
        current = study.read_bytes()
    except OSError as error:
        raise ConfigError(f"cannot be read again ({error.strerror})", path=str(study)) from None
    if current != original:
        raise UsageError(
            f"{study} changed while matcheck was checking it; nothing was written: run "
            "matcheck accept again"
        )
    try:
        write_output(study, combined, (), update_input=True)
    except UsageError as problem:
        raise UsageError(problem.message.replace("--output", "--write", 1)) from None
    return len(entries)
