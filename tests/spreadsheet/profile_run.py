#!/usr/bin/python3
"""A profile run through the Excel module's calls under Wine against the same run on Linux.

usage: profile_run.py write RUN                 writes the run: the invented two-day profile of
                                                test_core.py (SI values), its spec, inputs, outputs
       profile_run.py linux RUN LIBRARY PLANT   the run on Linux through ctypes (expected.Direct):
                                                prints what `vba_calls.exe profile` prints
       profile_run.py compare LINUX WINDOWS     every row's status and outputs and every figure of
                                                the run summary, to TOLERANCE relative

The steady points of spreadsheet.vba_points are bit-identical between the Linux library and the
DLL; a run in time is not quite: mingw-w64's expm1 and log1p (used by the coolant exchanger's
effectiveness) and, rarely, exp differ from glibc's in the last bit (106, 145 and 3 of 2000
arguments in a check on this machine), and the adaptive integrator with its located events
carries such differences on. Over the two days they stay below 2e-8 relative; TOLERANCE is 1e-6.
The summary's thermal_balance, a residual near zero, is compared against the heat released.
"""
import json
import math
import os
import sys

HERE = os.path.dirname(os.path.abspath(__file__))
TOLERANCE = 1e-6
RESIDUALS = {"thermal_balance": "heat_released"}  # figures near zero: compared against another
sys.path.insert(0, HERE)

# The profile of test_core.py (invented for the demo), in SI: hourly DC power with a lull below the
# minimum load, and the ambient temperature; automatic standby.
HOURS = list(range(49))
MW = [18, 20, 22, 24, 24, 22, 19, 15, 11, 8, 5, 2.5, 1.5, 1, 1.2, 3, 6, 10, 14, 17, 20, 23, 25, 24] * 2 + [20]
INPUTS = ["in.power", "in.ambient_temperature", "in.mode_request"]
OUTPUTS = ["product.hydrogen", "stack.temperature", "state.mode", "plant.power", "gas.h2_in_o2"]


def rows():
    return [(3600.0 * h, 1e6 * p, 283.15 + 8.0 * math.sin(math.pi * (h % 24 - 8) / 12), 3.0) for h, p in zip(HOURS, MW)]


def write(path):
    with open(path, "w", encoding="ascii") as f:
        f.write("spec power\n")
        f.write("inputs " + " ".join(INPUTS) + "\n")
        f.write("outputs " + " ".join(OUTPUTS) + "\n")
        for row in rows():
            f.write("row " + " ".join(repr(x) for x in row) + "\n")


def read_run(path):
    spec, inputs, outputs, times, values = None, [], [], [], []
    with open(path, encoding="ascii") as f:
        for line in f:
            words = line.split()
            if not words:
                continue
            if words[0] == "spec":
                spec = words[1]
            elif words[0] == "inputs":
                inputs = words[1:]
            elif words[0] == "outputs":
                outputs = words[1:]
            elif words[0] == "row":
                times.append(float(words[1]))
                values += [float(x) for x in words[2:]]
    return spec, inputs, outputs, times, values


def linux(run_path, library, plant):
    import expected
    spec, inputs, outputs, times, values = read_run(run_path)
    status, message, out, summary = expected.Direct(library).simulate(plant, spec, [], times, inputs, values, outputs)
    if isinstance(status, tuple):
        status = 2
    print(f"status {status}")
    for k, row in enumerate(out):
        print(f"row {k} {'-' if status == 2 else 0} " + " ".join(repr(v) for v in row))
    if summary is not None:
        print("summary " + json.dumps(summary, separators=(",", ":")))


def parse(path):
    status, rows, summary = None, [], None
    with open(path, encoding="utf-8", errors="replace") as f:
        for line in f:
            line = line.rstrip("\r\n")
            if line.startswith("status "):
                status = int(line.split()[1])
            elif line.startswith("row "):
                words = line.split()
                rows.append([float(x) for x in words[3:]])
            elif line.startswith("summary "):
                summary = json.loads(line[len("summary "):])
    return status, rows, summary


def close(a, b, scale=None):
    if a is None or b is None:
        return a is b
    scale = max(abs(a), abs(b)) if scale is None else abs(scale)
    return a == b or (math.isnan(a) and math.isnan(b)) or abs(a - b) <= TOLERANCE * scale


def compare(linux_path, windows_path):
    ls, lrows, lsum = parse(linux_path)
    ws, wrows, wsum = parse(windows_path)
    failures = []
    if ls != ws:
        failures.append(f"status: Linux {ls}, Windows {ws}")
    if len(lrows) != len(wrows) or not lrows:
        failures.append(f"{len(lrows)} rows on Linux, {len(wrows)} on Windows")
    identical, numbers, worst = 0, 0, 0.0

    def difference(x, y, scale=None):
        scale = max(abs(x), abs(y)) if scale is None else abs(scale)
        return abs(x - y) / scale if scale > 0 and not (math.isnan(x) or math.isnan(y)) else 0.0

    for k, (a, b) in enumerate(zip(lrows, wrows)):
        for o, (x, y) in enumerate(zip(a, b)):
            numbers += 1
            identical += x == y or (math.isnan(x) and math.isnan(y))
            worst = max(worst, difference(x, y))
            if not close(x, y):
                failures.append(f"row {k}, output {o}: Linux {x!r}, Windows {y!r}")
    if lsum is None or wsum is None or set(lsum["figures"]) != set(wsum["figures"]):
        failures.append("the run summaries differ in their figures")
    else:
        for name, figure in lsum["figures"].items():
            numbers += 1
            value, other = figure["value"], wsum["figures"][name]["value"]
            identical += value == other
            scale = lsum["figures"][RESIDUALS[name]]["value"] if name in RESIDUALS else None
            if value is not None and other is not None:
                worst = max(worst, difference(value, other, scale))
            if not close(value, other, scale):
                failures.append(f"summary {name}: Linux {value!r}, Windows {other!r}")
    for f in failures[:20]:
        print("FAILED:", f, file=sys.stderr)
    print(f"profile run: {len(lrows)} rows and {len(lsum['figures']) if lsum else 0} summary figures; "
          f"{identical} of {numbers} numbers bit-identical, largest relative difference {worst:.3g}, "
          f"{len(failures)} beyond {TOLERANCE:g}")
    return 1 if failures else 0


def main(argv):
    if len(argv) == 3 and argv[1] == "write":
        write(argv[2])
        return 0
    if len(argv) == 5 and argv[1] == "linux":
        linux(argv[2], argv[3], argv[4])
        return 0
    if len(argv) == 4 and argv[1] == "compare":
        return compare(argv[2], argv[3])
    print(__doc__, file=sys.stderr)
    return 2


if __name__ == "__main__":
    sys.exit(main(sys.argv))
