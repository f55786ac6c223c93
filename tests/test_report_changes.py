"""``ctllint report --changes-since REV``: the changed rungs before and after.

Each test builds a small git repository under tmp_path, commits schematics
from tests/data/diff, edits the working tree, and reads back the page the
report writes. The expectations are written from the edit that was made
(which rung, which contact, which wires), not from the program's output.

The browser test runs headless Chromium (``--dump-dom``, a probe copy of
the page for the geometry, and ``--screenshot``) and skips, saying so,
when no Chromium is installed (Debian: apt-get install chromium). Its
screenshot is kept at ``SCREENSHOT`` for a person to look at.
"""
from __future__ import annotations

import os
import re
import shutil
import subprocess
import tempfile
import xml.etree.ElementTree as ET
from html.parser import HTMLParser

import pytest

from ctllint.commands.cli import main
from ctllint.output.draw import Mark, layout
from ctllint.reading.loader import load_file

HERE = os.path.dirname(os.path.abspath(__file__))
DIFF = os.path.join(HERE, "data", "diff")
SVG = "{http://www.w3.org/2000/svg}"
SCREENSHOT = os.path.join(tempfile.gettempdir(), "ctllint-report-changes.png")

needs_git = pytest.mark.skipif(shutil.which("git") is None, reason="git is not installed")


def data(case: str, side: str) -> str:
    with open(os.path.join(DIFF, case, f"{side}.ctl.yaml"), encoding="utf-8") as handle:
        return handle.read()


BASE = data("seal-in-removed", "old")
SEAL_IN = "      - [2, M1.NO, 3]\n"
RUNNING_OLD, RUNNING_NEW = "[L1, M1.NO, 5, PL1, X2]", "[2, M1.NO, 5, PL1, X2]"
# The edit under review: the grinder's seal-in (rung 1) deleted, and the
# running light's M1.NO (rung 2) fed from wire 2 instead of L1. Rungs 3 and 4 untouched.
assert SEAL_IN in BASE and RUNNING_OLD in BASE
EDITED = BASE.replace(SEAL_IN, "").replace(RUNNING_OLD, RUNNING_NEW)
LAMP = """ctllint: 1
title: Lamp test
supplies:
  ctl: {hot: L1, common: X2, voltage: 24 VDC}
devices:
  PB9: {kind: pushbutton, function: start}
  PL9: {kind: pilot-light, voltage: 24 VDC}
rungs:
  - paths:
      - [L1, PB9.NO, 1, PL9, X2]
"""


def git(repo, *args: str) -> str:
    env = {**os.environ, "GIT_CONFIG_NOSYSTEM": "1", "GIT_CONFIG_GLOBAL": os.devnull, "NO_COLOR": "1"}
    done = subprocess.run(["git", *args], cwd=repo, env=env, capture_output=True, text=True)
    assert done.returncode == 0, done.stderr
    return done.stdout


@pytest.fixture
def repo(tmp_path, monkeypatch):
    """A repository with the press and wash schematics under plant/, committed once."""
    monkeypatch.setenv("CTLLINT_NO_CACHE", "1")
    monkeypatch.setenv("GIT_CONFIG_NOSYSTEM", "1")
    monkeypatch.setenv("GIT_CONFIG_GLOBAL", os.devnull)
    root = tmp_path / "repo"
    (root / "plant").mkdir(parents=True)
    git(root, "init", "-q")
    git(root, "config", "user.email", "ci@example.com")
    git(root, "config", "user.name", "ci")
    (root / "plant" / "press.ctl.yaml").write_text(BASE)
    (root / "plant" / "wash.ctl.yaml").write_text(data("wires-renumbered", "old"))
    git(root, "add", ".")
    git(root, "commit", "-qm", "first")
    monkeypatch.chdir(root)
    return root


