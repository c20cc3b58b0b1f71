"""Inline SVG for the HTML report: the verdict marks and the per-measure dot chart.

Written by hand rather than with a plotting library: the report must open offline with no
script and no request, a dot chart is a few dozen SVG elements, and the output stays
deterministic (tests and golden files can compare it). docs/html-report.md documents the marks
and colours. Every mark is a distinct *shape* with its label beside it, so a verdict reads in
greyscale and without colour vision; the colour only repeats what the shape says.
"""

from __future__ import annotations

import itertools
import math
from collections.abc import Sequence
from dataclasses import dataclass
from html import escape

from matcheck.findings import Status

# Colours of our own choosing, each at least 6:1 against white (WCAG 2.1 contrast,
# docs/references.md §27); in greyscale they look alike, which is why the shapes differ.
COLOURS = {
    Status.DIFFERS: "#a4262c",
    Status.INCONCLUSIVE: "#7a5c00",
    Status.ACCEPTED: "#6a3d7a",
    Status.INTENDED: "#1f5f99",
    Status.MATCHED: "#2e6b3a",
}
SHAPE_NAMES = {
    Status.DIFFERS: "filled triangle",
    Status.INCONCLUSIVE: "hollow diamond",
    Status.ACCEPTED: "hollow square",
    Status.INTENDED: "filled square",
    Status.MATCHED: "filled circle",
}
REFERENCE_COLOUR = "#222222"
BAND_FILL = "#e2e2e2"
BAND_EDGE = "#8a8a8a"


def shape(status: Status | None, x: float, y: float, r: float = 6.0) -> str:
    """The mark of ``status`` centred at (x, y); ``None`` is the reference (a hollow ring)."""
    if status is None:
        return (
            f'<circle cx="{x:.1f}" cy="{y:.1f}" r="{r:.1f}" fill="none" '
            f'stroke="{REFERENCE_COLOUR}" stroke-width="2"/>'
        )
    colour = COLOURS[status]
    if status is Status.DIFFERS:
        points = f"{x:.1f},{y - r:.1f} {x + r:.1f},{y + r * 0.8:.1f} {x - r:.1f},{y + r * 0.8:.1f}"
        return f'<polygon points="{points}" fill="{colour}" stroke="#000" stroke-width="0.8"/>'
    if status is Status.INCONCLUSIVE:
        points = f"{x:.1f},{y - r:.1f} {x + r:.1f},{y:.1f} {x:.1f},{y + r:.1f} {x - r:.1f},{y:.1f}"
        return f'<polygon points="{points}" fill="#fff" stroke="{colour}" stroke-width="2.2"/>'
    if status is Status.ACCEPTED:
        side = r * 1.5
        return (
            f'<rect x="{x - side / 2:.1f}" y="{y - side / 2:.1f}" width="{side:.1f}" '
            f'height="{side:.1f}" fill="#fff" stroke="{colour}" stroke-width="2.2"/>'
        )
    if status is Status.INTENDED:
        side = r * 1.6
        return (
            f'<rect x="{x - side / 2:.1f}" y="{y - side / 2:.1f}" width="{side:.1f}" '
            f'height="{side:.1f}" fill="{colour}" stroke="#000" stroke-width="0.8"/>'
        )
    return f'<circle cx="{x:.1f}" cy="{y:.1f}" r="{r * 0.85:.1f}" fill="{colour}"/>'


def mark(status: Status | None, label: str | None = None) -> str:
    """A small inline mark followed by its label (the verdict's name by default)."""
    text = label if label is not None else (status.value if status else "reference")
    name = SHAPE_NAMES[status] if status else "hollow ring"
    kind = status.value if status else "reference"
    return (
        f'<span class="mark mark-{kind}"><svg class="glyph" width="14" height="14" '
        f'viewBox="0 0 14 14" aria-hidden="true">{shape(status, 7, 7, 5.5)}</svg>'
        f'<span class="mark-label" title="{escape(name)}">{escape(text)}</span></span>'
    )


@dataclass(frozen=True, slots=True)
class ChartRow:
    """One contrast in a chart: the condition's value against its reference's band."""

    condition: str
    against: str  # the reference's name
    reference: float | None
    value: float | None
    low: float | None
    high: float | None
    status: Status
    text: str  # the values in words, shown at the right


@dataclass(frozen=True, slots=True)
class Zone:
    """A range of the axis shaded behind every row, with its name above (a WWC band)."""

    low: float
    high: float
    label: str
    fill: str


WIDTH, LABEL_W, TEXT_W, ROW_H, TOP = 720, 200, 240, 34, 26


