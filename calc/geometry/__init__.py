"""aeroreview.calc.geometry: measuring a vehicle surface, as pure functions on arrays.

``projection`` gives the frontal area (the union of the projected faces), ``sections``
slices a triangulated surface with a plane and turns the cut into upper and lower
outlines, ``fits`` fits lines and circles with their residuals, and ``profile`` finds the
trade's angles and radii on a centreline section and the taper of a horizontal section.
Inputs are numpy arrays in metres; the engine's ``aeroreview.measure`` does the file I/O.
"""
