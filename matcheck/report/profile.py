"""Render profiles (every measure of each version) as a Rich table or JSON."""

from __future__ import annotations

import json
from collections.abc import Sequence
from typing import TYPE_CHECKING, Any

from matcheck import __version__
from matcheck.findings import SCHEMA_VERSION
from matcheck.measures.base import Measurement, Profile
from matcheck.report.common import format_value
from matcheck.report.formatter import RenderOptions

if TYPE_CHECKING:
    from rich.console import Console

TERMS_SHOWN = 8


def _value(measurement: Measurement) -> Any:
    """A listing measure's value is its list (possibly empty); others their number."""
    field = measurement.spec.listing
    if field == "weight":
        return [{"term": term, "weight": round(weight, 6)} for term, weight in measurement.items]
    if field == "count":
        return [{"term": term, "count": int(count)} for term, count in measurement.items]
    return measurement.value


def profiles_dict(profiles: Sequence[Profile]) -> dict[str, Any]:
    documents = []
    for profile in profiles:
        document = profile.document
        documents.append(
            {
                "path": document.path,
                "format": document.format,
                "pages": document.pages,
                "measures": [
                    {
                        "dimension": m.spec.id,
                        "group": m.spec.group.value,
                        "value": _value(m),
                        "unit": m.spec.unit,
                        **({"count": m.value} if m.spec.listing else {}),
                        **({"note": m.note} if m.note else {}),
                    }
                    for m in profile.measurements
                ],
                "warnings": list(document.warnings),
                "excluded": list(document.excluded),
            }
        )
    return {
        "schema_version": SCHEMA_VERSION,
        "tool": {"name": "matcheck", "version": __version__},
        "documents": documents,
    }


def render_profiles_json(profiles: Sequence[Profile], options: RenderOptions | None = None) -> str:
    from matcheck.report.escape import json_text

    return json_text(json.dumps(profiles_dict(profiles), indent=2, ensure_ascii=False)) + "\n"


def render_profiles_table(
    profiles: Sequence[Profile], console: Console, options: RenderOptions | None = None
) -> None:
    from rich.table import Table

    from matcheck.report.escape import rich as esc

    table = Table(header_style="bold")
    table.add_column("Group")
    table.add_column("Measure")
    table.add_column("Unit")
    for profile in profiles:
        table.add_column(esc(profile.document.name), justify="right")
    ids: dict[str, Measurement] = {}
    for profile in profiles:
        for each in profile.measurements:
            ids.setdefault(each.spec.id, each)
    last_group = None
    for measure_id, first in ids.items():
        cells = []
        for profile in profiles:
            m = profile.get(measure_id)
            if m is None:
                cells.append("—")
            elif m.items:
                shown = esc(", ".join(term for term, _ in m.items[:TERMS_SHOWN]))
                cells.append(shown + (" …" if len(m.items) > TERMS_SHOWN else "") or "—")
            else:
                cells.append(format_value(m.value, m.spec.unit, m.spec.id))
        group = first.spec.group.value
        table.add_row(
            group if group != last_group else "",
            measure_id,
            first.spec.unit,
            *cells,
            end_section=False,
        )
        last_group = group
    console.print(table)
    for profile in profiles:
        document = profile.document
        name = esc(document.name)
        for warning in document.warnings:
            console.print(f"[yellow]warning[/yellow] {name}: {esc(warning)}", highlight=False)
        if document.excluded:
            console.print(
                f"[dim]{name}: left out of the lesson text: "
                f"{esc('; '.join(document.excluded))}[/dim]",
                highlight=False,
            )
