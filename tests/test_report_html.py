"""``ctllint report``: one self-contained HTML page, checked as text and in a real browser.

The browser tests run headless Chromium (``--dump-dom`` and ``--screenshot``)
and skip, saying so, when no Chromium is installed (Debian: apt-get install
chromium).
"""
from __future__ import annotations

import os
import re
import shutil
import subprocess
import tempfile
from collections import Counter
from html.parser import HTMLParser

import pytest

from ctllint.commands.cli import main
from ctllint.checking.engine import Checker
from ctllint.output.htmlreport import FileReport, render_html
from ctllint.reading.loader import load_file
from ctllint.reading.model import Severity
from ctllint.output.report import SAFETY_NOTE

HERE = os.path.dirname(os.path.abspath(__file__))
DATA = os.path.join(HERE, "data", "draw")
PRESS = os.path.join(DATA, "press.ctl.yaml")
AWKWARD = os.path.join(DATA, "awkward.ctl.yaml")
BAD = "ctllint: 1\nsupplies: {}\ndevices: {}\nrungs: []\nbogus: 1\n"


class Page(HTMLParser):
    """Ids, links, and the tags and classes of an HTML page."""

    def __init__(self, text: str):
        super().__init__()
        self.ids: list[str] = []
        self.hrefs: list[str] = []
        self.tags: Counter = Counter()
        self.elements: list[tuple[str, dict]] = []
        self.text: list[str] = []
        self.feed(text)

    def handle_starttag(self, tag, attrs):
        a = dict(attrs)
        self.tags[tag] += 1
        self.elements.append((tag, a))
        if "id" in a:
            self.ids.append(a["id"])
        if "href" in a:
            self.hrefs.append(a["href"])

    def handle_data(self, data):
        self.text.append(data)

    def all_text(self) -> str:
        return re.sub(r"\s+", " ", " ".join(self.text))

    def find(self, tag=None, **attrs):
        want = {k.rstrip("_").replace("_", "-"): v for k, v in attrs.items()}
        return [a for t, a in self.elements if (tag is None or t == tag) and all(
            (a.get(k) or "").split().count(v) if k == "class" else a.get(k) == v for k, v in want.items())]


