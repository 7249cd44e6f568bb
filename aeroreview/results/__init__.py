"""Reading solver and tunnel output: coefficient histories, surface fields, yaw tables.

``history`` finds where a run settled and what its coefficients are worth; ``surface``
integrates a surface field into coefficients and their build-up along the body; ``yaw``
reads a table of coefficients against yaw into a yaw sweep. ``sheet`` merges a result into
a feature sheet. Each module reads untrusted files and refuses bad input with located
problems, never a traceback.
"""
