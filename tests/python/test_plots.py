"""Plots: the data on the figures' artists against the C interface; PNG and SVG files."""
import subprocess
import sys
import xml.etree.ElementTree as ET

import numpy as np
import pytest
from matplotlib.collections import PolyCollection
from matplotlib.figure import Figure

import elyblock
from elyblock import plots
from conftest import DEMO_PLANT, MINIMAL, assert_same

PARTS = ["cell.reversible_voltage", "cell.activation_anode", "cell.activation_cathode", "cell.ohmic",
         "cell.degradation", "cell.concentration", "cell.voltage"]


def band_edges(collection):
    """Bottom and top of one stacked area at each x, read from its polygon."""
    vertices = collection.get_paths()[0].vertices
    edges = {}
    for x, y in vertices:
        low, high = edges.get(x, (y, y))
        edges[x] = (min(low, y), max(high, y))
    xs = np.array(sorted(edges))
    return xs, np.array([edges[x][0] for x in xs]), np.array([edges[x][1] for x in xs])


def c_results(reference, plant, inputs, outputs, spec="current_density"):
    reference.create(plant)
    reference.spec(spec)
    return reference.batch(inputs, outputs)


def test_polarization_areas_stack_to_the_cell_voltage(reference):
    j = np.linspace(1e3, 2.5e4, 25)
    figure = plots.polarization(DEMO_PLANT, j)
    ax = figure.axes[0]
    _, status, c = c_results(reference, DEMO_PLANT, {"in.current_density": j}, PARTS)
    assert (status >= 0).all()
    bands = [col for col in ax.collections if isinstance(col, PolyCollection)]
    assert [b.get_label() for b in bands] == [label for label, _ in plots.VOLTAGE_PARTS]
    expected_parts = [c["cell.reversible_voltage"], c["cell.activation_anode"], c["cell.activation_cathode"],
                      c["cell.ohmic"] - c["cell.degradation"], c["cell.degradation"], c["cell.concentration"]]
    bottom = np.zeros_like(j)
    for band, part in zip(bands, expected_parts):
        xs, low, high = band_edges(band)
        assert_same(xs, j / 1e4)
        assert_same(low, bottom, atol=1e-12)
        assert_same(high - low, part, atol=1e-12)
        bottom = high
    assert_same(bottom, c["cell.voltage"])  # the top of the stack is the cell voltage
    [line] = ax.get_lines()
    assert_same(line.get_xdata(), j / 1e4)
    assert_same(line.get_ydata(), c["cell.voltage"])
    assert ax.get_xlabel() == "current density [A/cm²]" and ax.get_ylabel() == "cell voltage [V]"


def test_polarization_leaves_out_failed_points_and_takes_inputs(reference):
    b = elyblock.Block(MINIMAL / "pem.json")
    j = np.array([1e3, 1e4, 2e4, 4e4, 5e4])
    figure = plots.polarization(b, j, inputs={"in.temperature": 353.15})
    _, status, c = c_results(reference, MINIMAL / "pem.json",
                             {"in.current_density": j, "in.temperature": np.full(j.size, 353.15)}, ["cell.voltage"])
    [line] = figure.axes[0].get_lines()
    solved = status >= 0
    assert_same(line.get_xdata(), j[solved] / 1e4)
    assert_same(line.get_ydata(), c["cell.voltage"][solved])


def test_efficiency_lines_are_the_c_values(reference):
    load = np.linspace(0.1, 1.0, 19)
    figure = plots.efficiency(DEMO_PLANT, load)
    top, bottom = figure.axes
    b = elyblock.Block(DEMO_PLANT)
    _, status, c = c_results(reference, DEMO_PLANT, {"in.current_density": load * b["param.limits.rated_current_density"]},
                             plots.EFFICIENCY_OUTPUTS)
    assert (status >= 0).all()
    x = c["perf.load_fraction"] * 100
    for ax, names, scale in ((top, ["perf.efficiency_hhv", "perf.efficiency_lhv"], 100.0),
                             (bottom, ["perf.specific_energy", "perf.specific_energy_plant"], 1 / 3.6e6)):
        lines = ax.get_lines()
        assert len(lines) == 2
        for line, name in zip(lines, names):
            assert_same(line.get_xdata(), x)
            assert_same(line.get_ydata(), c[name] * scale)
    assert_same(x, load * 100)
    assert "kWh/kg" in bottom.get_ylabel()


def test_draws_into_given_axes():
    figure = Figure()
    ax = figure.add_subplot()
    assert plots.polarization(DEMO_PLANT, np.linspace(1e3, 2e4, 5), ax=ax) is figure
    assert len(ax.get_lines()) == 1


