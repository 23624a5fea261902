#!/usr/bin/python3
"""The command line through its real binary, one CTest test per case:

    test_cli.py <elyblock binary> <source dir> <case>

Each case checks exit statuses and messages word for word where a user reads them. Unit
conversions of the output are checked against python3-pint (an independent unit library), the
shortest round-trip number text against Python's own float formatting.
"""
import csv
import io
import json
import math
import os
import re
import shlex
import subprocess
import sys
import tempfile

BIN, SRC, CASE = sys.argv[1], sys.argv[2], sys.argv[3]
DEMO = os.path.join(SRC, "examples", "demo-plant.json")
ZINC = os.path.join(SRC, "examples", "zinc-electrowinning.json")
MINIMAL = os.path.join(SRC, "examples", "minimal")
TMP = tempfile.mkdtemp(prefix="elyblock-cli-")


class Failed(Exception):
    pass


def expect(condition, what):
    if not condition:
        raise Failed(what)


def run(*args, stdout=subprocess.PIPE):
    p = subprocess.run([BIN, *args], stdout=stdout, stderr=subprocess.PIPE, text=True)
    return p.returncode, p.stdout or "", p.stderr


def run_ok(*args):
    rc, out, err = run(*args)
    expect(rc == 0, f"{' '.join(args)} exited {rc}: {err}")
    return out, err


def expect_usage_error(args, message):
    """Exit 2, nothing on standard output, exactly one line on standard error."""
    rc, out, err = run(*args)
    expect(rc == 2, f"{args} exited {rc}, not 2: {err}")
    expect(out == "", f"{args} wrote to standard output: {out!r}")
    expect(err == message + "\n", f"{args}:\n  got      {err!r}\n  expected {message + chr(10)!r}")


def expect_failure(args, message, stdout=subprocess.PIPE):
    rc, out, err = run(*args, stdout=stdout)
    expect(rc == 1, f"{args} exited {rc}, not 1: {err}")
    expect(err == message + "\n", f"{args}:\n  got      {err!r}\n  expected {message + chr(10)!r}")
    return out


def write_config(name, text):
    path = os.path.join(TMP, name)
    with open(path, "w") as f:
        f.write(text)
    return path


def every_config():
    configs = [DEMO, ZINC]
    configs += sorted(os.path.join(MINIMAL, f) for f in os.listdir(MINIMAL) if f.endswith(".json"))
    return configs


def csv_values(text):
    """solve --format csv: {name: (value or None, unit)}."""
    rows = list(csv.reader(io.StringIO(text)))
    expect(rows[0] == ["name", "value", "unit"], f"bad CSV header {rows[0]}")
    return {r[0]: (float(r[1]) if r[1] else None, r[2]) for r in rows[1:]}


def summary_rows(text):
    """The summary table: {label: (value, unit)} and the section titles."""
    rows, sections = {}, []
    for line in text.splitlines():
        m = re.match(r"^  (\S.*?)\s+(-?[0-9.e+-]+|nan|inf) ?(\S*)$", line)
        if m:
            rows[m.group(1)] = (float(m.group(2)), m.group(3))
        elif line.startswith("CAUTION"):
            break
        elif line and not line.startswith(" "):
            sections.append(line)
    return rows, sections


# --- item 14: version, help per command, one-line usage errors ---------------------------------

def case_every_example_solves():
    """Every bundled plant description (examples/*.json, examples/minimal/*.json) solves from the
    command line; its outputs keep the identities of a DC stack: the cell voltage above the
    reversible voltage (a driven cell), stack power = stack voltage x total current."""
    files = sorted(os.path.join(d, f) for d in (os.path.join(SRC, "examples"), MINIMAL)
                   for f in os.listdir(d) if f.endswith(".json"))
    expect(len(files) >= 9, f"only {len(files)} examples found")
    for path in files:
        out, _ = run_ok("solve", path, "--format", "json")
        v = {k: x["value"] for k, x in json.loads(out)["variables"].items()}
        name = os.path.relpath(path, SRC)
        expect(v["cell.voltage"] > v["cell.reversible_voltage"] > 0, f"{name}: cell voltage {v['cell.voltage']}")
        expect(math.isclose(v["stack.power"], v["stack.voltage"] * v["stack.current"], rel_tol=1e-12),
               f"{name}: stack power {v['stack.power']} != {v['stack.voltage']} * {v['stack.current']}")


