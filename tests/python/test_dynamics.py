"""The block in time from Python: reset, advance, time, save/restore, simulate and the run summary,
every number compared with the C interface (reference.c) for the same calls: bit for bit."""
import os
import signal
import warnings

import numpy as np
import pandas as pd
import pytest

import elyblock
from elyblock import errors
from conftest import DEMO_PLANT, MINIMAL, SOURCE_DIR

YEAR = SOURCE_DIR / "examples" / "profiles" / "windsolar-year.csv"
OUTPUTS = ["stack.temperature", "gas.h2_in_o2", "cell.current_density", "product.hydrogen", "heat.released",
           "heat.to_coolant", "heat.loss", "state.mode", "state.hours_operated", "plant.power"]


def assert_identical(actual, expected):
    """Bit for bit, NaN where the C interface has NaN."""
    a, e = np.asarray(actual, dtype=float), np.asarray(expected, dtype=float)
    assert a.shape == e.shape
    same = (a == e) | (np.isnan(a) & np.isnan(e))
    assert same.all(), f"differ at {np.flatnonzero(~same)[:5]}: {a[~same][:3]} against {e[~same][:3]}"


def steps():
    """Two hours of a controller's steps: a load step, a drop to low load, a standby and back."""
    return [(1.0, {"in.current_density": 1.5e4}), (600.0, {}), (1.0, {"in.current_density": 3e3}), (1800.0, {}),
            (0.0, {"in.mode_request": 1}), (900.0, {}), (0.0, {"in.mode_request": 2, "in.current_density": 2e4}),
            (3600.0, {})]


def test_reset_and_advance_give_the_numbers_of_c(reference):
    b = elyblock.Block(DEMO_PLANT)
    reference.create(DEMO_PLANT)
    b["in.temperature"] = 330.0
    reference.set("in.temperature", 330.0)
    assert b.reset(100.0) == reference.reset(100.0)
    assert b.time == reference.time() == 100.0
    assert_identical(list(b[OUTPUTS].values()), list(reference.values(OUTPUTS).values()))
    for step, inputs in steps():
        with warnings.catch_warnings():
            warnings.simplefilter("ignore", elyblock.ElyWarning)
            status = b.advance(step, inputs)
        for name, value in inputs.items():
            reference.set(name, value)
        assert status == reference.advance(step)
        assert b.time == reference.time()
        assert_identical(list(b[OUTPUTS].values()), list(reference.values(OUTPUTS).values()))
    assert b.time == 100.0 + sum(s for s, _ in steps())
    assert b["state.mode"] == 2.0


def test_advance_warns_with_the_alarm_and_keywords_set_inputs():
    b = elyblock.Block(DEMO_PLANT)
    b.reset()
    with pytest.warns(elyblock.ElyWarning, match="H2|hydrogen"):  # a long time at low load: H2 in O2 rises
        assert b.advance(4 * 3600, current_density=2.5e3) == elyblock.Status.WARNING
    assert b["in.current_density"] == 2.5e3 and b.warning


def test_reset_takes_a_spec_and_inputs(reference):
    b = elyblock.Block(DEMO_PLANT)
    b.reset(30.0, spec="power", power=12e6, ambient_temperature=280.0)
    assert b.spec == "power" and b.time == 30.0
    assert b["in.power"] == 12e6 and b["in.ambient_temperature"] == 280.0
    assert b["stack.power"] == pytest.approx(12e6, rel=1e-9)  # started at its setpoint
    reference.create(DEMO_PLANT)
    reference.spec("power")
    reference.set("in.power", 12e6)
    reference.set("in.ambient_temperature", 280.0)
    reference.reset(30.0)
    assert_identical(list(b[OUTPUTS].values()), list(reference.values(OUTPUTS).values()))


def test_time_and_summary_before_a_reset_are_wrong_state():
    b = elyblock.Block(DEMO_PLANT)
    with pytest.raises(errors.WrongStateError):
        b.time
    with pytest.raises(errors.WrongStateError):
        b.run_summary()
    with pytest.raises(errors.WrongStateError):
        b.advance(1.0)


