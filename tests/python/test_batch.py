"""Block.batch: arrays and DataFrames in and out, point statuses, progress and cancellation."""
import os
import signal
import subprocess
import sys
import textwrap

import numpy as np
import pandas as pd
import pytest

import elyblock
from elyblock import errors
from conftest import DEMO_PLANT, MINIMAL, assert_same

OUTPUTS = ["cell.voltage", "cell.faraday_efficiency", "product.hydrogen", "plant.power", "gas.h2_in_o2", "heat.duty"]


def test_arrays_equal_the_c_batch(reference):
    rng = np.random.default_rng(7)
    j = rng.uniform(500.0, 2.5e4, 3000)
    temperature = rng.uniform(320.0, 360.0, 3000)
    b = elyblock.Block(DEMO_PLANT)
    result = b.batch({"in.current_density": j, "temperature": temperature}, OUTPUTS, with_status=True)
    reference.create(DEMO_PLANT)
    status, point_status, expected = reference.batch({"in.current_density": j, "in.temperature": temperature}, OUTPUTS)
    assert status == elyblock.Status.WARNING  # some points below the minimum load
    np.testing.assert_array_equal(result["status"], point_status)
    for name in OUTPUTS:
        assert result[name].shape == (3000,) and result[name].dtype == np.float64
        assert_same(result[name], expected[name])


def test_power_spec_batch_equals_the_c_batch(reference):
    power = np.linspace(3e6, 2.4e7, 2500)
    b = elyblock.Block(DEMO_PLANT)
    result = b.batch({"in.power": power}, OUTPUTS + ["stack.power"], spec="power", with_status=True)
    reference.create(DEMO_PLANT)
    reference.spec("power")
    _, point_status, expected = reference.batch({"in.power": power}, OUTPUTS + ["stack.power"])
    np.testing.assert_array_equal(result["status"], point_status)
    for name in OUTPUTS + ["stack.power"]:
        assert_same(result[name], expected[name])
    assert_same(result["stack.power"], power)


def test_broadcast_grid_keeps_its_shape(reference):
    j = np.linspace(2e3, 2e4, 7)
    temperature = np.array([[330.0], [340.0], [350.0]])
    b = elyblock.Block(DEMO_PLANT)
    result = b.batch({"in.current_density": j, "in.temperature": temperature, "in.pressure_cathode": 2e6},
                     ["cell.voltage"])
    assert result["cell.voltage"].shape == (3, 7)
    jj, tt = np.broadcast_arrays(j, temperature)
    reference.create(DEMO_PLANT)
    _, _, expected = reference.batch({"in.current_density": jj.ravel(), "in.temperature": tt.ravel(),
                                      "in.pressure_cathode": np.full(21, 2e6)}, ["cell.voltage"])
    assert_same(result["cell.voltage"], expected["cell.voltage"].reshape(3, 7))
    scalar = b.batch({"current_density": 1e4}, "cell.voltage")
    assert scalar["cell.voltage"].shape == ()


def test_dataframe_in_dataframe_out(reference):
    frame = pd.DataFrame({"in.current_density": [1e4, 2e4, 5e3, 2.2e4], "in.temperature": [340.0, 345.0, 350.0, 335.0]},
                         index=pd.Index(["d", "a", "c", "b"], name="case"))
    b = elyblock.Block(DEMO_PLANT)
    result = b.batch(frame, OUTPUTS, with_status=True)
    assert isinstance(result, pd.DataFrame)
    assert list(result.columns) == OUTPUTS + ["status"] and result.index.equals(frame.index)
    reference.create(DEMO_PLANT)
    _, point_status, expected = reference.batch({c: frame[c].to_numpy() for c in frame.columns}, OUTPUTS)
    np.testing.assert_array_equal(result["status"].to_numpy(), point_status)
    for name in OUTPUTS:
        assert_same(result[name].to_numpy(), expected[name])


def test_failed_points_are_nan_with_their_status(reference):
    temperature = np.array([330.0, 400.0, 340.0, 420.0, 350.0])
    b = elyblock.Block(DEMO_PLANT)
    with pytest.warns(errors.ElyWarning, match=r"2 of 5 points failed .*point 1: .*400 K"):
        result = b.batch({"in.temperature": temperature}, ["cell.voltage"], with_status=True)
    reference.create(DEMO_PLANT)
    status, point_status, expected = reference.batch({"in.temperature": temperature}, ["cell.voltage"])
    assert status == errors.Status.PARTIAL
    np.testing.assert_array_equal(result["status"], point_status)
    assert list(point_status[[1, 3]]) == [errors.Status.OUT_OF_RANGE] * 2
    assert_same(result["cell.voltage"], expected["cell.voltage"])
    assert np.isnan(result["cell.voltage"][[1, 3]]).all()