def case_version_and_help():
    out, _ = run_ok("--version")
    expect(re.fullmatch(r"elyblock \d+\.\d+\.\d+ \(ABI 1\)\n", out), f"--version: {out!r}")
    expect(run_ok("version")[0] == out, "'version' and '--version' differ")
    top, _ = run_ok("--help")
    for command in ("solve", "sweep", "variables", "water", "version"):
        expect(re.search(rf"^  {command} ", top, re.M), f"--help does not list {command}")
    solve, _ = run_ok("solve", "--help")
    expect("Usage: elyblock solve [OPTIONS] config\n" in solve, f"solve --help: {solve[:200]}")
    expect("config PLANT.json REQUIRED" in solve, f"solve --help: {solve[:400]}")
    for option in ("--spec", "--set NAME=QUANTITY", "--format", "--units"):
        expect(option in solve, f"solve --help lacks {option}")
    expect("--over" not in solve, "solve --help shows the sweep's options")
    sweep, _ = run_ok("sweep", "--help")
    for option in ("--over NAME", "--from QUANTITY", "--to QUANTITY", "--points", "--columns", "--output"):
        expect(option in sweep, f"sweep --help lacks {option}")
    water, _ = run_ok("water", "--help")
    expect("temperature QUANTITY REQUIRED" in water, f"water --help: {water}")


def case_usage_errors():
    expect_usage_error([], "elyblock: A subcommand is required (see 'elyblock --help')")
    expect_usage_error(["frobnicate"], "elyblock: unknown command 'frobnicate'; the commands are solve, sweep, "
                                       "run, fit, fmu, variables, water, version (see 'elyblock --help')")
    expect_usage_error(["solve"], "elyblock: solve: config is required (see 'elyblock solve --help')")
    expect_usage_error(["solve", DEMO, "--bogus"],
                       "elyblock: solve: The following argument was not expected: --bogus (see 'elyblock solve --help')")
    expect_usage_error(["solve", DEMO, "--format", "xml"],
                       "elyblock: solve: --format: xml not in {table,json,csv} (see 'elyblock solve --help')")
    expect_usage_error(["sweep", DEMO, "--over", "in.current_density", "--from", "1", "--to", "2", "--points", "1"],
                       "elyblock: sweep: --points: Value 1 not in range 2 to 1000000 (see 'elyblock sweep --help')")
    expect_usage_error(["sweep", DEMO, "--from", "1", "--to", "2"],
                       "elyblock: sweep: --over is required (see 'elyblock sweep --help')")
    expect_usage_error(["solve", DEMO, "--set", "in.temperature"],
                       "elyblock: solve: --set: expected NAME=QUANTITY (e.g. in.temperature=\"80 degC\"), got "
                       "'in.temperature' (see 'elyblock solve --help')")
    expect_usage_error(["solve", DEMO, "--spec", "bogus"],
                       "elyblock: solve: --spec: unknown spec 'bogus'; known: current_density, current, power, "
                       "hydrogen_rate, voltage (see 'elyblock solve --help')")
    expect_usage_error(["solve", DEMO, "--units", "engineering"],
                       "elyblock: solve: --units: the table shows engineering units and the JSON report SI units; "
                       "--units goes with --format csv (see 'elyblock solve --help')")
    expect_usage_error(["water", "80 degC", "1 bar"],
                       "elyblock: water: cathode_pressure is required (see 'elyblock water --help')")


# --- item 17: messages speak of options and variable names ----------------------------------------

