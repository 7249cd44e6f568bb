"""The demo site in a real browser: Debian's Chromium, driven headless by Playwright.

Builds the demo site (with a hostile note added) and opens it twice: served on 127.0.0.1,
and as files from disk (file://), as the README says it can be. Each time it opens the home
page, follows the links to a revision, and checks that every image loaded, that the
findings tables have rows, that the site search finds a demo vehicle by name, that the
console shows no errors and no script from a sheet ever runs. At 1400 px wide no table is
wider than its container and no feature key or rule id breaks across lines, on every page.
Screenshots are saved in test-artifacts/.
"""

from __future__ import annotations

import functools
import re
import http.server
import threading
from urllib.parse import quote
from pathlib import Path

import pytest
from playwright.sync_api import sync_playwright

from conftest import ROOT, run_cli
from site_helpers import build, copy_knowledge_base

CHROMIUM = "/usr/bin/chromium"  # Debian's package; the README's test line installs it (never a downloaded browser)
FLAGS = ["--headless", "--no-sandbox", "--disable-gpu", "--disable-background-networking", "--disable-component-update",
         "--disable-sync", "--no-first-run", "--disable-quic"]
ARTIFACTS = ROOT / "test-artifacts"


@pytest.fixture(scope="module")
def site(tmp_path_factory):
    kb = copy_knowledge_base(tmp_path_factory.mktemp("kb"))
    sheet = kb / "vehicles/tessel/r2.yaml"
    sheet.write_text(sheet.read_text(encoding="utf-8").replace(
        "notes: |\n", "notes: |\n  Hostile test <script>alert(1)</script><img src=x onerror=alert(2)>\n"), encoding="utf-8")
    plant_payloads(kb)
    return build(kb, kb / "out")


@pytest.fixture(scope="module")
def served(site):
    handler = functools.partial(_QuietHandler, directory=str(site))
    server = http.server.ThreadingHTTPServer(("127.0.0.1", 0), handler)
    threading.Thread(target=server.serve_forever, daemon=True).start()
    yield f"http://127.0.0.1:{server.server_address[1]}"
    server.shutdown()


FILE_NAME_PAYLOAD = "x.png){ onload=alert(2) }(.png"  # the name: it made <img onload=...> fire
SVG_PAYLOAD = '<svg xmlns="http://www.w3.org/2000/svg"><script>alert(3)</script></svg>'
CAPTION_PAYLOAD = 'Roof end ![p](x.png){ onload=alert(4) } <svg onload=alert(5)> `code`'


def plant_payloads(kb: Path) -> None:
    """Hostile files beside the demo sheet, and the payloads in an attachment's caption.

    A sheet naming any of the files is refused by ``check`` (so nothing is built); the site
    is built with the files lying in the folder, unnamed, and the caption payload shown."""
    images = kb / "vehicles/tessel/img"
    (images / FILE_NAME_PAYLOAD).write_bytes((images / "r1-roof-end.png").read_bytes())
    (images / "evil.svg").write_text(SVG_PAYLOAD)
    (images / "evil-svg.png").write_text(SVG_PAYLOAD)  # an SVG renamed .png
    sheet = kb / "vehicles/tessel/r1.yaml"
    text = sheet.read_text(encoding="utf-8")
    for name in (FILE_NAME_PAYLOAD, "evil.svg", "evil-svg.png"):
        sheet.write_text(text.replace("file: img/r1-roof-end.png", f"file: 'img/{name}'"), encoding="utf-8")
        run = run_cli("check", sheet)
        assert run.code == 2 and f"{sheet}:" in run.err and "attachment" in run.err, (name, run.err)
    text = re.sub(r"(?m)^    caption: .*$", f'    caption: "{CAPTION_PAYLOAD}"', text)
    sheet.write_text(text, encoding="utf-8")


class _QuietHandler(http.server.SimpleHTTPRequestHandler):
    def log_message(self, *args):
        pass


@pytest.fixture(scope="module")
def browser():
    if not Path(CHROMIUM).is_file():  # fail loudly, never skip: the browser test is part of the job
        pytest.fail(f"{CHROMIUM} is missing: install Debian's Chromium with `apt-get install chromium` (as root), "
                    "or run the README's test line, which installs it when it is missing", pytrace=False)
    with sync_playwright() as playwright:
        instance = playwright.chromium.launch(executable_path=CHROMIUM, args=FLAGS)
        yield instance
        instance.close()


