"""The collector setting of ``check`` and ``site build``: no full collections, young ones as usual.

Behaviour checked against CPython's documented collector (the ``gc`` module documentation,
``set_threshold``: a generation is collected once its allocation or collection count exceeds
its threshold), not against the project's own code.
"""

from __future__ import annotations

import gc
import weakref

from aeroreview import collector


class _Node:
    pass


def test_young_collections_still_free_cycles_and_the_thresholds_come_back():
    before, enabled = gc.get_threshold(), gc.isenabled()
    gc.enable()
    try:
        with collector.young_collections_only():
            young, middle, full = gc.get_threshold()
            assert (young, middle) == before[:2] and full >= 10**9
            node = _Node()
            node.self = node  # a reference cycle: only the collector can free it
            alive = weakref.ref(node)
            del node
            keep = [[] for _ in range(young * (middle + 2) * 2)]  # enough new containers for gen 0 and 1 collections
            assert alive() is None, "a short-lived cycle must still be collected by the young generations"
            del keep
        assert gc.get_threshold() == before
    finally:
        gc.set_threshold(*before)
        if not enabled:
            gc.disable()


def test_a_report_pauses_the_collector_and_resumes_it():
    enabled = gc.isenabled()
    gc.enable()
    try:
        with collector.paused():
            assert not gc.isenabled()
        assert gc.isenabled()
    finally:
        if not enabled:
            gc.disable()


def test_drawing_with_matplotlib_gets_full_collections_back():
    """Inside a young-collections block, a figure drawing restores the interpreter's thresholds (closed
    matplotlib figures form cycles that outlive the young generations), and the block's come back after."""
    before = gc.get_threshold()
    try:
        with collector.young_collections_only():
            reduced = gc.get_threshold()
            with collector.full_collections():
                assert gc.get_threshold() == collector.STARTING_THRESHOLDS
            assert gc.get_threshold() == reduced
    finally:
        gc.set_threshold(*before)


def test_closed_figures_do_not_pile_up_while_a_site_is_drawn():
    """200 small matplotlib figures drawn and closed (plt.close), as aeroreview.site.figures draws the
    silhouettes and sections: with full collections back, closed figures are freed (about 10 stay
    alive; some 80 without them, measured), counted as matplotlib Figure objects known to gc."""
    import io

    import matplotlib

    matplotlib.use("svg")
    import matplotlib.pyplot as plt
    from matplotlib.figure import Figure

    with collector.young_collections_only():
        for _ in range(200):
            with collector.full_collections():
                fig, ax = plt.subplots()
                ax.plot(range(50), range(50))
                fig.savefig(io.BytesIO(), format="svg")
                plt.close(fig)
        alive = sum(isinstance(item, Figure) for item in gc.get_objects())
    assert alive < 40, f"{alive} closed figures still alive"
