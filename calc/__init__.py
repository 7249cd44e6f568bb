"""aeroreview.calc: the physics and geometry behind every consequence, as pure functions.

SI units inside (m, kg, s, Pa, N, W, J, rad); each function's docstring gives its formula,
units, a worked example reproducing a published number, and its references.
"""
