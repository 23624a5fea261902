#!/usr/bin/python3
"""The Calc add-in in a headless LibreOffice: install, Function Wizard, the example workbook.

usage: test_calc.py ods|xlsx --oxt elyblock.oxt --workbook FILE --reference PROGRAM --library LIB
                    --plant demo-plant.json --work DIR

1. A fresh user profile in DIR; the extension installed with `unopkg add` (see office.py).
2. The Function Wizard's list (com.sun.star.sheet.FunctionDescriptions) holds every function of
   functions.json in the Add-In category, with the table's argument names and descriptions.
3. ods: the example workbook (examples/spreadsheets/elyblock-demo.ods, written by the build) is
   loaded and recalculated; every formula cell is compared with what the C interface gives for
   the same call (expected.py): numbers to 1e-12 relative, texts exactly, errors as #NUM!
   (model refused) or #VALUE! (wrong arguments) with ELYMESSAGE giving the library's message.
   xlsx: the Excel example (for the VBA module) is loaded; Calc does not know its function names
   (#NAME?), so each formula is entered again under the same text, which Calc's formula parser
   resolves to the add-in; then it is checked like the .ods. This checks that the Excel
   workbook's formulas are calls of the table's functions that give the C interface's values.
Prints "skipped: ..." and exits 77 when LibreOffice or python3-uno is missing.
"""
import argparse
import json
import os
import re
import sys

HERE = os.path.dirname(os.path.abspath(__file__))
SOURCE = os.path.dirname(os.path.dirname(HERE))
sys.path.insert(0, HERE)
sys.path.insert(0, os.path.join(SOURCE, "examples", "spreadsheets"))

import expected  # noqa: E402
from demo_workbook import Formula, Name, Ref, cell_name, workbook  # noqa: E402
from make_examples import split_address  # noqa: E402
from office import Office, import_uno, skip  # noqa: E402

CALC_ERROR = {"num": 503, "value": 519}  # ScErrorCodes: #NUM! and #VALUE!
failures = []


def check(condition, message):
    if not condition:
        failures.append(message)
        print("FAILED:", message, file=sys.stderr)
    return condition


def function_wizard(office, table):
    descriptions = office.context.ServiceManager.createInstanceWithContext(
        "com.sun.star.sheet.FunctionDescriptions", office.context)
    found = {}
    for i in range(descriptions.getCount()):
        props = {p.Name: p.Value for p in descriptions.getByIndex(i)}
        found[props["Name"]] = props
    add_in_category = 11  # com.sun.star.sheet.FunctionCategory.ADDIN
    for f in table["functions"]:
        props = found.get(f["name"])
        if not check(props is not None, f"{f['name']} is not in the Function Wizard's list"):
            continue
        check(props["Category"] == add_in_category, f"{f['name']}: category {props['Category']}, not Add-In")
        check(props["Description"] == f["summary"], f"{f['name']}: description {props['Description']!r}")
        arguments = [(a.Name, a.Description) for a in (props["Arguments"] or ())]
        wanted = [(a["name"], a["description"]) for a in f["arguments"]]
        check(arguments == wanted, f"{f['name']}: arguments {arguments} instead of {wanted}")
    print(f"Function Wizard: {len(table['functions'])} functions with their argument descriptions")


def cell_values(cells, address):
    """The static values of a range of the description (for Ref arguments)."""
    parts = address.replace("$", "").split(":")
    (c0, r0), (c1, r1) = split_address(parts[0]), split_address(parts[-1])
    rows = [[cells.get(cell_name(c, r)) for c in range(c0, c1 + 1)] for r in range(r0, r1 + 1)]
    return rows if len(parts) > 1 else rows[0][0]


def arguments(call, cells, plant_path, base_dir):
    """The call's arguments as the evaluator takes them: plants as file paths, ranges as rows."""
    plant_position = 1 if call.name == "ELYMESSAGE" else 0
    args = []
    for k, a in enumerate(call.args):
        if isinstance(a, Name):
            a = plant_path
        elif isinstance(a, Ref):
            a = cell_values(cells, a.address)
        elif k == plant_position and isinstance(a, str) and call.name != "ELYVERSION":
            a = os.path.normpath(os.path.join(base_dir, a))
        args.append(a)
    return args


