"""Candidates as projects: with the slots free and the commutator segments not, the segments keep the file's
segments per slot, so the fit rule's whole multiple holds for every slot count tried."""

from __future__ import annotations

import pytest

from pmdc_sizer.core import ProjectError, project, with_values
from pmdc_sizer.core.fit_rules import check_fit
from pmdc_sizer.core.sizing_candidates import SEGMENTS_KEY, SLOTS_KEY, fitting_designs, project_with, tied_values
from pmdc_sizer.core.sizing_space import from_unit, parse_free, sample_unit

from ..conftest import DEMO_FOLDER

CANDIDATES = 512


@pytest.fixture(scope="module")
def ferrite():
    return project.load(DEMO_FOLDER / "appliance_ferrite_12v.toml")  # 12 slots, 12 segments


def _fit_share(base, texts):
    free = tuple(parse_free(text, base) for text in texts)
    values = from_unit(free, sample_unit(len(free), CANDIDATES, 1))
    rows, designs = fitting_designs(base, free, values)
    return len(rows) / CANDIDATES, values, rows, designs


def test_freed_slots_carry_the_segments_per_slot_and_far_more_candidates_fit(ferrite):
    thickness = "magnets.thickness_mm=4:8"
    tied, values, rows, designs = _fit_share(ferrite, ("armature.slots=8:24", thickness))
    # the segments held at the file's 12 (a one-value range frees them, so they do not follow): only the
    # 12-slot candidates fit, one slot count in 17
    held, *_ = _fit_share(ferrite, ("armature.slots=8:24", f"{SEGMENTS_KEY}=12:12", thickness))
    assert held == pytest.approx(1 / 17, abs=0.02)
    assert tied > 5 * held  # about 0.53 against 0.06 at the time of writing
    for row, design in zip(rows, designs, strict=True):  # one segment per slot, as in the file
        assert design.winding.commutator_segments == values[SLOTS_KEY][row]


def test_a_validated_candidate_has_the_tied_segments_and_a_free_segment_count_is_left_alone(ferrite):
    two_per_slot = with_values(ferrite, {SEGMENTS_KEY: 24})
    candidate = project_with(two_per_slot, {SLOTS_KEY: 16})
    assert candidate.winding.commutator_segments == 32
    check_fit(candidate)
    assert tied_values(two_per_slot, {SLOTS_KEY: 16, SEGMENTS_KEY: 48})[SEGMENTS_KEY] == 48
    assert SEGMENTS_KEY not in tied_values(two_per_slot, {"magnets.thickness_mm": 5.0})


def test_segments_the_ratio_takes_past_the_schemas_limit_are_refused_by_name(ferrite):
    ten_per_slot = with_values(ferrite, {SLOTS_KEY: 8, SEGMENTS_KEY: 80})
    with pytest.raises(ProjectError, match=rf"{SEGMENTS_KEY}: 10 per slot on 30 slots makes 300.*3 to 240"):
        tied_values(ten_per_slot, {SLOTS_KEY: 30})
