"""Rounding for people: no more figures than asked for, whatever the magnitude."""

from __future__ import annotations

import pytest

from pmdc_sizer.app.formatting import quantity, ratio, significant


@pytest.mark.parametrize("value, digits, expected", [
    (23389.0, 3, "23400"),  # past the decimal point the extra figures become zeros
    (3703.4, 3, "3700"),
    (9.996, 3, "10.0"),  # rounding up gains a digit in front: one decimal fewer
    (99.96, 3, "100"),
    (0.027812, 3, "0.0278"),
    (0.000120, 3, "0.000120"),
    (-281.3, 3, "-281"),
    (0.58145, 2, "0.58"),
    (1.0, 3, "1.00"),
    (0.0, 3, "0"),
])
def test_significant(value, digits, expected):
    assert significant(value, digits) == expected


def test_units_print_with_their_symbols():
    assert quantity(0.967, "ohm") == "0.967 Ω"
    assert quantity(1.18e-4, "g·cm2") == "1180 g·cm²"


def test_ratio_of_engineering_units():
    # 1 rad/s per N·m is 60/(2π) rpm per 1000 mN·m.
    assert ratio(1000.0, "rpm", "mN·m") == "9.55 rpm/mN·m"
