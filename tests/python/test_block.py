"""Block: creation, inputs and outputs by name, spec, solve, variables, report, errors, threads."""
import copy
import json
import math
import pathlib
import pickle
import threading
import warnings

import numpy as np
import pytest

import elyblock
from elyblock import errors
from conftest import DEMO_PLANT, MINIMAL, assert_same

OUTPUTS = ["cell.voltage", "cell.reversible_voltage", "cell.activation_anode", "cell.ohmic", "cell.faraday_efficiency",
           "stack.power", "plant.power", "product.hydrogen", "feed.water", "gas.h2_in_o2", "heat.duty",
           "perf.specific_energy_plant"]


@pytest.mark.parametrize("form", ["path", "str path", "text", "bytes", "dict"])
def test_plant_forms_give_the_same_block(form, demo_dict, reference):
    plant = {"path": DEMO_PLANT, "str path": str(DEMO_PLANT), "text": DEMO_PLANT.read_text(),
             "bytes": DEMO_PLANT.read_bytes(), "dict": demo_dict}[form]
    b = elyblock.Block(plant)
    assert b.solve() == elyblock.Status.OK
    assert reference.create(DEMO_PLANT) == 0 and reference.solve() == 0
    assert_same([b[o] for o in OUTPUTS], [reference.get(o) for o in OUTPUTS])
    assert json.loads(b.plant_text) == demo_dict


def test_solve_with_keywords_equals_the_c_interface(reference):
    b = elyblock.Block(DEMO_PLANT)
    assert b.solve(current_density=1.5e4, temperature=353.15, pressure_cathode=2e6) == elyblock.Status.OK
    reference.create(DEMO_PLANT)
    for name, value in (("in.current_density", 1.5e4), ("in.temperature", 353.15), ("in.pressure_cathode", 2e6)):
        assert reference.set(name, value) == 0
    assert reference.solve() == 0
    assert_same([b[o] for o in OUTPUTS], [reference.get(o) for o in OUTPUTS])
    assert b["in.temperature"] == 353.15 and b["in.current_density"] == 1.5e4
    assert b[["cell.voltage", "product.hydrogen"]] == {"cell.voltage": b["cell.voltage"],
                                                       "product.hydrogen": b["product.hydrogen"]}


def test_items_and_mappings_set_inputs(reference):
    b = elyblock.Block(DEMO_PLANT)
    b["in.temperature"] = 343.15
    b.solve({"in.current_density": 1e4}, hours_operated=20000)
    reference.create(DEMO_PLANT)
    reference.set("in.temperature", 343.15)
    reference.set("in.current_density", 1e4)
    reference.set("in.hours_operated", 20000)
    reference.solve()
    assert_same([b[o] for o in OUTPUTS + ["cell.degradation"]], [reference.get(o) for o in OUTPUTS + ["cell.degradation"]])


@pytest.mark.filterwarnings("ignore::elyblock.ElyWarning")
@pytest.mark.parametrize("technology", ["pem", "alkaline", "solid_oxide", "brine", "custom"])
def test_power_spec_equals_the_c_interface(technology, reference):
    plant = MINIMAL / f"{technology}.json"
    b = elyblock.Block(plant)
    reference.create(plant)
    reference.solve()
    power = 0.6 * reference.get("stack.power")
    status = b.solve(spec="power", power=power)
    assert reference.spec("power") == 0 and reference.set("in.power", power) == 0
    assert reference.solve() == status
    if b.spec is not None:
        assert b.spec == "power"
    names = [v.name for v in b.variables("output")]
    assert_same([b[o] for o in names], [reference.get(o) for o in names])
    assert_same(b["stack.power"], power)


def test_warning_status_and_message(reference):
    b = elyblock.Block(DEMO_PLANT)
    with pytest.warns(errors.ElyWarning, match="minimum load") as caught:
        status = b.solve(current_density=500.0)
    assert status == elyblock.Status.WARNING
    assert b.warning == str(caught[0].message)
    reference.create(DEMO_PLANT)
    reference.set("in.current_density", 500.0)
    assert reference.solve() == 1
    assert_same(b["cell.voltage"], reference.get("cell.voltage"))
    assert b["alarm.load_low"] == 1.0
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        assert b.solve(current_density=2e4) == elyblock.Status.OK
    assert b.warning == ""


def test_errors_carry_the_library_message_and_status(reference):
    b = elyblock.Block(DEMO_PLANT)
    reference.create(DEMO_PLANT)
    with pytest.raises(errors.WrongStateError) as e:
        b["cell.voltage"]
    assert e.value.status == errors.Status.WRONG_STATE and "not been solved" in e.value.message
    with pytest.raises(KeyError) as e:
        b["cell.nothing"]
    assert isinstance(e.value, errors.UnknownNameError) and str(e.value) == "unknown variable 'cell.nothing'"
    with pytest.raises(ValueError) as e:
        b["in.temperature"] = math.nan
    assert isinstance(e.value, errors.InvalidArgumentError) and "in.temperature" in str(e.value)
    with pytest.raises(errors.UnknownNameError, match="in.warmth"):
        b.solve(warmth=300.0)
    with pytest.raises(errors.InvalidArgumentError, match="unknown spec"):
        b.set_spec("heat")


