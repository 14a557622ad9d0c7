"""The exceptions of the field solution, each with a message fit for the user.

They subclass the built-in families the edges already catch (a bad design is a ``ValueError``, a solve
that fails a ``RuntimeError``), so the command line and the desktop tool need no new handlers.
"""

from __future__ import annotations


class FieldInputError(ValueError):
    """A design whose cross-section cannot be meshed; the message names the project key and the limit.

    Parameters
    ----------
    message : str
        What is wrong, naming the key and its limit in the file's units.
    key : str
        The project-file key, e.g. ``"armature.tooth_width_mm"``.
    """

    def __init__(self, message: str, key: str = ""):
        super().__init__(message)
        self.key = key


class FieldConvergenceError(RuntimeError):
    """Newton's method did not reach the stated tolerance; the message says what to try."""


class FieldCancelled(RuntimeError):
    """The caller asked the solve to stop (``should_stop()`` returned True); nothing was returned."""


__all__ = ["FieldCancelled", "FieldConvergenceError", "FieldInputError"]
