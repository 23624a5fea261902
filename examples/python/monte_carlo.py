#!/usr/bin/python3
"""Monte Carlo: the demo plant's yearly hydrogen when its kinetics and degradation are uncertain.

The demo plant (examples/demo-plant.json, an invented scenario) runs a year on an invented hourly
power profile (wind and sun of our own making, fixed seed). Three of its parameters are drawn
at random for each sample: the anode exchange current density (log-normal), the anode transfer
coefficient (normal) and the voltage degradation rate (uniform); the spreads are invented for
the demo. Each sample's year is one batch call at the power spec (hours below the minimum load
are off), with the operating hours, and so the degradation, growing through the year.

Locally (default) the samples run one after another; with --scheduler ADDRESS they run on a Dask
cluster, and with --local-cluster N on N local worker processes, through
elyblock.distributed.batch_plants (one task per sample, reduced on the worker to its totals).
Writes samples.csv and yearly_hydrogen.png/.svg into the output folder.

    /usr/bin/python3 examples/python/monte_carlo.py [--samples 200] [--local-cluster 2] [--output-dir DIR]
"""
import argparse
import json
import pathlib
import time

import numpy as np
import pandas as pd
from matplotlib.figure import Figure

import elyblock
import elyblock.distributed
from elyblock import plots

HERE = pathlib.Path(__file__).resolve().parent
DEMO_PLANT = HERE.parent / "demo-plant.json"
HOURS = 8760
OUTPUTS = ["product.hydrogen", "plant.power", "cell.voltage"]


def power_profile(rated_power, seed=2024):
    """An invented hourly DC power profile for one year, W: wind as a slowly varying random
    capacity factor, sun as a clipped daily sine with a seasonal swing (all invented)."""
    rng = np.random.default_rng(seed)
    hours = np.arange(HOURS)
    wind = np.empty(HOURS)
    wind[0] = 0.4
    for h in range(1, HOURS):  # first-order autoregressive, a day or so of memory (invented)
        wind[h] = wind[h - 1] + 0.04 * (0.38 - wind[h - 1]) + 0.06 * rng.standard_normal()
    wind = np.clip(wind, 0.0, 1.0)
    season = 0.75 + 0.25 * np.cos(2 * np.pi * (hours / 24 - 172) / 365)
    sun = np.clip(np.sin(2 * np.pi * ((hours % 24) - 6) / 24), 0.0, None) * season
    return rated_power * np.clip(0.7 * wind + 0.45 * sun, 0.0, 0.95)


def draw_plants(base, samples, power, seed=7):
    """Plant descriptions with the uncertain parameters drawn (spreads invented for the demo),
    at the power spec with ``power`` (W) as their initial power."""
    rng = np.random.default_rng(seed)
    exchange = 1e-3 * np.exp(rng.normal(0.0, np.log(2.0), samples))   # A/m2, median 1e-3, factor 2 at 1 sigma
    transfer = rng.normal(1.5, 0.08, samples)                          # anode transfer coefficient
    degradation = rng.uniform(2e-6, 8e-6, samples)                     # V/h
    plants = []
    for j0, alpha, rate in zip(exchange, transfer, degradation):
        cell = dict(base.get("cell", {}), anode_exchange_current_density=float(j0),
                    anode_transfer_coefficient_forward=float(alpha), anode_transfer_coefficient_backward=float(alpha))
        plant = dict(base, cell=cell, plant=dict(base["plant"], degradation={"voltage_rate": float(rate)}))
        plant["operating"] = dict(base["operating"], spec="power", power=float(power))
        plants.append(plant)
    parameters = pd.DataFrame({"anode_exchange_current_density": exchange, "anode_transfer_coefficient": transfer,
                               "voltage_rate_uV_per_h": degradation * 1e6})
    return plants, parameters


def year_totals(result):
    """A year's totals from one sample's batch (runs on the Dask worker when distributed)."""
    hydrogen = float(np.nansum(result["product.hydrogen"]) * 3600.0)      # kg
    energy = float(np.nansum(result["plant.power"]) * 3600.0)             # J, AC
    return {"hydrogen_t": hydrogen / 1000.0, "energy_GWh": energy / 3.6e12,
            "specific_energy_kWh_per_kg": energy / 3.6e6 / hydrogen,
            "voltage_end_V": float(result["cell.voltage"][np.isfinite(result["cell.voltage"])][-1]),
            "failed_hours": int(np.count_nonzero(result["status"] < 0))}


