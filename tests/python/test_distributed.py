"""elyblock.distributed on a LocalCluster of two worker processes on loopback."""
import warnings

import numpy as np
import pandas as pd
import pytest

import elyblock
import elyblock.distributed as ed
from elyblock import errors
from conftest import DEMO_PLANT, assert_same

distributed = pytest.importorskip("distributed")
OUTPUTS = ["cell.voltage", "product.hydrogen", "plant.power", "gas.h2_in_o2"]


@pytest.fixture(scope="module")
def client(tmp_path_factory):
    # Worker processes are spawned: they import this module under another name, never run the tests.
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", DeprecationWarning)  # tornado's make_current in distributed 2022.12
        cluster = distributed.LocalCluster(n_workers=2, threads_per_worker=1, processes=True, host="127.0.0.1",
                                           dashboard_address=None, local_directory=str(tmp_path_factory.mktemp("dask")))
        with cluster, distributed.Client(cluster) as c:
            yield c


def test_current_density_batch_is_identical_to_local_and_to_c(client, reference):
    rng = np.random.default_rng(11)
    j = rng.uniform(500.0, 2.5e4, 9000)
    temperature = rng.uniform(320.0, 355.0, 9000)
    inputs = {"in.current_density": j, "in.temperature": temperature}
    local = elyblock.Block(DEMO_PLANT).batch(inputs, OUTPUTS, with_status=True)
    spread = ed.batch(client, DEMO_PLANT, inputs, OUTPUTS, with_status=True, points_per_task=1000)
    assert list(spread) == list(local)
    for name in local:  # solved directly: bit for bit, in order
        np.testing.assert_array_equal(spread[name], local[name])
    reference.create(DEMO_PLANT)
    _, status, expected = reference.batch(inputs, OUTPUTS)
    np.testing.assert_array_equal(spread["status"], status)
    for name in OUTPUTS:
        assert_same(spread[name], expected[name])


def test_power_batch_equals_local_within_the_tolerance(client, reference):
    power = np.linspace(3e6, 2.4e7, 6000)
    spread = ed.batch(client, DEMO_PLANT.read_text(), {"in.power": power}, OUTPUTS, spec="power", points_per_task=1000)
    local = elyblock.Block(DEMO_PLANT).batch({"in.power": power}, OUTPUTS, spec="power")
    reference.create(DEMO_PLANT)
    reference.spec("power")
    _, _, expected = reference.batch({"in.power": power}, OUTPUTS)
    for name in OUTPUTS:
        assert_same(spread[name], local[name])
        assert_same(spread[name], expected[name])


def test_dataframe_and_grid_keep_their_form(client):
    frame = pd.DataFrame({"in.current_density": np.linspace(1e3, 2e4, 3000)},
                         index=pd.RangeIndex(3000)[::-1] * 7)
    spread = ed.batch(client, DEMO_PLANT, frame, ["cell.voltage"], points_per_task=1000)
    assert isinstance(spread, pd.DataFrame) and spread.index.equals(frame.index)
    pd.testing.assert_frame_equal(spread, elyblock.Block(DEMO_PLANT).batch(frame, ["cell.voltage"]))
    grid = {"current_density": np.linspace(1e3, 2e4, 50), "temperature": np.linspace(330, 350, 40)[:, None]}
    spread = ed.batch(client, DEMO_PLANT, grid, "cell.voltage", points_per_task=1000)
    np.testing.assert_array_equal(spread["cell.voltage"], elyblock.Block(DEMO_PLANT).batch(grid, "cell.voltage")["cell.voltage"])


def test_each_worker_loads_the_library_once_and_keeps_its_block(client):
    inputs = {"in.current_density": np.linspace(1e3, 2e4, 8000), "in.temperature": 341.0}
    ed.batch(client, DEMO_PLANT, inputs, ["cell.voltage"], points_per_task=1000)
    before = client.run(ed.worker_state)
    for _ in range(3):
        ed.batch(client, DEMO_PLANT, inputs, ["cell.voltage"], points_per_task=1000)
    after = client.run(ed.worker_state)
    assert len({s["pid"] for s in after.values()}) == 2
    assert all(s["library"] == elyblock.library_path for s in after.values())
    assert {w: s["blocks_created"] for w, s in after.items()} == {w: s["blocks_created"] for w, s in before.items()}


