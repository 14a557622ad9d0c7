"""Colours and marks shared by every chart, chosen for this tool.

Temperature cases run from a cool blue through charcoal to a warm brick; demagnetization results use
shape as well as colour (a hollow circle is safe, a large filled cross is past the knee), so they read
in grey print and for colour-blind users too.
"""

CASE_COLOURS = {"cold": "#2166ac", "nominal": "#404040", "hot": "#c2410c"}
CASE_TITLES = {"cold": "cold", "nominal": "nominal", "hot": "hot"}
SAFE_COLOUR = "#1b7f3b"
PAST_KNEE_COLOUR = "#c0137a"
WARNING_COLOUR = "#b7791f"
KNEE_COLOUR = "#111111"
LIMIT_COLOUR = "#6b3fa0"  # the drive's current limit on the performance chart
STATUS_COLOURS = {"pass": SAFE_COLOUR, "warning": WARNING_COLOUR, "fail": PAST_KNEE_COLOUR}
STATUS_MARKS = {"pass": "✔", "warning": "▲", "fail": "✖"}
STATUS_WORDS = {"pass": "OK", "warning": "Watch", "fail": "Fails"}

# Cross-section fills.
HOUSING_FILL = "#8a9099"
LAMINATION_FILL = "#b9c2cc"
COPPER_FILL = "#c8793a"
SHAFT_FILL = "#5c6570"
NORTH_FILL = "#d45d5d"
SOUTH_FILL = "#5d7fd4"
