"""The HTML report opened in a real browser: headless Chromium over its DevTools protocol.

What a reader relies on, checked in the page as Chromium renders it: every finding of the
JSON report is on the page, every chart is an SVG with marks and a size, every in-page link
leads somewhere, no request leaves the file, the console stays silent, the print style drops
the navigation, and the screenshot is not blank. A probe page first shows that the request and
console checks can fail. Where Chromium is missing the test says how to install it; when the
environment variable CI is set (as .ci/run and CI services do) it must run. The protocol's
messages: docs/references.md §27.
"""

from __future__ import annotations

import io
import json
import os
import shutil
from collections import Counter
from pathlib import Path
from typing import Any

import pytest
from browser import INSTALL_HINT, Browser, find_chromium

from matcheck.cli import main

ROOT = Path(__file__).resolve().parent.parent
STUDY = ROOT / "fixtures" / "demo" / "study.toml"

FACTS = """(() => {
  document.querySelectorAll('details').forEach(d => { d.open = true; });
  const ids = [...document.querySelectorAll('[id]')].map(e => e.id);
  const box = e => { const r = e.getBoundingClientRect(); return [r.width, r.height]; };
  return {
    ids,
    findings: [...document.querySelectorAll('tr.finding')].map(r => ({
      id: r.id, reference: r.dataset.reference, condition: r.dataset.condition,
      key: r.dataset.key, status: r.dataset.status,
      links: [...r.querySelectorAll('a[href^="#"]')].map(a => a.getAttribute('href').slice(1)),
    })),
    links: [...document.querySelectorAll('a[href]')].map(a => a.getAttribute('href')),
    charts: [...document.querySelectorAll('svg.chart')].map(s => ({
      id: s.id, marks: s.querySelectorAll('circle, polygon, rect').length,
      size: box(s), title: (s.querySelector('title') || {}).textContent || '',
    })),
    text: document.body.innerText,
    nav: getComputedStyle(document.querySelector('nav.toc')).display,
  };
})()"""


@pytest.fixture(scope="module")
def chromium() -> str:
    found = find_chromium()
    if found is None:
        if os.environ.get("CI"):
            pytest.fail(f"CI is set, so the browser test must run, but {INSTALL_HINT}")
        pytest.skip(INSTALL_HINT)
    return found


@pytest.fixture(scope="module")
def browser(chromium: str, tmp_path_factory: pytest.TempPathFactory) -> Any:
    with Browser(chromium, tmp_path_factory.mktemp("profile")) as opened:
        yield opened


@pytest.fixture(scope="module")
def demo(tmp_path_factory: pytest.TempPathFactory) -> tuple[Path, dict[str, Any]]:
    """The demo study's HTML and JSON reports, written by one run; the study gets a planned
    sample so that the page has every group: design (power), the learners' data, the post-test."""
    folder = tmp_path_factory.mktemp("report")
    study = folder / "demo"
    shutil.copytree(STUDY.parent, study)
    with (study / "study.toml").open("a", encoding="utf-8") as toml:
        toml.write("\n[sample]\nper_condition = 40\nsmallest_effect = 0.5\n")
    out = str(folder / "r")
    status = main(["check", str(study / "study.toml"), "-f", "html", "-f", "json", "-o", out])
    assert status == 1  # the demo's study has confounds (fixtures/README.md)
    report = json.loads((folder / "r.json").read_text(encoding="utf-8"))
    return folder / "r.html", report


def test_probe_page_shows_that_the_checks_can_fail(browser: Browser, tmp_path: Path) -> None:
    probe = tmp_path / "probe.html"
    probe.write_text(
        '<!DOCTYPE html><p>probe</p><img src="https://example.invalid/x.png">'
        '<script>console.error("probe error")</script>',
        encoding="utf-8",
    )
    visit = browser.visit(probe.as_uri(), "document.querySelectorAll('p').length")
    assert visit.facts == 1
    assert "https://example.invalid/x.png" in visit.requests
    assert any("probe error" in line for line in visit.console)