@pytest.fixture
def project(tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    monkeypatch.setenv("CTLLINT_NO_CACHE", "1")
    shutil.copy(PRESS, tmp_path / "press.ctl.yaml")
    shutil.copy(AWKWARD, tmp_path / "awkward.ctl.yaml")
    (tmp_path / "broken.ctl.yaml").write_text(BAD)
    return tmp_path


def expected_findings(project):
    checker = Checker.default()
    return {name: checker.check_file(name).diagnostics for name in ("awkward.ctl.yaml", "broken.ctl.yaml", "press.ctl.yaml")}


def test_report_is_self_contained_and_complete(project, capsys):
    code = main(["report", ".", "-o", "report.html"])
    assert code == 1  # errors present: as for check
    assert "wrote report.html" in capsys.readouterr().err
    html = (project / "report.html").read_text()
    page = Page(html)
    # Nothing to fetch: no scripts, stylesheets, images, fonts or frames; the only URL is the SVG namespace.
    for tag in ("script", "link", "img", "iframe", "object", "embed", "image", "use"):
        assert page.tags[tag] == 0, tag
    assert not re.search(r"url\(|@import|\bsrc=", html)
    assert set(re.findall(r"https?://[^\s\"'<>]+", html)) == {"http://www.w3.org/2000/svg"}
    assert html.startswith("<!DOCTYPE html>") and '<meta charset="utf-8">' in html
    assert SAFETY_NOTE in page.all_text()
    # One section and one summary row per file, counts by severity.
    found = expected_findings(project)
    summary = {a["data-path"]: a for t, a in page.elements if t == "tr" and "data-path" in a}
    assert sorted(summary) == sorted(found)
    cells = re.findall(r'<tr data-path="([^"]+)">.*?</tr>', html)
    assert cells == sorted(found)
    for name, diags in found.items():
        row = re.search(rf'<tr data-path="{re.escape(name)}">(.*?)</tr>', html).group(1)
        counts = [int(n) for n in re.findall(r'data-severity="\w+">(\d+)</td>', row)]
        assert counts == [sum(1 for d in diags if d.severity == s) for s in (Severity.ERROR, Severity.WARNING, Severity.INFO)]
    sections = page.find("section", class_="file")
    assert [s["data-path"] for s in sections] == sorted(found)
    # Every finding is listed; each drawn one links to an element of its own file's drawing.
    finding_rows = page.find("tr", class_="finding")
    assert len(finding_rows) == sum(len(d) for d in found.values())
    ids = set(page.ids)
    assert len(ids) == len(page.ids), "ids are unique across the page"
    for href in page.hrefs:
        assert href.startswith("#") and href[1:] in ids, href
    links = re.findall(r'<tr id="(f\d+)-d\d+" class="finding"[^>]*>.*?</tr>', html)
    assert links
    for row in re.findall(r'<tr id="f\d+-d\d+" class="finding".*?</tr>', html):
        prefix = re.match(r'<tr id="(f\d+)-', row).group(1)
        target = re.search(r'href="#([^"]+)"', row)
        if target:
            assert target.group(1).startswith(prefix + "-")
        else:
            assert "not on the drawing" in row
    # The drawings are there, one per loaded file, with the findings marked; the broken file is listed, not drawn.
    assert page.tags["svg"] == 2
    assert "Not drawn: the file does not load" in page.all_text()
    marked = [a for t, a in page.elements if t == "g" and "data-findings" in a]
    assert marked
    for a in marked:
        for rule in a["data-findings"].split():
            assert any(r["data-rule"] == rule for r in finding_rows)


def test_rule_labels_link_back_to_their_findings(project, capsys):
    main(["report", "press.ctl.yaml", "-o", "report.html"])
    html = (project / "report.html").read_text()
    page = Page(html)
    rows = {a["id"]: a for a in page.find("tr", class_="finding")}
    labels = [a for t, a in page.elements if t == "a" and "finding" in (a.get("class") or "").split()]
    assert labels
    for a in labels:
        row = rows[a["href"][1:]]
        assert (row["data-rule"], row["data-line"], row["data-column"]) == (a["data-rule"], a["data-line"], a["data-column"])


def test_report_is_deterministic(project, capsys):
    main(["report", ".", "-o", "a.html"])
    main(["report", "press.ctl.yaml", "awkward.ctl.yaml", "broken.ctl.yaml", "-o", "b.html"])
    assert (project / "a.html").read_bytes() == (project / "b.html").read_bytes()


def test_report_exit_status_and_usage(project, capsys):
    assert main(["report", "awkward.ctl.yaml", "--select", "dangling-wire", "-o", "r.html"]) == 0
    assert main(["report", "awkward.ctl.yaml", "--select", "dangling-wire", "--fail-on", "warning", "-o", "r.html"]) == 1
    assert main(["report", "missing.ctl.yaml"]) == 2
    assert "does not exist" in capsys.readouterr().err


def test_render_html_of_a_clean_file():
    sch = load_file(PRESS).schematic
    page = Page(render_html([FileReport("press.ctl.yaml", sch, [])], title="Cider press"))
    assert "no findings" in page.all_text()
    assert not page.find("table", class_="findings")
    assert page.tags["svg"] == 1
    assert page.find("h1") and "Cider press" in page.all_text()


# -- in a real browser ------------------------------------------------------------------

def chromium() -> str | None:
    for name in ("chromium", "chromium-browser", "google-chrome", "google-chrome-stable"):
        path = shutil.which(name)
        if path:
            return path
    return None


def browse(url: str, *flags: str, window: str = "1400,2000") -> subprocess.CompletedProcess:
    exe = chromium()
    if exe is None:
        pytest.skip("Chromium not found (looked for chromium, chromium-browser, google-chrome); "
                    "install it (Debian: apt-get install chromium) to run the browser checks")
    with tempfile.TemporaryDirectory(prefix="ctllint-chromium-") as profile:
        return subprocess.run(
            [exe, "--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
             "--disable-background-networking", "--disable-component-update", "--disable-sync",
             f"--user-data-dir={profile}", f"--window-size={window}", *flags, url],
            capture_output=True, text=True, timeout=180,
        )


@pytest.fixture
def report_file(project, capsys):
    main(["report", ".", "-o", "report.html"])
    capsys.readouterr()
    return project / "report.html"


def test_browser_renders_drawings_and_findings(report_file, project):
    result = browse(report_file.as_uri(), "--dump-dom")
    dom = result.stdout
    assert "<svg" in dom, result.stderr[-2000:]
    page = Page(dom)
    found = expected_findings(project)
    assert page.tags["svg"] == 2
    assert len(page.find("section", class_="file")) == 3
    assert len(page.find("tr", class_="finding")) == sum(len(d) for d in found.values())
    drawn = [a for t, a in page.elements if t == "g" and "el" in (a.get("class") or "").split()]
    sch_press, sch_awk = load_file(PRESS).schematic, load_file(AWKWARD).schematic
    assert len(drawn) == len(sch_press.elements) + len(sch_awk.elements)
    assert SAFETY_NOTE in page.all_text()


def test_browser_follows_a_finding_link_to_its_element(report_file, project):
    html = report_file.read_text()
    target = re.search(r'<tr id="f\d+-d\d+" class="finding".*?href="#([^"]+)"', html).group(1)
    probe = project / "probe.html"
    # A copy of the page with a probe script (the report itself has none) that records where the target landed.
    probe.write_text(html.replace(
        "</body>",
        "<script>setTimeout(function(){var r=document.getElementById(%r).getBoundingClientRect();"
        "document.body.setAttribute('data-probe', window.scrollY + ' ' + r.top + ' ' + r.height)}, 200)</script></body>" % target))
    result = browse(probe.as_uri() + "#" + target, "--dump-dom", "--virtual-time-budget=3000", window="1400,700")
    m = re.search(r'data-probe="([-\d.]+) ([-\d.]+) ([-\d.]+)"', result.stdout)
    assert m, result.stderr[-2000:]
    scroll, top, height = map(float, m.groups())
    assert scroll > 0, "following the link scrolls the page"
    assert 0 <= top <= 700 - height, "the element is in view"


def test_browser_screenshot(report_file, tmp_path):
    shot = tmp_path / "report.png"
    browse(report_file.as_uri(), f"--screenshot={shot}", "--hide-scrollbars")
    assert shot.exists(), "no screenshot written"
    data = shot.read_bytes()
    assert data[:8] == b"\x89PNG\r\n\x1a\n"
    width, height = int.from_bytes(data[16:20], "big"), int.from_bytes(data[20:24], "big")
    assert (width, height) == (1400, 2000)
    assert len(data) > 20_000  # a page with drawings, not a blank one