def case_messages_name_options_and_variables():
    inputs = ("in.current_density, in.current, in.power, in.hydrogen_rate, in.voltage, in.temperature, "
              "in.pressure_cathode, in.pressure_anode, in.hours_operated, in.feed_temperature, "
              "in.coolant_temperature, in.coolant_flow, in.ambient_temperature, in.mode_request")
    sweep = ["sweep", DEMO, "--from", "1", "--to", "2"]
    expect_usage_error(sweep + ["--over", "cell.voltage"],
                       f"elyblock: sweep: --over: 'cell.voltage' is an output; sweep an input: {inputs} "
                       "(see 'elyblock sweep --help')")
    expect_usage_error(sweep + ["--over", "param.cells"],
                       f"elyblock: sweep: --over: 'param.cells' is a parameter; sweep an input: {inputs} "
                       "(see 'elyblock sweep --help')")
    expect_usage_error(sweep + ["--over", "cell.colour"],
                       "elyblock: sweep: --over: unknown variable 'cell.colour' "
                       f"(see 'elyblock variables {DEMO}' for the plant's variables)")
    expect_usage_error(sweep + ["--over", "in.temperature", "--columns", "cell.voltage,product.chlorine"],
                       "elyblock: sweep: --columns: variable 'product.chlorine' does not exist for technology 'pem' "
                       f"(see 'elyblock variables {DEMO}' for the plant's variables)")
    expect_usage_error(["solve", DEMO, "--set", "cell.voltage=2"],
                       "elyblock: solve: --set cell.voltage: 'cell.voltage' is an output; set an input (in.…) or a "
                       "tunable parameter (param.…) (see 'elyblock solve --help')")
    expect_usage_error(["solve", DEMO, "--set", "param.cells=3"],
                       "elyblock: solve: --set param.cells: 'param.cells' is a structural parameter, fixed by the "
                       "plant description ($.stack.cells); create a block from a changed description to change it "
                       "(see 'elyblock solve --help')")
    expect_usage_error(["solve", DEMO, "--set", "in.temperature=nan"],
                       "elyblock: solve: --set in.temperature: 'nan' is not a finite number "
                       "(see 'elyblock solve --help')")
    expect_usage_error(["sweep", DEMO, "--over", "in.temperature", "--from", "1 bar", "--to", "2"],
                       "elyblock: sweep: --from: expected a quantity in K, got 'bar' (m-1 kg s-2 instead of K) "
                       "(see 'elyblock sweep --help')")
    # No message anywhere speaks of the C interface.
    for args in ([*sweep, "--over", "cell.voltage"], ["solve", DEMO, "--set", "cell.voltage=2"],
                 ["solve", DEMO, "--spec", "power", "--set", "in.power=1e12"]):
        _, _, err = run(*args)
        for word in ("input_indices", "output_indices", "index", "NULL", "ely_", "struct"):
            expect(word not in err, f"{args}: message speaks of '{word}': {err}")


# --- item 13: --set takes quantities with units ---------------------------------------------------

def case_set_takes_quantities_with_units():
    si = csv_values(run_ok("solve", DEMO, "--set", "in.current_density=15000", "--set", "in.temperature=343.15",
                           "--format", "csv")[0])
    units = csv_values(run_ok("solve", DEMO, "--set", "in.current_density=1.5 A/cm2",
                              "--set", "in.temperature=70 degC", "--format", "csv")[0])
    expect(si == units, "quantities with units differ from the same values in SI")
    expect(units["in.current_density"] == (15000.0, "A/m2"), f"in.current_density {units['in.current_density']}")
    expect(abs(units["in.temperature"][0] - 343.15) < 1e-12, f"in.temperature {units['in.temperature']}")
    hours = csv_values(run_ok("solve", DEMO, "--set", "in.hours_operated=2 d", "--format", "csv")[0])
    expect(hours["in.hours_operated"] == (48.0, "h"), f"2 d is {hours['in.hours_operated']}")
    power = csv_values(run_ok("solve", DEMO, "--spec", "power", "--set", "in.power=12.5 MW", "--format", "csv")[0])
    expect(abs(power["stack.power"][0] / 12.5e6 - 1) < 1e-9, f"stack.power {power['stack.power']}")


# --- item 18: "80 C" hints at degC; counts as strings ----------------------------------------------

def case_celsius_hint_and_counts():
    expect_usage_error(["solve", DEMO, "--set", "in.temperature=80 C"],
                       "elyblock: solve: --set in.temperature: expected a quantity in K, got 'C' (s A instead of K); "
                       "did you mean degC? (see 'elyblock solve --help')")
    config = write_config("c80.json", '{"technology": "pem", "stack": {"cells": 100, "active_area": 0.1}, '
                                      '"operating": {"spec": "current_density", "temperature": "80 C"}}')
    expect_failure(["solve", config], f"elyblock: solve: {config}: $.operating.temperature: expected a quantity in K, "
                                      "got 'C' (s A instead of K); did you mean degC?")
    # Counts follow the rule of quantities: a string holding a plain number reads like the number.
    text = '{"technology": "pem", "stack": {"cells": %s, "active_area": 0.1}, "operating": {"spec": "current_density"}}'
    as_number = run_ok("solve", write_config("n.json", text % "100"), "--format", "json")[0]
    as_string = run_ok("solve", write_config("s.json", text % '"100"'), "--format", "json")[0]
    expect(as_number == as_string, "\"cells\": \"100\" solves differently from 100")
    bad = write_config("u.json", text % '"100 cells"')
    expect_failure(["solve", bad], f"elyblock: solve: {bad}: $.stack.cells: expected an integer (a count is a plain "
                                   "number and takes no unit), got a string (\"100 cells\")")


