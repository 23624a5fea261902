#!/usr/bin/python3
"""Fit the demo plant's cell model to a measured polarization curve.

A test bench measured the cell voltage of one of the demo plant's stacks (examples/demo-plant.json,
an invented scenario) at three temperatures. The measured curve here is INVENTED for the demo: the
model itself with a slower anode, a higher contact resistance and 2 mV of random scatter stands in
for the bench. The script writes it as a data file in the format `elyblock fit` reads (units in
the header), reads it back with pandas, fits the anode's exchange current density, its transfer
coefficient and the contact resistance, and writes:

- bench.csv: the measured curve (invented), as the command line takes it:
  `elyblock fit examples/demo-plant.json bench.csv --free anode_exchange_current_density,...`
- fitted-plant.json: the calibrated plant description;
- fit.png / fit.svg: the measured points, the fitted curves and the residuals.

    /usr/bin/python3 examples/python/fit_curve.py [--output-dir DIR] [--scatter-mV 2] [--seed 7]

(with the package installed: see the README's Python section).
"""
import argparse
import pathlib

import numpy as np
import pandas as pd

import elyblock
from elyblock import plots

HERE = pathlib.Path(__file__).resolve().parent
DEMO_PLANT = HERE.parent / "demo-plant.json"

FREE = ["anode_exchange_current_density", "anode_transfer_coefficient_forward", "contact_resistance"]
# The invented "bench" stack: how it differs from the demo plant's description (factors on the
# description's values; invented for the demo).
BENCH_FACTORS = {"anode_exchange_current_density": 0.4, "anode_transfer_coefficient_forward": 1.08,
                 "contact_resistance": 1.35}
TEMPERATURES_DEGC = [55.0, 65.0, 75.0]           # bench temperatures (invented)
CURRENT_DENSITIES = np.linspace(0.1, 2.2, 12)    # A/cm2 (invented)
KELVIN = 273.15


def bench_curve(plant, scatter_volts, seed):
    """The invented measured curve: a copy of the plant with the bench factors, solved at the bench
    points in one batch, plus normally distributed scatter. Returns a DataFrame with the column
    names of a data file (units in brackets)."""
    bench = elyblock.Block(plant)
    for key, factor in BENCH_FACTORS.items():
        bench[f"param.cell.{key}"] = factor * bench[f"param.cell.{key}"]
    j = np.tile(CURRENT_DENSITIES, len(TEMPERATURES_DEGC))
    t = np.repeat(TEMPERATURES_DEGC, len(CURRENT_DENSITIES))
    volts = bench.batch({"in.current_density": j * 1e4, "in.temperature": t + KELVIN}, ["cell.voltage"],
                        spec="current_density")["cell.voltage"]
    volts = volts + np.random.default_rng(seed).normal(0.0, scatter_volts, volts.size)
    return pd.DataFrame({"in.current_density [A/cm2]": j, "in.temperature [degC]": t,
                         "cell.voltage [mV]": np.round(volts * 1e3, 2)})


def write_data_file(frame, path):
    with open(path, "w", encoding="utf-8") as f:
        f.write("# Polarization curve of one stack on a test bench: INVENTED for the demo (the model with\n")
        f.write("# changed parameters and random scatter), in the data format of `elyblock fit`.\n")
        frame.to_csv(f, index=False)


def main():
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--output-dir", type=pathlib.Path, default=pathlib.Path("."))
    parser.add_argument("--scatter-mV", type=float, default=2.0, help="scatter of the invented bench data")
    parser.add_argument("--seed", type=int, default=7)
    args = parser.parse_args()
    out = args.output_dir
    out.mkdir(parents=True, exist_ok=True)

    write_data_file(bench_curve(DEMO_PLANT, args.scatter_mV * 1e-3, args.seed), out / "bench.csv")
    measured = pd.read_csv(out / "bench.csv", comment="#")  # the units in the column names come along

    block = elyblock.Block(DEMO_PLANT)
    block.set_spec("current_density")
    start = {name: block[f"param.cell.{name}"] for name in FREE}
    result = block.fit(measured, FREE, progress=False)

    table = result.parameters
    table["bench (invented)"] = [start[n] * BENCH_FACTORS[n] for n in FREE]
    print(table[["start", "value", "standard_error", "low_95", "high_95", "unit", "bench (invented)"]]
          .to_string(float_format="{:.4g}".format))
    print(f"RMSE of the cell voltage: {result.rmse['cell.voltage'] * 1e3:.2f} mV over {result.data.points} points "
          f"({result.iterations} iterations)")
    for warning in result.warnings:
        print(f"warning: {warning}")
    correlation = pd.DataFrame(result.correlation, index=FREE, columns=FREE)
    print("correlation of the estimates:")
    print(correlation.round(3).to_string())

    result.save_plant(out / "fitted-plant.json")
    plots.save(plots.fit(result), out / "fit")
    print(f"wrote {out / 'bench.csv'}, {out / 'fitted-plant.json'}, {out / 'fit.png'} and {out / 'fit.svg'}")


if __name__ == "__main__":
    main()