class Page(HTMLParser):
    """Ids, links, the elements with their attributes, and the text of an HTML page."""

    def __init__(self, text: str):
        super().__init__()
        self.ids: list[str] = []
        self.hrefs: list[str] = []
        self.elements: list[tuple[str, dict]] = []
        self.text: list[str] = []
        self.feed(text)

    def handle_starttag(self, tag, attrs):
        a = dict(attrs)
        self.elements.append((tag, a))
        if "id" in a:
            self.ids.append(a["id"])
        if "href" in a:
            self.hrefs.append(a["href"])

    def handle_data(self, text):
        self.text.append(text)

    def all_text(self) -> str:
        return re.sub(r"\s+", " ", " ".join(self.text))

    def find(self, tag, cls=None, **attrs):
        want = {k.replace("_", "-"): v for k, v in attrs.items()}
        return [a for t, a in self.elements if t == tag and (cls is None or cls in (a.get("class") or "").split())
                and all(a.get(k) == v for k, v in want.items())]


def report(*argv: str) -> tuple[int, str]:
    code = main(["report", *argv, "-o", "report.html"])
    return code, open("report.html", encoding="utf-8").read()


def block(html: str, tag: str, ident: str) -> str:
    """The HTML of the element ``<tag id="ident">`` (not nested in one of its own kind)."""
    m = re.search(rf'<{tag}\b[^>]*\bid="{re.escape(ident)}".*?</{tag}>', html, re.S)
    assert m, ident
    return m.group(0)


def drawings(html: str) -> list[ET.Element]:
    return [ET.fromstring(svg) for svg in re.findall(r"<svg\b.*?</svg>", html, re.S)]


def drawn_elements(svg: ET.Element) -> list[ET.Element]:
    return [g for g in svg.iter(SVG + "g") if "el" in (g.get("class") or "").split()]


def marked(svg: ET.Element) -> dict[tuple[str, str], str]:
    """(element, wires) -> change, for the elements a drawing marks."""
    return {(g.get("data-element"), g.get("data-wires")): g.get("data-change") for g in drawn_elements(svg) if g.get("data-change")}


def rung_numbers(svg: ET.Element) -> list[int]:
    return [int(g.get("data-rung")) for g in svg.iter(SVG + "g") if "rung" in (g.get("class") or "").split()]


def figures(section_html: str) -> dict[str, str]:
    """figure id -> its HTML, for the rung pairs of one file's changes."""
    return {m.group(1): m.group(0) for m in re.finditer(r'<figure class="rungpair" id="([^"]+)".*?</figure>', section_html, re.S)}


# -- the changed rungs, drawn before and after ---------------------------------------------