# --- item 15: the summary shows solved values, never unread inputs --------------------------------

def case_summary_shows_solved_values():
    for config in every_config():
        for extra in ([], ["--spec", "power", "--set", "in.power=5e4"]):
            if extra and config == DEMO:
                extra = ["--spec", "power", "--set", "in.power=12 MW"]
            out, _ = run_ok("solve", config, *extra)
            values = csv_values(run_ok("solve", config, *extra, "--format", "csv", "--units", "engineering")[0])
            rows, _ = summary_rows(out)
            expect("(set)" not in out, f"{config} {extra}: the summary shows a drive input:\n{out}")
            j = rows["current density"][0]
            expect(abs(j - values["cell.current_density"][0]) <= 1e-5 * abs(j) + 1e-9,
                   f"{config} {extra}: summary current density {j} is not the solved one "
                   f"{values['cell.current_density']}")
            for label, (value, _) in rows.items():
                expect(math.isfinite(value), f"{config}: {label} shown as {value}")
            expect("licensed engineering practice" in out and "CAUTION" in out, f"{config}: the cautions are missing")
    out, _ = run_ok("solve", DEMO, "--spec", "power", "--set", "in.power=12 MW")
    rows, _ = summary_rows(out)
    expect(rows["DC power"] == (12.0, "MW"), f"DC power {rows['DC power']}")
    # The solved current density meets the set power: 10 stacks of 250 cells of 2000 cm2 (the demo plant),
    # P = N·A·j·V_cell, from the solved values alone.
    si = csv_values(run_ok("solve", DEMO, "--spec", "power", "--set", "in.power=12 MW", "--format", "csv")[0])
    j, v = si["cell.current_density"][0], si["cell.voltage"][0]
    expect(abs(10 * 250 * 0.2 * j * v / 12e6 - 1) < 1e-12, f"P = N A j V gives {10 * 250 * 0.2 * j * v} W")
    expect(abs(rows["current density"][0] - j / 1e4) <= 1e-5 * j / 1e4, f"current density {rows['current density']}")


# --- item 19: headline figures per technology ------------------------------------------------------

def case_summary_per_technology():
    out, _ = run_ok("solve", os.path.join(MINIMAL, "brine.json"))
    rows, sections = summary_rows(out)
    for label, unit in (("DC energy per tonne of chlorine", "kWh/t"), ("DC energy per tonne of caustic (100 % NaOH)", "kWh/t"),
                        ("salt per tonne of chlorine", "t/t"), ("make-up water per tonne of chlorine", "t/t"),
                        ("salt per tonne of caustic", "t/t"), ("make-up water per tonne of caustic", "t/t")):
        expect(label in rows and rows[label][1] == unit, f"brine summary lacks '{label}' in {unit}")
    # Stoichiometry 2 NaCl -> Cl2 + 2 NaOH at equal current efficiencies (IUPAC atomic weights):
    # 1.6485 t of salt and 1.128 t of NaOH per t of chlorine.
    expect(abs(rows["salt per tonne of chlorine"][0] - 2 * 58.44 / 70.90) < 2e-3, "salt per tonne of chlorine")
    ratio = rows["DC energy per tonne of chlorine"][0] / rows["DC energy per tonne of caustic (100 % NaOH)"][0]
    expect(abs(ratio - 2 * 39.997 / 70.90) < 2e-3, f"energy per t Cl2 / per t NaOH = {ratio}")
    hydrogen_section = out[out.index("Hydrogen (by-product)"):].splitlines()
    expect(hydrogen_section[1].lstrip().startswith("hydrogen "), f"brine: hydrogen is not in its by-product section")
    for not_brine in ("specific energy, DC stack", "Faraday efficiency", "kWh/kg"):
        expect(not_brine not in out, f"brine summary headlines '{not_brine}'")

    out, _ = run_ok("solve", ZINC)
    rows, sections = summary_rows(out)
    expect(sections[3] == "Main product", f"zinc: sections {sections}")
    expect(rows["main product made"] == rows["zinc deposition: Zn made"], "zinc: the main product is not the zinc")
    expect(rows["current efficiency, main product"] == rows["zinc deposition: share of current"],
           "zinc: the current efficiency is not the zinc's")
    expect(rows["current efficiency, main product"][0] > 80, f"zinc efficiency {rows['current efficiency, main product']}")
    energy = rows["DC energy per kg of main product"]
    expect(energy[1] == "kWh/kg" and 1 < energy[0] < 5, f"zinc energy {energy}")
    expect("Faraday efficiency" not in out, "zinc summary headlines the hydrogen's Faraday efficiency")
    expect(any("by-product" in s for s in sections), f"zinc: hydrogen not labelled as by-product: {sections}")


