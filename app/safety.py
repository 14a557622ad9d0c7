"""The safety text, written once: the About box, every datasheet, the terminal and the export dialog
read it from here.

Strong magnets, stall currents and heat can hurt people; the figures are estimates; local codes and
licensed practice decide. :data:`CAUTIONS` is the full text, :data:`SHORT_CAUTION` the one-line form
for places without room (the terminal, a page footer, beside a button).
"""

from __future__ import annotations

#: (lead, rest): each caution is one sentence, ``f"{lead} {rest}"``; the lead can be set in bold.
CAUTIONS: tuple[tuple[str, str], ...] = (
    ("Strong magnets",
     "pinch fingers and can shatter into sharp splinters when they snap together; their fields can disturb "
     "pacemakers and other implanted medical devices and erase magnetic media. Handle magnetized parts with "
     "care and eye protection, keep them apart, and keep them away from anyone with an implant."),
    ("A stalled motor overheats",
     "within seconds to minutes: it draws its stall current with no cooling air. Fit overcurrent and "
     "overtemperature protection sized for the stall current of the design."),
    ("Batteries and supplies deliver currents that burn",
     "skin, weld tools, melt conductors and start fires. Size wiring, fuses and switches for the stall "
     "current, and insulate terminals before connecting."),
    ("Every figure is an engineering estimate",
     "from typical material data and a model of the design; confirm it by test on a prototype before "
     "release."),
    ("Installation, protection and every safety decision",
     "must follow local codes and licensed practice, which take precedence over anything this tool or its "
     "datasheets say."),
)

ESTIMATES_NOTE = "Engineering estimates: confirm by test."
DEFER_NOTE = "Follow local codes and licensed practice."

#: The cautions in one line.
SHORT_CAUTION = (f"{ESTIMATES_NOTE} Strong magnets pinch, shatter and can harm implanted medical devices; a "
                 f"stalled motor overheats and its current burns. {DEFER_NOTE}")


def caution_sentences() -> tuple[str, ...]:
    return tuple(f"{lead} {rest}" for lead, rest in CAUTIONS)
