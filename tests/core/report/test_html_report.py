"""The HTML walkdown report: one self-contained file that says what the table says, with every
user text escaped; checked with Python's own ``html.parser`` always, and rendered in headless
Chromium (Debian's ``chromium``) where one is installed: its DOM, a PNG, and the printed page
on A4 and on US Letter (ISO 216: 210 × 297 mm; ANSI/ASME Y14.1: 8.5 × 11 in)."""

from __future__ import annotations

import json
import re
import shutil
import subprocess
import tempfile
from dataclasses import replace
from html.parser import HTMLParser

import pytest

from branchwise.core.report.columns import segment_rows
from branchwise.core.report.html_report import to_html
from branchwise.core.report.lines import CAUTIONS, summary_lines
from branchwise.core.report.text_table import to_table
from branchwise.core.site.read import demo_site
from branchwise.core.site.solve import solve_site, with_uncertainty
from branchwise.core.site.spec import RecordSpec

VOID = {"meta", "br", "img", "input", "link", "hr", "col", "area", "base", "wbr", "source",
        "path", "rect", "circle"}  # HTML void elements, and SVG elements written self-closed
HOSTILE = '<script>alert("x")</script> & <img src=x onerror=alert(1)>'


class Page(HTMLParser):
    """Tags, attributes and text of a page, and whether every element was closed in order."""

    def __init__(self) -> None:
        super().__init__(convert_charrefs=True)
        self.stack: list[str] = []
        self.tags: list[str] = []
        self.attrs: list[tuple[str, str, str | None]] = []
        self.text: list[str] = []
        self.errors: list[str] = []

    def handle_starttag(self, tag, attrs):
        self.tags.append(tag)
        self.attrs += [(tag, k, v) for k, v in attrs]
        if tag not in VOID:
            self.stack.append(tag)

    def handle_startendtag(self, tag, attrs):
        self.tags.append(tag)
        self.attrs += [(tag, k, v) for k, v in attrs]

    def handle_endtag(self, tag):
        if tag in VOID:
            return
        if not self.stack or self.stack[-1] != tag:
            self.errors.append(f"</{tag}> closes {self.stack[-1:] or 'nothing'}")
        else:
            self.stack.pop()

    def handle_data(self, data):
        self.text.append(data)


def parse(text: str) -> Page:
    page = Page()
    page.feed(text)
    page.close()
    return page


def _demo(hostile: bool = False, banded: bool = False):
    site = demo_site()
    if hostile:
        branches = list(site.branches)
        branches[0] = replace(branches[0], name=f"AHU {HOSTILE}", tag="<b>T</b>")
        site = replace(site, name=f"Site {HOSTILE}", notes=HOSTILE,
                       record=RecordSpec(technician=HOSTILE, date="2025-03-12"))
    solved = solve_site(site)
    return with_uncertainty(solved, 500, 0) if banded else solved


@pytest.mark.parametrize("banded", [False, True])
@pytest.mark.parametrize("system", ["si", "us"])
def test_self_contained_and_well_formed(system, banded):
    text = to_html(_demo(banded=banded), system)
    page = parse(text)
    assert not page.errors and not page.stack, page.errors[:3]
    assert text.startswith("<!DOCTYPE html>") and page.tags.count("style") == 1
    assert "script" not in page.tags and "link" not in page.tags and "img" not in page.tags
    # offline: nothing is fetched (no address in any attribute, no url() in the styles)
    for tag, key, value in page.attrs:
        if key != "xmlns":  # a namespace name, never fetched
            assert not (value or "").startswith(("http:", "https:", "//", "file:")), (tag, key)
        assert key not in ("src", "href") or tag == "svg", (tag, key)
    assert "url(" not in text and "@import" not in text
    assert page.tags.count("svg") >= 2  # the split as bars, the system curve
    words = " ".join(" ".join(page.text).split())
    assert all(c in words for c in CAUTIONS)


@pytest.mark.parametrize("system", ["si", "us"])
def test_says_what_the_table_says(system):
    solved = _demo(banded=True)
    text = to_html(solved, system)
    words = " ".join(" ".join(parse(text).text).split())
    table = to_table(solved, system)
    for _, _, cells in segment_rows(solved, system):
        for key in ("flow", "velocity", "reynolds", "major", "minor", "band"):
            if cells.get(key):
                assert cells[key] in words and cells[key] in table, (key, cells[key])
    for line in summary_lines(solved, system):
        assert " ".join(line.split()) in words


def test_every_user_text_is_escaped():
    text = to_html(_demo(hostile=True), "si")
    page = parse(text)
    assert "script" not in page.tags and "img" not in page.tags and "b" not in page.tags
    assert "<script>" not in text and "<img" not in text and "<b>T</b>" not in text
    assert "&lt;script&gt;" in text
    words = " ".join(page.text)
    assert HOSTILE in words  # shown as the text it is


