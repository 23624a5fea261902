"""Fixtures of the Python tests.

Run by CTest (tests/CMakeLists.txt) with /usr/bin/python3 against the build tree's package
(PYTHONPATH=<build>/adapters/python) and with ELYBLOCK_REFERENCE naming the C program
reference.c built there: every number the package gives is compared with what that program
gets from the C interface for the same calls. By hand, from the source folder:

    PYTHONPATH=build/adapters/python ELYBLOCK_REFERENCE=build/tests/elyblock_python_reference \\
        /usr/bin/python3 -m pytest tests/python
"""
import json
import os
import pathlib
import subprocess

import numpy as np
import pytest

SOURCE_DIR = pathlib.Path(os.environ.get("ELYBLOCK_SOURCE_DIR", pathlib.Path(__file__).resolve().parents[2]))
BUILD_DIR = pathlib.Path(os.environ.get("ELYBLOCK_BUILD_DIR", SOURCE_DIR / "build"))
DEMO_PLANT = SOURCE_DIR / "examples" / "demo-plant.json"
MINIMAL = SOURCE_DIR / "examples" / "minimal"
HEADER = SOURCE_DIR / "abi" / "include" / "elyblock" / "elyblock.h"
#: Relative tolerance of every comparison with the C interface.
RTOL = 1e-12


def assert_same(actual, expected, rtol=RTOL, atol=0.0):
    """Equal to the C interface's numbers within 1e-12 relative (NaN where it has NaN)."""
    np.testing.assert_allclose(np.asarray(actual, dtype=float), np.asarray(expected, dtype=float), rtol=rtol,
                               atol=atol, equal_nan=True)


