"""The worksheet functions' Python implementation (adapters/spreadsheet/calc/elyblock_sheet.py),
without LibreOffice: plants from ranges, inputs, units, errors, the block cache, and every
number against the C interface (expected.py: the C reference program and python3-pint).

Environment (set by CTest): PYTHONPATH with the build's elyblock package and the add-in's folder,
ELYBLOCK_REFERENCE (tests/python/reference.c built), ELYBLOCK_TEST_LIBRARY (libelyblock.so.1),
ELYBLOCK_SOURCE_DIR.
"""
import json
import math
import os
import sys
import time

import pytest

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import elyblock_sheet as sheet  # noqa: E402
import expected  # noqa: E402

SOURCE = os.environ.get("ELYBLOCK_SOURCE_DIR", os.path.join(os.path.dirname(__file__), "..", ".."))
DEMO = os.path.abspath(os.path.join(SOURCE, "examples", "demo-plant.json"))


def flatten(tree, prefix=""):
    for key, value in tree.items():
        if isinstance(value, dict):
            yield from flatten(value, prefix + key + ".")
        else:
            yield (prefix + key, value)


with open(DEMO, encoding="utf-8") as _f:
    DEMO_TREE = json.load(_f)
DEMO_ROWS = tuple(tuple(row) for row in flatten(DEMO_TREE))


@pytest.fixture(scope="module")
def evaluator():
    reference = expected.Reference(os.environ["ELYBLOCK_REFERENCE"])
    yield expected.Evaluator(reference, expected.Direct(os.environ["ELYBLOCK_TEST_LIBRARY"]))
    reference.close()


@pytest.fixture
def functions():
    f = sheet.Functions()
    yield f
    f.cache.clear()


def failure(functions, name, args, base_dir=None):
    with pytest.raises(sheet.Failure) as e:
        functions.call(name, args, base_dir)
    return e.value


# ---- plants from ranges ----------------------------------------------------------------------------
def test_range_gives_the_plant_description():
    assert json.loads(sheet.plant_json(DEMO_ROWS)) == DEMO_TREE


def test_range_values():
    rows = (("technology", "pem"), ("stack.cells", 100.0), ("stack.active_area", 0.1), ("#", "a comment row"),
            ("", None), ("plant.drag_water_returned", "FALSE"), ("operating.spec", "current_density"),
            ("x.list", "[1, 2]"), ("x.text", 'say "1 bar"'), ("x.flag", True), ("x.tiny", 1e-7 / 3))
    tree = json.loads(sheet.plant_json(rows))
    assert tree["stack"] == {"cells": 100, "active_area": 0.1}
    assert isinstance(tree["stack"]["cells"], int)  # a count is written without ".0"
    assert tree["plant"]["drag_water_returned"] is False and tree["x"]["flag"] is True
    assert tree["x"]["list"] == [1, 2] and tree["x"]["text"] == 'say "1 bar"'
    assert tree["x"]["tiny"] == 1e-7 / 3  # numbers round-trip exactly
    assert "#" not in tree


@pytest.mark.parametrize("rows, message", [
    ((("stack.cells", 1), ("stack.cells", 2)), "rows 1 and 2: the key 'stack.cells' is given twice"),
    ((("stack.cells", None),), "row 1: the key 'stack.cells' has no value"),
    ((("stack", 1), ("stack.cells", 2)), "row 2: 'stack' has a value, so 'stack.cells' cannot be under it"),
    ((("stack.cells", 2), ("stack", 1)), "row 2: 'stack' holds keys below it, so it cannot have a value"),
    (((3.0, "x"),), "row 1: the key is the number 3, not a text"),
    ((("stack..cells", 1),), "row 1: the key 'stack..cells' has an empty part"),
    ((("", "80 degC"),), "row 1: a value without a key"),
    ((("stack.cells", math.inf),), "row 1: the value of 'stack.cells' is not a finite number"),
])
def test_range_errors(rows, message):
    with pytest.raises(sheet.Failure) as e:
        sheet.plant_json(rows)
    assert e.value.message == "plant range, " + message