@needs_git
def test_changed_rungs_are_drawn_before_and_after_with_the_changes_marked(repo):
    (repo / "plant" / "press.ctl.yaml").write_text(EDITED)
    code, html = report("plant", "--changes-since", "HEAD")
    assert code == 1  # the edit brings errors (the seal-in rule); the exit status is check's
    page = Page(html)
    sha = git(repo, "rev-parse", "HEAD").strip()
    assert page.find("section", "changes", id="changes")
    assert f"Changes since HEAD commit {sha[:12]}" in page.all_text()
    # The summary table says which file changed and links to its changes.
    since = {a["href"] for a in page.find("a") if a.get("href", "").startswith("#change-")}
    (press,) = page.find("section", "change", data_path="plant/press.ctl.yaml")
    assert since == {"#" + press["id"]}
    assert press["data-status"] == "changed"
    assert not page.find("section", "change", data_path="plant/wash.ctl.yaml")  # unchanged: not in the section
    section = block(html, "section", press["id"])

    # What changed, in words: the two rungs and their elements.
    words = Page(section).all_text()
    assert "rung 1 \u201cGrinder motor\u201d changed" in words
    assert "M1.NO on wires 2\u20133 removed" in words
    assert "rung 2 \u201cGrinder running\u201d changed" in words
    assert "M1.NO moved from wires L1\u20135 to 2\u20135" in words

    # Only the two changed rungs are drawn, each twice (before, after), keeping its number.
    figs = figures(section)
    assert len(figs) == 2
    pairs = {}
    for fig_id, fig in figs.items():
        before, after = drawings(fig)
        assert "Before \u00b7 HEAD" in fig and "After \u00b7 working tree" in fig
        assert rung_numbers(before) == rung_numbers(after)
        (number,) = rung_numbers(before)
        pairs[number] = (before, after)
        assert before.get("data-columns") == after.get("data-columns"), "both drawings on the same grid"
    assert sorted(pairs) == [1, 2]
    assert len(drawings(section)) == 4

    # The marks sit on the right elements, on the right side, and nowhere else.
    before, after = pairs[1]
    assert marked(before) == {("M1.NO", "2 3"): "removed"}
    assert marked(after) == {}
    assert len(drawn_elements(before)) == 5 and len(drawn_elements(after)) == 4  # the seal-in is gone
    before, after = pairs[2]
    assert marked(before) == {("M1.NO", "L1 5"): "moved-from"}
    assert marked(after) == {("M1.NO", "2 5"): "moved-to"}
    # Each mark is an outline in the change's style with its words under the element.
    for svg, change, label in ((pairs[1][0], "removed", "removed"), (before, "moved-from", "moved to wires 2\u20135"),
                               (after, "moved-to", "moved from wires L1\u20135")):
        (g,) = [g for g in drawn_elements(svg) if g.get("data-change")]
        assert [r.get("class") for r in g.iter(SVG + "rect") if "change" in (r.get("class") or "").split()] == [f"change chg-{change}"]
        labels = [t for t in svg.iter(SVG + "text") if "changelabel" in (t.get("class") or "").split()]
        assert [(t.text, t.get("data-for")) for t in labels] == [(label, g.get("id"))]

    # The findings that appeared, each linked to its row in the file's own findings table.
    appeared = [a for a in Page(section).find("li", data_change="appeared")]
    assert "seal-in" in [a["data-rule"] for a in appeared]
    assert not Page(section).find("li", data_change="disappeared")
    rows = {a["id"]: a for a in page.find("tr", "finding")}
    links = re.findall(r'<li class="d-appeared"[^>]*data-rule="([^"]+)"[^>]*>.*?href="#([^"]+)"', section)
    assert {rule for rule, _ in links} >= {"seal-in"}
    for rule, row in links:
        assert rows[row]["data-rule"] == rule

    # Still one page with nothing to fetch, unique ids, links that resolve.
    assert "<script" not in html and not re.search(r"url\(|@import|\bsrc=", html)
    assert set(re.findall(r"https?://[^\s\"'<>]+", html)) == {"http://www.w3.org/2000/svg"}
    assert len(set(page.ids)) == len(page.ids)
    for href in page.hrefs:
        assert href[1:] in page.ids, href


@needs_git
def test_a_renumbering_is_listed_as_such_and_nothing_is_drawn(repo):
    (repo / "plant" / "wash.ctl.yaml").write_text(data("wires-renumbered", "new"))
    code, html = report("plant", "--changes-since", "HEAD")
    page = Page(html)
    (wash,) = page.find("section", "change", data_path="plant/wash.ctl.yaml")
    assert wash["data-status"] == "renumbered"
    section = block(html, "section", wash["id"])
    renames = [(a["data-old"], a["data-new"]) for a in Page(section).find("li") if "data-old" in a]
    assert renames == [("2", "102"), ("3", "103"), ("4", "104"), ("5", "201"), ("6", "301"), ("7", "302"), ("8", "303"), ("9", "401")]
    assert "wire 2 \u2192 102" in Page(section).all_text()
    assert "No rung changed electrically: nothing to draw." in Page(section).all_text()
    assert not figures(section) and "<svg" not in section
    assert "None appeared or disappeared." in Page(section).all_text()
    # The changes section holds no drawing at all; the file's own section still has its full drawing.
    assert "<svg" not in block(html, "section", "changes")
    assert not page.find("section", "change", data_path="plant/press.ctl.yaml")


