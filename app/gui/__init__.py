"""The desktop tool: a design editor, live charts and checks on top of the core chain."""
