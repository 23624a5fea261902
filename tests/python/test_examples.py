"""The example scripts of examples/python run, and what they write equals the C interface."""
import importlib.util
import json
import os
import pathlib
import subprocess
import sys

import numpy as np
import pandas as pd
import elyblock
from conftest import DEMO_PLANT, SOURCE_DIR, assert_same

EXAMPLES = SOURCE_DIR / "examples" / "python"


def load(name):
    spec = importlib.util.spec_from_file_location(name, EXAMPLES / f"{name}.py")
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module


def run(script, *args, cwd):
    # the scripts run elsewhere: give them the package this test imports by an absolute path
    package_dir = pathlib.Path(elyblock.__file__).resolve().parents[1]
    env = dict(os.environ, PYTHONPATH=os.pathsep.join([str(package_dir), os.environ.get("PYTHONPATH", "")]))
    done = subprocess.run([sys.executable, str(EXAMPLES / script), *map(str, args)], cwd=cwd, env=env,
                          capture_output=True, text=True, timeout=600)
    assert done.returncode == 0, done.stderr
    return done.stdout


def test_design_sweep(tmp_path, reference):
    out = run("design_sweep.py", "--output-dir", tmp_path, "--stacks", 7, 10, cwd=tmp_path)
    assert "chosen:" in out
    for name in ("sweep.csv", "design.png", "design.svg", "polarization.png", "polarization.svg", "efficiency.png",
                 "efficiency.svg"):
        assert (tmp_path / name).stat().st_size > 0, name
    table = pd.read_csv(tmp_path / "sweep.csv")
    assert sorted(table["stacks"].unique()) == [7, 8, 9, 10]
    example = load("design_sweep")
    base = json.loads(DEMO_PLANT.read_text())
    for _, row in table.iloc[[0, 5, 12, 27]].iterrows():
        plant = dict(base, stack=dict(base["stack"], stacks=int(row["stacks"])))
        reference.create(plant, tmp_path)
        reference.spec("hydrogen_rate")
        reference.set("in.hydrogen_rate", example.TARGET_HYDROGEN)
        reference.set("in.temperature", row["temperature_degC"] + example.KELVIN)
        status = reference.solve()
        assert status == row["status"]
        if status >= 0:
            # the CSV holds 17 significant digits (pandas' float format), enough for 1e-12
            assert_same([row[o] for o in example.OUTPUTS], [reference.get(o) for o in example.OUTPUTS])
    assert (table.loc[table["status"] < 0, "cell.current_density"].isna()).all()


def test_monte_carlo_locally_and_on_two_workers(tmp_path, reference):
    local = run("monte_carlo.py", "--samples", 6, "--output-dir", tmp_path / "local", cwd=tmp_path)
    spread = run("monte_carlo.py", "--samples", 6, "--local-cluster", 2, "--output-dir", tmp_path / "spread",
                 cwd=tmp_path)
    assert "P50" in local and "P50" in spread
    a = pd.read_csv(tmp_path / "local" / "samples.csv")
    b = pd.read_csv(tmp_path / "spread" / "samples.csv")
    pd.testing.assert_frame_equal(a, b, check_exact=True)
    assert (tmp_path / "local" / "yearly_hydrogen.svg").exists()
    # one sample's year through the C batch
    example = load("monte_carlo")
    base = json.loads(DEMO_PLANT.read_text())
    inputs, _, running = example.year_inputs(base)
    plants, parameters = example.draw_plants(base, 6, np.median(inputs["in.power"]))
    assert_same(parameters["anode_exchange_current_density"], a["anode_exchange_current_density"])
    reference.create(plants[2], tmp_path)
    _, status, values = reference.batch(inputs, example.OUTPUTS)
    assert (status >= 0).all() and len(status) == running
    assert_same(a.loc[2, "hydrogen_t"], values["product.hydrogen"].sum() * 3600.0 / 1000.0)
    assert_same(a.loc[2, "energy_GWh"], values["plant.power"].sum() * 3600.0 / 3.6e12)


def test_fit_curve(tmp_path, reference):
    """The fit example: its calibrated plant is the C fit's on the data file it wrote (read by pandas
    and converted by the library's units, as the example reads it)."""
    out = run("fit_curve.py", "--output-dir", tmp_path, cwd=tmp_path)
    assert "RMSE of the cell voltage" in out
    for name in ("bench.csv", "fitted-plant.json", "fit.png", "fit.svg"):
        assert (tmp_path / name).stat().st_size > 0, name
    frame = pd.read_csv(tmp_path / "bench.csv", comment="#")
    inputs = {"in.current_density": elyblock.convert_unit(frame["in.current_density [A/cm2]"], "A/cm2", "A/m2"),
              "in.temperature": elyblock.convert_unit(frame["in.temperature [degC]"], "degC", "K")}
    measured = {"cell.voltage": elyblock.convert_unit(frame["cell.voltage [mV]"], "mV", "V")}
    example = load("fit_curve")
    reference.create(DEMO_PLANT)
    reference.spec("current_density")
    status, parameters, report, plant = reference.fit(inputs, measured, [f"param.cell.{n}" for n in example.FREE])
    assert status >= 0
    assert json.loads((tmp_path / "fitted-plant.json").read_text()) == plant
    # the bench's invented values lie within the reported 95 % intervals
    start = elyblock.Block(DEMO_PLANT)
    for p, name in zip(report["parameters"], example.FREE):
        bench = start[f"param.cell.{name}"] * example.BENCH_FACTORS[name]
        assert p["interval_95"][0] < bench < p["interval_95"][1], (name, bench, p["interval_95"])