def test_plant_argument_errors(functions, tmp_path):
    assert failure(functions, "ELYSOLVE", [None, "cell.voltage"]).message.startswith("plant: empty")
    assert "has two columns" in failure(functions, "ELYSOLVE", [(("a", "b", "c"),), "cell.voltage"]).message
    assert "relative path" in failure(functions, "ELYSOLVE", ["plant.json", "cell.voltage"]).message
    missing = failure(functions, "ELYSOLVE", ["nowhere.json", "cell.voltage"], str(tmp_path))
    assert missing.kind == "value" and str(tmp_path / "nowhere.json") in missing.message  # the library's message
    bad = failure(functions, "ELYSOLVE", [(("technology", "pem"), ("stack.cells", -3)), "cell.voltage"])
    assert bad.kind == "value" and "$.stack" in bad.message  # the library names the JSON path


# ---- the functions against the C interface ------------------------------------------------------------
POINTS = [
    ("cell.voltage",),
    ("product.hydrogen [kg/h]", "in.power", "15 MW"),
    ("perf.specific_energy [kWh/kg]", "in.power [MW]", 12.5),
    ("feed.water", "power", 9e6),  # a keyword: in.power
    ("cell.voltage", "in.current_density", "1.2 A/cm2", "in.temperature", "70 degC", "in.pressure_cathode [bar]", 20),
    ("stream.cathode.temperature [degC]", "in.temperature [degC]", 60),
    ("gas.h2_in_o2 [%]", "spec", "hydrogen_rate", "in.hydrogen_rate [kg/h]", 200),
    ("cell.voltage", "in.current_density", 15000, "param.cell.contact_resistance", "0.2 ohm cm2"),
    ("plant.power [MW]", "in.current", "100 kA"),
]


@pytest.mark.parametrize("point", POINTS, ids=[" ".join(map(str, p)) for p in POINTS])
def test_solve_equals_the_c_interface(functions, evaluator, point):
    output, pairs = point[0], list(point[1:])
    want = evaluator.call("ELYSOLVE", [DEMO, output, *pairs])
    assert want.kind == "value", want
    for plant in (DEMO_ROWS, DEMO):
        got = functions.call("ELYSOLVE", [plant, output, *pairs])
        assert expected.close(got, want.value), (plant is DEMO, got, want.value)


def test_outputs_keep_the_shape_of_their_names(functions, evaluator):
    names = (("cell.voltage", None, "product.hydrogen [kg/h]"), ("heat.duty [kW]", "perf.efficiency_lhv [%]", ""))
    got = functions.call("ELYOUTPUTS", [DEMO_ROWS, names, "in.power", "18 MW"])
    want = evaluator.call("ELYOUTPUTS", [DEMO, [list(r) for r in names], "in.power", "18 MW"])
    assert len(got) == 2 and all(len(r) == 3 for r in got)
    assert got[0][1] == "" and got[1][2] == ""
    for g_row, w_row in zip(got, want.value):
        for g, w in zip(g_row, w_row):
            assert g == w if isinstance(w, str) else expected.close(g, w)
    column = functions.call("ELYOUTPUTS", [DEMO_ROWS, (("cell.voltage",), ("cell.ohmic",))])
    assert [len(r) for r in column] == [1, 1]


def test_variables_equal_the_c_interface(functions, evaluator):
    assert functions.call("ELYVARIABLES", [DEMO_ROWS]) == evaluator.call("ELYVARIABLES", [DEMO]).value
    inputs = functions.call("ELYVARIABLES", [DEMO, "input"])
    assert inputs == evaluator.call("ELYVARIABLES", [DEMO, "input"]).value and len(inputs) > 5
    assert "none of input, output, parameter" in failure(functions, "ELYVARIABLES", [DEMO, "outputs"]).message


def test_version(functions, evaluator):
    assert functions.call("ELYVERSION", []) == evaluator.direct.version()


# ---- errors and messages ----------------------------------------------------------------------------
def test_model_refusals_are_num_errors_with_the_library_message(functions, evaluator):
    args = [DEMO_ROWS, "product.hydrogen", "in.power", "40 MW"]
    f = failure(functions, "ELYSOLVE", args)
    want = evaluator.call("ELYSOLVE", [DEMO, *args[1:]])
    assert f.kind == "num" == want.value and f.message == want.message
    assert functions.message("ELYSOLVE", args) == want.message


