#!/usr/bin/python3
"""Timings of the Python package, run by hand (never by a test: timings are not assertions).

    PYTHONPATH=build/adapters/python /usr/bin/python3 tests/python/benchmark.py [--points 2000000]

Prints: the cost of one call (get, solve, a one-point batch) against the bare ctypes call; a fit
of six parameters to 100 points against ely_block_fit called through bare ctypes; the
cost per point of a large batch against the library's own batch called directly through
ctypes (the difference is what the package adds: building the input matrix and the result);
and the speed-up of elyblock.distributed.batch on a LocalCluster of 2 worker processes over a
local batch, beside the speed-up of two local threads on two clones (what two cores of the
machine give at that moment, without any transfer). The best of several repeats is reported
(the machine may be shared).
"""
import argparse
import ctypes
import pathlib
import statistics
import time
import warnings

import numpy as np

import elyblock
import elyblock.distributed
from elyblock import _capi

DEMO_PLANT = pathlib.Path(__file__).resolve().parents[2] / "examples" / "demo-plant.json"


def best(function, repeat=7, number=1, clock=time.perf_counter):
    times = []
    for _ in range(repeat):
        started = clock()
        for _ in range(number):
            function()
        times.append((clock() - started) / number)
    return min(times), statistics.median(times)


def report(label, seconds, per=1, unit="us"):
    scale = {"us": 1e6, "ns": 1e9, "s": 1.0}[unit]
    print(f"  {label:<58} {seconds[0] / per * scale:10.3f} {unit} (median {seconds[1] / per * scale:.3f})")


def raw_batch(block, names, matrix, outputs):
    """The library's batch through bare ctypes, on prepared arrays (what the package calls)."""
    in_idx = np.array([block._index(n) for n in names], dtype=np.int32)
    out_idx = np.array([block._index(n) for n in outputs], dtype=np.int32)
    values = np.empty((len(matrix), len(outputs)))
    status = np.empty(len(matrix), dtype=np.int32)
    none = _capi.PROGRESS()
    return lambda: _capi.lib.ely_block_solve_batch(block._handle, len(matrix), len(in_idx), in_idx.ctypes.data,
                                                   matrix.ctypes.data, len(out_idx), out_idx.ctypes.data,
                                                   values.ctypes.data, status.ctypes.data, none, None)


