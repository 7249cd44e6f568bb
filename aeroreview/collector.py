"""The cyclic garbage collector while a fleet is loaded, reviewed and reported.

A fleet's sheets, reviews and report live until the command ends: thousands of small objects a
sheet. CPython's full collections walk that whole heap again each time it has grown by a
quarter, which cost a quarter of ``check``'s load and review at 1000 sheets (bench/check.py).
The reference cycles a review makes are short-lived (measured on 1000 synthetic sheets: none
outlive the young generations), so the young collections still free them; only the full walks
are held back, and the thresholds are restored afterwards. A report makes no cycles at all, so
the collector pauses while one is built.
"""

from __future__ import annotations

import contextlib
import gc

NEVER = 1 << 30  # young-generation collections before a full one: more than any run makes
STARTING_THRESHOLDS = gc.get_threshold()  # the interpreter's own, before any block here changes them


@contextlib.contextmanager
def young_collections_only():
    """Collect the young generations as usual, but make no full collection (see the module)."""
    young, middle, full = gc.get_threshold()
    gc.set_threshold(young, middle, NEVER)
    try:
        yield
    finally:
        gc.set_threshold(young, middle, full)


@contextlib.contextmanager
def full_collections():
    """The interpreter's own collection thresholds inside a :func:`young_collections_only` block.

    For drawing with matplotlib: a figure's artists form reference cycles that live long enough
    to leave the young generations, so without full collections closed figures pile up (measured:
    drawing and closing 200 small figures left 80 alive and 119 MB of memory, against 10 and 76 MB).
    """
    saved = gc.get_threshold()
    gc.set_threshold(*STARTING_THRESHOLDS)
    try:
        yield
    finally:
        gc.set_threshold(*saved)


@contextlib.contextmanager
def paused():
    """Pause the collector while a report is built.

    A report is a tree of some 1,300 small dicts and lists a sheet and makes no reference
    cycles, but each full collection would walk the whole fleet, its reviews and the report
    so far again: about half the report's cost at 1000 sheets (bench/check.py). Reference
    counting still frees what is dropped; the collector resumes when the report is written.
    """
    enabled = gc.isenabled()
    gc.disable()
    try:
        yield
    finally:
        if enabled:
            gc.enable()