def test_wrong_arguments_are_value_errors(functions, evaluator):
    unknown = failure(functions, "ELYSOLVE", [DEMO_ROWS, "product.hydrogen", "in.powr", 1])
    want = evaluator.call("ELYSOLVE", [DEMO, "product.hydrogen", "in.powr", 1])
    assert unknown.kind == "value" and unknown.message == want.message == "unknown variable 'in.powr'"
    assert failure(functions, "ELYSOLVE", [DEMO_ROWS, "product.hydrogn"]).message == "unknown variable 'product.hydrogn'"
    cases = [
        ([DEMO_ROWS, "cell.voltage", "in.power"], "inputs come in pairs of name and value; the last name, 'in.power', has no value"),
        ([DEMO_ROWS, "cell.voltage", "in.power", "1 MW", "in.current_density", 2e4],
         'in.power and in.current_density are the drive inputs of different specs: set one, or choose the spec '
         'with the pair "spec"; "<name>"'),
        ([DEMO_ROWS, "cell.voltage", "in.power", None], "in.power: no value (an empty cell)"),
        ([DEMO_ROWS, "cell.voltage", "in.power", math.nan], "in.power: the value is not a finite number"),
        ([DEMO_ROWS, None], "variable: empty"),
        ([DEMO_ROWS, 3.0], "variable: expected a text, got the number 3"),
        ([DEMO_ROWS, "cell.voltage [kg]"], None),  # the library: dimensions differ
        ([DEMO_ROWS, "cell.voltage", "in.temperature", "80 C"], None),  # the library: did you mean degC?
        ([DEMO_ROWS, "cell.voltage", "in.temperature", -5], None),  # the library: below the limit
        ([DEMO_ROWS, "cell.voltage", "spec", "speed"], None),
    ]
    for args, message in cases:
        f = failure(functions, "ELYSOLVE", args)
        assert f.kind == "value", (args, f.message)
        if message is not None:
            assert f.message == message
        assert functions.message("ELYSOLVE", args) == f.message
    assert "C" in functions.message("SOLVE", [DEMO_ROWS, "cell.voltage", "in.temperature", "80 C"])
    assert "2 or more arguments expected, got 1" in failure(functions, "ELYSOLVE", [DEMO_ROWS]).message
    assert "no elyblock function 'ELYSOLV'" in functions.message("ELYSOLV", [])


def test_message_of_a_warning_is_the_library_alarm_text(functions, evaluator):
    args = [DEMO_ROWS, "product.hydrogen", "in.power", "1.5 MW"]
    value = functions.call("ELYSOLVE", args)
    want = evaluator.call("ELYSOLVE", [DEMO, *args[1:]])
    assert expected.close(value, want.value) and want.warning.startswith("solved with alarms")
    assert functions.message("ELYSOLVE", args) == want.warning
    assert functions.message("elysolve", [DEMO_ROWS, "product.hydrogen", "in.power", "15 MW"]) == ""


# ---- the block cache ------------------------------------------------------------------------------------
def test_a_plant_is_parsed_once_for_many_cells(functions):
    for k in range(2000):
        functions.call("ELYSOLVE", [DEMO_ROWS, "product.hydrogen", "in.power", 1e6 * (5 + k % 20)])
    assert functions.cache.creations == 1
    changed = tuple(("stack.stacks", 8) if key == "stack.stacks" else (key, value) for key, value in DEMO_ROWS)
    functions.call("ELYSOLVE", [changed, "product.hydrogen"])
    functions.call("ELYSOLVE", [DEMO_ROWS, "product.hydrogen"])
    assert functions.cache.creations == 2