def test_errors_are_raised_before_anything_is_sent(client):
    with pytest.raises(errors.UnknownNameError, match="cell.nothing"):
        ed.batch(client, DEMO_PLANT, {"in.current_density": [1e4]}, ["cell.nothing"])
    with pytest.raises(errors.InvalidArgumentError, match="not an input"):
        ed.batch(client, DEMO_PLANT, {"cell.voltage": [1e4]}, ["cell.voltage"])
    with pytest.raises(errors.ConfigError, match="stack"):
        ed.batch(client, {"technology": "pem"}, {"in.current_density": [1e4]}, ["cell.voltage"])
    with pytest.raises(errors.InvalidArgumentError, match="unknown spec"):
        ed.batch(client, DEMO_PLANT, {"in.current_density": [1e4]}, ["cell.voltage"], spec="heat")


def test_failed_points_warn_like_a_local_batch(client):
    temperature = np.where(np.arange(4000) % 1000 == 999, 400.0, 340.0)
    with pytest.warns(errors.ElyWarning, match=r"4 of 4000 points failed .*task from point 0: .*point 999"):
        spread = ed.batch(client, DEMO_PLANT, {"in.temperature": temperature}, ["cell.voltage"], with_status=True,
                          points_per_task=1000)
    assert (spread["status"][temperature > 350] == errors.Status.OUT_OF_RANGE).all()
    assert np.isnan(spread["cell.voltage"][temperature > 350]).all()


def test_callable_cancels_the_rest(client):
    with pytest.raises(errors.CancelledError) as e:
        ed.batch(client, DEMO_PLANT, {"in.current_density": np.full(20000, 1e4)}, ["cell.voltage"],
                 with_status=True, points_per_task=1000, progress=lambda done, total: True)
    partial = e.value.result
    solved = partial["status"] >= 0
    assert 1000 <= solved.sum() < 20000
    assert (partial["status"][~solved] == errors.Status.CANCELLED).all() and np.isnan(partial["cell.voltage"][~solved]).all()


def yearly_hydrogen(result):
    return float(np.nansum(result["product.hydrogen"]) * 3600.0)


def test_batch_plants_one_batch_per_plant(client, demo_dict, reference, tmp_path):
    plants = []
    for rate in (0.0, 4e-6, 12e-6):
        plant = dict(demo_dict, plant=dict(demo_dict["plant"], degradation={"voltage_rate": rate}))
        plants.append(plant)
    power = np.full(2000, 1.5e7)
    hours = np.arange(2000.0) * 4
    inputs = {"in.power": power, "in.hours_operated": hours}
    totals = ed.batch_plants(client, plants, inputs, ["product.hydrogen"], spec="power", reduce=yearly_hydrogen)
    results = ed.batch_plants(client, plants, inputs, ["product.hydrogen", "cell.voltage"], spec="power")
    for plant, total, result in zip(plants, totals, results):
        reference.create(plant, tmp_path)
        reference.spec("power")
        _, _, expected = reference.batch(inputs, ["product.hydrogen", "cell.voltage"])
        assert_same(result["product.hydrogen"], expected["product.hydrogen"])
        assert_same(result["cell.voltage"], expected["cell.voltage"])
        assert_same(total, np.sum(expected["product.hydrogen"]) * 3600.0)
    voltages = [r["cell.voltage"][-1] for r in results]
    assert voltages[0] < voltages[1] < voltages[2]  # degradation raises the voltage


def test_batch_plants_names_the_failing_plant(client, demo_dict):
    bad = dict(demo_dict, stack=dict(demo_dict["stack"], cells=-3))
    with pytest.raises(errors.ConfigError, match="plant 1: .*stack.cells"):
        ed.batch_plants(client, [demo_dict, bad], {"in.current_density": [1e4]}, ["cell.voltage"])
