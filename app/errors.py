"""The error the app shows a user as one line, from the command line or the desktop tool alike.

It lives apart from the CLI so that the datasheet, the file writers and the GUI can raise and catch it
without importing the command line.
"""

from __future__ import annotations

#: Exit statuses of the ``pmdc-sizer`` command (the README states them; scripts rely on them).
EXIT_OK = 0  #: done
EXIT_NO_SOLUTION = 1  #: the design has no solution (the magnetic circuit, a re-fit out of reach)
EXIT_BAD_INPUT = 2  #: a bad file, key, value, path, format or environment: one line naming it
EXIT_INTERNAL = 3  #: a defect in pmdc-sizer: one line saying where the crash report was written


class CommandError(Exception):
    """A user-facing error: one line that names what is wrong, no traceback.

    ``status`` is the exit status the command line returns for it; the GUI shows the message only.
    """

    def __init__(self, message: str, status: int = EXIT_BAD_INPUT):
        super().__init__(message)
        self.status = status
