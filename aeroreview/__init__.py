"""aeroreview: review road-vehicle aerodynamics from feature sheets.

The engine package: sheet loading and validation, the feature catalogue, the review,
the reports and the command line. The rule library and the physics install beside it
as ``aeroreview.rules`` and ``aeroreview.calc``.
"""

__version__ = "0.1.0"