# --- item 16: shortest numbers in JSON, units in CSV, engineering units ---------------------------

def shortest(value):
    """Fewest significant digits that read back to the same double."""
    for digits in range(1, 18):
        if float(f"{value:.{digits}g}") == value:
            return digits
    return 17


def significant_digits(text):
    mantissa = text.lower().split("e")[0].lstrip("-").replace(".", "").lstrip("0").rstrip("0")
    return max(len(mantissa), 1)


def case_json_numbers_are_shortest():
    out, _ = run_ok("solve", DEMO, "--format", "json")
    expect('"in.temperature":{"value":338.15,"unit":"K"}' in out, "65 degC is not written 338.15")
    numbers = re.findall(r'"value":(-?[0-9][0-9.eE+-]*)', out)
    expect(len(numbers) > 50, f"only {len(numbers)} numbers in the report")
    for text in numbers:
        value = float(text)
        expect(significant_digits(text) == shortest(value), f"{text} is not the shortest text of {value!r}")
    json.loads(out)


def pint_unit(symbol):
    """A display or SI unit symbol of the variable table in pint's syntax."""
    if symbol in ("1", "mol/mol", "kg/kg"):
        return "dimensionless"
    if symbol == "%":
        return "percent"
    symbol = symbol.replace("%", "percent")  # "%/s"
    return re.sub(r"([A-Za-z])(\d)", r"\1**\2", symbol).replace(" ", "*")


def case_csv_units_and_engineering_units():
    import pint
    ureg = pint.UnitRegistry()
    ureg.define("percent = 0.01 = %")
    si_text, _ = run_ok("solve", DEMO, "--format", "csv")
    eng_text, _ = run_ok("solve", DEMO, "--format", "csv", "--units", "engineering")
    si, eng = csv_values(si_text), csv_values(eng_text)
    expect(si["in.temperature"] == (338.15, "K") and eng["in.temperature"] == (65.0, "degC"), "temperature units")
    expect(eng["in.pressure_cathode"] == (30.0, "bar"), f"pressure {eng['in.pressure_cathode']}")
    checked = set()
    for name, (value, unit) in si.items():
        shown, shown_unit = eng[name]
        if value is None:
            expect(shown is None, f"{name}: SI empty, engineering {shown}")
            continue
        expected = ureg.Quantity(value, pint_unit(unit)).to(pint_unit(shown_unit)).magnitude
        expect(abs(shown - expected) <= 1e-9 * max(abs(expected), 1e-300) + 1e-12,
               f"{name}: {value} {unit} shown as {shown} {shown_unit}, pint says {expected}")
        checked.add(shown_unit)
    for unit in ("degC", "bar", "kg/h", "kWh/kg", "MW", "kA", "A/cm2", "%"):
        expect(unit in checked, f"no variable shown in {unit}")
    # Sweep: the unit of each column in its header; SI numbers as shortest round-trip text.
    out, _ = run_ok("sweep", DEMO, "--over", "in.current_density", "--from", "0.5 A/cm2", "--to", "2 A/cm2",
                    "--points", "4", "--columns", "cell.voltage,perf.specific_energy,in.temperature")
    rows = list(csv.reader(io.StringIO(out)))
    expect(rows[0] == ["in.current_density [A/m2]", "status", "cell.voltage [V]", "perf.specific_energy [J/kg]",
                       "in.temperature [K]"], f"header {rows[0]}")
    expect([r[0] for r in rows[1:]] == ["5000", "10000", "15000", "20000"], f"inputs {[r[0] for r in rows[1:]]}")
    expect(all(r[4] == "338.15" for r in rows[1:]), "temperature not written as 338.15")
    for r in rows[1:]:
        for text in r[2:]:
            expect(significant_digits(text) == shortest(float(text)), f"{text} is not the shortest text")
    eng_out, _ = run_ok("sweep", DEMO, "--over", "in.current_density", "--from", "0.5 A/cm2", "--to", "2 A/cm2",
                        "--points", "4", "--columns", "cell.voltage,perf.specific_energy,in.temperature",
                        "--units", "engineering")
    eng_rows = list(csv.reader(io.StringIO(eng_out)))
    expect(eng_rows[0] == ["in.current_density [A/cm2]", "status", "cell.voltage [V]", "perf.specific_energy [kWh/kg]",
                           "in.temperature [degC]"], f"engineering header {eng_rows[0]}")
    for a, b in zip(rows[1:], eng_rows[1:]):
        expect(float(b[0]) == float(a[0]) / 1e4 and float(b[4]) == 65.0, f"engineering row {b}")
        expected = ureg.Quantity(float(a[3]), "J/kg").to("kWh/kg").magnitude
        expect(abs(float(b[3]) / expected - 1) < 1e-11, f"{b[3]} kWh/kg against {a[3]} J/kg")