def year_inputs(base):
    """The hours the plant runs (above its minimum load) with their power and operating hours."""
    block = elyblock.Block(base)
    block.solve(current_density=block["param.current_density_max"])
    rated = block["stack.power"]
    power = power_profile(rated)
    running = power >= 0.12 * rated  # the minimum load is 10 % of the current density; keep a margin
    hours_operated = base["operating"].get("hours_operated", 0) + np.cumsum(running)[running]
    return {"in.power": power[running], "in.hours_operated": hours_operated.astype(float)}, rated, running.sum()


def histogram(table):
    figure = Figure(figsize=(7.0, 4.5), layout="constrained")
    ax = figure.add_subplot()
    ax.hist(table["hydrogen_t"], bins=30, color="tab:blue", alpha=0.8)
    for q, style in ((0.1, ":"), (0.5, "-"), (0.9, ":")):
        ax.axvline(table["hydrogen_t"].quantile(q), color="black", linestyle=style, label=f"P{q * 100:.0f}")
    ax.set_xlabel("hydrogen in the year [t]")
    ax.set_ylabel("samples")
    ax.set_title("yearly hydrogen with uncertain kinetics and degradation")
    ax.legend(fontsize="small")
    return figure


def run(plants, inputs, client=None):
    if client is None:
        return [year_totals(elyblock.Block(p).batch(inputs, OUTPUTS, with_status=True)) for p in plants]
    return elyblock.distributed.batch_plants(client, plants, inputs, OUTPUTS, with_status=True, reduce=year_totals)


def main(argv=None):
    parser = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    parser.add_argument("--plant", type=pathlib.Path, default=DEMO_PLANT)
    parser.add_argument("--samples", type=int, default=200)
    parser.add_argument("--output-dir", type=pathlib.Path, default=pathlib.Path("."))
    where = parser.add_mutually_exclusive_group()
    where.add_argument("--scheduler", help="address of a Dask scheduler, e.g. tcp://10.0.0.5:8786")
    where.add_argument("--local-cluster", type=int, metavar="N", help="run on N local Dask worker processes")
    args = parser.parse_args(argv)
    args.output_dir.mkdir(parents=True, exist_ok=True)

    base = json.loads(args.plant.read_text())
    inputs, rated, running = year_inputs(base)
    plants, parameters = draw_plants(base, args.samples, np.median(inputs["in.power"]))
    print(f"elyblock {elyblock.__version__}: {args.samples} samples of a year, {running} running hours of "
          f"{HOURS}, rated DC power {rated / 1e6:.1f} MW")

    if args.scheduler or args.local_cluster:
        from dask.distributed import Client, LocalCluster
        cluster = None if args.scheduler else LocalCluster(n_workers=args.local_cluster, threads_per_worker=1,
                                                           processes=True, dashboard_address=None)
        with Client(args.scheduler or cluster) as client:
            started = time.perf_counter()
            totals = run(plants, inputs, client)
            elapsed = time.perf_counter() - started
        if cluster is not None:
            cluster.close()
    else:
        started = time.perf_counter()
        totals = run(plants, inputs)
        elapsed = time.perf_counter() - started

    table = pd.concat([parameters, pd.DataFrame(totals)], axis=1)
    table.to_csv(args.output_dir / "samples.csv", index=False)
    h2 = table["hydrogen_t"]
    print(f"{elapsed:.2f} s for {args.samples * running} operating points")
    print(f"yearly hydrogen: P10 {h2.quantile(0.1):.0f} t, P50 {h2.quantile(0.5):.0f} t, P90 {h2.quantile(0.9):.0f} t; "
          f"specific energy (AC) P50 {table['specific_energy_kWh_per_kg'].median():.1f} kWh/kg")
    if table["failed_hours"].any():
        print(f"hours that failed to solve: {int(table['failed_hours'].sum())} over all samples")
    plots.save(histogram(table), args.output_dir / "yearly_hydrogen")
    return 0


if __name__ == "__main__":  # Dask's worker processes import this file: run only when started
    raise SystemExit(main())