def test_demo_report_in_chromium(browser: Browser, demo: tuple[Path, dict[str, Any]]) -> None:
    page, report = demo
    visit = browser.visit(page.as_uri(), FACTS)
    facts = visit.facts
    # No request leaves the file, and nothing is said on the console.
    assert visit.requests == [page.as_uri()]
    assert visit.console == []
    assert visit.errors == []
    # Every finding of the JSON report is a row of the page (same pair, measure, verdict).
    rows = Counter(
        (f["reference"], f["condition"], f["key"], f["status"]) for f in facts["findings"]
    )
    expected = Counter(
        (
            f["reference"],
            f["condition"],
            f"{f['dimension']}:{f['item']}" if f["item"] else f["dimension"],
            f["status"],
        )
        for f in report["findings"]
    )
    assert rows == expected
    assert {f["group"] for f in report["findings"]} >= {"design", "groups", "instrument"}
    # ... and links to where it shows (its chart, its passages, its grid or counts).
    ids = set(facts["ids"])
    assert len(ids) == len(facts["ids"]), "an id is used twice"
    for row in facts["findings"]:
        assert row["links"], f"finding {row['key']} links nowhere"
        assert set(row["links"]) <= ids
    for href in facts["links"]:
        assert href.startswith("#") and href[1:] in ids, href
    # Every chart rendered: an SVG with marks and a size on the page.
    assert facts["charts"]
    for chart in facts["charts"]:
        assert chart["marks"] >= 1, chart["id"]
        assert chart["size"][0] > 100 and chart["size"][1] > 40, chart["id"]
    # The study's own charts: baseline g against the WWC bands, and power per contrast.
    titles = {chart["id"]: chart["title"] for chart in facts["charts"]}
    assert "WWC bands" in titles["chart-baseline-pretest"]
    assert "needed for the target power" in titles["group-design-chart"]
    # Every located passage of the findings is quoted on the page (the comparison's «» around
    # changed words become marks).
    text = " ".join(facts["text"].split())
    for finding in report["findings"]:
        for item in finding["evidence"]:
            quoted = item["text"].replace("«", "").replace("»", "")
            assert " ".join(quoted.split()) in text
    _assert_screenshot(visit.screenshot, 1280)


def test_print_style_drops_the_navigation(
    browser: Browser, demo: tuple[Path, dict[str, Any]]
) -> None:
    page, _ = demo
    on_screen = browser.visit(page.as_uri(), FACTS).facts["nav"]
    on_paper = browser.visit(page.as_uri(), FACTS, media="print").facts["nav"]
    assert (on_screen, on_paper) == ("block", "none")


def test_folder_page_in_chromium(browser: Browser, tmp_path: Path) -> None:
    page = tmp_path / "studies.html"
    main(["check", str(STUDY.parent), "-f", "html", "-j", "1", "-o", str(page)])
    visit = browser.visit(page.as_uri(), FACTS)
    assert visit.requests == [page.as_uri()]
    assert visit.console == [] and visit.errors == []
    ids = visit.facts["ids"]
    assert len(set(ids)) == len(ids), "two studies share an id"
    assert all(h[1:] in set(ids) for h in visit.facts["links"])
    # Both demo studies are on the page, each with its findings.
    assert visit.facts["findings"] and visit.facts["charts"]
    assert "study.toml" in visit.facts["text"] and "study-clean.toml" in visit.facts["text"]


def _assert_screenshot(png: bytes, width: int) -> None:
    from PIL import Image

    assert png.startswith(b"\x89PNG\r\n\x1a\n")
    image = Image.open(io.BytesIO(png)).convert("L")
    assert image.width == width and image.height > 2000
    low, high = image.getextrema()
    assert high - low > 200, "the screenshot is blank"