def test_results_do_not_depend_on_the_order_of_recalculation(functions):
    a = [DEMO_ROWS, "cell.voltage", "in.power", "20 MW"]
    b = [DEMO_ROWS, "cell.voltage", "in.power", "5 MW"]
    first = functions.call("ELYSOLVE", a)
    functions.call("ELYSOLVE", b)
    assert functions.call("ELYSOLVE", a) == first  # bit for bit: every call solves a fresh clone
    fresh = sheet.Functions()
    assert fresh.call("ELYSOLVE", b) == functions.call("ELYSOLVE", b)
    fresh.cache.clear()


def test_an_edited_plant_file_is_read_again(functions, tmp_path):
    path = tmp_path / "plant.json"
    path.write_text(json.dumps(DEMO_TREE))
    before = functions.call("ELYSOLVE", ["plant.json", "product.hydrogen"], str(tmp_path))
    assert functions.call("ELYSOLVE", [str(path), "product.hydrogen"]) == before
    tree = json.loads(json.dumps(DEMO_TREE))
    tree["stack"]["stacks"] = 5
    path.write_text(json.dumps(tree))
    os.utime(path, ns=(time.time_ns(), time.time_ns() + 10**9))
    after = functions.call("ELYSOLVE", [str(path), "product.hydrogen"])
    assert after == pytest.approx(before / 2, rel=1e-12)
    assert functions.cache.creations == 2


def test_the_least_recently_used_plant_is_freed(functions):
    functions.cache.capacity = 3
    plants = [tuple(("stack.stacks", n) if k == "stack.stacks" else (k, v) for k, v in DEMO_ROWS) for n in (1, 2, 3, 4)]
    for p in plants:
        functions.call("ELYSOLVE", [p, "product.hydrogen"])
    assert functions.cache.creations == 4 and len(functions.cache._blocks) == 3
    functions.call("ELYSOLVE", [plants[3], "product.hydrogen"])
    functions.call("ELYSOLVE", [plants[0], "product.hydrogen"])  # freed before: parsed again
    assert functions.cache.creations == 5


# ---- profiles (ely_block_simulate) ------------------------------------------------------------------------
def has_profiles():
    return hasattr(sheet.library()._capi.lib, "ely_block_simulate")


# An invented two-day profile for the demo (not measured data): hourly power in MW with a lull below
# the minimum load, and the ambient temperature; the last row ends the run.
PROFILE_HOURS = list(range(49))
PROFILE_MW = [18, 20, 22, 24, 24, 22, 19, 15, 11, 8, 5, 2.5, 1.5, 1, 1.2, 3, 6, 10, 14, 17, 20, 23, 25, 24] * 2 + [20]
PROFILE = (("time [h]", "power [MW]", "in.ambient_temperature [degC]"),) + tuple(
    (float(h), float(p), 10.0 + 8.0 * math.sin(math.pi * (h % 24 - 8) / 12)) for h, p in zip(PROFILE_HOURS, PROFILE_MW))
OUTPUTS = (("product.hydrogen [kg/h]", "stack.temperature [degC]", None, "state.mode"),)
needs_profiles = pytest.mark.skipif("not has_profiles()", reason="the library has no ely_block_simulate")


@needs_profiles
@pytest.mark.parametrize("pairs", [[], ["in.mode_request", 3]], ids=["production", "automatic standby"])
def test_profile_and_summary_equal_the_c_interface(functions, evaluator, pairs):
    got = functions.call("ELYPROFILE", [DEMO_ROWS, PROFILE, OUTPUTS, *pairs])
    want = evaluator.call("ELYPROFILE", [DEMO, [list(r) for r in PROFILE], [list(r) for r in OUTPUTS], *pairs])
    assert want.kind == "value" and len(got) == len(PROFILE) - 1 and all(len(r) == 4 for r in got)
    for g_row, w_row in zip(got, want.value):
        assert g_row[2] == ""
        assert all(expected.close(g, w) for g, w in zip(g_row[:2] + g_row[3:], w_row[:2] + w_row[2:]))
    table = functions.call("ELYSUMMARY", [DEMO_ROWS, PROFILE, "", *pairs])
    want = evaluator.call("ELYSUMMARY", [DEMO, [list(r) for r in PROFILE], [[""]], *pairs])
    assert table[0] == ["figure", "value", "unit", "label"] and len(table) == len(want.value) > 10
    for g_row, w_row in zip(table, want.value):
        assert g_row[0] == w_row[0] and g_row[2:] == w_row[2:]
        assert g_row[1] == w_row[1] if isinstance(w_row[1], str) else expected.close(g_row[1], w_row[1])
    figures = (("hydrogen [t]", "energy_ac [MWh]", "specific_energy_ac [kWh/kg]", "water [kg]", "full_load_hours",
                "starts"),)
    got = functions.call("ELYSUMMARY", [DEMO, PROFILE, figures, *pairs])
    want = evaluator.call("ELYSUMMARY", [DEMO, [list(r) for r in PROFILE], [list(r) for r in figures], *pairs])
    assert all(expected.close(g, w) for g, w in zip(got[0], want.value[0])) and len(got[0]) == 6
    if pairs:  # the lull below the minimum load: the plant stands by and starts again, once a day
        assert got[0][5] == 2 and any(row[3] == 1 for row in functions.call("ELYPROFILE", [DEMO, PROFILE, OUTPUTS, *pairs]))
    else:
        assert got[0][5] == 0


