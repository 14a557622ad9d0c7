"""Files the app writes: every one atomically, and the speed-torque table as CSV.

A file is written to a temporary file in the target's folder and renamed over the target only when
the writing succeeded, so a failure (a full disk, a folder in the way, an exception while drawing)
leaves the old file, or nothing, never half a file. Failures are :class:`CommandError` with one line.

Project files are saved by ``core.project.save``, which keeps its own atomic write for now (it must not
import the app).
"""

from __future__ import annotations

import contextlib
import csv
import io
import os
import tempfile
from collections.abc import Iterator
from pathlib import Path

from pmdc_sizer.core.units import from_si

from .errors import CommandError


@contextlib.contextmanager
def atomic_output(path: str | os.PathLike) -> Iterator[str]:
    """A temporary path beside ``path`` to write into, renamed over ``path`` only if the block succeeds.

    Nothing is left behind on failure. The file gets the usual permissions (0666 less the umask), not
    the private 0600 of a temporary file, since exports are meant to be handed on.
    """
    path = Path(path)
    folder = path.parent if str(path.parent) else Path(".")
    if not folder.is_dir():
        raise CommandError(f"{path}: the folder {folder} does not exist")
    try:
        handle, temporary = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".tmp", dir=folder)
    except OSError as error:
        raise CommandError(f"{path}: cannot write here ({error.strerror or error})") from None
    os.close(handle)
    try:
        yield temporary
        umask = os.umask(0)
        os.umask(umask)
        os.chmod(temporary, 0o666 & ~umask)
        os.replace(temporary, path)
    except OSError as error:
        raise CommandError(f"{path}: cannot write the file ({error.strerror or error})") from None
    finally:
        Path(temporary).unlink(missing_ok=True)


def write_text_atomically(path: str | os.PathLike, text: str) -> None:
    """Write ``text`` (UTF-8, line ends as given) to ``path`` through :func:`atomic_output`."""
    with atomic_output(path) as temporary, open(temporary, "w", encoding="utf-8", newline="") as stream:
        stream.write(text)


def write_bytes_atomically(path: str | os.PathLike, data: bytes) -> None:
    """Write ``data`` to ``path`` through :func:`atomic_output`."""
    with atomic_output(path) as temporary:
        Path(temporary).write_bytes(data)


#: The curve table's columns: (CSV header with its unit, field of core's CurveData, unit shown).
CURVE_COLUMNS = (
    ("torque_mN_m", "torque_N_m", "mN·m"),
    ("speed_rpm", "speed_rad_per_s", "rpm"),
    ("current_A", "current_A", "A"),
    ("input_power_W", "input_power_W", "W"),
    ("output_power_W", "output_power_W", "W"),
    ("efficiency_pct", "efficiency", "%"),
    ("copper_loss_W", "copper_loss_W", "W"),
    ("brush_loss_W", "brush_loss_W", "W"),
    ("friction_loss_W", "friction_loss_W", "W"),
    ("viscous_loss_W", "viscous_loss_W", "W"),
    ("iron_loss_W", "iron_loss_W", "W"),
)


def curves_csv(results, cases=("cold", "nominal", "hot")) -> str:
    """The speed-torque tables of the chosen cases as CSV; the header names every unit."""
    buffer = io.StringIO()
    writer = csv.writer(buffer, lineterminator="\n")
    writer.writerow(["case", "winding_temperature_C", "magnet_temperature_C"] + [c[0] for c in CURVE_COLUMNS])
    for case in results.cases:
        if case.name not in cases:
            continue
        columns = [from_si(getattr(case.curve, field), unit) for _, field, unit in CURVE_COLUMNS]
        for row in zip(*columns, strict=True):
            writer.writerow([case.name, f"{case.winding_temperature_C:.2f}", f"{case.magnet_temperature_C:.2f}"]
                            + [f"{v:.6g}" for v in row])
    return buffer.getvalue()