class Reference:
    """The C program reference.c, driven through its stdin (see its header for the commands)."""

    def __init__(self, path):
        self.process = subprocess.Popen([str(path)], stdin=subprocess.PIPE, stdout=subprocess.PIPE, text=True,
                                        bufsize=1)

    def _ask(self, line):
        self.process.stdin.write(line + "\n")
        self.process.stdin.flush()
        return self._reply()

    def _reply(self):
        words = self.process.stdout.readline().split(" ", 2)
        assert words[0] == "status", words
        return int(words[1]), (words[2].rstrip("\n") if len(words) > 2 else "")

    def create(self, plant, tmp_path=None):
        if isinstance(plant, dict):
            path = tmp_path / "reference-plant.json"
            path.write_text(json.dumps(plant))
            plant = path
        return self._ask(f"create {plant}")[0]

    def spec(self, name):
        return self._ask(f"spec {name}")[0]

    def set(self, name, value):
        return self._ask(f"set {name} {float(value).hex()}")[0]

    def solve(self):
        return self._ask("solve")[0]

    def get(self, name):
        status, rest = self._ask(f"get {name}")
        assert status >= 0, rest
        return float.fromhex(rest)

    def values(self, names):
        return {name: self.get(name) for name in names}

    def report(self):
        status, rest = self._ask("report")
        assert status >= 0, rest
        return json.loads(self.process.stdout.readline())

    def variables(self):
        status, rest = self._ask("variables")
        assert status >= 0, rest
        return [self.process.stdout.readline().rstrip("\n").split("\t") for _ in range(int(rest))]

    def water(self, temperature):
        status, rest = self._ask(f"water {float(temperature).hex()}")
        return status, float.fromhex(rest) if status >= 0 else rest

    def voltages(self, temperature, pressure_anode, pressure_cathode):
        status, rest = self._ask(f"voltages {float(temperature).hex()} {float(pressure_anode).hex()} "
                                 f"{float(pressure_cathode).hex()}")
        return status, tuple(float.fromhex(v) for v in rest.split()) if status >= 0 else rest

    def batch(self, inputs, outputs):
        """The C batch: inputs a dict of equally long 1-D arrays. Returns (call status, point
        statuses, dict of output arrays)."""
        names = list(inputs)
        columns = [np.asarray(inputs[n], dtype=float).ravel() for n in names]
        n = len(columns[0])
        lines = [f"batch {n} {len(names)} {len(outputs)}", " ".join(names), " ".join(outputs)]
        lines += [" ".join(float(c[k]).hex() for c in columns) for k in range(n)]
        self.process.stdin.write("\n".join(lines) + "\n")
        self.process.stdin.flush()
        status, rest = self._reply()
        assert status >= 0 or status == -10, rest
        rows = [self.process.stdout.readline().split() for _ in range(n)]
        point_status = np.array([int(r[0]) for r in rows], dtype=np.int32)
        values = {o: np.array([float.fromhex(r[1 + i]) for r in rows]) for i, o in enumerate(outputs)}
        return status, point_status, values

    def fit(self, inputs, measured, free, weights=None, bounds=None):
        """The C fit (ely_block_fit) on the current block: inputs and measured dicts of equally long
        1-D arrays (NaN: not measured), weights a dict by measured name (default 1), bounds a dict
        {name: (low, high)} in SI (NaN: the variable's limit). Returns (status, [(value, standard
        error)], report, plant) or (status, message) on an error."""
        names, outputs = list(inputs), list(measured)
        columns = [np.asarray(inputs[n], dtype=float).ravel() for n in names]
        values = [np.asarray(measured[o], dtype=float).ravel() for o in outputs]
        n = len(values[0])
        w = [np.broadcast_to(np.asarray((weights or {}).get(o, 1.0), dtype=float), (n,)) for o in outputs]
        limits = [(bounds or {}).get(f, (np.nan, np.nan)) for f in free]
        lines = [f"fit {n} {len(names)} {len(outputs)} {len(free)}", " ".join(names), " ".join(outputs), " ".join(free),
                 " ".join(float(b[0]).hex() for b in limits) + " " + " ".join(float(b[1]).hex() for b in limits)]
        lines += [" ".join(float(c[k]).hex() for c in columns + values + w) for k in range(n)]
        self.process.stdin.write("\n".join(lines) + "\n")
        self.process.stdin.flush()
        status, rest = self._reply()
        if status < 0:
            return status, rest
        parameters = [tuple(float.fromhex(v) for v in self.process.stdout.readline().split()) for _ in free]
        report, plant = self._json_line(), self._json_line()
        return status, parameters, report, plant

    def reset(self, start_time):
        return self._ask(f"reset {float(start_time).hex()}")[0]

    def advance(self, step):
        return self._ask(f"advance {float(step).hex()}")[0]

    def time(self):
        status, rest = self._ask("time")
        assert status >= 0, rest
        return float.fromhex(rest)

    def save_state(self):
        status, rest = self._ask("save")
        assert status >= 0, rest
        return bytes.fromhex(self.process.stdout.readline().strip())

    def restore_state(self, state):
        self.process.stdin.write(f"restore {len(state)}\n{state.hex()}\n")
        self.process.stdin.flush()
        return self._reply()

    def simulate(self, times, inputs, outputs):
        """The C profile run (ely_block_simulate): times and inputs (a dict of equally long 1-D
        arrays, SI). Returns (call status, row statuses, dict of output arrays)."""
        names = list(inputs)
        columns = [np.asarray(inputs[n], dtype=float).ravel() for n in names]
        times = np.asarray(times, dtype=float).ravel()
        n = len(times)
        lines = [f"simulate {n} {len(names)} {len(outputs)}", " ".join(names), " ".join(outputs)]
        lines += [" ".join(float(v).hex() for v in [times[k]] + [c[k] for c in columns]) for k in range(n)]
        self.process.stdin.write("\n".join(lines) + "\n")
        self.process.stdin.flush()
        status, rest = self._reply()
        rows = [self.process.stdout.readline().split() for _ in range(n)]
        row_status = np.array([int(r[0]) for r in rows], dtype=np.int32)
        values = {o: np.array([float.fromhex(r[1 + i]) if len(r) > 1 + i else np.nan for r in rows])
                  for i, o in enumerate(outputs)}
        return status, row_status, values

    def run_summary(self):
        status, rest = self._ask("summary")
        assert status >= 0, rest
        return json.loads(self.process.stdout.readline(), parse_constant=lambda c: float("nan"))

    def _json_line(self):
        self.process.stdout.readline()  # the length
        return json.loads(self.process.stdout.readline())

    def close(self):
        if self.process.poll() is None:
            self.process.stdin.write("quit\n")
            self.process.stdin.close()
            self.process.wait(timeout=30)
        self.process.stdout.close()


@pytest.fixture
def reference():
    path = os.environ.get("ELYBLOCK_REFERENCE", BUILD_DIR / "tests" / "elyblock_python_reference")
    if not pathlib.Path(path).exists():
        pytest.fail(f"the C reference program {path} is missing: build the target elyblock_python_reference")
    ref = Reference(path)
    yield ref
    ref.close()


@pytest.fixture
def demo_plant():
    return DEMO_PLANT


@pytest.fixture
def demo_dict():
    return json.loads(DEMO_PLANT.read_text())