def dot_chart(
    title: str, rows: Sequence[ChartRow], chart_id: str, zones: Sequence[Zone] = ()
) -> str:
    """One measure: a row per contrast, the tolerance band shaded around the reference (a
    hollow ring), the condition as the mark of its verdict; a shared axis below. ``zones``
    shade ranges of the axis behind all rows."""
    known = [
        v for row in rows for v in (row.reference, row.value, row.low, row.high) if v is not None
    ]
    known += [v for zone in zones for v in (zone.low, zone.high)]
    low, high = _domain(known)
    left, right = LABEL_W, WIDTH - TEXT_W

    def x(value: float) -> float:
        return left + (value - low) / (high - low) * (right - left)

    height = TOP + (14 if zones else 0) + ROW_H * len(rows) + 26
    parts = [
        f'<svg class="chart" id="{escape(chart_id)}" role="img" width="{WIDTH}" '
        f'height="{height}" viewBox="0 0 {WIDTH} {height}">',
        f"<title>{escape(title)}</title>",
        f'<text x="0" y="16" class="chart-title">{escape(title)}</text>',
    ]
    top = TOP + (14 if zones else 0)
    for zone in zones:
        x0, x1 = x(zone.low), x(zone.high)
        parts.append(
            f'<rect class="zone" x="{x0:.1f}" y="{top:.1f}" width="{x1 - x0:.1f}" '
            f'height="{ROW_H * len(rows):.1f}" fill="{zone.fill}" stroke="{BAND_EDGE}" '
            'stroke-dasharray="3 2"/>'
        )
        if zone.label:
            parts.append(
                f'<text x="{(x0 + x1) / 2:.1f}" y="{top - 3:.1f}" text-anchor="middle" '
                f'class="tick">{escape(zone.label)}</text>'
            )
    for index, row in enumerate(rows):
        y = top + ROW_H * index + ROW_H / 2
        parts.append(
            f'<text x="{left - 8}" y="{y - 1:.1f}" text-anchor="end" class="row-label">'
            f"{escape(_clip(row.condition, 30))}<title>{escape(row.condition)}</title></text>"
        )
        if row.against:
            parts.append(
                f'<text x="{left - 8}" y="{y + 11:.1f}" text-anchor="end" class="row-against">'
                f"vs {escape(_clip(row.against, 27))}<title>{escape(row.against)}</title></text>"
            )
        parts.append(
            f'<line x1="{left}" x2="{right}" y1="{y:.1f}" y2="{y:.1f}" stroke="#d0d0d0" '
            'stroke-width="1"/>'
        )
        if row.low is not None and row.high is not None:
            x0, x1 = x(row.low), x(row.high)
            parts.append(
                f'<rect class="band" x="{x0:.1f}" y="{y - 9:.1f}" width="{max(x1 - x0, 1.5):.1f}" '
                f'height="18" fill="{BAND_FILL}" stroke="{BAND_EDGE}" stroke-dasharray="3 2"/>'
            )
        # The ring goes over the mark so that both show where the values coincide.
        if row.value is not None:
            parts.append(shape(row.status, x(row.value), y))
        if row.reference is not None:
            parts.append(shape(None, x(row.reference), y, 7.5))
        parts.append(
            f'<text x="{right + 10}" y="{y + 4:.1f}" class="row-value">{escape(row.text)}</text>'
        )
    axis_y = TOP + (14 if zones else 0) + ROW_H * len(rows) + 4
    parts.append(
        f'<line x1="{left}" x2="{right}" y1="{axis_y}" y2="{axis_y}" stroke="#555" '
        'stroke-width="1"/>'
    )
    for tick in _ticks(low, high):
        tx = x(tick)
        parts.append(
            f'<line x1="{tx:.1f}" x2="{tx:.1f}" y1="{axis_y}" y2="{axis_y + 4}" stroke="#555"/>'
            f'<text x="{tx:.1f}" y="{axis_y + 16}" text-anchor="middle" class="tick">'
            f"{_tick_text(tick)}</text>"
        )
    parts.append("</svg>")
    return "".join(parts)


def _domain(values: Sequence[float]) -> tuple[float, float]:
    if not values:
        return 0.0, 1.0
    low, high = min(values), max(values)
    if math.isclose(low, high):
        pad = abs(low) * 0.1 or 1.0
        return low - pad, high + pad
    pad = (high - low) * 0.08
    return low - pad, high + pad


