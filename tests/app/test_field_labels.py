"""Field labels outside the GUI: the table the editor, the sizing page and the ``size`` command share, and the
core's key-bearing sentences worded with it."""

from __future__ import annotations

import re

from pmdc_sizer.app.field_labels import field_message, label_for, label_in_sentence, worded_keys

DOTTED_KEY = re.compile(r"\b[a-z]+\.[a-z_]+\b")
SENTENCE = ("The closest design (magnets.thickness_mm = 3.1 mm, winding.turns_per_coil = 30) fails. It presses "
            "against magnets.thickness_mm at the low end of its range (3); with housing.wall_mm = 7.4 mm it passes, "
            "but only with housing.max_outer_diameter_mm widened to 45.2 mm.")


def test_labels_from_the_table_and_from_the_key():
    assert label_for("magnets.thickness_mm") == "Magnet thickness"  # from the table
    assert label_for("winding.turns_per_coil") == "Turns per coil"  # from the key, its words
    assert label_for("armature.stack_length_mm") == "Stack length"  # the unit suffix dropped
    assert label_in_sentence("housing.max_outer_diameter_mm") == "envelope diameter"
    assert label_in_sentence("magnets.custom_grade.coercivity_HcJ_kA_per_m") == "HcJ"  # an acronym keeps its case
    message = "magnets.thickness_mm = 50: above 40"
    assert field_message("magnets.thickness_mm", message) == "Magnet thickness = 50: above 40"


def test_the_screen_wording_names_labels_and_no_key():
    text = worded_keys(SENTENCE)
    assert text.startswith("The closest design (magnet thickness 3.1 mm, turns per coil 30) fails.")
    assert "presses against magnet thickness at the low end" in text
    assert "with housing wall 7.4 mm it passes, but only with envelope diameter widened to 45.2 mm" in text
    assert not DOTTED_KEY.search(text), text


def test_the_terminal_wording_gives_each_key_once_in_parentheses():
    text = worded_keys(SENTENCE, show_keys=True)
    assert text.startswith("The closest design (magnet thickness (magnets.thickness_mm) 3.1 mm, turns per coil "
                           "(winding.turns_per_coil) 30) fails.")
    assert text.count("magnets.thickness_mm") == 1 and "presses against magnet thickness at" in text
    assert "envelope diameter (housing.max_outer_diameter_mm) widened" in text and " = " not in text


def test_a_key_that_starts_a_sentence_is_capitalised_and_other_dotted_words_stay():
    assert worded_keys("Refused. housing.wall_mm = 3 mm is thin; see e.g. core.sizing.") == \
        "Refused. Housing wall 3 mm is thin; see e.g. core.sizing."
