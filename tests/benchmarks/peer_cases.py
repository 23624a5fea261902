#!/usr/bin/python3 -B
"""The library beside the numpy peer: adds elyblock's batch cases to the shared harness
(peer_bench.py, in ../shared/bench beside the checkout) and runs it, so that the peer rows and
the library rows come from one run on the same inputs.

    /usr/bin/python3 -B tests/benchmarks/peer_cases.py [--lib build/abi/libelyblock.so]
        [--peer-dir DIR] [--threads N] [peer_bench options: --n 1000000 --reps 7 --json FILE ...]

Cases added (through ely_block_solve_batch over ctypes, the inputs handed over as the row-major
matrix that call reads, built inside the timed call, and through ely_block_solve_batch_columns with
the arrays as they are; the eleven outputs that
correspond to the peer's eleven: voltage and its five parts, Faraday efficiency, hydrogen,
DC power, specific energy, H2 in O2):
  library batch evaluate          spec current_density, inputs j, T, p_c, p_a per point
  library batch power solve       spec power, inputs P, T, p_c, p_a per point (kind "solve")
  ... the same two through ely_block_solve_batch_columns (the numpy arrays handed over as they are,
      the outputs as contiguous columns).
  ... with --threads N also the same two through ely_block_solve_batch_threads (information).

The plant is the peer's stack (100 cells x 0.1 m2, PARAMS of peer_numpy) with the cell
parameters that have a counterpart in the peer set to the peer's values; the library's own model
does more per point (crossover with supersaturation and oxygen permeation, gas coolers,
condensate, the energy balance with IAPWS-IF97 water, alarms), which the comparison accepts.

When the harness is not found the script says so and exits 0 (nothing to compare with).
"""
import argparse
import ctypes
import json
import os
import sys

sys.dont_write_bytecode = True
HERE = os.path.dirname(os.path.abspath(__file__))
ROOT = os.path.dirname(os.path.dirname(HERE))


def find_peer_dir(given):
    candidates = [given] if given else []
    candidates += [os.environ.get("ELY_PEER_BENCH_DIR"),
                   os.path.join(ROOT, "..", "shared", "bench"),
                   os.path.join(ROOT, "..", "..", "shared", "bench")]
    for c in candidates:
        if c and os.path.isfile(os.path.join(c, "peer_bench.py")):
            return os.path.abspath(c)
    return None


def plant_json(pn, spec):
    """The peer's stack and, where the library's PEM cell has the same parameter, the peer's value."""
    p = pn.PARAMS
    cell = {
        "membrane_thickness": p["delta_mem"],
        "membrane_water_content": p["lambda_mem"],
        "contact_resistance": p["asr_el"],
        "anode_exchange_current_density": p["j0_a"],
        "anode_activation_energy": p["Ea_a"],
        "anode_transfer_coefficient_forward": p["alpha_a"],
        "anode_transfer_coefficient_backward": p["alpha_a"],
        "cathode_exchange_current_density": p["j0_c"],
        "cathode_activation_energy": p["Ea_c"],
        "cathode_transfer_coefficient_forward": p["alpha_c"],
        "cathode_transfer_coefficient_backward": p["alpha_c"],
        "limiting_current_density": p["j_lim"],
        "h2_permeability": p["perm_H2"],
        "h2_permeability_activation_energy": p["E_perm"],
    }
    return json.dumps({"technology": "pem", "name": "peer stack",
                       "stack": {"cells": p["n_cells"], "active_area": p["area"]},
                       "cell": cell, "operating": {"spec": spec, "power": 1.0e5}})


OUTPUTS = ("cell.voltage", "cell.reversible_voltage", "cell.activation_anode", "cell.activation_cathode",
           "cell.ohmic", "cell.concentration", "cell.faraday_efficiency", "product.hydrogen", "stack.power",
           "perf.specific_energy", "gas.h2_in_o2")