def main():
    parser = argparse.ArgumentParser()
    parser.add_argument("--points", type=int, default=2_000_000)
    parser.add_argument("--skip-distributed", action="store_true")
    args = parser.parse_args()
    warnings.simplefilter("ignore")
    b = elyblock.Block(DEMO_PLANT)
    b.solve(current_density=1.5e4)
    index = b._index("cell.voltage")
    value = ctypes.c_double()

    print(f"elyblock {elyblock.__version__}, library {elyblock.library_path}")
    print("one call:")
    report("bare ctypes ely_block_get", best(lambda: _capi.lib.ely_block_get(b._handle, index, ctypes.byref(value)),
                                              number=100_000))
    report('b["cell.voltage"]', best(lambda: b["cell.voltage"], number=100_000))
    report("b.solve(current_density=1.5e4) (set + solve)", best(lambda: b.solve(current_density=1.5e4), number=20_000))
    one = {"in.current_density": np.array([1.5e4])}
    outputs = ["cell.voltage", "product.hydrogen", "plant.power"]
    report("b.batch(1 point, 3 outputs)", best(lambda: b.batch(one, outputs, progress=False), number=5_000))
    report("bare ctypes ely_block_solve_batch(1 point, 3 outputs)",
           best(raw_batch(b, list(one), np.array([[1.5e4]]), outputs), number=5_000))
    c = elyblock.Block(DEMO_PLANT)
    report("b.batch(1 point) on a block with inputs set since its solve",
           best(lambda: (c.__setitem__("in.temperature", 340.0), c.batch(one, outputs, progress=False)), number=2_000))
    fit_timings()
    simulate_timings()

    n = args.points
    rng = np.random.default_rng(1)
    grid = {"in.current_density": rng.uniform(1e3, 2.5e4, n)}
    print(f"per point, {n} points, current-density spec, temperature fixed:")
    matrix = np.ascontiguousarray(grid["in.current_density"][:, None])
    raw = best(raw_batch(b, list(grid), matrix, outputs), repeat=3)
    mine = best(lambda: b.batch(grid, outputs, progress=False), repeat=3)
    report("bare ctypes ely_block_solve_batch", raw, per=n, unit="ns")
    report("Block.batch (dict of arrays)", mine, per=n, unit="ns")
    print(f"  {'package overhead per point':<58} {(mine[0] - raw[0]) / n * 1e9:10.3f} ns")

    if args.skip_distributed:
        return
    from dask.distributed import Client, LocalCluster
    print(f"distributed on 2 local worker processes vs local, {n} points:")
    power = {"in.power": rng.uniform(3e6, 2.4e7, n)}
    cases = [("current-density spec, T varying", {**grid, "in.temperature": rng.uniform(320, 355, n)}, None),
             ("power spec", power, "power")]
    with LocalCluster(n_workers=2, threads_per_worker=1, processes=True, dashboard_address=None,
                      host="127.0.0.1") as cluster, Client(cluster) as client:
        for label, inputs, spec in cases:
            local = best(lambda: b.batch(inputs, outputs, spec=spec, progress=False), repeat=3)
            elyblock.distributed.batch(client, DEMO_PLANT, inputs, outputs, spec=spec)  # warm the workers
            spread = best(lambda: elyblock.distributed.batch(client, DEMO_PLANT, inputs, outputs, spec=spec,
                                                             progress=False), repeat=3)
            threads = best(lambda: two_threads(b, inputs, outputs, spec), repeat=3)
            print(f"  {label:<34} local {local[0]:.3f} s, 2 workers {spread[0]:.3f} s, speed-up "
                  f"{local[0] / spread[0]:.2f} (2 local threads, each a clone on half: {local[0] / threads[0]:.2f})")


# The fit of tests/benchmarks/bench_calibration.cpp: six cell parameters, 100 points at four
# temperatures, 2 mV of scatter (invented for the benchmark), start values 10 % off.
FIT_PLANT = {"technology": "pem", "stack": {"cells": 100, "active_area": 0.1},
             "cell": {"cathode_exchange_current_density": 30, "h2_recombination_fraction_anode": 0.9},
             "operating": {"spec": "current_density", "temperature": 353.15}}
FIT_FREE = ["anode_exchange_current_density", "anode_transfer_coefficient_forward", "anode_activation_energy",
            "contact_resistance", "membrane_water_content", "cathode_exchange_current_density"]


def fit_timings():
    """Block.fit against ely_block_fit through bare ctypes on the same arrays: both start from a
    clone of the same block (its cost is in both), so the difference is what the package adds
    (data preparation, names, options, the report and the plant read back, the result object)."""
    truth = elyblock.Block(FIT_PLANT)
    j = np.tile(np.linspace(5000.0, 20000.0, 25), 4)
    t = np.repeat([323.15, 338.15, 353.15, 363.15], 25)
    v = truth.batch({"in.current_density": j, "in.temperature": t}, ["cell.voltage"])["cell.voltage"]
    v = v + np.random.default_rng(11).normal(0.0, 0.002, v.size)
    start = truth.clone()
    for name in FIT_FREE:
        start[f"param.cell.{name}"] = 1.1 * start[f"param.cell.{name}"]
    data = {"in.current_density": j, "in.temperature": t, "cell.voltage": v}
    inputs = np.ascontiguousarray(np.column_stack([j, t]))
    measured = np.ascontiguousarray(v[:, None])
    in_idx = np.array([start._index("in.current_density"), start._index("in.temperature")], dtype=np.int32)
    out_idx = np.array([start._index("cell.voltage")], dtype=np.int32)
    names = (ctypes.c_char_p * len(FIT_FREE))(*[n.encode() for n in FIT_FREE])
    none = _capi.PROGRESS()

    def bare():
        b = start.clone()
        result = ctypes.c_void_p()
        status = _capi.lib.ely_block_fit(b._handle, len(j), 2, in_idx.ctypes.data, inputs.ctypes.data, 1,
                                         out_idx.ctypes.data, measured.ctypes.data, None, len(FIT_FREE), names, None,
                                         none, None, ctypes.byref(result))
        assert status >= 0, _capi.last_error()
        _capi.lib.ely_fit_destroy(result)

    print("fit, 6 parameters, 100 points (the problem of bench_calibration):")
    raw = best(bare, repeat=7)
    mine = best(lambda: start.clone().fit(data, FIT_FREE, progress=False), repeat=7)
    report("bare ctypes ely_block_fit", raw, unit="s")
    report("Block.fit (dict of arrays, result with report and plant)", mine, unit="s")
    print(f"  {'package overhead per fit':<58} {(mine[0] - raw[0]) * 1e3:10.3f} ms")


