"""The example workbook of the spreadsheet functions on the invented demo plant, as data.

make_examples.py writes it as elyblock-demo.ods (LibreOffice Calc, the add-in's stored function
names) and elyblock-demo.xlsx (Excel, for the VBA module); the Calc test recalculates the .ods
and checks every formula of it against the C interface. Sheets:

  Plant      the demo plant (examples/demo-plant.json) as keys and values; the range is named plant
  Point      one operating point: each function once, an error case of each kind and a warning
  Sweep      a power sweep: one formula per cell, names and units in the header row
  Profile    two days of hourly power (invented for the demo) run through the plant in time:
             ELYPROFILE over the rows, ELYSUMMARY's figures, with and without automatic standby
  Variables  ELYVARIABLES(plant)
"""
import json
import math
import os

HERE = os.path.dirname(os.path.abspath(__file__))
DEMO_PLANT = os.path.join(HERE, "..", "demo-plant.json")
PLANT_RANGE = "plant"  # the workbook-wide name of the plant's key/value range


class Call:
    """A call of a worksheet function; arguments are numbers, texts, Ref, Name or Call."""

    def __init__(self, name, *args):
        self.name = name
        self.args = args


class Ref:
    """A cell or range of the same sheet, in A1 notation with optional $ ("B8", "C$1", "B16:F16")."""

    def __init__(self, address):
        self.address = address


class Name:
    """A workbook-wide named range."""

    def __init__(self, name):
        self.name = name


class Formula:
    """A formula cell; ``array=(rows, columns)`` makes it an array formula over that block."""

    def __init__(self, call, array=None):
        self.call = call
        self.array = array


def plant_rows(path=DEMO_PLANT):
    """The plant description as (dotted key, value) rows, in the file's order."""
    with open(path, encoding="utf-8") as f:
        tree = json.load(f)

    def walk(node, prefix):
        for key, value in node.items():
            if isinstance(value, dict):
                yield from walk(value, prefix + key + ".")
            else:
                yield prefix + key, value
    return list(walk(tree, ""))


def cell_name(column, row):
    """(0-based column, 1-based row) -> "B8"."""
    letters = ""
    column += 1
    while column:
        column, rest = divmod(column - 1, 26)
        letters = chr(ord("A") + rest) + letters
    return f"{letters}{row}"


def plant_sheet():
    rows = plant_rows()
    cells = {"A1": "key", "B1": "value",
             "D1": "The invented demo plant of examples/demo-plant.json (every number invented for the demo).",
             "D2": f"Keys with dots make the nesting of the JSON description; A2:B{len(rows) + 1} is named "
                   f"'{PLANT_RANGE}'."}
    for r, (key, value) in enumerate(rows, start=2):
        cells[f"A{r}"] = key
        cells[f"B{r}"] = value
    return cells, f"$A$2:$B${len(rows) + 1}"


