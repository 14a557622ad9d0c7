"""Shared parameter entries: written into each docstring in the signature's order, a function's own first."""

from __future__ import annotations

from pmdc_sizer.core.shared_docs import parameter_table, shared_parameters, with_parameters

TABLE = parameter_table("""
model : MotorModel
    The motor at one case's temperatures.
current : float or ndarray
    Armature current [A].
low, high : float
    Ends of a range [m].
""")


def test_the_table_reads_entries_as_a_parameters_section_does():
    assert TABLE["model"] == ("model : MotorModel", "    The motor at one case's temperatures.")
    assert TABLE["low"] == TABLE["high"] == ("low, high : float", "    Ends of a range [m].")


def test_a_section_is_written_before_the_first_other_one_in_the_signature_s_order():
    @shared_parameters(TABLE)
    def speed(current, model):
        """Speed at a current.

        Returns
        -------
        float
            [rad/s].
        """

    assert speed.__doc__ == (
        "Speed at a current.\n\n"
        "Parameters\n----------\n"
        "current : float or ndarray\n    Armature current [A].\n"
        "model : MotorModel\n    The motor at one case's temperatures.\n\n"
        "Returns\n-------\nfloat\n    [rad/s].\n")


def test_the_function_s_own_entry_wins_and_keeps_its_place():
    written = with_parameters('''Summary.

    Parameters
    ----------
    current : float
        Current at stall, of either sign [A].
    extra : int
        Not in the signature, kept [1].
    ''', ["model", "current"], TABLE)
    assert written.splitlines()[2:] == [
        "Parameters", "----------",
        "model : MotorModel", "    The motor at one case's temperatures.",
        "current : float", "    Current at stall, of either sign [A].",
        "extra : int", "    Not in the signature, kept [1]."]


def test_an_entry_naming_two_parameters_is_written_once_and_an_unknown_name_left_out():
    written = with_parameters("Summary.", ["low", "high", "unknown"], TABLE)
    assert written == "Summary.\n\nParameters\n----------\nlow, high : float\n    Ends of a range [m].\n"


def test_a_docstring_without_sections_gets_the_section_at_its_end_and_a_method_skips_self():
    class Motor:
        @shared_parameters(TABLE)
        def at(self, current):
            """The motor at a current."""

    assert Motor.at.__doc__ == "The motor at a current.\n\nParameters\n----------\ncurrent : float or ndarray\n" \
                               "    Armature current [A].\n"