@needs_git
def test_new_deleted_and_unchanged_files(repo):
    (repo / "elsewhere").mkdir()
    (repo / "elsewhere" / "other.ctl.yaml").write_text(BASE)
    git(repo, "add", "elsewhere")
    git(repo, "commit", "-qm", "second")
    git(repo, "rm", "-q", "plant/wash.ctl.yaml")
    (repo / "plant" / "extra.ctl.yaml").write_text(data("rung-added", "new"))     # untracked: new since HEAD
    (repo / "plant" / "staged.ctl.yaml").write_text(LAMP)
    git(repo, "add", "plant/staged.ctl.yaml")                                      # staged: new since HEAD too
    git(repo, "rm", "-q", "elsewhere/other.ctl.yaml")  # deleted, but outside the report's paths
    code, html = report("plant", "--changes-since", "HEAD")
    page = Page(html)
    status = {a["data-path"]: a["data-status"] for a in page.find("section", "change")}
    assert status == {"plant/extra.ctl.yaml": "new file", "plant/staged.ctl.yaml": "new file"}
    assert [a["data-path"] for a in page.find("li", "deleted")] == ["plant/wash.ctl.yaml"]
    text = page.all_text()
    assert "Deleted since HEAD" in text
    assert "1 changed, 2 new, 1 deleted, 0 unchanged" not in text  # press is unchanged
    assert "0 changed, 2 new, 1 deleted, 1 unchanged" in text
    assert "elsewhere/other.ctl.yaml" not in html
    cells = {a["data-path"]: a for a in page.find("tr") if "data-path" in a}
    assert sorted(cells) == ["plant/extra.ctl.yaml", "plant/press.ctl.yaml", "plant/staged.ctl.yaml"]
    assert re.search(r'<tr data-path="plant/press.ctl.yaml">.*?<td class="since unchanged">unchanged</td></tr>', html)
    assert re.search(r'<tr data-path="plant/extra.ctl.yaml">.*?>new file</a></td></tr>', html)
    # A new file is summed up and linked, not drawn twice.
    assert "<svg" not in block(html, "section", "changes")


@needs_git
def test_a_renamed_and_edited_schematic_shows_its_changes_under_its_new_name(repo):
    git(repo, "mv", "plant/press.ctl.yaml", "plant/grinder.ctl.yaml")
    (repo / "plant" / "grinder.ctl.yaml").write_text(EDITED)
    _, html = report("plant", "--changes-since", "HEAD")
    page = Page(html)
    (sec,) = page.find("section", "change")
    assert (sec["data-path"], sec["data-status"]) == ("plant/grinder.ctl.yaml", "renamed")
    section = block(html, "section", sec["id"])
    assert "renamed from plant/press.ctl.yaml" in Page(section).all_text()
    assert len(figures(section)) == 2
    assert not page.find("li", "deleted")


@needs_git
def test_a_schematic_moved_out_of_the_reported_folder_is_listed_as_gone(repo):
    (repo / "archive").mkdir()
    git(repo, "mv", "plant/wash.ctl.yaml", "archive/wash.ctl.yaml")
    _, html = report("plant", "--changes-since", "HEAD")
    page = Page(html)
    (gone,) = page.find("li", "deleted")
    assert gone["data-path"] == "plant/wash.ctl.yaml"
    assert "renamed to archive/wash.ctl.yaml, which this report does not cover" in page.all_text()
    assert not page.find("section", "change")


@needs_git
def test_a_rung_added_is_drawn_after_only_with_every_element_marked(repo):
    assert data("rung-added", "old") == BASE  # the committed press
    (repo / "plant" / "press.ctl.yaml").write_text(data("rung-added", "new"))
    code, html = report("plant/press.ctl.yaml", "--changes-since", "HEAD")
    section = block(html, "section", "change-1")
    figs = figures(section)
    assert len(figs) == 1, "the rungs after the new one are renumbered, not changed"
    (fig,) = figs.values()
    assert "Not in HEAD: the rung is new." in fig
    (after,) = drawings(fig)
    assert rung_numbers(after) == [1]
    assert set(marked(after).values()) == {"added"} and len(marked(after)) == len(drawn_elements(after)) == 1
    assert "PL3" in Page(section).all_text()


