"""Attachments on the site: raster only, size-limited, copied by streaming, paths shown as typed.

Issue 14, items 3 (an SVG attachment ran script in the site's origin), 13 (the sheet path
escaped twice inside a code span for any id with a hyphen) and 14 (no size limit: a 1.5 GB
attachment was read whole into memory).
"""

from __future__ import annotations

from html import unescape

from aeroreview.review import review_sheet
from aeroreview.settings import ATTACHMENT_BYTES, Settings, load_settings
from aeroreview.sheet import load_fleet
from aeroreview.site.figures import FigureCache
from aeroreview.site.pages import generate
from conftest import MINIMAL, ROOT, VEHICLES, run_cli
from test_sheet_errors import located
from test_site_output import site_build, tiny_kb

PNG = (VEHICLES / "tessel/img/r1-roof-end.png").read_bytes()


def with_attachment(kb, name="img/a.png", content=PNG, caption="a sketch"):
    sheet = kb / "vehicles/test-car/r1.yaml"
    (sheet.parent / name).parent.mkdir(parents=True, exist_ok=True)
    (sheet.parent / name).write_bytes(content)
    sheet.write_text(MINIMAL + f"attachments:\n  - file: {name}\n    zone: rear\n    caption: {caption}\n")
    return sheet


def test_svg_attachments_are_refused(tmp_path):
    kb = tiny_kb(tmp_path / "kb")
    sheet = with_attachment(kb, "img/a.svg", b'<svg xmlns="http://www.w3.org/2000/svg"><script>alert(1)</script></svg>')
    assert located(run_cli("check", sheet), sheet, "'img/a.svg' is not an image") == (11, 11)


def test_a_document_renamed_as_an_image_is_refused(tmp_path):
    kb = tiny_kb(tmp_path / "kb")
    sheet = with_attachment(kb, "img/a.png", b"<svg onload=alert(1)></svg>")
    assert located(run_cli("check", sheet), sheet, "is not a PNG, JPEG, GIF or WebP image") == (11, 11)


def test_sheet_path_with_a_hyphen_shows_as_typed(tmp_path):
    kb = tiny_kb(tmp_path / "kb")
    assert site_build(kb, tmp_path / "out").code == 0
    html = (tmp_path / "out/fleet/test-car/r1.html").read_text(encoding="utf-8")
    assert "<code>vehicles/test-car/r1.yaml</code>" in unescape(html)
    assert "&amp;#" not in html  # no entity escaped a second time anywhere on the page


def test_attachment_over_the_limit_is_a_located_error(tmp_path):
    kb = tiny_kb(tmp_path / "kb")
    sheet = with_attachment(kb)
    config = kb / "mkdocs.yml"
    config.write_text(config.read_text(encoding="utf-8").replace("      fail_on: failure\n",
                                                                 "      fail_on: failure\n      max_attachment_mb: 0.001\n"))
    run = run_cli("check", sheet, "--config", config)
    assert located(run, sheet, f"attachment 'img/a.png' is {len(PNG):,} bytes, over the limit of 1,000") == (11, 1)
    build = site_build(kb, tmp_path / "out")
    assert build.code == 2 and "over the limit of 1,000" in build.err
    assert load_settings(config).max_attachment_bytes == 1000


def test_default_limit_and_bad_setting(tmp_path):
    assert Settings().max_attachment_bytes == ATTACHMENT_BYTES == 20_000_000
    config = tiny_kb(tmp_path / "kb") / "mkdocs.yml"
    text = config.read_text(encoding="utf-8").replace("      fail_on: failure\n", "      fail_on: failure\n"
                                                      "      max_attachment_mb: -1\n")
    config.write_text(text)
    line = text.splitlines().index("      max_attachment_mb: -1") + 1
    run = run_cli("check", "--config", config, tmp_path / "kb/vehicles")
    assert located(run, config, "max_attachment_mb must be a number of megabytes") == (line, 26)


def test_attachments_are_copied_from_disk_not_held_in_memory():
    settings = Settings(root=ROOT)
    reviews = [review_sheet(s, settings) for s in load_fleet([VEHICLES]).sheets]
    site = generate(reviews, settings, FigureCache(None))
    target = "fleet/tessel/files/r1/img/r1-roof-end.png"
    assert site.copies[target] == (VEHICLES / "tessel/img/r1-roof-end.png").resolve()
    assert target not in site.files and not any(isinstance(v, bytes) and v == PNG for v in site.files.values())
