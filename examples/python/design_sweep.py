#!/usr/bin/python3
"""Design sweep: how many stacks for the demo plant, and at what temperature?

The demo plant (examples/demo-plant.json, an invented scenario) must deliver a fixed hydrogen
rate. For each stack count the block is solved at that rate (spec "hydrogen_rate") over a range
of stack temperatures in one batch call; fewer stacks run at a higher current density and pay
in specific energy, more stacks cost more. A levelized cost with invented demo prices picks
the design. Writes sweep.csv and the figures design.png/.svg, polarization.png/.svg and
efficiency.png/.svg of the chosen design into the output folder.

    /usr/bin/python3 examples/python/design_sweep.py [--output-dir DIR]

(with the package installed: see the README's Python section).
"""
import argparse
import json
import pathlib
import warnings

import numpy as np
import pandas as pd
from matplotlib.figure import Figure

import elyblock
from elyblock import plots

HERE = pathlib.Path(__file__).resolve().parent
DEMO_PLANT = HERE.parent / "demo-plant.json"

# Invented numbers for the demo only (no real prices): what a stack costs per year of its life,
# the price of electricity and the hours of operation per year.
STACK_COST_PER_YEAR = 250_000.0    # currency units per stack and year (invented)
ELECTRICITY_PRICE = 50.0 / 3.6e9   # currency units per J, i.e. 50 per MWh (invented)
HOURS_PER_YEAR = 8000.0            # (invented)
TARGET_HYDROGEN = 0.09             # kg/s, 324 kg/h (invented)

KELVIN = 273.15
OUTPUTS = ["cell.current_density", "perf.load_fraction", "plant.power", "perf.specific_energy_plant", "alarm.any"]


def sweep(base, stacks, temperatures):
    rows = []
    for n in stacks:
        plant = dict(base, stack=dict(base["stack"], stacks=int(n)))
        block = elyblock.Block(plant)
        # One call for all temperatures; points the plant cannot make (too few stacks) fail and
        # come back as NaN with their status, without stopping the others (and without the
        # warning that says so: the table keeps the statuses).
        with warnings.catch_warnings():
            warnings.simplefilter("ignore", elyblock.ElyWarning)
            result = block.batch({"in.hydrogen_rate": TARGET_HYDROGEN, "in.temperature": temperatures}, OUTPUTS,
                                 spec="hydrogen_rate", with_status=True)
        frame = pd.DataFrame(result)
        frame.insert(0, "stacks", int(n))
        frame.insert(1, "temperature_degC", temperatures - KELVIN)
        rows.append(frame)
    table = pd.concat(rows, ignore_index=True)
    seconds = HOURS_PER_YEAR * 3600.0
    energy_cost = table["plant.power"] * seconds * ELECTRICITY_PRICE
    table["cost_per_kg"] = (energy_cost + table["stacks"] * STACK_COST_PER_YEAR) / (TARGET_HYDROGEN * seconds)
    return table


def design_figure(table):
    figure = Figure(figsize=(7.0, 4.5), layout="constrained")
    ax = figure.add_subplot()
    for temperature, rows in table.groupby("temperature_degC"):
        ax.plot(rows["stacks"], rows["cost_per_kg"], marker="o", label=f"{temperature:.0f} °C")
    ax.set_xlabel("stacks")
    ax.set_ylabel("levelized cost per kg H₂ [invented units]")
    ax.set_title(f"{TARGET_HYDROGEN * 3600:.0f} kg/h of hydrogen: stacks and stack temperature")
    ax.grid(alpha=0.3)
    ax.legend(fontsize="small", title="stack temperature")
    return figure


def main(argv=None):
    parser = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    parser.add_argument("--plant", type=pathlib.Path, default=DEMO_PLANT)
    parser.add_argument("--output-dir", type=pathlib.Path, default=pathlib.Path("."))
    parser.add_argument("--stacks", type=int, nargs=2, default=(6, 16), metavar=("FROM", "TO"))
    args = parser.parse_args(argv)
    args.output_dir.mkdir(parents=True, exist_ok=True)

    base = json.loads(args.plant.read_text())
    temperatures = np.arange(50.0, 80.1, 5.0) + KELVIN
    table = sweep(base, np.arange(args.stacks[0], args.stacks[1] + 1), temperatures)
    table.to_csv(args.output_dir / "sweep.csv", index=False)

    feasible = table[table["status"] >= 0]
    best = feasible.loc[feasible["cost_per_kg"].idxmin()]
    print(f"elyblock {elyblock.__version__}: {len(table)} designs, {len(table) - len(feasible)} cannot make "
          f"{TARGET_HYDROGEN * 3600:.0f} kg/h")
    print(f"chosen: {best['stacks']:.0f} stacks at {best['temperature_degC']:.0f} °C, "
          f"{best['cell.current_density'] / 1e4:.2f} A/cm², load {best['perf.load_fraction']:.0%}, "
          f"{best['perf.specific_energy_plant'] / 3.6e6:.1f} kWh/kg (AC plant), "
          f"cost {best['cost_per_kg']:.2f} per kg (invented prices)")

    plots.save(design_figure(table), args.output_dir / "design")
    chosen = dict(base, stack=dict(base["stack"], stacks=int(best["stacks"])))
    chosen["operating"] = dict(base["operating"], temperature=float(best["temperature_degC"] + KELVIN))
    plots.save(plots.polarization(chosen, title=f"chosen design: {best['stacks']:.0f} stacks"),
               args.output_dir / "polarization")
    plots.save(plots.efficiency(chosen), args.output_dir / "efficiency")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
