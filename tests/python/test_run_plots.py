"""Plots of a profile run: the data on the artists against the run (itself equal to the C run, see
test_dynamics.py) and against identities the plot code does not use; the example script."""
import json
import os
import subprocess
import sys
import warnings
import xml.etree.ElementTree as ET

import numpy as np
import pandas as pd
import pytest

import elyblock
from elyblock import plots
from conftest import DEMO_PLANT, SOURCE_DIR

YEAR = SOURCE_DIR / "examples" / "profiles" / "windsolar-year.csv"


@pytest.fixture(scope="module")
def month():
    frame = pd.read_csv(YEAR, comment="#", skipinitialspace=True).iloc[:30 * 24 + 1]
    frame["in.mode_request"] = 3
    # An uneven step: the second half of the month at 2-hour rows, so that rows hold for different times.
    frame = pd.concat([frame.iloc[:360], frame.iloc[360::2]])
    block = elyblock.Block(DEMO_PLANT)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", elyblock.ElyWarning)
        run = block.simulate(frame, plots.RUN_OUTPUTS)
    return block, run


def test_duration_curve_is_the_load_sorted_against_the_hours_it_holds(month):
    block, run = month
    figure = plots.duration_curve(run)
    ax = figure.axes[0]
    [line] = ax.get_lines()
    hours, load = line.get_xdata(), line.get_ydata()
    # Falling from the highest load to the lowest, over the whole run.
    assert hours[0] == 0 and hours[-1] == pytest.approx((run["time"].iloc[-1] - run["time"].iloc[0]) / 3600, rel=1e-12)
    assert (np.diff(load[1:]) <= 0).all()
    assert load[1] == pytest.approx(run["perf.load_fraction"].max() * 100, rel=1e-15)
    # The area under the curve is the time integral of the load with each row held until the next
    # (the run's definition of a row), computed here by the row's own interval.
    t = run["time"].to_numpy()
    integral = np.sum(run["perf.load_fraction"].to_numpy()[:-1] * np.diff(t)) / 3600 * 100
    area = np.sum(np.diff(hours) * load[1:])
    assert area == pytest.approx(integral, rel=1e-12)
    # Hours at or above the minimum load: the hours in production read off the curve.
    minimum = block["param.limits.min_load_fraction"] * 100
    held = np.diff(t)
    producing = np.sum(held[(run["perf.load_fraction"].to_numpy()[:-1] * 100) >= minimum * (1 - 1e-12)]) / 3600
    assert hours[1:][load[1:] >= minimum * (1 - 1e-12)].max() == pytest.approx(producing, rel=1e-12)
    assert ax.get_ylabel() == "load, current density / rated [%]"


def test_duration_curve_of_power_in_mw(month):
    _, run = month
    [line] = plots.duration_curve(run, "stack.power").axes[0].get_lines()
    assert line.get_ydata()[1] == pytest.approx(run["stack.power"].max() / 1e6, rel=1e-15)


def test_traces_show_the_run_with_setpoint_and_alarm_levels(month):
    block, run = month
    figure = plots.run_traces(run, block=block)
    top, bottom = figure.axes
    days = (run["time"].to_numpy() - run["time"].iloc[0]) / 86400
    temperature, setpoint = top.get_lines()
    np.testing.assert_allclose(temperature.get_xdata(), days, rtol=1e-15, atol=1e-15)
    np.testing.assert_allclose(temperature.get_ydata(), run["stack.temperature"] - 273.15, rtol=0, atol=1e-12)
    assert setpoint.get_ydata()[0] == pytest.approx(block["param.thermal.temperature_setpoint"] - 273.15)
    separator, stack, warning, trip = bottom.get_lines()
    np.testing.assert_allclose(separator.get_ydata(), run["gas.h2_in_o2"] * 100, rtol=1e-15)
    production = run["state.mode"].to_numpy() == 2
    np.testing.assert_allclose(stack.get_ydata()[production], run["gas.h2_in_o2_stack"][production] * 100, rtol=1e-15)
    assert np.isnan(stack.get_ydata()[~production]).all()
    assert warning.get_ydata()[0] == pytest.approx(block["param.alarms.h2_in_o2_warning"] * 100)
    assert trip.get_ydata()[0] == pytest.approx(block["param.alarms.h2_in_o2_trip"] * 100)
    assert bottom.get_xlabel() == "time from the start [d]"