def test_a_failed_step_raises_and_leaves_the_block_as_it_was():
    b = elyblock.Block(DEMO_PLANT)
    b.reset()
    b.advance(60)
    before = b[OUTPUTS]
    with pytest.raises(errors.InvalidArgumentError):
        b.advance(-1.0)
    with pytest.raises(errors.InvalidArgumentError):
        b.advance(float("nan"))
    assert b.time == 60.0 and b[OUTPUTS] == before


def test_saved_states_are_those_of_c_and_continue_bit_for_bit(reference):
    b = elyblock.Block(DEMO_PLANT)
    reference.create(DEMO_PLANT)
    b.reset()
    reference.reset(0.0)
    for step, inputs in steps()[:4]:
        b.set(inputs)
        for name, value in inputs.items():
            reference.set(name, value)
        with warnings.catch_warnings():
            warnings.simplefilter("ignore", elyblock.ElyWarning)
            b.advance(step)
        reference.advance(step)
    state = b.save_state()
    assert state == reference.save_state()
    # Restored into a fresh block of the same plant (Python) and into the C program: both go on as
    # the saved block does.
    fresh = elyblock.Block(DEMO_PLANT)
    fresh.restore_state(state)
    assert fresh.time == b.time
    other = elyblock.Block(DEMO_PLANT)
    reference.create(DEMO_PLANT)
    assert reference.restore_state(state)[0] == 0
    for block in (b, fresh):
        with warnings.catch_warnings():
            warnings.simplefilter("ignore", elyblock.ElyWarning)
            block.advance(1800.0, current_density=1.8e4)
    reference.set("in.current_density", 1.8e4)
    reference.advance(1800.0)
    expected = list(reference.values(OUTPUTS).values())
    assert_identical(list(b[OUTPUTS].values()), expected)
    assert_identical(list(fresh[OUTPUTS].values()), expected)
    # A state of another plant description is refused, and the block is left as it was.
    minimal = elyblock.Block(MINIMAL / "pem.json")
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", elyblock.ElyWarning)
        minimal.reset()
    with pytest.raises(errors.InvalidArgumentError, match="plant description"):
        other.restore_state(minimal.save_state())
    with pytest.raises(errors.InvalidArgumentError):
        other.restore_state(state[:-10])  # cut short
    with pytest.raises(errors.WrongStateError):
        other.time  # still never reset
    assert other.save_state() != state


def year_frame(rows=None):
    frame = pd.read_csv(YEAR, comment="#", skipinitialspace=True)
    frame["in.mode_request"] = 3
    return frame if rows is None else frame.iloc[:rows]


def si_columns(frame):
    """The profile's columns in SI, converted here by the units' definitions (independent of the
    library's conversion): hours, MW, degC."""
    return (frame["time [h]"].to_numpy() * 3600.0,
            {"in.power": frame["power [MW]"].to_numpy() * 1e6,
             "in.ambient_temperature": frame["in.ambient_temperature [degC]"].to_numpy() + 273.15,
             "in.mode_request": frame["in.mode_request"].to_numpy(dtype=float)})