def test_batch_leaves_the_block_as_it_was():
    b = elyblock.Block(DEMO_PLANT)
    b.solve(current_density=1.1e4)
    before = b.report()
    spec = b.spec
    b.batch({"in.power": [5e6, 1e7]}, ["cell.voltage"], spec="power")
    b.batch({"in.current_density": [5e3, 2e4], "in.temperature": 330.0}, ["cell.voltage"])
    assert b.report() == before and b.spec == spec


def test_bad_batch_arguments():
    b = elyblock.Block(DEMO_PLANT)
    with pytest.raises(errors.InvalidArgumentError, match="'cell.voltage', which is not an input"):
        b.batch({"cell.voltage": [1.0]}, ["cell.voltage"])
    with pytest.raises(errors.UnknownNameError, match="cell.nothing"):
        b.batch({"in.current_density": [1.0]}, ["cell.nothing"])
    with pytest.raises(errors.InvalidArgumentError, match="given twice"):
        b.batch({"current_density": [1e4], "in.current_density": [2e4]}, ["cell.voltage"])
    with pytest.raises(errors.InvalidArgumentError, match="broadcast"):
        b.batch({"in.current_density": [1e4, 2e4], "in.temperature": [330.0, 340.0, 350.0]}, ["cell.voltage"])
    with pytest.raises(errors.InvalidArgumentError, match="no input"):
        b.batch({}, ["cell.voltage"])
    with pytest.raises(TypeError):
        b.batch([1e4, 2e4], ["cell.voltage"])
    empty = b.batch({"in.current_density": np.array([])}, ["cell.voltage"], with_status=True)
    assert empty["cell.voltage"].shape == (0,) and empty["status"].shape == (0,)


def test_progress_callable_sees_every_report():
    calls = []
    n = 5000
    elyblock.Block(DEMO_PLANT).batch({"in.current_density": np.full(n, 1e4)}, ["cell.voltage"],
                                     progress=lambda done, total: calls.append((done, total)))
    assert calls == [(1024, n), (2048, n), (3072, n), (4096, n), (n, n)]


def test_callable_cancels_after_n_points(reference):
    j = np.linspace(1e3, 2e4, 5000)
    b = elyblock.Block(DEMO_PLANT)
    with pytest.raises(errors.CancelledError) as e:
        b.batch({"in.current_density": j}, ["cell.voltage"], with_status=True, progress=lambda done, total: done >= 2048)
    assert e.value.status == errors.Status.CANCELLED
    partial = e.value.result
    reference.create(DEMO_PLANT)
    _, _, expected = reference.batch({"in.current_density": j[:2048]}, ["cell.voltage"])
    assert (partial["status"][:2048] >= 0).all() and (partial["status"][2048:] == errors.Status.CANCELLED).all()
    assert_same(partial["cell.voltage"][:2048], expected["cell.voltage"])
    assert np.isnan(partial["cell.voltage"][2048:]).all()


def test_exception_in_callable_cancels_and_propagates():
    def fail(done, total):
        raise ZeroDivisionError("from the callback")

    with pytest.raises(ZeroDivisionError, match="from the callback"):
        elyblock.Block(DEMO_PLANT).batch({"in.current_density": np.full(3000, 1e4)}, ["cell.voltage"], progress=fail)


def test_interrupt_inside_the_call_raises_keyboard_interrupt_after_it():
    """SIGINT while the library works (sent here from the progress callback, as Ctrl-C would
    arrive) cancels the batch through the callback and raises KeyboardInterrupt once it returned."""
    seen = []

    def interrupt(done, total):
        seen.append(done)
        if done == 1024:
            os.kill(os.getpid(), signal.SIGINT)

    b = elyblock.Block(DEMO_PLANT)
    for points in (200_000, 20_000):  # with the package's own SIGINT handler, and with Python's
        seen.clear()
        with pytest.raises(KeyboardInterrupt):
            b.batch({"in.current_density": np.full(points, 1e4)}, ["cell.voltage"], progress=interrupt)
        assert seen[-1] <= 2048  # stopped at the next progress call
        assert signal.getsignal(signal.SIGINT) is signal.default_int_handler
        assert b.solve(current_density=1e4) == elyblock.Status.OK  # the block is fine


