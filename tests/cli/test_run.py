#!/usr/bin/python3
"""`elyblock run` through its real binary, one CTest test per case:

    test_run.py <elyblock binary> <source dir> <case>

The series and the summary are checked against each other (the summary's totals are integrals of
the series), against the profile given, and against their units (python3-pint, an independent
unit library); the progress bar only on a terminal (a pseudo-terminal here).
"""
import csv
import io
import os
import pty
import re
import subprocess
import sys
import tempfile

BIN, SRC, CASE = sys.argv[1], sys.argv[2], sys.argv[3]
DEMO = os.path.join(SRC, "examples", "demo-plant.json")
YEAR = os.path.join(SRC, "examples", "profiles", "windsolar-year.csv")
TMP = tempfile.mkdtemp(prefix="elyblock-run-")


class Failed(Exception):
    pass


def expect(condition, what):
    if not condition:
        raise Failed(what)


def run(*args):
    p = subprocess.run([BIN, *args], stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True, cwd=TMP)
    return p.returncode, p.stdout, p.stderr


def write(name, text):
    path = os.path.join(TMP, name)
    with open(path, "w") as f:
        f.write(text)
    return path


def series(path):
    rows = list(csv.reader(open(path)))
    return rows[0], [[float(x) if re.match(r"^-?[0-9.]", x) else x for x in r] for r in rows[1:]]


def summary(text):
    """The summary table: {label: (value, unit)}."""
    out = {}
    for line in text.splitlines():
        m = re.match(r"^  (\S.*?)\s+(-?[0-9.e+-]+) ?(\S*)$", line)
        if m:
            out[m.group(1)] = (float(m.group(2)), m.group(3))
    return out