def test_simulate_a_dataframe_with_units_equals_the_c_run(reference):
    frame = year_frame(24 * 7)  # a week of the demo year
    b = elyblock.Block(DEMO_PLANT)
    result = b.simulate(frame, OUTPUTS, time="time", with_status=True)
    assert isinstance(result, pd.DataFrame) and (result.index == frame.index).all()
    assert list(result.columns) == ["time"] + OUTPUTS + ["status"]
    assert b.spec == "power"  # the profile's drive column chose the spec
    times, inputs = si_columns(frame)
    np.testing.assert_allclose(result["time"], times, rtol=1e-15)
    # The C run with the columns as the library converted them (bit for bit), and as converted here
    # (to rounding: the library's factor for MW and its offset for degC are the same numbers).
    converted = {"in.power": elyblock.convert_unit(frame["power [MW]"].to_numpy(), "MW", "W"),
                 "in.ambient_temperature": elyblock.convert_unit(frame["in.ambient_temperature [degC]"].to_numpy(),
                                                                 "degC", "K"),
                 "in.mode_request": inputs["in.mode_request"]}
    for name in converted:
        np.testing.assert_allclose(converted[name], inputs[name], rtol=1e-15)
    reference.create(DEMO_PLANT)
    reference.spec("power")
    status, row_status, expected = reference.simulate(result["time"].to_numpy(), converted, OUTPUTS)
    assert status >= 0
    assert (result["status"].to_numpy() == row_status).all()
    for name in OUTPUTS:
        assert_identical(result[name], expected[name])
    # The summary of the run is the C program's, figure by figure.
    mine, theirs = b.run_summary(full=True), reference.run_summary()
    assert mine["figures"].keys() == theirs["figures"].keys()
    for name, figure in theirs["figures"].items():
        assert_identical(mine["figures"][name]["value"], np.nan if figure["value"] is None else figure["value"])
    summary = b.run_summary()
    assert summary["duration"] == 24 * 7 * 3600 - 3600
    assert summary["hydrogen"] > 0


def test_simulate_is_the_loop_of_reset_and_advance_it_stands_for():
    """A profile run equals the calls it stands for (the library's rule, checked from Python):
    reset at the first row with its inputs, then advance to each row's time with the previous
    inputs held and apply the row's inputs."""
    times = np.array([0.0, 60.0, 60.0, 600.0, 2400.0, 2460.0, 7200.0])
    power = np.array([12e6, 20e6, 6e6, 3e6, 25e6, 25e6, 1e6])
    b = elyblock.Block(DEMO_PLANT)
    result = b.simulate({"time": times, "power": power}, OUTPUTS)
    assert isinstance(result, dict) and list(result) == ["time"] + OUTPUTS
    loop = elyblock.Block(DEMO_PLANT)
    loop.set_spec("power")
    rows = []
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", elyblock.ElyWarning)
        loop.reset(times[0], power=power[0])
        rows.append(loop[OUTPUTS])
        for k in range(1, len(times)):
            loop.advance(times[k] - times[k - 1])
            loop.advance(0.0, power=power[k])
            rows.append(loop[OUTPUTS])
    for name in OUTPUTS:
        assert_identical(result[name], [r[name] for r in rows])
    assert b.run_summary() == pytest.approx(loop.run_summary(), nan_ok=True, rel=0, abs=0)


def test_a_run_that_stops_warns_and_gives_nan_from_the_failing_row(reference):
    times = np.array([0.0, 60.0, 120.0, 180.0])
    j = np.array([15000.0, 16000.0, np.nan, 14000.0])
    b = elyblock.Block(DEMO_PLANT)
    with pytest.warns(elyblock.ElyWarning, match="2 of 4 rows not run.*row 2"):
        result = b.simulate({"time": times, "in.current_density": j}, OUTPUTS, with_status=True)
    reference.create(DEMO_PLANT)
    status, row_status, expected = reference.simulate(times, {"in.current_density": j}, OUTPUTS)
    assert status == errors.Status.PARTIAL
    assert (result["status"] == row_status).all()
    for name in OUTPUTS:
        assert_identical(result[name], expected[name])
    assert b.time == 120.0  # left where it stopped
    with pytest.raises(errors.InvalidArgumentError, match="row 0"):
        b.simulate({"time": times, "in.current_density": [np.nan, 1, 1, 1]}, OUTPUTS)


def test_bad_profiles_are_refused_naming_the_problem():
    b = elyblock.Block(DEMO_PLANT)
    with pytest.raises(errors.InvalidArgumentError, match="no time column 'time'"):
        b.simulate({"t": [0, 1], "power": [1e6, 1e6]}, OUTPUTS)
    with pytest.raises(errors.InvalidArgumentError, match="different lengths"):
        b.simulate({"time": [0, 1], "power": [1e6]}, OUTPUTS)
    with pytest.raises(errors.InvalidArgumentError, match="cell.voltage is output"):
        b.simulate({"time": [0, 1], "cell.voltage": [1.8, 1.9]}, OUTPUTS)
    with pytest.raises(errors.UnknownNameError):
        b.simulate({"time": [0, 1], "power": [1e6, 1e6]}, ["no.such_output"])
    with pytest.raises(errors.InvalidArgumentError, match="time"):
        b.simulate({"time": [10, 0], "power": [1e6, 1e6]}, OUTPUTS)  # times go back: the library says so
    with pytest.raises(errors.ElyError, match="furlong"):
        b.simulate({"time [furlong]": [0, 1], "power": [1e6, 1e6]}, OUTPUTS)
    with pytest.raises(errors.WrongStateError):
        b.time  # nothing ran