# --- item 12: sweeps that fail, and sweeps of an input the spec does not read ---------------------

def case_sweep_failures_exit_nonzero():
    out = expect_failure(["sweep", DEMO, "--over", "in.temperature", "--from", "60 degC", "--to", "120 degC",
                          "--points", "4", "--columns", "cell.voltage"],
                         "elyblock: sweep: 1 of 4 points solved with alarms:\n"
                         "  stack temperature above its limit: at in.temperature = 100 degC\n"
                         "  cell model extrapolated beyond its fitted range: at in.temperature = 100 degC\n"
                         "elyblock: sweep: 1 of 4 points failed (the status column names each failure); the first, "
                         "at in.temperature = 120 degC: pem cell: temperature 393.15 K is above the limit 373.15 K")
    rows = list(csv.reader(io.StringIO(out)))
    expect(len(rows) == 5, f"{len(rows)} rows: the data of the points that solved must be written")
    expect(rows[4] == ["393.15", "out of range", ""], f"failed row {rows[4]}")
    expect([r[1] for r in rows[1:4]] == ["ok", "ok", "solved with a warning"], f"statuses {[r[1] for r in rows]}")


def case_sweep_switches_to_the_spec_that_reads_its_input():
    power_plant = write_config("power.json", '{"technology": "pem", "stack": {"cells": 100, "active_area": 0.1}, '
                                             '"operating": {"spec": "power", "power": "0.2 MW"}}')
    rc, out, err = run("sweep", power_plant, "--over", "in.current_density", "--from", "5000", "--to", "15000",
                       "--points", "3", "--columns", "cell.current_density,stack.power")
    expect(rc == 0, f"exit {rc}: {err}")
    expect(err.splitlines()[0] == "elyblock: sweep: the plant's spec power does not read in.current_density; "
                                  "sweeping with spec current_density (choose one with --spec)", f"note: {err}")
    rows = list(csv.reader(io.StringIO(out)))[1:]
    expect([float(r[0]) for r in rows] == [float(r[2]) for r in rows] == [5000, 10000, 15000],
           f"the swept current density is not the solved one: {rows}")
    expect(len({r[3] for r in rows}) == 3, "every point has the same power: the sweep did not vary anything")
    expect_usage_error(["sweep", power_plant, "--spec", "power", "--over", "in.current_density", "--from", "1",
                        "--to", "2"],
                       "elyblock: sweep: --over in.current_density: --spec power does not read in.current_density; "
                       "give --spec current_density, or leave --spec out (see 'elyblock sweep --help')")
    # solve: --set of another spec's drive input selects that spec the same way.
    rc, out, err = run("solve", DEMO, "--set", "in.power=12 MW", "--format", "csv")
    expect(rc == 0 and abs(csv_values(out)["stack.power"][0] / 12e6 - 1) < 1e-9, f"solve --set in.power: {err}")
    expect(err == "elyblock: solve: the plant's spec current_density does not read in.power; solving with spec "
                  "power (choose one with --spec)\n", f"note: {err!r}")
    expect_usage_error(["solve", DEMO, "--set", "in.power=12 MW", "--set", "in.current=20 kA"],
                       "elyblock: solve: --set in.power and --set in.current are drive inputs of two specs (power, "
                       "current); a solve reads one: choose it with --spec (see 'elyblock solve --help')")


# --- item 20: warnings of a sweep, once, after it (the demo's own commands) -----------------------