def simulate_timings():
    """The demo year (8761 hourly rows) through Block.simulate against ely_block_simulate called
    through bare ctypes with the same SI columns; and the same year read as the CSV's DataFrame,
    whose units in the column names the package converts."""
    import pandas as pd
    frame = pd.read_csv(DEMO_PLANT.parent / "profiles" / "windsolar-year.csv", comment="#")
    frame["in.mode_request"] = 3
    times = frame["time [h]"].to_numpy() * 3600.0
    columns = {"in.power": frame["power [MW]"].to_numpy() * 1e6,
               "in.ambient_temperature": frame["in.ambient_temperature [degC]"].to_numpy() + 273.15,
               "in.mode_request": frame["in.mode_request"].to_numpy(dtype=float)}
    outputs = ["stack.temperature", "gas.h2_in_o2", "product.hydrogen", "plant.power"]
    b = elyblock.Block(DEMO_PLANT)
    b.set_spec("power")
    in_idx = np.array([b._index(n) for n in columns], dtype=np.int32)
    out_idx = np.array([b._index(n) for n in outputs], dtype=np.int32)
    matrix = np.ascontiguousarray(np.column_stack(list(columns.values())))
    n = len(times)
    values, status = np.empty((n, len(outputs))), np.empty(n, dtype=np.int32)

    def bare():
        s = _capi.lib.ely_block_simulate(b._handle, n, times.ctypes.data, len(in_idx), in_idx.ctypes.data,
                                         matrix.ctypes.data, len(out_idx), out_idx.ctypes.data, values.ctypes.data,
                                         status.ctypes.data, _capi.PROGRESS(), None)
        assert s >= 0, _capi.last_error()

    # CPU time of this process: the calls run on one thread, and the machine may be shared.
    print(f"a profile run, the demo year ({n} hourly rows, {len(outputs)} outputs), CPU time:")
    cpu = time.process_time
    raw = best(bare, repeat=3, clock=cpu)
    mine = best(lambda: b.simulate(dict(time=times, **columns), outputs, progress=False), repeat=3, clock=cpu)
    units = best(lambda: b.simulate(frame, outputs, time="time", progress=False), repeat=3, clock=cpu)
    report("bare ctypes ely_block_simulate", raw, unit="s")
    report("Block.simulate, dict of SI arrays", mine, unit="s")
    report("Block.simulate, the CSV's DataFrame (units converted)", units, unit="s")
    print(f"  {'package overhead per run (SI arrays)':<58} {(mine[0] - raw[0]) * 1e3:10.3f} ms")


def two_threads(block, inputs, outputs, spec):
    """The batch split in two halves, each on its own clone in its own thread (ctypes releases the
    GIL during the call): what two cores of this machine give without any transfer."""
    import threading
    n = len(next(iter(inputs.values())))
    halves = [{k: v[:n // 2] for k, v in inputs.items()}, {k: v[n // 2:] for k, v in inputs.items()}]
    threads = [threading.Thread(target=block.clone().batch, args=(h, outputs), kwargs={"spec": spec, "progress": False})
               for h in halves]
    for t in threads:
        t.start()
    for t in threads:
        t.join()


if __name__ == "__main__":
    main()
