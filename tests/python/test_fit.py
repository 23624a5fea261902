"""Block.fit against the C interface's ely_block_fit (the reference program runs the same fit):
values, standard errors, correlations, residuals, RMSE, warnings and the calibrated plant equal
to 1e-12; the data forms (dict, DataFrame, units in column names, weights); errors; progress."""
import json
import os
import signal

import numpy as np
import pandas as pd
import pytest

import elyblock
from conftest import assert_same

# A PEM plant whose anode gas stays below the alarm levels (the fits run without warnings of the
# solve), at 80 degC.
PLANT = {"technology": "pem", "stack": {"cells": 100, "active_area": 0.1},
         "cell": {"h2_recombination_fraction_anode": 0.9, "anode_exchange_current_density": 1e-3,
                  "contact_resistance": 1e-5},
         "operating": {"spec": "current_density", "temperature": "80 degC"}}
FREE = ["anode_exchange_current_density", "contact_resistance"]
FREE_NAMES = ["param.cell.anode_exchange_current_density", "param.cell.contact_resistance"]
# Start values 30 % off the plant's (1e-3 A/m2 and 1e-5 ohm m2, set in PLANT).
START = {"param.cell.anode_exchange_current_density": 1.3e-3, "param.cell.contact_resistance": 1.3e-5}


@pytest.fixture
def curve(reference, tmp_path):
    """Test data made by the model itself through the C batch: 6 current densities at 60 and
    80 degC, with 0.7 mV of alternating scatter."""
    j = np.tile(np.linspace(6000.0, 20000.0, 6), 2)
    t = np.repeat([333.15, 353.15], 6)
    assert reference.create(PLANT, tmp_path) == 0
    _, status, values = reference.batch({"in.current_density": j, "in.temperature": t}, ["cell.voltage"])
    assert (status == 0).all()
    scatter = np.where(np.arange(12) % 2, 0.7e-3, -0.7e-3)
    return {"in.current_density": j, "in.temperature": t, "cell.voltage": values["cell.voltage"] + scatter}


def started_block():
    b = elyblock.Block(PLANT)
    b.set(START)
    return b


def c_fit(reference, tmp_path, data, free=FREE_NAMES, weights=None, bounds=None, settings=START):
    assert reference.create(PLANT, tmp_path) == 0
    for name, value in settings.items():
        assert reference.set(name, value) == 0
    inputs = {k: v for k, v in data.items() if k.startswith("in.")}
    measured = {k: v for k, v in data.items() if not k.startswith("in.") and not k.startswith("weight:")}
    return reference.fit(inputs, measured, free, weights, bounds)


def assert_same_fit(result, c):
    status, parameters, report, plant = c
    assert result.status == status
    assert_same([result.values[n] for n in result.names], [p[0] for p in parameters])
    assert_same([result.standard_errors[n] for n in result.names], [p[1] for p in parameters])
    assert_same([result.intervals[n] for n in result.names], [p["interval_95"] for p in report["parameters"]])
    assert_same(result.correlation, report["correlation"])
    assert_same(result.condition_number, report["condition_number"])
    residuals = np.array([[np.nan if v is None else v for v in row] for row in report["residuals"]])
    fitted = np.array([[np.nan if v is None else v for v in row] for row in report["fitted"]])
    for o, name in enumerate(report["measured"]):
        assert_same(np.asarray(result.residuals[name]), residuals[:, o])
        assert_same(np.asarray(result.fitted[name]), fitted[:, o])
        assert_same(result.rmse[name], report["rmse"][name])
    assert result.warnings == report["warnings"]
    assert result.iterations == report["iterations"]
    assert result.plant == plant
    assert json.loads(result.plant_text) == plant


def test_fit_equals_the_c_fit(curve, reference, tmp_path):
    b = started_block()
    result = b.fit(curve, FREE)
    assert result.names == FREE_NAMES and result.status == elyblock.Status.OK
    assert_same_fit(result, c_fit(reference, tmp_path, curve))
    # the plant's own values come back within the scatter
    assert abs(result.values["param.cell.contact_resistance"] / 1e-5 - 1) < 0.02
    assert abs(result.values["param.cell.anode_exchange_current_density"] / 1e-3 - 1) < 0.05
    assert 0.0003 < result.rmse["cell.voltage"] < 0.001
    # the block holds the fitted values; its inputs are as before
    for name in FREE_NAMES:
        assert b[name] == result.values[name]
    assert b["in.temperature"] == 353.15
    frame = result.parameters
    assert list(frame.index) == FREE_NAMES and list(frame["unit"]) == ["A/m2", "ohm m2"]
    assert (frame["low_95"] < frame["value"]).all() and (frame["value"] < frame["high_95"]).all()