def steady_rows(rows):
    """A profile of many cheap rows: 12 MW every minute (the integrator goes on across rows whose
    inputs do not change), for the tests of progress and cancellation."""
    return pd.DataFrame({"time [min]": np.arange(rows, dtype=float), "power [MW]": np.full(rows, 12.0)})


def test_progress_of_a_run_and_cancelling_it(reference):
    frame = steady_rows(3000)
    calls = []
    b = elyblock.Block(DEMO_PLANT)
    b.simulate(frame, ["stack.temperature"], progress=lambda done, total: calls.append((done, total)))
    assert calls == [(1024, 3000), (2048, 3000), (3000, 3000)]
    with pytest.raises(errors.CancelledError) as e:
        b.simulate(frame, ["stack.temperature"], with_status=True, progress=lambda done, total: done >= 2048)
    partial = e.value.result
    assert (partial["status"].iloc[:2048] >= 0).all() and (partial["status"].iloc[2048:] == errors.Status.CANCELLED).all()
    assert np.isnan(partial["stack.temperature"].iloc[2048:]).all()
    reference.create(DEMO_PLANT)
    reference.spec("power")
    _, _, expected = reference.simulate(np.arange(2048) * 60.0, {"in.power": np.full(2048, 12e6)},
                                        ["stack.temperature"])
    assert_identical(partial["stack.temperature"].iloc[:2048], expected["stack.temperature"])


def test_interrupt_inside_a_run_raises_keyboard_interrupt_after_it():
    def interrupt(done, total):
        if done == 1024:
            os.kill(os.getpid(), signal.SIGINT)

    b = elyblock.Block(DEMO_PLANT)
    with pytest.raises(KeyboardInterrupt):
        b.simulate(steady_rows(5000), ["stack.temperature"], progress=interrupt)
    assert signal.getsignal(signal.SIGINT) is signal.default_int_handler
    assert b.time <= 2048 * 60.0  # stopped at the next report
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", elyblock.ElyWarning)
        b.advance(60.0)  # the block goes on


def test_tqdm_bar_counts_rows(capsys, monkeypatch):
    from elyblock import _progress
    bars = []

    def recording_bar(*args):
        bars.append(make_bar(*args))
        return bars[-1]

    make_bar = _progress._bar
    monkeypatch.setattr(_progress, "_bar", recording_bar)
    elyblock.Block(DEMO_PLANT).simulate(steady_rows(2000), ["stack.temperature"], progress=True)
    assert len(bars) == 1 and bars[0].n == bars[0].total == 2000
    assert "run" in capsys.readouterr().err


@pytest.mark.parametrize("technology", ["alkaline", "solid_oxide", "aem"])
def test_other_technologies_equal_the_c_run(technology, reference):
    plant = MINIMAL / f"{technology}.json"
    b = elyblock.Block(plant)
    rated = b["param.limits.rated_current_density"]
    times = np.arange(0.0, 6 * 3600.0 + 1, 900.0)
    j = rated * (0.55 + 0.4 * np.sin(times / 3600.0))
    outputs = ["stack.temperature", "cell.voltage", "product.hydrogen", "heat.released", "state.mode"]
    result = b.simulate({"time": times, "in.current_density": j}, outputs)
    reference.create(plant)
    status, _, expected = reference.simulate(times, {"in.current_density": j}, outputs)
    assert status >= 0
    for name in outputs:
        assert_identical(result[name], expected[name])