def point_sheet():
    plant = Name(PLANT_RANGE)
    outputs = ["cell.voltage", "stack.power [MW]", "product.hydrogen [kg/h]", "perf.efficiency_hhv [%]",
               "gas.h2_in_o2 [%]"]
    cells = {
        "A1": "elyblock worksheet functions on the invented demo plant (sheet Plant, range named plant)",
        "A3": "library version", "B3": Formula(Call("ELYVERSION")),
        "A4": "hydrogen at the plant's operating point [kg/h]",
        "B4": Formula(Call("ELYSOLVE", plant, "product.hydrogen [kg/h]")),
        "A5": "cell voltage there [V]", "B5": Formula(Call("ELYSOLVE", plant, "cell.voltage")),
        "A6": "the same plant from its JSON file, hydrogen [kg/h]",
        "B6": Formula(Call("ELYSOLVE", "../demo-plant.json", "product.hydrogen [kg/h]")),
        "A8": "DC power setpoint", "B8": "15 MW",
        "A9": "hydrogen at that power [kg/h]",
        "B9": Formula(Call("ELYSOLVE", plant, "product.hydrogen [kg/h]", "in.power", Ref("B8"))),
        "A10": "specific energy, stacks DC [kWh/kg]",
        "B10": Formula(Call("ELYSOLVE", plant, "perf.specific_energy [kWh/kg]", "in.power", Ref("B8"))),
        "A11": "specific energy, plant AC [kWh/kg]",
        "B11": Formula(Call("ELYSOLVE", plant, "perf.specific_energy_plant [kWh/kg]", "in.power", Ref("B8"))),
        "A12": "make-up water [kg/h]",
        "B12": Formula(Call("ELYSOLVE", plant, "feed.water [kg/h]", "in.power", Ref("B8"))),
        "A13": "cell voltage at that power, 70 degC and 20 bar cathode pressure [V]",
        "B13": Formula(Call("ELYSOLVE", plant, "cell.voltage", "in.power", Ref("B8"), "in.temperature", "70 degC",
                            "in.pressure_cathode [bar]", 20)),
        "A15": "several outputs at 1.5 A/cm2 (ELYOUTPUTS, an array formula over B17:F17)",
        "A19": "too much power: #NUM! (ELYMESSAGE beside it says why)",
        "B19": Formula(Call("ELYSOLVE", plant, "product.hydrogen", "in.power", "40 MW")),
        "C19": Formula(Call("ELYMESSAGE", "ELYSOLVE", plant, "product.hydrogen", "in.power", "40 MW")),
        "A20": "a misspelt input name: #VALUE!",
        "B20": Formula(Call("ELYSOLVE", plant, "product.hydrogen", "in.powr", "15 MW")),
        "C20": Formula(Call("ELYMESSAGE", "ELYSOLVE", plant, "product.hydrogen", "in.powr", "15 MW")),
        "A21": "low load: a value, with the alarms it raised",
        "B21": Formula(Call("ELYSOLVE", plant, "product.hydrogen [kg/h]", "in.power", "1.5 MW")),
        "C21": Formula(Call("ELYMESSAGE", "ELYSOLVE", plant, "product.hydrogen [kg/h]", "in.power", "1.5 MW")),
    }
    for k, name in enumerate(outputs):
        cells[cell_name(1 + k, 16)] = name
    cells["B17"] = Formula(Call("ELYOUTPUTS", plant, Ref("B16:F16"), "in.current_density", "1.5 A/cm2"),
                           array=(1, len(outputs)))
    return cells


SWEEP_POWERS_MW = [2, 4, 6, 8, 10, 12, 14, 16, 18, 20, 22, 24, 26]
SWEEP_OUTPUTS = ["product.hydrogen [kg/h]", "perf.specific_energy [kWh/kg]", "perf.specific_energy_plant [kWh/kg]",
                 "cell.voltage", "perf.load_fraction [%]"]
COLUMN_OUTPUTS = ["cell.voltage", "cell.activation_anode", "cell.activation_cathode", "cell.ohmic",
                  "cell.concentration"]


def sweep_sheet():
    plant = Name(PLANT_RANGE)
    cells = {"A1": "DC power [MW]"}
    for k, name in enumerate(SWEEP_OUTPUTS):
        cells[cell_name(1 + k, 1)] = name
    for r, power in enumerate(SWEEP_POWERS_MW, start=2):
        cells[f"A{r}"] = power
        for k in range(len(SWEEP_OUTPUTS)):
            column = cell_name(1 + k, 1)[:-1]
            cells[f"{column}{r}"] = Formula(Call("ELYSOLVE", plant, Ref(f"{column}$1"), "in.power [MW]", Ref(f"$A{r}")))
    cells["H1"] = "voltage breakdown at 20 MW [V] (ELYOUTPUTS over a column: I2:I6)"
    for k, name in enumerate(COLUMN_OUTPUTS, start=2):
        cells[f"H{k}"] = name
    cells["I2"] = Formula(Call("ELYOUTPUTS", plant, Ref(f"H2:H{len(COLUMN_OUTPUTS) + 1}"), "in.power", "20 MW"),
                          array=(len(COLUMN_OUTPUTS), 1))
    return cells