@needs_profiles
def test_summary_hydrogen_is_the_integral_of_the_rows(functions):
    """The run summary's hydrogen against the trapezoidal integral of the hydrogen rate over the
    rows (a sum the functions do not make), with the profile's hours given minute by minute: rows
    that repeat the inputs leave the run as it was, and the rates between them follow the ramps."""
    minutes = [PROFILE[0]] + [(h + m / 60.0,) + PROFILE[1 + h][1:] for h in range(48) for m in range(60)] + [PROFILE[-1]]
    minutes = tuple(minutes)
    rates = [row[0] for row in functions.call("ELYPROFILE", [DEMO_ROWS, minutes, (("product.hydrogen [kg/h]",),)])]
    times = [row[0] for row in minutes[1:]]
    made = functions.call("ELYSUMMARY", [DEMO_ROWS, minutes, "hydrogen [kg]"])[0][0]
    integral = sum((a + b) / 2 * (t1 - t0) for a, b, t0, t1 in zip(rates, rates[1:], times, times[1:]))
    assert made == pytest.approx(integral, rel=2e-4)
    assert functions.call("ELYSUMMARY", [DEMO_ROWS, PROFILE, "hydrogen [kg]"])[0][0] == pytest.approx(made, rel=1e-9)
    duration = functions.call("ELYSUMMARY", [DEMO_ROWS, PROFILE, "duration [h]"])[0][0]
    assert duration == pytest.approx(48.0, rel=1e-15)


@needs_profiles
def test_summary_cells_share_one_run(functions):
    for figure in ("hydrogen", "water", "starts", "energy_dc"):
        functions.call("ELYSUMMARY", [DEMO_ROWS, PROFILE, figure])
    assert len(functions._runs) == 1
    functions.call("ELYSUMMARY", [DEMO_ROWS, PROFILE, "hydrogen", "in.mode_request", 3])
    assert len(functions._runs) == 2


@needs_profiles
def test_a_run_that_stops_gives_num_errors_after_its_last_good_row(functions, evaluator):
    broken = PROFILE[:4] + ((3.0, -1.0, 10.0),) + PROFILE[5:]
    rows = functions.call("ELYPROFILE", [DEMO_ROWS, broken, OUTPUTS])
    assert all(math.isfinite(r[0]) for r in rows[:3]) and all(math.isnan(r[0]) for r in rows[3:])
    message = functions.message("ELYPROFILE", [DEMO_ROWS, broken, OUTPUTS])
    want = evaluator.call("ELYPROFILE", [DEMO, [list(r) for r in broken], [list(r) for r in OUTPUTS]])
    assert message == want.warning and "the run stopped at row 3" in message and "in.power" in message
    # A power below zero is a wrong input (#VALUE!), as in ELYSOLVE; the summary of a run cut short is an error.
    f = failure(functions, "ELYSUMMARY", [DEMO_ROWS, broken, "hydrogen"])
    assert f.kind == "value" and f.message == message
    assert evaluator.call("ELYSUMMARY", [DEMO, [list(r) for r in broken], [["hydrogen"]]]).message == message
    first = failure(functions, "ELYPROFILE", [DEMO_ROWS, ((PROFILE[0]), (0.0, -1.0, 10.0)), OUTPUTS])
    assert first.kind == "value" and "in.power" in first.message
    # Coolant at 200 degC: the stack heats beyond the cell model's range, which refuses the row (#NUM!).
    refused = ((PROFILE[0] + ("in.coolant_temperature [degC]",),) +
               tuple(row + (200.0 if 2 <= k <= 3 else 20.0,) for k, row in enumerate(PROFILE[1:])))
    f = failure(functions, "ELYSUMMARY", [DEMO_ROWS, refused, "hydrogen"])
    want = evaluator.call("ELYSUMMARY", [DEMO, [list(r) for r in refused], [["hydrogen"]]])
    assert f.kind == want.value == "num" and f.message == want.message and "stack temperature" in f.message