def test_save_writes_png_and_svg(tmp_path):
    figure = plots.polarization(DEMO_PLANT, np.linspace(1e3, 2e4, 10))
    written = plots.save(figure, tmp_path / "curve")
    assert written == [str(tmp_path / "curve.png"), str(tmp_path / "curve.svg")]
    assert (tmp_path / "curve.png").read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"
    root = ET.parse(tmp_path / "curve.svg").getroot()
    assert root.tag == "{http://www.w3.org/2000/svg}svg"
    assert plots.save(figure, tmp_path / "one.svg") == [str(tmp_path / "one.svg")]


@pytest.mark.parametrize("plot", ["polarization", "efficiency"])
def test_command_line_writes_the_files(plot, tmp_path):
    run = subprocess.run([sys.executable, "-m", "elyblock.plots", plot, str(DEMO_PLANT), "-o", str(tmp_path / "a.png"),
                          "-o", str(tmp_path / "a.svg"), "--points", "12"], capture_output=True, text=True)
    assert run.returncode == 0, run.stderr
    assert run.stdout.split() == [str(tmp_path / "a.png"), str(tmp_path / "a.svg")]
    assert (tmp_path / "a.png").stat().st_size > 1000 and (tmp_path / "a.svg").stat().st_size > 1000


def test_command_line_reports_a_bad_plant(tmp_path):
    bad = tmp_path / "bad.json"
    bad.write_text('{"technology": "pem", "stack": {"cells": -1, "active_area": 0.1}}')
    run = subprocess.run([sys.executable, "-m", "elyblock.plots", "polarization", str(bad), "-o",
                          str(tmp_path / "x.png")], capture_output=True, text=True)
    assert run.returncode != 0 and "stack.cells" in run.stderr and not (tmp_path / "x.png").exists()


def test_fit_plot_shows_the_measured_points_the_fitted_curves_and_the_residuals(reference, tmp_path):
    """plots.fit: per temperature the measured points, the fitted model as a curve (the C batch of
    the calibrated plant over the same grid) and the residuals in mV below."""
    plant = {"technology": "pem", "stack": {"cells": 100, "active_area": 0.1},
             "cell": {"h2_recombination_fraction_anode": 0.9}, "operating": {"spec": "current_density"}}
    j = np.tile(np.linspace(6000.0, 20000.0, 5), 2)
    t = np.repeat([333.15, 353.15], 5)
    truth = elyblock.Block(plant).batch({"in.current_density": j, "in.temperature": t}, ["cell.voltage"])
    measured = truth["cell.voltage"] + np.where(np.arange(10) % 2, 1e-3, -1e-3)  # test data: the model, with scatter
    b = elyblock.Block(plant)
    b["param.cell.contact_resistance"] = 1.5e-5
    result = b.fit({"in.current_density": j, "in.temperature": t, "cell.voltage": measured}, ["contact_resistance"])
    figure = plots.fit(result, points=30)
    top, bottom = figure.axes
    lines = top.get_lines()
    assert len(lines) == 4  # measured and fitted, per temperature
    path = tmp_path / "fitted.json"
    result.save_plant(path)
    reference.create(path)
    for k, temperature in enumerate((333.15, 353.15)):
        rows = t == temperature
        points, curve = lines[2 * k], lines[2 * k + 1]
        assert_same(points.get_xdata(), j[rows] / 1e4)
        assert_same(points.get_ydata(), measured[rows])
        grid = np.linspace(6000.0, 20000.0, 30)
        _, status, c = reference.batch({"in.current_density": grid, "in.temperature": np.full(30, temperature)},
                                       ["cell.voltage"])
        assert (status >= 0).all()
        assert_same(curve.get_xdata(), grid / 1e4)
        assert_same(curve.get_ydata(), c["cell.voltage"])
        assert curve.get_color() == points.get_color() and f"{temperature - 273.15:.4g} °C" in curve.get_label()
        [residuals] = [line for line in bottom.get_lines() if len(line.get_xdata()) == 5][k:k + 1]
        assert_same(residuals.get_ydata(), result.residuals["cell.voltage"][rows] * 1e3)
    assert top.get_ylabel() == "cell.voltage [V]" and bottom.get_xlabel() == "in.current_density [A/cm²]"
    assert "[mV]" in bottom.get_ylabel() and "contact_resistance" in top.get_title()
    assert plots.save(figure, tmp_path / "fit") == [str(tmp_path / "fit.png"), str(tmp_path / "fit.svg")]
    with pytest.raises(ValueError, match="'in.pressure_cathode' is not an input column"):
        plots.fit(result, x="in.pressure_cathode")