def test_the_curve_file_is_an_svg_image(tmp_path, capsys):
    import xml.etree.ElementTree as ET

    from branchwise.tui.cli import main

    out = tmp_path / "curve.svg"
    assert main(["solve", "--units", "us", "--curve", str(out)]) == 0
    assert "system curve (image) written" in capsys.readouterr().err
    root = ET.parse(out).getroot()  # well-formed XML
    assert root.tag == "{http://www.w3.org/2000/svg}svg"
    text = out.read_text(encoding="utf-8")
    assert "Pressure drop (psi)" in text and "Flow (gpm)" in text
    # The operating point is the answer's own total flow and Δp (demo: 10 psid), in US units:
    # 1 US gpm = 231 in³/min (NIST SP 811).
    capsys.readouterr()
    assert main(["solve", "--format", "json"]) == 0
    total = json.loads(capsys.readouterr().out)["total_flow_m3_s"]
    gpm = total * 60 / (231 * 0.0254**3)
    assert f"operating point: {gpm:.1f} gpm, 10.00 psi" in text
    csv_out = tmp_path / "curve.csv"
    assert main(["solve", "--curve", str(csv_out)]) == 0  # CSV stays for other names
    assert csv_out.read_text(encoding="utf-8").startswith("Total flow (L/s)")


# ---- in a real browser ----------------------------------------------------------------------

CHROMIUM = shutil.which("chromium") or shutil.which("chromium-browser")
FLAGS = ["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
         "--disable-background-networking", "--disable-component-update", "--disable-sync",
         "--disable-extensions"]
needs_browser = pytest.mark.skipif(
    CHROMIUM is None, reason="no headless Chromium here (Debian: apt-get install chromium); "
    "the html.parser checks above ran")


def chromium(*args: str) -> subprocess.CompletedProcess[str]:
    assert CHROMIUM is not None
    with tempfile.TemporaryDirectory() as profile:
        return subprocess.run([CHROMIUM, *FLAGS, f"--user-data-dir={profile}", *args],
                              capture_output=True, text=True, timeout=120)


@needs_browser
def test_chromium_renders_it_offline(tmp_path):
    solved = _demo(hostile=True, banded=True)
    page = tmp_path / "report.html"
    page.write_text(to_html(solved, "si"), encoding="utf-8")
    dom = chromium("--dump-dom", page.as_uri())
    assert dom.returncode == 0, dom.stderr[-2000:]
    html = dom.stdout
    assert html.count("<tr>") >= 5 + 1 and html.count("<svg") >= 3
    assert "<script>" not in html and "&lt;script&gt;" in html  # escaped text stayed text
    assert "0.7086 kg/s" not in html and "Walkdown report: Site" in html
    png = tmp_path / "report.png"
    shot = chromium(f"--screenshot={png}", "--window-size=1000,2400", page.as_uri())
    assert png.exists() and png.stat().st_size > 20_000, shot.stderr[-2000:]
    assert png.read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"


@needs_browser
@pytest.mark.parametrize(("paper", "width_mm"), [("A4", 210.0), ("letter", 215.9)])
def test_prints_within_the_page_on_a4_and_letter(tmp_path, paper, width_mm):
    """Printed (the print styles applied), nothing is wider than the paper less its margins,
    and Chromium makes a PDF of a few pages."""
    text = to_html(_demo(banded=True), "us")
    margins = 2 * 14.0  # mm, the report's @page margin
    px = round((width_mm - margins) / 25.4 * 96)  # CSS px at 96 per inch
    probe = text.replace("@media print {", "@media all {").replace(
        "</body>", "<script>document.body.setAttribute('data-wide', String("
        "document.documentElement.scrollWidth > window.innerWidth));</script></body>")
    page = tmp_path / "probe.html"
    page.write_text(probe, encoding="utf-8")
    dom = chromium("--dump-dom", f"--window-size={px},1200", page.as_uri())
    assert 'data-wide="false"' in dom.stdout, (paper, px)
    printed = tmp_path / f"{paper}.html"
    printed.write_text(text.replace("@page {", f"@page {{ size: {paper};"), encoding="utf-8")
    pdf = tmp_path / f"{paper}.pdf"
    chromium("--no-pdf-header-footer", f"--print-to-pdf={pdf}", printed.as_uri())
    data = pdf.read_bytes()
    pages = len(re.findall(rb"/Type\s*/Page[^s]", data))
    assert data.startswith(b"%PDF") and 1 <= pages <= 6, pages