def compare(sheet, address, formula, want, label):
    """One formula cell (or its array) against the expectation; returns the values compared."""
    cell = sheet.getCellRangeByName(address)
    if want.kind == "error":
        error = cell.getError()
        check(error == CALC_ERROR[want.value],
              f"{label}: error {error} ({cell.getString()!r}), expected {CALC_ERROR[want.value]} for: {want.message}")
        return []
    if not check(cell.getError() == 0, f"{label}: error {cell.getError()} ({cell.getString()!r}), expected {want.value!r}"):
        return []
    if isinstance(want.value, list):  # an array formula
        rows, columns = formula.array
        block = sheet.getCellRangeByPosition(cell.CellAddress.Column, cell.CellAddress.Row,
                                             cell.CellAddress.Column + columns - 1, cell.CellAddress.Row + rows - 1)
        got = block.getDataArray()
        check(len(want.value) == rows and all(len(r) == columns for r in want.value),
              f"{label}: {len(want.value)} x {len(want.value[0])} results for an array of {rows} x {columns}")
        differences = []
        for r, (got_row, want_row) in enumerate(zip(got, want.value)):
            for c, (g, w) in enumerate(zip(got_row, want_row)):
                if isinstance(w, float):
                    check(isinstance(g, float) and expected.close(g, w), f"{label}[{r},{c}]: {g!r}, expected {w!r}")
                    differences.append(abs(g - w) / max(abs(w), 1e-300) if isinstance(g, float) else 1.0)
                else:
                    check(g == w, f"{label}[{r},{c}]: {g!r}, expected {w!r}")
        return differences
    if isinstance(want.value, str):
        check(cell.getString() == want.value, f"{label}: {cell.getString()!r}, expected {want.value!r}")
        return []
    got = cell.getValue()
    check(expected.close(got, want.value), f"{label}: {got!r}, expected {want.value!r}")
    return [abs(got - want.value) / max(abs(want.value), 1e-300)]


FUNCTION_NAME = re.compile(r"(?i)\b(ELY[A-Z]+)\s*\(")


def reenter(sheet, address, formula):
    """An Excel formula that Calc did not resolve, entered again with the function names as typed."""
    cell = sheet.getCellRangeByName(address)
    text = cell.getFormula().lstrip("{").rstrip("}")
    text = FUNCTION_NAME.sub(lambda m: m.group(1).upper() + "(", text)
    if formula.array:
        rows, columns = formula.array
        block = sheet.getCellRangeByPosition(cell.CellAddress.Column, cell.CellAddress.Row,
                                             cell.CellAddress.Column + columns - 1, cell.CellAddress.Row + rows - 1)
        block.setArrayFormula(text)
    else:
        cell.setFormula(text)


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("kind", choices=["ods", "xlsx"])
    ap.add_argument("--oxt", required=True)
    ap.add_argument("--workbook", required=True)
    ap.add_argument("--reference", required=True)
    ap.add_argument("--library", required=True)
    ap.add_argument("--plant", required=True)
    ap.add_argument("--work", required=True)
    a = ap.parse_args()
    import_uno()
    if not os.path.exists(a.oxt):
        skip(f"{a.oxt} was not built")
    if not os.path.exists(a.workbook):
        skip(f"{a.workbook} was not written (python3-openpyxl missing?)")
    with open(os.path.join(SOURCE, "adapters", "spreadsheet", "functions.json"), encoding="utf-8") as f:
        table = json.load(f)

    reference = expected.Reference(a.reference)
    evaluator = expected.Evaluator(reference, expected.Direct(a.library))
    plant_path = os.path.abspath(a.plant)
    variable_count = len(evaluator.table(plant_path))
    sheets, _ = workbook(variable_count)
    base_dir = os.path.dirname(os.path.abspath(a.workbook))
    try:
        with Office(a.work, a.oxt) as office:
            print(f"extension installed with {office.install_method}")
            function_wizard(office, table)
            document = office.load(a.workbook)
            try:
                if a.kind == "xlsx":
                    for sheet_name, cells in sheets:
                        sheet = document.Sheets.getByName(sheet_name)
                        for address, value in cells.items():
                            if isinstance(value, Formula):
                                reenter(sheet, address, value)
                document.calculateAll()
                differences, formulas, used = [], 0, set()
                for sheet_name, cells in sheets:
                    sheet = document.Sheets.getByName(sheet_name)
                    for address, value in cells.items():
                        if not isinstance(value, Formula):
                            continue
                        formulas += 1
                        call = value.call
                        used.add(call.name)
                        want = evaluator.call(call.name, arguments(call, cells, plant_path, base_dir))
                        differences += compare(sheet, address, value, want, f"{sheet_name}!{address} ({call.name})")
            finally:
                document.close(True)
    finally:
        reference.close()
    check(used == {f["name"] for f in table["functions"]}, f"the workbook calls {sorted(used)}, not every function")
    worst = max(differences) if differences else 0.0
    print(f"{a.kind}: {formulas} formulas, {len(differences)} numbers compared with the C interface; "
          f"largest relative difference {worst:.3g}")
    if failures:
        print(f"{len(failures)} checks failed", file=sys.stderr)
        return 1
    return 0


if __name__ == "__main__":
    sys.exit(main())