# Two days of hourly DC power and ambient temperature, invented for the demo (no measured data): a
# lull below the plant's minimum load each night; the last row ends the run.
PROFILE_MW = [18, 20, 22, 24, 24, 22, 19, 15, 11, 8, 5, 2.5, 1.5, 1, 1.2, 3, 6, 10, 14, 17, 20, 23, 25, 24] * 2 + [20]
PROFILE_HEADER = ["time [h]", "power [MW]", "in.ambient_temperature [degC]"]
PROFILE_OUTPUTS = ["product.hydrogen [kg/h]", "stack.temperature [degC]", "state.mode", "plant.power [MW]"]
SUMMARY_FIGURES = ["hydrogen [t]", "energy_ac [MWh]", "specific_energy_ac [kWh/kg]", "water [t]", "full_load_hours",
                   "starts", "hours_standby"]


def profile_sheet():
    plant = Name(PLANT_RANGE)
    last = len(PROFILE_MW) + 1
    profile = Ref(f"$A$1:$C${last}")
    cells = {}
    for k, name in enumerate(PROFILE_HEADER):
        cells[cell_name(k, 1)] = name
    for h, power in enumerate(PROFILE_MW):
        cells[f"A{h + 2}"] = h
        cells[f"B{h + 2}"] = power
        cells[f"C{h + 2}"] = round(10.0 + 8.0 * math.sin(math.pi * (h % 24 - 8) / 12), 2)
    for k, name in enumerate(PROFILE_OUTPUTS):
        cells[cell_name(4 + k, 1)] = name
    standby = ("in.mode_request", 3)  # automatic: hot standby while the power is below the minimum load
    cells["E2"] = Formula(Call("ELYPROFILE", plant, profile, Ref("E1:H1"), *standby),
                          array=(len(PROFILE_MW), len(PROFILE_OUTPUTS)))
    cells["J1"] = "run summary with automatic standby (ELYSUMMARY over K2:K8)"
    for k, name in enumerate(SUMMARY_FIGURES, start=2):
        cells[f"J{k}"] = name
    cells["K2"] = Formula(Call("ELYSUMMARY", plant, profile, Ref(f"J2:J{len(SUMMARY_FIGURES) + 1}"), *standby),
                          array=(len(SUMMARY_FIGURES), 1))
    cells["J10"] = "hydrogen [t] when the plant never stands by (it holds the minimum load)"
    cells["K10"] = Formula(Call("ELYSUMMARY", plant, profile, "hydrogen [t]"))
    cells["J11"] = "starts then"
    cells["K11"] = Formula(Call("ELYSUMMARY", plant, profile, "starts"))
    cells["J12"] = "the run's message (alarms of its rows)"
    cells["K12"] = Formula(Call("ELYMESSAGE", "ELYPROFILE", plant, profile, Ref("E1:H1"), *standby))
    cells["J13"] = "a misspelt figure: #VALUE!"
    cells["K13"] = Formula(Call("ELYSUMMARY", plant, profile, "hydrogn"))
    return cells


def variables_sheet(variable_count):
    return {"A1": Formula(Call("ELYVARIABLES", Name(PLANT_RANGE)), array=(variable_count + 1, 5))}


def workbook(variable_count):
    """[(sheet name, {address: value or Formula})], and the named ranges {name: (sheet, range)}."""
    plant_cells, plant_range = plant_sheet()
    sheets = [("Plant", plant_cells), ("Point", point_sheet()), ("Sweep", sweep_sheet()),
              ("Profile", profile_sheet()), ("Variables", variables_sheet(variable_count))]
    return sheets, {PLANT_RANGE: ("Plant", plant_range)}