@needs_git
def test_the_page_is_deterministic(repo):
    (repo / "plant" / "press.ctl.yaml").write_text(EDITED)
    (repo / "plant" / "wash.ctl.yaml").write_text(data("wires-renumbered", "new"))
    _, first = report("plant", "--changes-since", "HEAD")
    _, second = report("plant/wash.ctl.yaml", "plant/press.ctl.yaml", "--changes-since", "HEAD")
    assert first == second


# -- usage ------------------------------------------------------------------------------------

@needs_git
@pytest.mark.parametrize("rev, words", [
    ("nope", "bad revision 'nope'"),
    ("HEAD~5", "bad revision 'HEAD~5'"),
    ("--all", "bad revision '--all'"),
    ("HEAD~1..HEAD", "takes one revision, not a range"),
])
def test_a_bad_revision_exits_2(repo, capsys, rev, words):
    assert main(["report", "plant", f"--changes-since={rev}", "-o", "report.html"]) == 2
    assert words in capsys.readouterr().err
    assert not (repo / "report.html").exists(), "nothing is written on a usage error"


def test_outside_a_git_repository_exits_2(tmp_path, monkeypatch, capsys):
    monkeypatch.chdir(tmp_path)
    monkeypatch.setenv("GIT_CEILING_DIRECTORIES", str(tmp_path.parent))
    monkeypatch.setenv("CTLLINT_NO_CACHE", "1")
    (tmp_path / "press.ctl.yaml").write_text(BASE)
    assert main(["report", ".", "--changes-since", "HEAD", "-o", "report.html"]) == 2
    err = capsys.readouterr().err
    assert "not a git repository" in err or "needs the git program" in err
    assert not (tmp_path / "report.html").exists()


@needs_git
def test_without_the_option_there_is_no_changes_section(repo):
    (repo / "plant" / "press.ctl.yaml").write_text(EDITED)
    _, html = report("plant")
    assert 'id="changes"' not in html and "since HEAD" not in html and "data-change" not in html


def test_help_documents_the_option(capsys):
    with pytest.raises(SystemExit):
        main(["report", "--help"])
    out = capsys.readouterr().out
    assert "--changes-since REV" in out
    assert "Changes since REV" in out and "before" in out and "after" in out


# -- drawing a subset of rungs ----------------------------------------------------------------

def test_a_subset_of_rungs_keeps_numbers_supply_and_cross_references():
    path = os.path.join(DIFF, "seal-in-removed", "old.ctl.yaml")
    sch = load_file(path).schematic
    whole = ET.fromstring(layout(sch, header=False, legend=False).svg)
    some = ET.fromstring(layout(sch, header=False, legend=False, rungs=[2, 0]).svg)
    assert rung_numbers(whole) == [1, 2, 3, 4]
    assert rung_numbers(some) == [1, 3]
    assert {g.get("data-element") for g in drawn_elements(some)} == {e.text for e in sch.elements if e.rung in (0, 2)}
    xref = {t.get("data-coil"): t.get("data-no") for t in some.iter(SVG + "text") if t.get("data-no") is not None}
    assert xref == {"M1": "1,2", "M2": "3,4"}  # contacts elsewhere in the file are still cross-referenced
    assert layout(sch).svg == layout(sch, rungs=None, marks={}).svg  # the defaults draw what they always did


def test_marks_and_a_wider_grid():
    sch = load_file(os.path.join(DIFF, "seal-in-removed", "old.ctl.yaml")).schematic
    seal = next(e for e in sch.elements if e.text == "M1.NO" and e.rung == 0)
    drawing = layout(sch, header=False, legend=False, rungs=[0], marks={seal.index: Mark("removed", "removed")}, min_columns=9)
    assert drawing.columns == 9
    svg = ET.fromstring(drawing.svg)
    assert svg.get("data-columns") == "9"
    assert marked(svg) == {("M1.NO", "2 3"): "removed"}
    # no two texts overlap, the mark's words included (boxes from font size and length, as in test_draw)
    boxes = []
    for t in svg.iter(SVG + "text"):
        size, text = float(t.get("font-size")), "".join(t.itertext())
        width = len(text) * size * 0.61
        x, y = float(t.get("x")), float(t.get("y"))
        anchor = t.get("text-anchor", "start")
        left = x - width / 2 if anchor == "middle" else x - width if anchor == "end" else x
        boxes.append((left, y - 0.8 * size, left + width, y + 0.25 * size, text))
    for i, a in enumerate(boxes):
        for b in boxes[i + 1:]:
            assert not (a[0] < b[2] and b[0] < a[2] and a[1] < b[3] and b[1] < a[3]), (a, b)