def search(page, text: str) -> str:
    """Type into the site search until results show: the search index loads in a web worker,
    which can take a while on a busy machine, and queries typed before it is ready are lost."""
    box = "input[data-md-component='search-query']"
    for _ in range(9):
        page.fill(box, "")
        page.locator(box).press_sequentially(text, delay=40)  # real key events, as a person types
        try:
            page.wait_for_selector(".md-search-result__item", timeout=5000)
            return page.inner_text(".md-search-result")
        except Exception:  # noqa: BLE001 - Playwright's timeout; try again
            continue
    page.screenshot(path=str(ARTIFACTS / "search-failed.png"))
    raise AssertionError(f"the site search found nothing for {text!r}: {page.inner_text('.md-search')[:300]!r}")


@pytest.fixture(params=["served", "file"])
def base(request, site):
    """The site's address: served over HTTP, or the built files opened from disk."""
    return request.getfixturevalue("served") if request.param == "served" else site.as_uri()


def test_demo_site_in_the_browser(base, browser):
    ARTIFACTS.mkdir(exist_ok=True)
    kind = "file" if base.startswith("file:") else "served"
    page = browser.new_page(viewport={"width": 1280, "height": 900})
    errors, dialogs = [], []
    page.on("console", lambda message: errors.append(message.text) if message.type == "error" else None)
    page.on("pageerror", lambda error: errors.append(str(error)))
    page.on("dialog", lambda dialog: (dialogs.append(dialog.message), dialog.dismiss()))

    page.goto(base + "/index.html")
    page.wait_for_load_state("networkidle")
    assert "Maroska Tessel" in page.inner_text("article")
    page.screenshot(path=str(ARTIFACTS / f"home-{kind}.png"), full_page=True)

    page.click("article table >> text=Maroska Tessel")
    page.wait_for_load_state("networkidle")
    page.click("article table >> text=r2")
    page.wait_for_load_state("networkidle")
    assert page.url.endswith("/fleet/tessel/r2.html")  # plain file links: they work from disk too
    page.screenshot(path=str(ARTIFACTS / f"revision-{kind}.png"), full_page=True)

    images = page.evaluate("Array.from(document.images).map(i => [i.src, i.complete, i.naturalWidth])")
    figures = [image for image in images if "/figures/" in image[0]]
    assert len(figures) >= 5
    assert all(complete and width > 0 for _, complete, width in images), images
    rows = page.locator("article table:has(th:text('Status')) tbody tr").count()
    assert rows >= 30
    assert "Hostile test <script>alert(1)</script>" in page.inner_text("article")

    page.click("nav >> text=Fleet")  # the navigation, from a page two folders down
    page.wait_for_load_state("networkidle")
    assert page.url.endswith("/fleet/index.html") and "Maroska Quillon" in page.inner_text("article")
    page.goto(base + "/fleet/tessel/r1.html")
    page.wait_for_load_state("networkidle")
    loaded = page.evaluate("Array.from(document.images).every(i => i.complete && i.naturalWidth > 0)")
    assert loaded

    assert "Quillon" in search(page, "Quillon")
    page.screenshot(path=str(ARTIFACTS / f"search-{kind}.png"))
    assert "Hostile" in search(page, "Hostile")

    assert dialogs == [], dialogs
    assert errors == [], errors
    page.close()



def test_diff_page_shows_the_build_up_change_by_zone(served, browser):
    """Tessel r1 -> r2 (invented demo): both build-up curves and their difference are drawn, and the
    change by zone is a table with a row per zone along x and the total."""
    page = browser.new_page(viewport={"width": 1280, "height": 900})
    page.goto(served + "/fleet/tessel/r1-to-r2.html")
    page.wait_for_load_state("networkidle")
    drawn = page.evaluate("Array.from(document.images).filter(i => i.alt.startsWith('Cumulative drag along x'))"
                          ".map(i => [i.complete, i.naturalWidth])")
    assert drawn and all(complete and width > 0 for complete, width in drawn), drawn
    zones = page.locator("article table:has(th:text('Zone')) tbody tr")
    assert zones.count() >= 2
    assert zones.last.inner_text().startswith("All")
    page.goto(served + "/fleet/tessel/r2.html")
    page.wait_for_load_state("networkidle")
    solver = page.evaluate("Array.from(document.images).filter(i => /^(Force history|Cumulative drag and lift)/"
                           ".test(i.alt)).map(i => i.complete && i.naturalWidth > 0)")
    assert solver == [True, True], solver
    page.close()