@needs_profiles
def test_profile_errors_name_the_problem(functions):
    header = PROFILE[0]
    cases = [
        ((header,), 'profile: a header row ("time [h]", "power [MW]", ...) and at least one row of values are needed'),
        ((("power [MW]", "time [h]"), (1.0, 0.0)),
         "profile: the first column is 'power [MW]'; it must be the time, e.g. \"time [h]\""),
        ((("time [h]",), (0.0,)), "profile: no input column after the time"),
        ((("time [h]", 5.0), (0.0, 1.0)), 'profile, column 2: the header 5.0 is not a column name such as "time [h]" or "power [MW]"'),
        ((("time [h]", "cell.voltage"), (0.0, 1.0)),
         "profile: column 'cell.voltage' is cell.voltage, an output; the columns after the time are inputs"),
        ((("time [h]", "power [MW]", "in.power"), (0.0, 1.0, 1.0)),
         "profile: column 'in.power' gives in.power a second time"),
        ((("time [h]", "power [MW]"), (1.0, 5.0), (0.0, 5.0)),
         "profile, row 3, column 'time [h]': the time goes back (rows are in time order)"),
        ((("time [h]", "power [MW]"), (0.0, None)), "profile, row 2, column 'power [MW]': no value (an empty cell)"),
        ((("time [h]", "power [MW]", "current"), (0.0, 5.0, 1e4)),
         'in.power and in.current are the drive inputs of different specs: set one, or choose the spec with the '
         'pair "spec"; "<name>"'),
        ((("time [kg]", "power [MW]"), (0.0, 5.0)), None),  # the library: not a time unit
        ((("time [h]", "pwr [MW]"), (0.0, 5.0)), "unknown variable 'in.pwr'"),
    ]
    for profile, message in cases:
        f = failure(functions, "ELYSUMMARY", [DEMO_ROWS, profile, ""])
        assert f.kind == "value", (profile, f.message)
        if message is not None:
            assert f.message == message
        assert functions.message("ELYSUMMARY", [DEMO_ROWS, profile, ""]) == f.message
    both = failure(functions, "ELYSUMMARY", [DEMO_ROWS, PROFILE, "", "in.ambient_temperature", "5 degC"])
    assert both.message == ("in.ambient_temperature is a column of the profile ('in.ambient_temperature [degC]') "
                            "and an input pair: give it once")
    assert "no figure 'hydrogn'" in failure(functions, "ELYSUMMARY", [DEMO_ROWS, PROFILE, "hydrogn"]).message
    assert "has no value for this run" in failure(functions, "ELYSUMMARY", [DEMO_ROWS, PROFILE, "first_trip_time"]).message
    assert "a row or a column" in failure(functions, "ELYPROFILE", [DEMO_ROWS, PROFILE, (("a", "b"), ("c", "d"))]).message
    # Trailing empty rows of a longer range are no rows of the profile.
    padded = PROFILE + ((None, None, None), ("", None, ""))
    assert functions.call("ELYPROFILE", [DEMO_ROWS, padded, OUTPUTS]) == functions.call("ELYPROFILE", [DEMO_ROWS, PROFILE, OUTPUTS])
