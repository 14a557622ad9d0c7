"""How long a GUI test waits for the window's own work (an evaluation, a redraw after one) before failing.

An evaluation takes well under a second here, but CI runs two test workers on a shared two-core machine
whose speed moves from day to day, and a wait that expires fails the run: a wait only lasts as long as
the work it waits for, so the limit is set far above it.
"""

WAIT_MS = 60_000