def demo_commands():
    """The elyblock commands of scripts/demo, with the binary under test and outputs in TMP."""
    commands = []
    text = open(os.path.join(SRC, "scripts", "demo")).read().replace("\\\n", " ")
    for line in text.splitlines():
        words = shlex.split(line.strip())
        if words and words[0] == "build/adapters/cli/elyblock":
            words = [BIN] + [os.path.join(SRC, w) if w.startswith("examples/") else
                             os.path.join(TMP, os.path.basename(w)) if w.startswith("build/") else w for w in words[1:]]
            commands.append(words)
    return commands


def case_demo_warnings_once_after_the_sweep():
    commands = demo_commands()
    expect(any("sweep" in c for c in commands), f"no sweep in scripts/demo: {commands}")
    for c in commands:
        p = subprocess.run(c, stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True)
        expect(p.returncode == 0, f"{c} exited {p.returncode}: {p.stderr}")
        lines = p.stderr.splitlines()
        expect(all(not l.rstrip().endswith(";") for l in lines), f"a warning ends in ';': {p.stderr}")
        expect(len(lines) == len(set(lines)), f"a warning repeats: {p.stderr}")
        if "sweep" in c and lines:
            expect(re.fullmatch(r"elyblock: sweep: \d+ of \d+ points solved with alarms:", lines[0]), lines[0])
            for l in lines[1:]:
                expect(re.fullmatch(r"  [a-zA-Z0-9 -]+: (at in\.current_density = [0-9.]+ A/cm2|\d+ points, "
                                    r"in\.current_density [0-9.]+ A/cm2 to [0-9.]+ A/cm2)", l), f"warning line {l!r}")
            expect("point 0" not in p.stderr, "the library's per-point text leaks into the summary")


# --- item 21: every write and close is checked ----------------------------------------------------

def case_write_errors():
    full = open("/dev/full", "w")
    for args in (["solve", DEMO], ["solve", DEMO, "--format", "json"], ["solve", DEMO, "--format", "csv"],
                 ["variables", DEMO], ["water", "353.15", "1e5", "1e5"], ["version"], ["--version"], ["--help"],
                 ["solve", "--help"],
                 ["sweep", DEMO, "--over", "in.current_density", "--from", "1000", "--to", "20000", "--points", "50000"]):
        prefix = "" if args[0].startswith("--") or args[-1] == "--help" else args[0] + ": "
        expect_failure(args, f"elyblock: {prefix}cannot write to standard output: No space left on device", stdout=full)
    sweep = ["sweep", DEMO, "--over", "in.current_density", "--from", "1000", "--to", "20000"]
    expect_failure(sweep + ["--output", "/dev/full"],
                   "elyblock: sweep: cannot write to --output '/dev/full': No space left on device")
    missing = os.path.join(TMP, "no-such-folder", "c.csv")
    expect_failure(sweep + ["--output", missing],
                   f"elyblock: sweep: cannot write to --output '{missing}': No such file or directory")
    rc, _, err = run(*sweep, "--output", "/proc/version")
    expect(rc == 1 and err.startswith("elyblock: sweep: cannot write to --output '/proc/version': "),
           f"/proc/version: exit {rc}: {err}")


# --- the cases kept from before, stricter ---------------------------------------------------------

def case_solve_table():
    out, err = run_ok("solve", DEMO)
    expect(err == "", f"standard error: {err}")
    rows, sections = summary_rows(out)
    expect(sections == ["Operating point", "Cell voltage breakdown", "Stacks and plant", "Products and feeds",
                        "Efficiency and heat", "Gas purity", "Alarms"], f"sections {sections}")
    parts = sum(rows[k][0] for k in ("reversible voltage", "anode activation", "cathode activation",
                                     "ohmic (incl. degradation)", "concentration"))
    expect(abs(parts - rows["cell voltage"][0]) < 1e-4, "the voltage parts do not add up in the table")
    expect(out.endswith("Alarms\n  none\n\nCAUTION: electrolyzers handle hydrogen/oxygen mixtures (flammable from "
                        "about 4 % H2),\nDC currents of thousands of amperes, hot caustic electrolytes, chlorine and hot "
                        "stacks.\nThese are model estimates for study work; design, operation, alarms and trips "
                        "follow\nlocal codes, standards and licensed engineering practice.\n"), out[-400:])