# -- in a real browser ----------------------------------------------------------------------------

def chromium() -> str | None:
    for name in ("chromium", "chromium-browser", "google-chrome", "google-chrome-stable"):
        path = shutil.which(name)
        if path:
            return path
    return None


def browse(url: str, *flags: str, window: str) -> subprocess.CompletedProcess:
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


PROBE = """<script>setTimeout(function(){
var out=[];document.querySelectorAll('figure.rungpair').forEach(function(f){
var b=f.querySelector('.pane.before').getBoundingClientRect(),a=f.querySelector('.pane.after').getBoundingClientRect();
var s=f.querySelector('.pane.before svg'),r=s.getBoundingClientRect();
out.push([b.left,b.top,b.right,b.bottom,a.left,a.top,a.right,a.bottom,r.width/s.width.baseVal.value]
.map(function(v){return Math.round(v*100)/100}).join(' '))});
document.body.setAttribute('data-probe',out.join(';'))},200)</script></body>"""


@needs_git
def test_browser_renders_the_changes_section(repo):
    if chromium() is None:
        pytest.skip("Chromium not found (looked for chromium, chromium-browser, google-chrome); "
                    "install it (Debian: apt-get install chromium) to run the browser checks")
    (repo / "plant" / "press.ctl.yaml").write_text(EDITED)
    (repo / "plant" / "wash.ctl.yaml").write_text(data("wires-renumbered", "new"))
    _, html = report("plant", "--changes-since", "HEAD")
    url = (repo / "report.html").as_uri()

    dom = browse(url, "--dump-dom", window="1800,2000")
    assert "<svg" in dom.stdout, dom.stderr[-2000:]
    page = Page(dom.stdout)
    assert page.find("section", "changes", id="changes")
    assert len(page.find("figure", "rungpair")) == 2
    assert len(page.find("div", "pane")) == 4
    changed = [a for t, a in page.elements if t == "g" and a.get("data-change")]
    assert sorted((a["data-element"], a["data-change"]) for a in changed) == [
        ("M1.NO", "moved-from"), ("M1.NO", "moved-to"), ("M1.NO", "removed")]
    assert "wire 2 \u2192 102" in page.all_text()

    # Side by side on a wide window, drawn at no less than three quarters of their size; stacked on a narrow one.
    probe = repo / "probe.html"
    probe.write_text(html.replace("</body>", PROBE))
    for window, side_by_side in (("1800,1000", True), ("1000,1000", False)):
        result = browse(probe.as_uri(), "--dump-dom", "--virtual-time-budget=3000", window=window)
        m = re.search(r'data-probe="([^"]+)"', result.stdout)
        assert m, result.stderr[-2000:]
        for fig in m.group(1).split(";"):
            bl, bt, br, bb, al, at, ar, ab, scale = map(float, fig.split())
            if side_by_side:
                assert bt == at and br <= al, fig
                assert scale >= 0.75, fig
            else:
                assert at >= bb and al == bl, fig

    if os.path.exists(SCREENSHOT):
        os.remove(SCREENSHOT)
    browse(url, f"--screenshot={SCREENSHOT}", "--hide-scrollbars", window="1800,1500")
    assert os.path.exists(SCREENSHOT), "no screenshot written"
    with open(SCREENSHOT, "rb") as handle:
        png = handle.read()
    assert png[:8] == b"\x89PNG\r\n\x1a\n"
    assert (int.from_bytes(png[16:20], "big"), int.from_bytes(png[20:24], "big")) == (1800, 1500)
    assert len(png) > 20_000