def test_fitted_block_and_plant_reproduce_the_fitted_values(curve):
    result = started_block().fit(curve, FREE)
    inputs = {k: curve[k] for k in ("in.current_density", "in.temperature")}
    again = result.block().batch(inputs, ["cell.voltage"])
    assert_same(again["cell.voltage"], result.fitted["cell.voltage"])
    # the calibrated description alone gives the same model (its operating point is the plant's)
    loaded = elyblock.Block(result.plant_text)
    for name in FREE_NAMES:
        assert loaded[name] == result.values[name]
    assert_same(loaded.batch(inputs, ["cell.voltage"])["cell.voltage"], result.fitted["cell.voltage"])


def test_a_data_file_read_by_pandas_fits_as_the_cli_reads_it(curve, tmp_path):
    """Column names with units in brackets, as `elyblock fit` reads them; a DataFrame in, the
    residuals out as a DataFrame with the data's index."""
    path = tmp_path / "bench.csv"
    with open(path, "w") as f:
        f.write("# test data made by the model itself\n")
        f.write("in.current_density [A/cm2], in.temperature [degC], cell.voltage [mV]\n")
        for j, t, v in zip(curve["in.current_density"], curve["in.temperature"], curve["cell.voltage"]):
            f.write(f"{j / 1e4!r}, {t - 273.15!r}, {v * 1e3!r}\n")
    frame = pd.read_csv(path, comment="#", skipinitialspace=True)
    frame.index = [f"row {k}" for k in range(len(frame))]
    from_file = started_block().fit(frame, FREE)
    in_si = started_block().fit(curve, FREE)
    # the unit conversions round in the last place: the same fit to far below its precision
    for name in FREE_NAMES:
        assert_same(from_file.values[name], in_si.values[name], rtol=1e-9)
    assert isinstance(from_file.residuals, pd.DataFrame) and list(from_file.residuals.index) == list(frame.index)
    assert_same(from_file.residuals["cell.voltage"], in_si.residuals["cell.voltage"], atol=1e-12)
    # the data in SI, as the fit used them
    assert_same(from_file.data.inputs[:, 1], curve["in.temperature"])


def test_weights_and_values_not_measured_equal_the_c_fit(curve, reference, tmp_path):
    data = dict(curve)
    data["cell.voltage"] = data["cell.voltage"].copy()
    data["cell.voltage"][4] = np.nan  # not measured
    w = np.ones(12)
    w[2] = 0.0                         # weighed out
    w[7] = 4.0
    b = started_block()
    result = b.fit(data, FREE, weights={"cell.voltage": w})
    c = c_fit(reference, tmp_path, data, weights={"cell.voltage": w})
    assert_same_fit(result, c)
    assert c[2]["measurements"] == 10 and np.isnan(result.residuals["cell.voltage"][4])
    # the same weights as a weight: column
    as_column = dict(data, **{"weight:cell.voltage": w})
    assert_same_fit(started_block().fit(as_column, FREE), c)


def test_bounds_with_units_and_scales(curve, reference, tmp_path):
    bounds = {"contact_resistance": ("0.05 ohm cm2", "0.5 ohm cm2"),
              "param.cell.anode_exchange_current_density": (None, 0.01)}
    result = started_block().fit(curve, FREE, bounds=bounds, scales={"contact_resistance": "linear"})
    assert [p["bounds"] for p in result.report["parameters"]][1] == [5e-6, 5e-5]
    assert result.report["parameters"][1]["scale"] == "linear"
    assert result.report["parameters"][0]["bounds"][1] == 0.01
    with pytest.raises(elyblock.InvalidArgumentError, match="fit bounds of 'param.cell.contact_resistance', lower: "
                                                            "expected a quantity in ohm m2, got 'bar'"):
        started_block().fit(curve, FREE, bounds={"contact_resistance": ("1 bar", None)})