class Library:
    def __init__(self, path):
        self.lib = ctypes.CDLL(path)
        L = self.lib
        L.ely_block_create.argtypes = [ctypes.c_char_p, ctypes.POINTER(ctypes.c_void_p)]
        L.ely_block_find.argtypes = [ctypes.c_void_p, ctypes.c_char_p, ctypes.POINTER(ctypes.c_int32)]
        L.ely_last_error.restype = ctypes.c_char_p
        L.ely_block_solve_batch.argtypes = [ctypes.c_void_p, ctypes.c_size_t, ctypes.c_int32, ctypes.c_void_p,
                                            ctypes.c_void_p, ctypes.c_int32, ctypes.c_void_p, ctypes.c_void_p,
                                            ctypes.c_void_p, ctypes.c_void_p, ctypes.c_void_p]
        self.columns = getattr(L, "ely_block_solve_batch_columns", None)
        if self.columns is not None:
            self.columns.argtypes = [ctypes.c_void_p, ctypes.c_size_t, ctypes.c_int32, ctypes.c_void_p, ctypes.c_void_p,
                                     ctypes.c_int32, ctypes.c_void_p, ctypes.c_void_p, ctypes.c_void_p, ctypes.c_void_p,
                                     ctypes.c_void_p]
        self.threads = getattr(L, "ely_block_solve_batch_threads", None)
        if self.threads is not None:
            self.threads.argtypes = [ctypes.c_void_p, ctypes.c_size_t, ctypes.c_int32, ctypes.c_void_p,
                                     ctypes.c_void_p, ctypes.c_int32, ctypes.c_void_p, ctypes.c_void_p,
                                     ctypes.c_void_p, ctypes.c_int32, ctypes.c_void_p, ctypes.c_void_p]

    def block(self, text):
        b = ctypes.c_void_p()
        if self.lib.ely_block_create(text.encode(), ctypes.byref(b)) != 0:
            raise RuntimeError(self.lib.ely_last_error().decode())
        return b

    def index(self, block, name):
        i = ctypes.c_int32(-1)
        if self.lib.ely_block_find(block, name.encode(), ctypes.byref(i)) != 0:
            raise RuntimeError(self.lib.ely_last_error().decode())
        return i.value


def make_case(np, lib, block, input_names, output_names, threads=0):
    idx_in = np.array([lib.index(block, n) for n in input_names], dtype=np.int32)
    idx_out = np.array([lib.index(block, n) for n in output_names], dtype=np.int32)

    def run(columns):
        n = columns[0].size
        matrix = np.empty((n, len(columns)))
        for k, c in enumerate(columns):
            matrix[:, k] = c
        out = np.empty((n, idx_out.size))
        status = np.empty(n, dtype=np.int32)
        args = [block, n, idx_in.size, idx_in.ctypes.data, matrix.ctypes.data, idx_out.size, idx_out.ctypes.data,
                out.ctypes.data, status.ctypes.data]
        if threads:
            rc = lib.threads(*args, threads, None, None)
        else:
            rc = lib.lib.ely_block_solve_batch(*args, None, None)
        if rc < 0 or rc == 2:
            raise RuntimeError(f"batch status {rc}: {lib.lib.ely_last_error().decode()}")
        return out, status
    return run


def make_columns_case(np, lib, block, input_names, output_names):
    """The same through ely_block_solve_batch_columns: the caller's arrays as they are, the outputs as
    the rows of one (n_outputs, n) array (each a contiguous column of the call)."""
    idx_in = np.array([lib.index(block, n) for n in input_names], dtype=np.int32)
    idx_out = np.array([lib.index(block, n) for n in output_names], dtype=np.int32)

    def run(columns):
        n = columns[0].size
        cols = [np.ascontiguousarray(c, dtype=np.float64) for c in columns]
        in_ptr = (ctypes.c_void_p * len(cols))(*[c.ctypes.data for c in cols])
        out = np.empty((idx_out.size, n))
        out_ptr = (ctypes.c_void_p * idx_out.size)(*[out[o].ctypes.data for o in range(idx_out.size)])
        status = np.empty(n, dtype=np.int32)
        rc = lib.columns(block, n, idx_in.size, idx_in.ctypes.data, ctypes.addressof(in_ptr), idx_out.size,
                         idx_out.ctypes.data, ctypes.addressof(out_ptr), status.ctypes.data, None, None)
        if rc < 0 or rc == 2:
            raise RuntimeError(f"batch status {rc}: {lib.lib.ely_last_error().decode()}")
        return out.T, status
    return run


