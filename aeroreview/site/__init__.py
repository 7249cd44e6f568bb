"""The review site: a MkDocs plugin that turns the reviewed fleet into pages and figures.

``pages`` writes the Markdown of every generated page, one module per page kind, from the
reviews and what :mod:`aeroreview.digest` computed for them (formatting only),
``figures`` draws deterministic SVG figures behind a cache keyed by their inputs,
``plugin`` wires both into MkDocs' events, and ``build`` holds the ``aeroreview site``
wrappers. Nothing generated is written into ``site_src/``.
"""