def test_warnings_of_the_fit_are_the_c_fits(curve, reference, tmp_path):
    """Both exchange current densities from a curve at one temperature: the cathode's, which
    hardly shows in a PEM cell's voltage, runs to its bound and the anode's is poorly determined.
    The fit succeeds with warnings naming them: an ElyWarning, status WARNING, and the list."""
    one_temperature = {k: v[6:] for k, v in curve.items()}
    free = ["param.cell.anode_exchange_current_density", "param.cell.cathode_exchange_current_density"]
    with pytest.warns(elyblock.ElyWarning, match="cathode_exchange_current_density ended at its upper bound"):
        result = started_block().fit(one_temperature, free)
    assert result.status == elyblock.Status.WARNING
    assert any("param.cell.anode_exchange_current_density is poorly determined" in w for w in result.warnings)
    assert_same_fit(result, c_fit(reference, tmp_path, one_temperature, free=free))


def test_errors_name_the_problem_and_leave_the_block_unchanged(curve):
    b = started_block()
    with pytest.raises(elyblock.UnknownNameError):
        b.fit(dict(curve, **{"cell.colour": curve["cell.voltage"]}), FREE)
    with pytest.raises(elyblock.InvalidArgumentError, match="'param.cell.membrane_thickness' is a parameter"):
        b.fit(dict(curve, **{"param.cell.membrane_thickness": 1e-4}), FREE)
    with pytest.raises(elyblock.InvalidArgumentError, match="no measured output"):
        b.fit({"in.current_density": curve["in.current_density"]}, FREE)
    with pytest.raises(elyblock.InvalidArgumentError, match="different lengths"):
        b.fit({"in.current_density": [1e4, 2e4], "cell.voltage": [1.7, 1.8, 1.9]}, FREE)
    with pytest.raises(elyblock.UnknownNameError, match="no_such_key"):
        b.fit(curve, ["no_such_key"])
    with pytest.raises(elyblock.InvalidArgumentError, match="not among the free parameters"):
        b.fit(curve, FREE, bounds={"membrane_water_content": (10, 20)})
    with pytest.raises(elyblock.InvalidArgumentError, match="'fast' is not one of auto, linear, log"):
        b.fit(curve, FREE, scales={"contact_resistance": "fast"})
    with pytest.raises(elyblock.InvalidArgumentError, match="weights of 'cell.voltage' are given twice"):
        b.fit(dict(curve, **{"weight:cell.voltage": 1.0}), FREE, weights={"cell.voltage": 2.0})
    # the library's own checks: a row that cannot be solved at the start values, named
    beyond = dict(curve, **{"in.current_density": curve["in.current_density"] * 100})
    with pytest.raises(elyblock.ElyError, match="data row 1"):
        b.fit(beyond, FREE)
    for name, value in START.items():
        assert b[name] == value


def test_progress_sees_iterations_and_cancels(curve):
    seen = []
    b = started_block()
    b.fit(curve, FREE, progress=lambda done, total: seen.append((done, total)))
    assert seen and seen[0] == (1, 200) and [d for d, _ in seen] == list(range(1, len(seen) + 1))
    b = started_block()
    with pytest.raises(elyblock.CancelledError):
        b.fit(curve, FREE, max_iterations=50, progress=lambda done, total: done >= 2)
    for name, value in START.items():
        assert b[name] == value


def test_ctrl_c_during_a_fit_cancels_it_and_raises_after_the_call(curve):
    """SIGINT while the library iterates (sent from the progress callback, as Ctrl-C would arrive):
    the package's handler records it, the next progress call cancels the fit, KeyboardInterrupt
    is raised once the call has returned, and the block is as before."""
    seen = []

    def interrupt(done, total):
        seen.append(done)
        if done == 1:
            os.kill(os.getpid(), signal.SIGINT)

    b = started_block()
    with pytest.raises(KeyboardInterrupt):
        b.fit(curve, FREE, progress=interrupt)
    assert seen == [1]  # the next iteration's progress call cancels (without calling it again)
    assert signal.getsignal(signal.SIGINT) is signal.default_int_handler
    for name, value in START.items():
        assert b[name] == value
