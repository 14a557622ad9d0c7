"""Writes docs/project-file.md from the schema, so the key table can never drift from the validator.

    python -m pmdc_sizer.app.project_docs > docs/project-file.md
"""

from __future__ import annotations

import sys

from pmdc_sizer.core.project import FORMAT_VERSION, key_specs
from pmdc_sizer.core.schema import MAX_FURTHER_POINTS

_INTRO = f"""# The project file (format version {FORMAT_VERSION})

A project file is TOML: one complete motor design in plain text, with comments and clean diffs. Every
key carries its unit in its name (`thickness_mm`, `voltage_V`, `torque_mNm`); the table below gives each
key's unit, allowed range, default and meaning. It is generated from the schema in `core/project.py`
(`python -m pmdc_sizer.app.project_docs > docs/project-file.md`), which is also what validates files, builds the
editor in the desktop tool and checks `--set` on the command line.

Rules:

* Unknown keys are errors (a typo is never ignored), and so are values of the wrong type.
* Every range is inclusive; a value outside it is refused with the key, the value and the range named.
* Cross-field checks refuse parts that do not fit: magnet arc at most 98 % of the pole pitch, magnet
  at least as long as the stack (overhang not negative), housing at least as long as the magnet, core
  of at least 1 mm under the slots, teeth narrower than the slot pitch at the slot bottom, slot opening
  narrower than the slot, commutator segments a whole multiple of the slots, wave windings only where
  segments ± multiplicity divide by the pole pairs, housing within `max_outer_diameter_mm` and its tube
  within `max_length_mm` if given,
  `ambient_min_C ≤ ambient_nominal_C ≤ ambient_max_C`, and exactly one of `magnets.grade` and
  `[magnets.custom_grade]`.
* `format_version` newer than this program reads is refused with a message to update.
* Every key marked *required* must be written; a file that leaves one out is refused, so no design
  quantity is ever silently defaulted. Keys marked *may be left out* are truly optional (the tool then
  does what the description says); a few others show the value they take when left out.
* The housing diameter is not an input: it follows from the armature diameter, air gap, magnet
  thickness and wall (`D = D_armature + 2·(gap + magnet + wall)`).

A user's own magnet grades and steels can also live in TOML files in the user library folder
(`$PMDC_SIZER_LIBRARY`, or the platform's user data folder + `/pmdc-sizer/library`) as `[[grade]]`
tables with the keys of `magnets.custom_grade` below, and `[[steel]]` tables as in `core/data/steels.toml`.

| key | unit | allowed | if left out | meaning |
|---|---|---|---|---|
"""


def _cell(value) -> str:
    if value is None:
        return ""
    if isinstance(value, float):
        return f"{value:g}"
    return str(value)


def project_file_markdown() -> str:
    rows = []
    for spec in key_specs():
        if spec.kind == "choice":
            allowed = ", ".join(f"`{c}`" if isinstance(c, str) else str(c) for c in spec.choices)
        elif spec.minimum is not None or spec.maximum is not None:
            allowed = f"{_cell(spec.minimum)} to {_cell(spec.maximum)}"
        elif spec.kind == "str":
            allowed = "text"
        elif spec.kind == "points":
            allowed = f"1 to {MAX_FURTHER_POINTS} points, each within the [load] limits"
        else:
            allowed = spec.kind
        if spec.optional and spec.default is None:
            default = "*may be left out*"
        elif spec.required_in_file:
            default = "*required*"
        else:
            shown = f"`{spec.default!r}`" if isinstance(spec.default, str) else _cell(spec.default)
            default = f"{shown} if left out"
        rows.append(f"| `{spec.path}` | {spec.unit} | {allowed} | {default} | {spec.description} |")
    return _INTRO + "\n".join(rows) + "\n"


if __name__ == "__main__":
    sys.stdout.write(project_file_markdown())
