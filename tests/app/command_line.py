"""Running ``pmdc-sizer`` in-process the way the command-line tests do: arguments in, exit status and
the two streams out."""

from __future__ import annotations

from pmdc_sizer.app.cli import main


def run(capsys, *argv) -> tuple[int, str, str]:
    """``pmdc-sizer ARGV...`` (paths may be Path objects) → (exit status, stdout, stderr)."""
    status = main([str(a) for a in argv])
    out, err = capsys.readouterr()
    return status, out, err