# Every table sits inside its container; keys (zone.name) and rule ids keep to one line.
LAYOUT = """() => {
  const out = {wide: [], broken: []};
  const article = document.querySelector('article').getBoundingClientRect();
  for (const table of document.querySelectorAll('article table')) {
    const box = table.closest('.md-typeset__table') || table.parentElement;
    if (table.getBoundingClientRect().width > article.width + 1 || table.scrollWidth > box.clientWidth + 1)
      out.wide.push((table.querySelector('th') || {}).innerText || 'table');
  }
  const walker = document.createTreeWalker(document.querySelector('article'), NodeFilter.SHOW_TEXT);
  for (let node; (node = walker.nextNode());) {
    for (const match of node.data.matchAll(/[a-z][a-z_]*\\.[a-z][a-z0-9_-]*/g)) {
      const range = document.createRange();
      range.setStart(node, match.index);
      range.setEnd(node, match.index + match[0].length);
      if (new Set(Array.from(range.getClientRects()).map(r => Math.round(r.top))).size > 1) out.broken.push(match[0]);
    }
  }
  return out;
}"""


def test_layout_at_1400_px(site, browser):
    page = browser.new_page(viewport={"width": 1400, "height": 900})
    problems = {}
    for html in sorted(site.rglob("*.html")):
        if "assets" in html.parts:
            continue
        page.goto(html.as_uri())
        found = page.evaluate(LAYOUT)
        if found["wide"] or found["broken"]:
            problems[html.relative_to(site).as_posix()] = found
    page.close()
    assert len(list(site.rglob("*.html"))) > 80
    assert problems == {}, problems


def test_file_name_and_svg_payloads_stay_inert(served, browser):
    page = browser.new_page()
    dialogs = []
    page.on("dialog", lambda dialog: (dialogs.append(dialog.message), dialog.dismiss()))
    page.goto(served + "/fleet/tessel/r1.html")
    page.wait_for_load_state("networkidle")
    assert "onload=alert(4)" in page.inner_text("article")  # the caption shows as typed
    handlers = page.evaluate("""Array.from(document.querySelectorAll('*')).flatMap(e =>
        Array.from(e.attributes).filter(a => a.name.startsWith('on')).map(a => e.tagName + ' ' + a.name))""")
    assert handlers == [], handlers  # no live element: not one event-handler attribute on the page
    assert page.evaluate("document.querySelectorAll('svg script, article svg').length") == 0
    for name in ("evil.svg", "evil-svg.png", FILE_NAME_PAYLOAD):  # never published
        response = page.request.get(f"{served}/fleet/tessel/files/r1/img/{quote(name)}")
        assert response.status == 404, name
    page.goto(f"{served}/fleet/tessel/files/r1/img/evil.svg")
    page.wait_for_timeout(300)
    assert dialogs == [], dialogs
    page.close()


# Every text of a figure, as Chromium lays it out with the real font, inside the figure's canvas.
OUTSIDE = """() => {
  const svg = document.documentElement, canvas = svg.getBoundingClientRect(), out = [];
  for (const text of svg.querySelectorAll('text')) {
    const r = text.getBoundingClientRect();
    if (text.textContent.trim() && (r.left < canvas.left - 0.5 || r.top < canvas.top - 0.5
        || r.right > canvas.right + 0.5 || r.bottom > canvas.bottom + 0.5)) out.push(text.textContent);
  }
  return {texts: svg.querySelectorAll('text').length, outside: out};
}"""


def test_no_figure_label_or_legend_is_clipped(site, browser):
    """Figure margins are fixed per kind (no tight box): a title, axis label, tick label, note or
    legend entry that outgrew them would fall outside the canvas and be cut off."""
    page = browser.new_page(viewport={"width": 1000, "height": 800})
    svgs = sorted((site / "figures").glob("*.svg"))
    clipped, kinds = {}, set()
    for svg in svgs:
        page.goto(svg.as_uri())
        found = page.evaluate(OUTSIDE)
        assert found["texts"] >= 3, svg.name  # text kept as text: a title and axis labels at least
        kinds.add(svg.name.rsplit("-", 1)[0])
        if found["outside"]:
            clipped[svg.name] = found["outside"]
    page.close()
    assert len(kinds) >= 15, kinds  # every kind the demo draws, matplotlib's and the direct SVG charts
    assert clipped == {}, clipped
