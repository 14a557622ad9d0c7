"""pmdc-sizer's edges: the ``pmdc-sizer`` command, the desktop tool and the datasheet.

Nothing here computes physics: the app edits a project, asks :mod:`pmdc_sizer.core` to evaluate it and
shows what comes back. ``pmdc_sizer.app.cli.main`` is the command's entry point.
"""