def test_failed_solve_rolls_back(reference):
    b = elyblock.Block(DEMO_PLANT)
    b.solve(current_density=1.2e4)
    voltage = b["cell.voltage"]
    with pytest.raises(errors.OutOfRangeError) as e:
        b.solve(temperature=400.0)
    reference.create(DEMO_PLANT)
    reference.set("in.current_density", 1.2e4)
    reference.solve()
    reference.set("in.temperature", 400.0)
    status = reference.solve()
    assert e.value.status == status == errors.Status.OUT_OF_RANGE
    assert "400 K" in e.value.message
    assert b["in.temperature"] == reference.get("in.temperature") == 338.15
    assert b["cell.voltage"] == voltage


def test_infeasible_power():
    b = elyblock.Block(DEMO_PLANT)
    with pytest.raises(errors.InfeasibleError) as e:
        b.solve(spec="power", power=1e9)
    assert e.value.status == errors.Status.INFEASIBLE


def test_set_is_all_or_nothing():
    b = elyblock.Block(DEMO_PLANT)
    before = b[["in.temperature", "in.current_density"]]
    with pytest.raises(errors.InvalidArgumentError):
        b.set(temperature=350.0, current_density=math.inf)
    assert b[["in.temperature", "in.current_density"]] == before


def test_bad_plants():
    with pytest.raises(errors.ConfigError) as e:
        elyblock.Block({"technology": "pem", "stack": {"cells": 0, "active_area": 0.1}})
    assert e.value.status == errors.Status.CONFIG and "stack.cells" in e.value.message
    with pytest.raises(ValueError, match="technology"):
        elyblock.Block('{"technology": "steam engine"}')
    with pytest.raises(errors.ConfigError, match="NUL"):
        elyblock.Block('{"technology": "pem\u0000"}')
    with pytest.raises(errors.ConfigError):
        elyblock.Block({"technology": "pem", "stack": {"cells": math.nan, "active_area": 0.1}})
    with pytest.raises(OSError) as e:
        elyblock.Block(pathlib.Path("/nonexistent/plant.json"))
    assert isinstance(e.value, errors.FileError) and e.value.status == errors.Status.IO
    with pytest.raises(TypeError):
        elyblock.Block(42)


def test_variables_equal_the_c_interface(reference):
    for plant in (DEMO_PLANT, MINIMAL / "brine.json", MINIMAL / "custom.json"):
        b = elyblock.Block(plant)
        reference.create(plant)
        rows = reference.variables()
        table = b.variables()
        assert [v.name for v in table] == [r[0] for r in rows]
        causality = {0: "input", 1: "output", 2: "parameter"}
        assert [(v.unit, v.causality, v.description) for v in table] == \
            [(r[1], causality[int(r[2])], r[3]) for r in rows]
        if len(rows[0]) > 4:  # the library and header have the second version of the metadata
            for v, r in zip(table, rows):
                assert v.variability is not None and v.label == r[10] and v.display_unit == r[11]
                assert_same([v.min, v.max, v.start, v.nominal, v.display_scale, v.display_offset],
                            [float.fromhex(x) for x in (r[6], r[7], r[8], r[9], r[12], r[13])])
                assert (v.summary_group, v.summary_rank, v.config_key) == (r[14], int(r[15]), r[16])
        else:
            assert all(v.variability is None and v.min is None and v.label is None for v in table)
        assert b.names("input") == [v.name for v in table if v.causality == "input"]
        assert "cell.voltage" in b and "cell.nothing" not in b


def test_report_is_the_c_report(reference):
    b = elyblock.Block(DEMO_PLANT)
    b.solve(current_density=1.8e4)
    reference.create(DEMO_PLANT)
    reference.set("in.current_density", 1.8e4)
    reference.solve()
    assert b.report() == reference.report()
    assert b.report()["variables"]["cell.voltage"]["unit"] == "V"


def test_clone_is_independent():
    b = elyblock.Block(DEMO_PLANT)
    b.solve(current_density=1e4)
    c = b.clone()
    assert c["cell.voltage"] == b["cell.voltage"]
    c.solve(current_density=2e4)
    assert c["cell.voltage"] > b["cell.voltage"]
    d = copy.deepcopy(b)
    b.close()
    assert d["in.current_density"] == 1e4
    with pytest.raises(errors.WrongStateError, match="closed"):
        b["cell.voltage"]
    with elyblock.Block(DEMO_PLANT) as e:
        e.solve()
    assert "closed" in repr(e)


def test_block_does_not_pickle():
    with pytest.raises(TypeError, match="plant_text"):
        pickle.dumps(elyblock.Block(DEMO_PLANT))


def test_one_block_per_thread_and_a_shared_block(reference):
    """Each thread with its own clone gives the serial results; a Block shared by threads is
    serialized by its lock and still gives them."""
    b = elyblock.Block(DEMO_PLANT)
    j = np.linspace(1e3, 2.5e4, 4000)
    reference.create(DEMO_PLANT)
    _, _, expected = reference.batch({"in.current_density": j}, ["cell.voltage"])
    results = {}

    def work(key, block):
        for _ in range(5):
            results[key] = block.batch({"in.current_density": j}, ["cell.voltage"], progress=False)

    threads = [threading.Thread(target=work, args=(i, b.clone() if i < 4 else b)) for i in range(6)]
    for t in threads:
        t.start()
    for t in threads:
        t.join()
    for key in range(6):
        assert_same(results[key]["cell.voltage"], expected["cell.voltage"])
