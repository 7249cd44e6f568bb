"""Slow results (settled histories, build-up curves, refitted studies) are
remembered between builds by a hash of their inputs and code: a rebuild reuses them and gives
the same pages; changed inputs are computed again; results no build uses are removed."""

from __future__ import annotations

import pytest

from aeroreview.memo import Memo, key
from aeroreview.results import evidence
from aeroreview.review import review_sheet
from aeroreview.settings import load_settings
from aeroreview.sheet import load_fleet
from aeroreview.site.figures import FigureCache
from aeroreview.site.pages import calibrations, generate
from site_helpers import copy_knowledge_base


def site_files(kb, cache):
    settings = load_settings(kb / "mkdocs.yml")
    reviews = [review_sheet(s, settings) for s in load_fleet([settings.sheets_path]).sheets]
    return generate(reviews, settings, FigureCache(cache / "figures")).files


def test_a_rebuild_reuses_what_it_remembered_and_gives_the_same_pages(tmp_path, monkeypatch):
    kb = copy_knowledge_base(tmp_path / "kb")
    first = site_files(kb, tmp_path)
    remembered = sorted(p.name for p in (tmp_path / "aeroreview-data").glob("*.json"))
    assert len(remembered) >= 5  # 2 histories, 2 build-ups, 1 calibration (the demo's)

    def refuse(*args, **kwargs):
        raise AssertionError("recomputed although remembered")

    for module, name in ((evidence, "history_figure"), (evidence, "read_buildup"), (calibrations, "page_data")):
        monkeypatch.setattr(module, name, refuse)
    assert site_files(kb, tmp_path) == first
    monkeypatch.undo()

    history = kb / "vehicles/tessel/cfd/tessel-r2-forces.dat"  # one result file changes: it alone is read again
    history.write_text(history.read_text(encoding="utf-8") + "\n", encoding="utf-8")
    site_files(kb, tmp_path)
    now = sorted(p.name for p in (tmp_path / "aeroreview-data").glob("*.json"))
    assert len(now) == len(remembered) and len(set(now) - set(remembered)) == 1  # the old result evicted


def test_memo_keys_follow_inputs_and_code(tmp_path):
    assert key(b"ab", b"c") != key(b"a", b"bc")  # length-prefixed parts
    assert key(b"x", code=("aeroreview.memo",)) != key(b"x")
    memo = Memo(tmp_path)
    assert memo.get("k", lambda: {"v": [1.5, None]}) == {"v": [1.5, None]}
    assert Memo(tmp_path).get("k", lambda: pytest.fail("stored")) == {"v": [1.5, None]}
    with pytest.raises(ValueError):
        Memo(tmp_path).get("bad", lambda: (_ for _ in ()).throw(ValueError("unreadable")))
    assert not (tmp_path / "bad.json").exists()  # an error is not remembered