def _ticks(low: float, high: float) -> list[float]:
    """About five round ticks inside [low, high]."""
    raw = (high - low) / 4
    power = 10 ** math.floor(math.log10(raw))
    step = next(m * power for m in (1, 2, 2.5, 5, 10) if m * power >= raw)
    first = math.ceil(low / step) * step
    count = int((high - first) // step) + 1
    return [first + i * step for i in range(count)]


def _tick_text(value: float) -> str:
    if abs(value) < 1e-9:
        return "0"
    return f"{value:,.0f}" if abs(value) >= 100 else f"{value:.3g}"


def _clip(text: str, width: int) -> str:
    return text if len(text) <= width else text[: width - 1] + "…"


@dataclass(frozen=True, slots=True)
class Curve:
    """One line of a curve chart: its label, the verdict of its mark, its points, and the
    point to mark on it (the planned sample)."""

    label: str
    status: Status | None
    points: tuple[tuple[float, float], ...]
    marked: float | None = None


CURVE_DASHES = ("", "6 3", "2 3", "8 3 2 3", "1 2")


def curve_chart(
    title: str, curves: Sequence[Curve], chart_id: str, *, target: float, x_label: str
) -> str:
    """Power (0–1) against the sample per condition: one line per contrast, told apart by its
    dash pattern and its label at the line's end (never by colour alone), the target power as
    a dashed rule, and the planned sample as the mark of the contrast's verdict."""
    xs = [x for curve in curves for x, _ in curve.points]
    low, high = (min(xs), max(xs)) if xs else (0.0, 1.0)
    high = high if high > low else low + 1
    left, right, top, bottom = 48.0, WIDTH - TEXT_W, 30.0, 210.0

    def px(value: float) -> float:
        return left + (value - low) / (high - low) * (right - left)

    def py(value: float) -> float:
        return bottom - value * (bottom - top)

    height = int(bottom) + 34
    parts = [
        f'<svg class="chart" id="{escape(chart_id)}" role="img" width="{WIDTH}" '
        f'height="{height}" viewBox="0 0 {WIDTH} {height}">',
        f"<title>{escape(title)}</title>",
        f'<text x="0" y="16" class="chart-title">{escape(title)}</text>',
        f'<line x1="{left}" x2="{right}" y1="{bottom}" y2="{bottom}" stroke="#555"/>',
        f'<line x1="{left}" x2="{left}" y1="{top}" y2="{bottom}" stroke="#555"/>',
        f'<line class="target" x1="{left}" x2="{right}" y1="{py(target):.1f}" '
        f'y2="{py(target):.1f}" stroke="{BAND_EDGE}" stroke-dasharray="4 3"/>',
        f'<text x="{left + 4}" y="{py(target) - 4:.1f}" class="tick">target {target:g}</text>',
    ]
    for tick in (0.0, 0.25, 0.5, 0.75, 1.0):
        parts.append(
            f'<text x="{left - 6}" y="{py(tick) + 4:.1f}" text-anchor="end" class="tick">'
            f"{tick:g}</text>"
        )
    for tick in _ticks(low, high):
        if low <= tick <= high:
            parts.append(
                f'<text x="{px(tick):.1f}" y="{bottom + 16}" text-anchor="middle" '
                f'class="tick">{_tick_text(tick)}</text>'
            )
    parts.append(
        f'<text x="{(left + right) / 2:.1f}" y="{bottom + 30}" text-anchor="middle" '
        f'class="tick">{escape(x_label)}</text>'
    )
    for index, curve in enumerate(curves):
        if not curve.points:
            continue
        path = " ".join(f"{px(x):.1f},{py(y):.1f}" for x, y in curve.points)
        dash = CURVE_DASHES[index % len(CURVE_DASHES)]
        parts.append(
            f'<polyline class="curve" points="{path}" fill="none" stroke="{REFERENCE_COLOUR}" '
            f'stroke-width="1.6"' + (f' stroke-dasharray="{dash}"' if dash else "") + "/>"
        )
        end_x, end_y = curve.points[-1]
        parts.append(
            f'<text x="{px(end_x) + 6:.1f}" y="{py(end_y) + 4:.1f}" class="row-value">'
            f"{escape(_clip(curve.label, 24))}</text>"
        )
        if curve.marked is not None:
            power_there = _interpolate(curve.points, curve.marked)
            parts.append(shape(curve.status, px(curve.marked), py(power_there)))
    parts.append("</svg>")
    return "".join(parts)


def _interpolate(points: Sequence[tuple[float, float]], at: float) -> float:
    for (x0, y0), (x1, y1) in itertools.pairwise(points):
        if x0 <= at <= x1:
            return y0 if x1 == x0 else y0 + (y1 - y0) * (at - x0) / (x1 - x0)
    return points[-1][1] if at > points[-1][0] else points[0][1]