def two_days():
    """Two days at 10-minute rows: power stepping between 6 and 18 MW every 3 hours, a stop."""
    lines = ["time [min],power [MW],in.mode_request [1]"]
    for k in range(2 * 24 * 6 + 1):
        t = 10 * k
        power = 18 if (t // 180) % 2 else 6
        mode = 0 if 1500 <= t < 1800 else 2
        lines.append(f"{t},{power},{mode}")
    return write("two-days.csv", "\n".join(lines) + "\n")


def first_days(days):
    """The first days of the demo year, as a profile of its own."""
    lines = [l for l in open(YEAR) if not l.startswith("#")]
    return write(f"first-{days}-days.csv", "".join(lines[:1 + days * 24 + 1]))


def case_demo_year():
    # The README's command: the invented year of wind and sun, automatic stand-by below the minimum load
    # (its first fortnight in the sanitizer builds, where the year takes half an hour).
    hours = 14 * 24 if os.environ.get("ELY_TEST_SHORT_PROFILES") else 8760
    profile = YEAR if hours == 8760 else first_days(14)
    rc, out, err = run("run", DEMO, profile, "--set", "in.mode_request=3", "--output", "year.csv")
    expect(rc == 0, f"exited {rc}: {err}")
    head, rows = series(os.path.join(TMP, "year.csv"))
    expect(head[:3] == ["time [s]", "status", "state.mode [1]"], f"header {head}")
    expect(len(rows) == hours + 1 and rows[-1][0] == hours * 3600, f"{len(rows)} rows, last at {rows[-1][0]}")
    s = summary(out)
    expect(s["duration"] == (hours, "h"), f"duration {s.get('duration')}")
    for label in ("hydrogen made", "DC energy (stacks)", "specific energy, AC", "make-up water",
                  "full-load hours (DC energy / rated DC power)", "hours in hot standby", "start-ups from hot standby",
                  "hours held at minimum load (setpoint below it)",
                  "hours with H2 in the anode gas at the warning level",
                  "cell-voltage rise by ageing at rated current density, at the end"):
        expect(label in s, f"summary lacks '{label}'")
    # Every hour is in one mode; the stacks never draw more than the profile offers.
    by_mode = sum(s[k][0] for k in s if k.startswith("hours in ") or k.startswith("hours off") or k.startswith("hours starting"))
    expect(abs(by_mode - hours) < 0.03, f"hours by mode sum to {by_mode}")  # each printed to 6 digits
    profile = [l.split(",") for l in open(profile) if l[0].isdigit()]
    offered_mwh = sum(float(p[1]) for p in profile[:-1])  # MW for an hour each
    expect(s["DC energy (stacks)"][0] < offered_mwh, f"{s['DC energy (stacks)']} above {offered_mwh} MWh offered")
    expect(s["DC energy (stacks)"][0] > 0.9 * offered_mwh, f"{s['DC energy (stacks)']} far below {offered_mwh} MWh")
    # Specific energy = energy / hydrogen, in the summary's own display units (MWh, t, kWh/kg).
    ratio = s["AC energy (plant: rectifier, auxiliaries, heater)"][0] / s["hydrogen made"][0]
    expect(abs(ratio - s["specific energy, AC"][0]) < 1e-4 * ratio, f"{ratio} vs {s['specific energy, AC']}")
    expect(err.count("\n") <= 2 and "\r" not in err, f"no progress bar when not on a terminal: {err!r}")


def case_totals_are_integrals_of_the_series():
    # The summary's hydrogen and energy against the trapezoidal integral of the series at 1-minute
    # rows (the run's own totals are integrated with the plant; the series samples it).
    lines = ["time [min],power [MW]"] + [f"{t},{6 + 12 * ((t // 90) % 2)}" for t in range(0, 24 * 60 + 1)]
    profile = write("minutes.csv", "\n".join(lines) + "\n")
    rc, out, err = run("run", DEMO, profile, "--output", "m.csv", "--columns", "product.hydrogen,stack.power")
    expect(rc == 0, f"exited {rc}: {err}")
    head, rows = series(os.path.join(TMP, "m.csv"))
    expect(head == ["time [s]", "status", "product.hydrogen [kg/s]", "stack.power [W]"], f"header {head}")
    h2 = sum(0.5 * (a[2] + b[2]) * (b[0] - a[0]) for a, b in zip(rows, rows[1:]))
    energy = sum(0.5 * (a[3] + b[3]) * (b[0] - a[0]) for a, b in zip(rows, rows[1:]))
    s = summary(out)
    expect(abs(s["hydrogen made"][0] * 1e3 - h2) < 2e-3 * h2, f"hydrogen {s['hydrogen made']} t vs {h2} kg")
    expect(abs(s["DC energy (stacks)"][0] * 3.6e9 - energy) < 2e-3 * energy, f"energy {s['DC energy (stacks)']} vs {energy} J")


def case_current_column_and_units():
    # A current column selects the current spec; engineering units show the time in the profile's unit.
    profile = write("current.csv", "time [h],current [kA]\n0,20\n1,30\n2,10\n3,10\n")
    rc, out, err = run("run", DEMO, profile, "--units", "engineering", "--output", "-",
                       "--columns", "stack.current,stack.temperature")
    expect(rc == 0, f"exited {rc}: {err}")
    rows = list(csv.reader(io.StringIO(out)))
    expect(rows[0] == ["time [h]", "status", "stack.current [kA]", "stack.temperature [degC]"], f"header {rows[0]}")
    expect([float(r[0]) for r in rows[1:]] == [0, 1, 2, 3], f"times {[r[0] for r in rows[1:]]}")
    # At each row the stacks carry the current of the row before (held over the hour), the first its own.
    expect([round(float(r[2]), 9) for r in rows[1:]] == [20, 20, 30, 10], f"currents {[r[2] for r in rows[1:]]}")
    expect("spec current" in err, f"no note of the spec: {err}")
    expect("duration" in err, f"the summary goes to standard error with --output -: {err}")


def case_modes_and_starts():
    rc, out, err = run("run", DEMO, two_days(), "--output", "d.csv", "--columns", "state.mode")
    expect(rc == 0, f"exited {rc}: {err}")
    s = summary(out)
    expect(s["hours off"][0] == 5.0, f"hours off {s['hours off']}")
    expect(s["start-ups from cold"][0] == 1.0, f"starts {s.get('start-ups from cold')}")
    _, rows = series(os.path.join(TMP, "d.csv"))
    modes = {int(r[2]) for r in rows}
    expect(modes == {0, 2, 3}, f"modes seen {modes}")


def case_progress_bar_on_a_terminal():
    # On a terminal: a bar on standard error, redrawn in place; --no-progress: none.
    # A month of the demo year (short enough for the sanitizer builds).
    month = first_days(30)

    def on_terminal(*extra):
        master, slave = pty.openpty()
        p = subprocess.Popen([BIN, "run", DEMO, month, "--output", "p.csv", *extra], stdout=subprocess.DEVNULL,
                             stderr=slave, cwd=TMP)
        os.close(slave)
        seen = b""
        while True:
            try:
                chunk = os.read(master, 4096)
            except OSError:
                break
            if not chunk:
                break
            seen += chunk
        expect(p.wait() == 0, "the run failed")
        return seen.decode(errors="replace")
    bar = on_terminal()
    expect("\r" in bar and "100 %" in bar and "(721 of 721 rows)" in bar, f"no progress bar: {bar[-200:]!r}")
    expect("rows)" not in on_terminal("--no-progress"), "--no-progress drew a bar")


def case_profile_errors():
    def failure(text, *fragments, name="bad.csv"):
        path = write(name, text) if text is not None else os.path.join(TMP, "missing.csv")
        rc, out, err = run("run", DEMO, path, "--output", "x.csv")
        expect(rc == 1, f"{text!r}: exited {rc}: {err}")
        for f in fragments:
            expect(f in err, f"{text!r}: message lacks '{f}': {err}")
    failure(None, "cannot read the profile", "missing.csv")
    failure("power [MW],time [h]\n1,0\n", "first column is 'power'", "line 1")
    failure("time [h]\n0\n", "no input column")
    failure("time [h],wind [MW]\n0,1\n", "column 'wind' is not an input", "elyblock variables")
    failure("time [h],power [MW]\n0,1\n1,x\n", "line 3, column in.power", "'x' is not a number")
    failure("time [h],power [MW]\n0,1\n2,1\n1,1\n", "line 4", "time goes back")
    failure("time [h],power [MV]\n0,1\n", "column in.power")
    failure("time [h],power [MW]\n0,1,2\n", "3 fields; the header has 2")
    failure("# only a comment\n", "is empty")
    failure("time [h],power [MW],power [kW]\n0,1,1\n", "given twice")
    ok = write("ok.csv", "time [h],power [MW],in.ambient_temperature [degC]\n0,5,10\n1,5,12\n")
    rc, out, err = run("run", DEMO, ok, "--set", "in.power=4e6")
    expect(rc == 2 and "the profile's column already varies it" in err, f"--set of the drive column: {rc} {err}")
    rc, out, err = run("run", DEMO, ok, "--set", "in.ambient_temperature=300")
    expect(rc == 2 and "the profile has a column of it" in err, f"--set of a profile column: {rc} {err}")


def case_plot_files():
    # --plot: PNG and SVG of the run, drawn by the Python package from the run's own numbers; the
    # SVG's duration curve ends at the run's length (two days), its traces span the profile.
    if os.environ.get("ELY_TEST_NO_PYTHON_LIBRARY"):
        print("skipped: the sanitizer build's library does not load into an uninstrumented python3")
        return
    rc, out, err = run("run", DEMO, two_days(), "--output", "d.csv", "--plot", "d.png", "--plot", "d.svg")
    expect(rc == 0, f"exited {rc}: {err}")
    with open(os.path.join(TMP, "d.png"), "rb") as f:
        expect(f.read(8) == b"\x89PNG\r\n\x1a\n", "d.png is not a PNG")
    svg = open(os.path.join(TMP, "d.svg")).read()
    expect(svg.lstrip().startswith("<?xml") and "<svg" in svg, "d.svg is not an SVG")
    expect("load duration curve" in svg or "load" in svg, "the SVG lacks the duration curve")
    expect("wrote d.png" in err and "wrote d.svg" in err, f"no note of the files: {err}")
    expect("duration" in out, "the summary still goes to standard output")
    expect(not os.path.exists(os.path.join(TMP, "d.csv")) or "d.png" not in open(os.path.join(TMP, "d.csv")).read(),
           "the plot's columns went into the series")
    head, _ = series(os.path.join(TMP, "d.csv"))
    expect("perf.load_fraction [1]" not in head, f"the plot's columns went into the series: {head}")


def case_plot_errors():
    # A bad file name is a usage error before anything runs; a missing interpreter or matplotlib is
    # a clear failure after the run (the series and the summary are written).
    profile = two_days()
    rc, out, err = run("run", DEMO, profile, "--plot", "d.jpeg")
    expect(rc == 2 and ".png, .svg or .pdf" in err, f"bad plot file: {rc} {err}")
    env = dict(os.environ, ELYBLOCK_PYTHON="/nonexistent/python3")
    p = subprocess.run([BIN, "run", DEMO, profile, "--plot", "d.png"], capture_output=True, text=True, cwd=TMP, env=env)
    expect(p.returncode == 1 and "needs Python 3 with matplotlib" in p.stderr and "/nonexistent/python3" in p.stderr,
           f"missing python: {p.returncode} {p.stderr}")
    expect("duration" in p.stdout, "the summary is printed before the plot fails")
    fake = os.path.join(TMP, "no-matplotlib")
    os.makedirs(os.path.join(fake, "matplotlib"), exist_ok=True)
    with open(os.path.join(fake, "matplotlib", "__init__.py"), "w") as f:
        f.write("raise ImportError('no matplotlib here')\n")
    env = dict(os.environ, ELYBLOCK_PYTHON="/usr/bin/python3", PYTHONPATH=fake)
    p = subprocess.run([BIN, "run", DEMO, profile, "--plot", "d.png"], capture_output=True, text=True, cwd=TMP, env=env)
    expect(p.returncode == 1 and "needs matplotlib" in p.stderr and "python3-matplotlib" in p.stderr,
           f"missing matplotlib: {p.returncode} {p.stderr}")
    expect(not os.path.exists(os.path.join(TMP, "d.png")), "a plot was written")


def case_sweep_plot():
    # `elyblock sweep --plot`: the voltage breakdown of the sweep, drawn by the same package; the
    # series on standard output is the sweep's own (no plot columns added to it).
    if os.environ.get("ELY_TEST_NO_PYTHON_LIBRARY"):
        print("skipped: the sanitizer build's library does not load into an uninstrumented python3")
        return
    rc, out, err = run("sweep", DEMO, "--over", "in.temperature", "--from", "50 degC", "--to", "80 degC",
                       "--points", "7", "--columns", "cell.voltage", "--plot", "t.svg")
    expect(rc == 0, f"exited {rc}: {err}")
    expect(out.splitlines()[0] == "in.temperature [K],status,cell.voltage [V]", f"header {out.splitlines()[0]}")
    svg = open(os.path.join(TMP, "t.svg")).read()
    expect("<svg" in svg and "in.temperature" in svg, "the SVG lacks the swept input's axis")
    expect("wrote t.svg" in err, f"no note of the file: {err}")
    rc, out, err = run("sweep", DEMO, "--over", "in.current_density", "--from", "0.1 A/cm2", "--to", "2 A/cm2",
                       "--points", "5", "--plot", "curve.pdf")
    expect(rc == 0 and open(os.path.join(TMP, "curve.pdf"), "rb").read(5) == b"%PDF-", f"pdf: {rc} {err}")


def main():
    case = globals().get("case_" + CASE)
    if case is None:
        print(f"FAIL: unknown case {CASE}")
        return 1
    try:
        case()
    except Failed as e:
        print(f"FAIL: {CASE}: {e}")
        return 1
    print(f"ok: {CASE}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
