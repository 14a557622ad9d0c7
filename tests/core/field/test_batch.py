"""Many solutions on a local dask.distributed cluster of two worker processes."""

from __future__ import annotations

import dataclasses

from pmdc_sizer.core.field import BatchItem, FieldOptions, no_load_case, solve_case, solve_many

TINY = FieldOptions(mesh_fineness=0.3)


def test_batch_on_two_worker_processes_reports_each_and_survives_a_bad_design(ferrite):
    case = no_load_case(23.0)
    bad = dataclasses.replace(ferrite, geometry=dataclasses.replace(ferrite.geometry, tooth_width=5e-3))
    thinner = dataclasses.replace(ferrite, geometry=dataclasses.replace(ferrite.geometry, housing_wall=3e-3))
    items = [BatchItem("demo", ferrite, case), BatchItem("too wide teeth", bad, case),
             BatchItem("thin wall", thinner, case)]
    seen = []
    outcomes = solve_many(items, workers=2, progress=lambda done, total, o: seen.append((done, total, o.label)),
                          options=TINY)
    assert [o.label for o in outcomes] == ["demo", "too wide teeth", "thin wall"]
    assert sorted(d for d, _, _ in seen) == [1, 2, 3] and all(t == 3 for _, t, _ in seen)
    assert outcomes[0].ok and outcomes[2].ok and not outcomes[1].ok
    assert outcomes[1].error_type == "FieldInputError" and "armature.tooth_width_mm" in outcomes[1].error
    local = solve_case(ferrite, case, TINY)
    assert outcomes[0].solution.flux_per_pole_Wb_per_m == local.flux_per_pole_Wb_per_m
    assert outcomes[2].solution.flux_per_pole_Wb_per_m < local.flux_per_pole_Wb_per_m


def test_an_empty_batch_starts_nothing():
    assert solve_many([]) == []