def test_profile_run_figure_and_files(month, tmp_path):
    block, run = month
    figure = plots.profile_run(run, block=block)
    assert len(figure.axes) == 3
    written = plots.save(figure, tmp_path / "run")
    assert [os.path.basename(p) for p in written] == ["run.png", "run.svg"]
    assert (tmp_path / "run.png").read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"
    ET.parse(tmp_path / "run.svg")


def test_a_dict_run_and_a_missing_column():
    b = elyblock.Block(DEMO_PLANT)
    run = b.simulate({"time": [0.0, 3600.0, 7200.0], "power": [10e6, 20e6, 5e6]}, plots.RUN_OUTPUTS)
    plots.profile_run(run, block=b)
    with pytest.raises(ValueError, match="no column 'gas.h2_in_o2'"):
        plots.run_traces({"time": run["time"], "stack.temperature": run["stack.temperature"]})


def test_read_series_of_the_command_line(tmp_path):
    """A series as `elyblock run` writes it, in SI and in engineering units, reads back in SI."""
    path = tmp_path / "series.csv"
    path.write_text("time [h],status,stack.temperature [degC],stack.power [MW]\n0,ok,65,10\n1,ok,66.5,12\n")
    series = plots.read_series(path, DEMO_PLANT)
    np.testing.assert_allclose(series["time"], [0, 3600])
    np.testing.assert_allclose(series["stack.temperature"], [338.15, 339.65], rtol=1e-15)
    np.testing.assert_allclose(series["stack.power"], [10e6, 12e6], rtol=1e-15)
    assert list(series["status"]) == ["ok", "ok"]


def test_command_line_entry_draws_a_series(tmp_path, month):
    block, run = month
    csv = tmp_path / "run.csv"
    table = run.rename(columns={"time": "time [s]"})
    table.to_csv(csv, index=False, float_format="%.17g")
    done = subprocess.run([sys.executable, "-m", "elyblock.plots", "run", str(csv), "-o", str(tmp_path / "r.svg"),
                           "--setpoint", "338.15", "--warning", "0.01", "--trip", "0.02"], capture_output=True,
                          text=True)
    assert done.returncode == 0, done.stderr
    assert (tmp_path / "r.svg").stat().st_size > 0


def test_profile_run_example(tmp_path, reference):
    package_dir = os.path.dirname(os.path.dirname(os.path.abspath(elyblock.__file__)))
    env = dict(os.environ, PYTHONPATH=os.pathsep.join([package_dir, os.environ.get("PYTHONPATH", "")]))
    done = subprocess.run([sys.executable, str(SOURCE_DIR / "examples" / "python" / "profile_run.py"), "--output-dir",
                           str(tmp_path), "--days", "10"], capture_output=True, text=True, env=env, cwd=tmp_path,
                          timeout=600)
    assert done.returncode == 0, done.stderr
    assert "hydrogen made" in done.stdout and "one more day at 15 MW" in done.stdout
    for name in ("run.csv", "summary.json", "profile_run.png", "profile_run.svg"):
        assert (tmp_path / name).stat().st_size > 0, name
    # The summary the example wrote is the C program's for the same profile, figure by figure.
    frame = pd.read_csv(YEAR, comment="#", skipinitialspace=True).iloc[:10 * 24 + 1]
    reference.create(DEMO_PLANT)
    reference.spec("power")
    times = frame["time [h]"].to_numpy() * 3600.0
    inputs = {"in.power": elyblock.convert_unit(frame["power [MW]"].to_numpy(), "MW", "W"),
              "in.ambient_temperature": elyblock.convert_unit(frame["in.ambient_temperature [degC]"].to_numpy(),
                                                              "degC", "K"),
              "in.mode_request": np.full(len(frame), 3.0)}
    status, _, expected = reference.simulate(times, inputs, ["stack.temperature"])
    assert status >= 0
    series = pd.read_csv(tmp_path / "run.csv", float_precision="round_trip")  # 17 digits read back exactly
    np.testing.assert_array_equal(series["stack.temperature"].to_numpy(), expected["stack.temperature"])
    mine = json.loads((tmp_path / "summary.json").read_text())
    theirs = reference.run_summary()
    for name, figure in theirs["figures"].items():
        value = mine["figures"][name]["value"]
        if figure["value"] is None:
            assert value is None or np.isnan(value)
        else:
            assert value == figure["value"], name
