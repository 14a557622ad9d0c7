"""The exception types that the edges (command line, desktop tool) catch and turn into messages.

Each carries a message fit for the user: it names the key or the computation and the limit.
"""

from __future__ import annotations


class ProjectError(ValueError):
    """A project file, key or value that cannot be used; the message names the key and the limit.

    Parameters
    ----------
    message : str
        One line for the user: the file or key, the value and the limit.
    key : str, optional
        The dotted key at fault, kept as ``key`` ("" when the file as a whole is at fault).
    """

    def __init__(self, message: str, key: str = "") -> None:
        super().__init__(message)
        self.key = key


class MagneticCircuitError(RuntimeError):
    """The magnetic circuit has no solution (or the solver did not converge); the message says which."""


__all__ = ["MagneticCircuitError", "ProjectError"]
