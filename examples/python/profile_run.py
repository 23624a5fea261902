#!/usr/bin/python3
"""A year of wind and sun: the demo plant in time.

The demo plant (examples/demo-plant.json, an invented scenario) runs through a year of hourly DC
power from an invented wind farm and solar park (examples/profiles/windsolar-year.csv, written by
make_windsolar.py with a fixed seed; no measured data), with the ambient temperature of the same
invented year, standing by whenever the power falls below its minimum load (in.mode_request 3,
automatic). One call of the library runs the year (Block.simulate over ely_block_simulate, with a
progress bar on a terminal; Ctrl-C stops it); the run summary gives the year's hydrogen, energy,
hours in each mode, start-ups and alarm hours. Then a controller's view: the state at the end of
the year is saved, restored into a second block, and stepped on for a day at 1-minute steps.

Writes run.csv (the series, SI), summary.json and profile_run.png/.svg (load duration curve,
stack temperature and H2-in-O2 traces) into the output folder.

    /usr/bin/python3 examples/python/profile_run.py [--output-dir DIR] [--days N]
"""
import argparse
import json
import pathlib
import warnings

import numpy as np
import pandas as pd

import elyblock
from elyblock import plots

HERE = pathlib.Path(__file__).resolve().parent
DEMO_PLANT = HERE.parent / "demo-plant.json"
YEAR = HERE.parent / "profiles" / "windsolar-year.csv"
AUTOMATIC = 3  # in.mode_request: production above the minimum load, hot standby below
OUTPUTS = plots.RUN_OUTPUTS + ["product.hydrogen", "plant.power", "alarm.h2_in_o2_warning"]


def profile(days=None):
    """The invented year (or its first days), with the automatic mode request as a column."""
    frame = pd.read_csv(YEAR, comment="#", skipinitialspace=True)
    if days is not None:
        frame = frame.iloc[:days * 24 + 1]
    frame["in.mode_request"] = AUTOMATIC
    return frame


def summary_lines(report):
    """The run summary as the command line shows it: label, value in its display unit."""
    lines = []
    for figure in report["figures"].values():
        value = figure["value"]
        if value is None or (isinstance(value, float) and np.isnan(value)):
            continue
        shown = value * figure["display_scale"] + figure["display_offset"]
        unit = "" if figure["display_unit"] == "1" else figure["display_unit"]
        lines.append(f"  {figure['label']:<66}{shown:>14.6g} {unit}")
    return lines


def main(argv=None):
    parser = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    parser.add_argument("--output-dir", type=pathlib.Path, default=pathlib.Path("."))
    parser.add_argument("--days", type=int, default=None, help="run only the first days of the year")
    args = parser.parse_args(argv)
    args.output_dir.mkdir(parents=True, exist_ok=True)

    block = elyblock.Block(DEMO_PLANT)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", elyblock.ElyWarning)  # alarms are part of the story: the summary counts them
        run = block.simulate(profile(args.days), OUTPUTS, with_status=True)
    run.to_csv(args.output_dir / "run.csv", index=False, float_format="%.17g")
    report = block.run_summary(full=True)
    (args.output_dir / "summary.json").write_text(json.dumps(report, indent=1, default=float))
    print(f"Run of the {report['technology']} plant from t = {report['start_time'] / 3600:g} h "
          f"to {report['end_time'] / 3600:g} h")
    print("\n".join(summary_lines(report)))
    for path in plots.save(plots.profile_run(run, block=block), args.output_dir / "profile_run"):
        print(f"wrote {path}")

    # A controller's view: the plant's state at the end of the run, restored into another block of the
    # same description, stepped on minute by minute at a steady 15 MW for a day.
    follower = elyblock.Block(DEMO_PLANT)
    follower.restore_state(block.save_state())
    follower.set_spec("power")
    hydrogen = 0.0
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", elyblock.ElyWarning)
        follower.advance(0.0, power=15e6, mode_request=2)
        for _ in range(24 * 60):
            rate_before = follower["product.hydrogen"]
            follower.advance(60.0)
            hydrogen += 0.5 * (rate_before + follower["product.hydrogen"]) * 60.0
    print(f"one more day at 15 MW from the state at the end: {hydrogen / 1000:.4g} t of hydrogen, stack at "
          f"{follower['stack.temperature'] - 273.15:.4g} degC, {follower['state.hours_operated']:.6g} operating hours")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