def test_ctrl_c_from_outside_cancels_a_long_batch(tmp_path):
    """A real Ctrl-C (SIGINT from another process) during a long batch on the main thread."""
    script = tmp_path / "long_batch.py"
    script.write_text(textwrap.dedent(f"""
        import signal, sys
        import numpy as np
        import elyblock
        signal.signal(signal.SIGINT, signal.default_int_handler)
        b = elyblock.Block({str(DEMO_PLANT)!r})
        started = []
        def tell(done, total):
            if not started:
                started.append(done)
                print("running", flush=True)
        try:
            b.batch({{"in.power": np.linspace(3e6, 2.4e7, 400_000_000 // 8)}}, ["cell.voltage"], spec="power",
                    progress=tell)
        except KeyboardInterrupt:
            print("interrupted", flush=True)
            b.solve(current_density=1e4)
            print("usable", flush=True)
            sys.exit(3)
    """))
    child = subprocess.Popen([sys.executable, str(script)], stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True)
    try:
        assert child.stdout.readline().strip() == "running"
        child.send_signal(signal.SIGINT)
        out, err = child.communicate(timeout=60)
    finally:
        child.kill()
    assert child.returncode == 3, err
    assert out.split() == ["interrupted", "usable"]


def test_tqdm_bar_when_asked(capsys, monkeypatch):
    from elyblock import _progress
    bars = []

    def recording_bar(*args):
        bars.append(make_bar(*args))
        return bars[-1]

    make_bar = _progress._bar
    monkeypatch.setattr(_progress, "_bar", recording_bar)
    elyblock.Block(DEMO_PLANT).batch({"in.current_density": np.full(4096, 1e4)}, ["cell.voltage"], progress=True)
    assert len(bars) == 1 and bars[0].n == bars[0].total == 4096
    assert "batch" in capsys.readouterr().err


def test_no_bar_off_a_terminal(capsys):
    elyblock.Block(DEMO_PLANT).batch({"in.current_density": np.full(4096, 1e4)}, ["cell.voltage"])
    assert capsys.readouterr().err == ""


@pytest.mark.parametrize("technology", ["alkaline", "solid_oxide", "brine", "custom"])
def test_other_technologies_equal_the_c_batch(technology, reference):
    plant = MINIMAL / f"{technology}.json"
    b = elyblock.Block(plant)
    j = np.linspace(0.05, 1.0, 50) * b["param.current_density_max"]
    names = [n for n in b.names("output")]
    result = b.batch({"in.current_density": j}, names, with_status=True)
    reference.create(plant)
    _, point_status, expected = reference.batch({"in.current_density": j}, names)
    np.testing.assert_array_equal(result["status"], point_status)
    for name in names:
        assert_same(result[name], expected[name])


def single_solves(reference, plant, settings, spec, rows, outputs):
    """Each point solved on its own fresh C block: settings, spec, the row's inputs, solve."""
    statuses, values = [], []
    for row in rows:
        reference.create(plant)
        for name, value in settings.items():
            assert reference.set(name, value) == 0
        reference.spec(spec)
        status = min([reference.set(name, value) for name, value in row.items()])
        status = reference.solve() if status >= 0 else status
        statuses.append(status)
        values.append([reference.get(o) if status >= 0 else np.nan for o in outputs])
    return np.array(statuses), np.array(values)


@pytest.mark.filterwarnings("ignore::elyblock.ElyWarning")
def test_points_after_a_failure_keep_the_blocks_inputs_and_spec(reference):
    """A failed point does not take the later points back to the inputs and spec of the block's
    last successful solve: they run at the inputs and spec the batch started from."""
    b = elyblock.Block(DEMO_PLANT)
    b.solve()
    b["in.temperature"] = 352.0
    b.set_spec("power")
    power = [1e12, 1e7, 1.5e7, 2e12, 5e6]
    result = b.batch({"in.power": power}, ["cell.voltage", "in.temperature", "stack.power"], with_status=True)
    statuses, values = single_solves(reference, DEMO_PLANT, {"in.temperature": 352.0}, "power",
                                     [{"in.power": p} for p in power], ["cell.voltage", "in.temperature", "stack.power"])
    np.testing.assert_array_equal(result["status"], statuses)
    assert list(statuses[[0, 3]]) == [errors.Status.INFEASIBLE] * 2 and (statuses[[1, 2, 4]] >= 0).all()
    for o, name in enumerate(["cell.voltage", "in.temperature", "stack.power"]):
        assert_same(result[name], values[:, o])
    # the same through the spec argument, from a freshly created block
    again = elyblock.Block(DEMO_PLANT)
    again["in.temperature"] = 352.0
    result = again.batch({"in.power": power}, ["cell.voltage"], spec="power", with_status=True)
    np.testing.assert_array_equal(result["status"], statuses)
    assert_same(result["cell.voltage"], values[:, 0])


def test_c_batch_keeps_the_inputs_set_before_it(reference):
    """The library's own batch (through the C reference, no package in between): a failed point
    returns the working copy to the block's state at the start of the batch, so the next point
    runs at the temperature set before it, never solved."""
    reference.create(DEMO_PLANT)
    reference.set("in.temperature", 352.0)
    _, status, values = reference.batch({"in.current_density": [1e6, 1e4]}, ["in.temperature"])  # 100 A/cm2 fails
    assert status[0] < 0 and values["in.temperature"][1] == 352.0