def case_solve_json():
    out, _ = run_ok("solve", DEMO, "--format", "json")
    r = json.loads(out)
    v = {k: x["value"] for k, x in r["variables"].items()}
    parts = sum(v[k] for k in ("cell.reversible_voltage", "cell.activation_anode", "cell.activation_cathode",
                               "cell.ohmic", "cell.concentration"))
    expect(abs(parts - v["cell.voltage"]) < 1e-12, "voltage parts")
    expect(r["technology"] == "pem" and r["drive_input"] == "in.current_density", "technology and drive input")
    expect(v["in.power"] is None, "an input never given is null, not 0")


def case_sweep_csv():
    path = os.path.join(TMP, "c.csv")
    _, err = run_ok("sweep", DEMO, "--over", "in.current_density", "--from", "1000", "--to", "20000", "--points", "11",
                    "--output", path)
    rows = list(csv.reader(open(path)))
    expect(len(rows) == 12, "a header and 11 rows")
    header = rows[0]
    expect(header[:2] == ["in.current_density [A/m2]", "status"], f"header {header}")
    # The default columns are the technology's summary (what solve shows), alarms left out.
    for column in ("cell.voltage [V]", "cell.reversible_voltage [V]", "perf.specific_energy [J/kg]", "heat.duty [W]"):
        expect(column in header, f"default columns lack {column}")
    expect(not any(c.startswith("alarm.") for c in header), "alarms are columns")
    voltage = header.index("cell.voltage [V]")
    values = [float(r[voltage]) for r in rows[1:]]
    expect(all(b > a for a, b in zip(values, values[1:])), "voltage does not rise with current density")


def case_power_spec():
    values = csv_values(run_ok("solve", DEMO, "--spec", "power", "--set", "in.power=12e6", "--format", "csv")[0])
    expect(abs(values["stack.power"][0] / 12e6 - 1) < 1e-9, f"stack.power {values['stack.power']}")
    expect(values["in.power"] == (12e6, "W"), "in.power")


def case_bad_input():
    expect_failure(["solve", "/nonexistent.json"],
                   "elyblock: solve: cannot read config file '/nonexistent.json': No such file or directory")
    bad = write_config("bad.json", '{"technology":"pem","stack":{"cells":0,"active_area":0.1},'
                                   '"operating":{"spec":"current_density"}}')
    expect_failure(["solve", bad], f"elyblock: solve: {bad}: $.stack.cells: 0 is below the lower limit 1")
    rc, _, err = run("solve", DEMO, "--spec", "power", "--set", "in.power=1e12")
    expect(rc == 1 and err.startswith("elyblock: solve: solve: ") and "maximum current density" in err
           and err.count("\n") == 1, f"infeasible power: exit {rc}: {err}")


def case_alarm():
    # 6 % load at 30 bar: hydrogen crossing the membrane raises the anode-gas alarm; the run still
    # succeeds and says which alarm, on stderr and in the table.
    out, err = run_ok("solve", DEMO, "--set", "in.current_density=1500")
    message = ("solved with alarms: hydrogen in the anode gas at or above the warning level; load below the "
               "minimum load")
    expect(err == f"elyblock: solve: warning: {message}\n", f"standard error: {err!r}")
    expect(out.split("Alarms\n")[1].startswith(
        "  RAISED  hydrogen in the anode gas at or above the warning level (alarm.h2_in_o2_warning)\n"
        "  RAISED  load below the minimum load (alarm.load_low)\n"
        f"  ({message})\n"), out)


def case_variables():
    out, _ = run_ok("variables", DEMO)
    expect(re.search(r"^cell\.voltage +V +output ", out, re.M), "no cell.voltage")
    expect(re.search(r"^in\.temperature +K +input ", out, re.M), "no input in.temperature")
    expect(re.search(r"^param\.limits\.min_load_fraction +1 +parameter \(tunable\) ", out, re.M), "no tunable")


def case_water():
    si, _ = run_ok("water", "298.15", "101325", "101325")
    units, _ = run_ok("water", "25 degC", "1 atm", "1.01325 bar")
    expect(si == units, "water: quantities with units differ from SI")
    e_rev = float(re.search(r"reversible voltage +([0-9.]+) V", si).group(1))
    # 1.229 V standard (CRC, O2/H2O vs SHE); the wet gases' lower partial pressures take off about 0.7 mV.
    expect(abs(e_rev - 1.229) < 2e-3, f"E_rev at 25 degC, 1 atm: {e_rev}")
    expect_usage_error(["water", "25 C", "1 atm", "1 atm"],
                       "elyblock: water: temperature: expected a quantity in K, got 'C' (s A instead of K); "
                       "did you mean degC? (see 'elyblock water --help')")


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