def main(argv=None):
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0], add_help=True)
    ap.add_argument("--lib", default=os.path.join(ROOT, "build", "abi", "libelyblock.so"))
    ap.add_argument("--peer-dir", help="folder of peer_bench.py (default ../shared/bench beside the checkout)")
    ap.add_argument("--threads", type=int, default=0, help="also time the threaded batch with this many threads")
    a, rest = ap.parse_known_args(argv)
    peer = find_peer_dir(a.peer_dir)
    if peer is None:
        print("skipped: the peer harness (peer_bench.py) was not found; give --peer-dir or ELY_PEER_BENCH_DIR")
        return 0
    if not os.path.isfile(a.lib):
        print(f"skipped: {a.lib} not found; build the library first (cmake --build build --target elyblock)")
        return 0
    sys.path.insert(0, peer)
    import numpy as np
    import peer_bench as pb
    import peer_numpy as pn

    lib = Library(a.lib)
    evaluate = lib.block(plant_json(pn, "current_density"))
    solve = lib.block(plant_json(pn, "power"))
    ev = make_case(np, lib, evaluate, ("in.current_density", "in.temperature", "in.pressure_cathode",
                                        "in.pressure_anode"), OUTPUTS)
    so = make_case(np, lib, solve, ("in.power", "in.temperature", "in.pressure_cathode", "in.pressure_anode"), OUTPUTS)

    # Check once, outside the timing, that every point solves and the power solve meets its target.
    x = pb.make_inputs(20000)
    out, st = ev((x["j"], x["T"], x["p_c"], x["p_a"]))
    assert (st >= 0).all(), "evaluate: some points failed"
    out, st = so((x["P"], x["T"], x["p_c"], x["p_a"]))
    assert (st >= 0).all(), "power solve: some points failed"
    assert np.allclose(out[:, OUTPUTS.index("stack.power")], x["P"], rtol=1e-9, atol=0)

    if lib.columns is not None:
        evc = make_columns_case(np, lib, evaluate, ("in.current_density", "in.temperature", "in.pressure_cathode",
                                                     "in.pressure_anode"), OUTPUTS)
        soc = make_columns_case(np, lib, solve, ("in.power", "in.temperature", "in.pressure_cathode",
                                                  "in.pressure_anode"), OUTPUTS)
        out_r, _ = ev((x["j"], x["T"], x["p_c"], x["p_a"]))
        out_c, st = evc((x["j"], x["T"], x["p_c"], x["p_a"]))
        assert (st >= 0).all() and np.array_equal(out_c, out_r), "columns: not the row-major call's outputs"
        pb.add_case("library batch evaluate (ely_block_solve_batch_columns)",
                    lambda x: evc((x["j"], x["T"], x["p_c"], x["p_a"])))
        pb.add_case("library batch power solve (ely_block_solve_batch_columns)",
                    lambda x: soc((x["P"], x["T"], x["p_c"], x["p_a"])), kind="solve")
    pb.add_case("library batch evaluate (ely_block_solve_batch)",
                lambda x: ev((x["j"], x["T"], x["p_c"], x["p_a"])))
    pb.add_case("library batch power solve (ely_block_solve_batch)",
                lambda x: so((x["P"], x["T"], x["p_c"], x["p_a"])), kind="solve")
    if a.threads and lib.threads is not None:
        evt = make_case(np, lib, evaluate, ("in.current_density", "in.temperature", "in.pressure_cathode",
                                             "in.pressure_anode"), OUTPUTS, a.threads)
        sot = make_case(np, lib, solve, ("in.power", "in.temperature", "in.pressure_cathode", "in.pressure_anode"),
                        OUTPUTS, a.threads)
        pb.add_case(f"library batch evaluate, {a.threads} threads (info)",
                    lambda x: evt((x["j"], x["T"], x["p_c"], x["p_a"])))
        pb.add_case(f"library batch power solve, {a.threads} threads (info)",
                    lambda x: sot((x["P"], x["T"], x["p_c"], x["p_a"])), kind="solve")
    return pb.main(rest)


if __name__ == "__main__":
    raise SystemExit(main())
