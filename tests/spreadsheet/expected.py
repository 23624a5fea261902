"""What each worksheet function call should give, worked out without the spreadsheet code.

The numbers come from the C interface: tests/python/reference.c (a C program over the public
header, driven through its stdin with hexadecimal floats) creates the block from the plant file,
sets the spec and the inputs and solves; the warning text of a solve that raised alarms and the
library version come from the library through ctypes (the reference program prints neither).
Units are converted with python3-pint, independently of the library's unit parser, and the
rules of the functions (pairs of name and value, the spec chosen by its drive input, units in
brackets) are written again here from their description in functions.json.
"""
import ctypes
import json
import math
import re
import subprocess

SPECS = ("current_density", "current", "power", "hydrogen_rate", "voltage")
CAUSALITY = {0: "input", 1: "output", 2: "parameter"}
NUM_STATUSES = {-2, -4, -5}


class Expected:
    """A value ('value', number or text), or an error ('error', kind 'num'/'value', message)."""

    def __init__(self, kind, value, message=""):
        self.kind, self.value, self.message = kind, value, message

    def __repr__(self):
        return f"Expected({self.kind}, {self.value!r}, {self.message!r})"


class Reference:
    """tests/python/reference.c through its stdin."""

    def __init__(self, program):
        self.process = subprocess.Popen([program], stdin=subprocess.PIPE, stdout=subprocess.PIPE, text=True)

    def ask(self, line):
        self.process.stdin.write(line + "\n")
        self.process.stdin.flush()
        return self.process.stdout.readline().rstrip("\n")

    def status(self, line):
        answer = self.ask(line)
        m = re.match(r"status (-?\d+) ?(.*)$", answer)
        if not m:
            raise RuntimeError(f"reference program: '{line}' answered '{answer}'")
        return int(m.group(1)), m.group(2)

    def variables(self):
        status, rest = self.status("variables")
        if status < 0:
            raise RuntimeError(f"variables: {rest}")
        rows = []
        for _ in range(int(rest)):
            fields = self.process.stdout.readline().rstrip("\n").split("\t")
            rows.append({"name": fields[0], "unit": fields[1], "causality": CAUSALITY[int(fields[2])],
                         "description": fields[3], "display_unit": fields[11]})
        return rows

    def close(self):
        try:
            self.process.stdin.write("quit\n")
            self.process.stdin.close()
        except OSError:
            pass
        self.process.wait(timeout=30)


class Direct:
    """The library through ctypes, for what the reference program does not print."""

    def __init__(self, library_path):
        self.lib = ctypes.CDLL(library_path)
        self.lib.ely_version.restype = ctypes.c_char_p
        self.lib.ely_last_error.restype = ctypes.c_char_p
        for name in ("ely_block_create_from_file", "ely_block_find", "ely_block_set", "ely_block_set_spec",
                     "ely_block_solve"):
            getattr(self.lib, name).restype = ctypes.c_int32
        self.lib.ely_block_set.argtypes = [ctypes.c_void_p, ctypes.c_int32, ctypes.c_double]
        self.lib.ely_block_find.argtypes = [ctypes.c_void_p, ctypes.c_char_p, ctypes.POINTER(ctypes.c_int32)]
        self.lib.ely_block_set_spec.argtypes = [ctypes.c_void_p, ctypes.c_char_p]
        self.lib.ely_block_solve.argtypes = [ctypes.c_void_p]
        self.lib.ely_block_destroy.argtypes = [ctypes.c_void_p]

    def version(self):
        return self.lib.ely_version().decode()

    def simulate(self, plant_path, spec, sets, times, input_names, values, output_names):
        """ely_block_simulate on a block created from the plant file: (status, message, rows of
        the outputs, run summary as parsed JSON or None)."""
        lib = self.lib
        lib.ely_block_simulate.restype = ctypes.c_int32
        lib.ely_block_simulate.argtypes = [ctypes.c_void_p, ctypes.c_size_t] + [ctypes.c_void_p] * 10
        lib.ely_block_simulate.argtypes[3] = ctypes.c_int32
        lib.ely_block_simulate.argtypes[6] = ctypes.c_int32
        lib.ely_block_run_summary_json.restype = ctypes.c_int32
        lib.ely_block_run_summary_json.argtypes = [ctypes.c_void_p, ctypes.c_char_p, ctypes.c_size_t,
                                                   ctypes.POINTER(ctypes.c_size_t)]
        block = ctypes.c_void_p()
        assert self.lib.ely_block_create_from_file(plant_path.encode(), ctypes.byref(block)) == 0
        try:
            if spec:
                assert lib.ely_block_set_spec(block, spec.encode()) == 0
            for name, value in sets:
                assert lib.ely_block_set(block, self.index(block, name), value) == 0, name
            n, n_in, n_out = len(times), len(input_names), len(output_names)
            inputs = (ctypes.c_int32 * max(n_in, 1))(*[self.index(block, x) for x in input_names])
            outputs = (ctypes.c_int32 * max(n_out, 1))(*[self.index(block, x) for x in output_names])
            out = (ctypes.c_double * max(n * n_out, 1))()
            status = (ctypes.c_int32 * n)()
            result = lib.ely_block_simulate(block, n, (ctypes.c_double * n)(*times), n_in, inputs,
                                            (ctypes.c_double * (n * n_in))(*values), n_out, outputs, out, status,
                                            None, None)
            message = lib.ely_last_error().decode() if result != 0 else ""
            summary = None
            if result >= 0:
                length = ctypes.c_size_t()
                assert lib.ely_block_run_summary_json(block, None, 0, ctypes.byref(length)) == 0
                buffer = ctypes.create_string_buffer(length.value)
                assert lib.ely_block_run_summary_json(block, buffer, length, ctypes.byref(length)) == 0
                summary = json.loads(buffer.value.decode())
            rows = [[out[k * n_out + o] for o in range(n_out)] for k in range(n)]
            if result == 2:  # the run stopped: the status of the row that failed
                result = (result, next(s for s in status if s < 0))
            return result, message, rows, summary
        finally:
            self.lib.ely_block_destroy(block)

    def index(self, block, name):
        index = ctypes.c_int32()
        assert self.lib.ely_block_find(block, name.encode(), ctypes.byref(index)) == 0, name
        return index.value

    def solve_message(self, plant_path, spec, sets):
        """The message of a solve (the alarms of a warning), '' when it raised none."""
        block = ctypes.c_void_p()
        assert self.lib.ely_block_create_from_file(plant_path.encode(), ctypes.byref(block)) == 0
        try:
            if spec:
                assert self.lib.ely_block_set_spec(block, spec.encode()) == 0
            for name, value in sets:
                index = ctypes.c_int32()
                assert self.lib.ely_block_find(block, name.encode(), ctypes.byref(index)) == 0
                assert self.lib.ely_block_set(block, index, value) == 0
            status = self.lib.ely_block_solve(block)
            return self.lib.ely_last_error().decode() if status != 0 else ""
        finally:
            self.lib.ely_block_destroy(block)


# ---- units (python3-pint) ----------------------------------------------------------------------------
_registry = None


def ureg():
    global _registry
    if _registry is None:
        import pint
        _registry = pint.UnitRegistry()
        _registry.define("percent = 0.01 = %")
    return _registry


def pint_unit(symbol):
    if symbol in ("1", "mol/mol", "kg/kg"):
        return "dimensionless"
    if symbol == "%":
        return "percent"
    return re.sub(r"([A-Za-z])(\d)", r"\1**\2", symbol).replace(" ", "*")


def convert(value, from_unit, to_unit):
    if from_unit == to_unit:
        return value
    return ureg().Quantity(value, pint_unit(from_unit)).to(pint_unit(to_unit)).magnitude


def quantity(text, si_unit):
    """'15 MW' -> 15e6 in si_unit; a bare number is in si_unit."""
    m = re.match(r"^\s*([-+0-9.eE]+)\s*(.*?)\s*$", text)
    number, unit = float(m.group(1)), m.group(2)
    return convert(number, unit, si_unit) if unit else number


def name_unit(text):
    m = re.match(r"^\s*(\S+?)\s*(?:\[\s*(.*?)\s*\])?\s*$", text)
    return m.group(1), m.group(2)


# ---- the calls -----------------------------------------------------------------------------------------
class Evaluator:
    def __init__(self, reference, direct):
        self.reference, self.direct = reference, direct
        self._tables = {}

    def table(self, plant_path):
        if plant_path not in self._tables:
            status, message = self.reference.status(f"create {plant_path}")
            assert status == 0, message
            self._tables[plant_path] = {v["name"]: v for v in self.reference.variables()}
        return self._tables[plant_path]

    def point(self, plant_path, pairs):
        """The spec the pairs choose (or None) and their [(name, SI value)]."""
        table = self.table(plant_path)
        spec, sets, drives = None, [], []
        for name_text, value in zip(pairs[0::2], pairs[1::2]):
            if name_text == "spec":
                spec = value
                continue
            name, unit = name_unit(name_text)
            if "." not in name:  # a keyword: in.x, or param.x when only that exists
                name = "param." + name if "in." + name not in table and "param." + name in table else "in." + name
            if name not in table:  # the reference program names it when it is set
                sets.append((name, 0.0))
                continue
            si = table[name]["unit"]
            if isinstance(value, str):
                number = quantity(value, unit or si)
                number = convert(number, unit, si) if unit else number
            else:
                number = convert(float(value), unit, si) if unit else float(value)
            sets.append((name, number))
            if name.startswith("in.") and name[3:] in SPECS:
                drives.append(name[3:])
        if spec is None and drives:
            assert len(set(drives)) == 1, "the examples give one drive input"
            spec = drives[0]
        return spec, sets

    def solve(self, plant_path, pairs):
        """The reference block solved at the pairs' point: None, or an Expected error."""
        spec, sets = self.point(plant_path, pairs)
        status, message = self.reference.status(f"create {plant_path}")
        assert status == 0, message
        if spec:
            status, message = self.reference.status(f"spec {spec}")
            assert status == 0, message
        for name, value in sets:
            status, message = self.reference.status(f"set {name} {value.hex()}")
            if status < 0:
                return Expected("error", "num" if status in NUM_STATUSES else "value", message), None
        status, message = self.reference.status("solve")
        if status < 0:
            return Expected("error", "num" if status in NUM_STATUSES else "value", message), None
        warning = self.direct.solve_message(plant_path, spec, sets) if status > 0 else ""
        return None, warning

    def get(self, plant_path, output):
        name, unit = name_unit(output)
        table = self.table(plant_path)
        status, rest = self.reference.status(f"get {name}")
        if status < 0:
            return Expected("error", "value", rest)
        value = float.fromhex(rest)
        return Expected("value", convert(value, table[name]["unit"], unit) if unit else value)

    def call(self, name, args):
        """args: plant paths for plants, texts, numbers, lists of rows for ranges."""
        if name == "ELYVERSION":
            return Expected("value", self.direct.version())
        if name == "ELYVARIABLES":
            rows = [["name", "unit", "causality", "display unit", "description"]]
            for v in self.table(args[0]).values():
                if len(args) < 2 or v["causality"] == args[1]:
                    rows.append([v["name"], v["unit"], v["causality"], v["display_unit"], v["description"]])
            return Expected("value", rows)
        if name == "ELYMESSAGE":
            result = self.call(args[0], args[1:])
            if result.kind == "error":
                return Expected("value", result.message)
            return Expected("value", getattr(result, "warning", ""))
        if name in ("ELYSOLVE", "ELYOUTPUTS"):
            plant, outputs, pairs = args[0], args[1], list(args[2:])
            error, warning = self.solve(plant, pairs)
            if error:
                return error
            if name == "ELYSOLVE":
                result = self.get(plant, outputs)
            else:
                rows = [[self.get(plant, cell) if cell else Expected("value", "") for cell in row] for row in outputs]
                errors = [e for row in rows for e in row if e.kind == "error"]
                result = errors[0] if errors else Expected("value", [[e.value for e in row] for row in rows])
            result.warning = warning
            return result
        if name in ("ELYPROFILE", "ELYSUMMARY"):
            return self.run(name, args[0], args[1], args[2], list(args[3:]))
        raise ValueError(f"no expectation for {name}")

    def run(self, name, plant, profile, names, pairs):
        """A profile run: the profile's header read again here (the time first, then inputs; power,
        current and current_density stand for in.x), units by pint, the run by ely_block_simulate."""
        table = self.table(plant)
        header = [name_unit(h) for h in profile[0]]
        rows = [r for r in profile[1:] if any(c not in (None, "") for c in r)]
        times = [convert(float(r[0]), header[0][1] or "s", "s") for r in rows]
        columns = [x if "." in x else "in." + x for x, _ in header[1:]]
        values = [convert(float(r[c]), header[c][1], table[columns[c - 1]]["unit"]) if header[c][1] else float(r[c])
                  for r in rows for c in range(1, len(header))]
        spec, sets = self.point(plant, pairs)
        drives = [x[3:] for x in columns if x[3:] in SPECS]
        if spec is None and drives:
            spec = drives[0]
        cells = [c for row in names for c in row] if isinstance(names, list) else [names]
        wanted = [name_unit(c) for c in cells if c]
        outputs = [x for x, _ in wanted] if name == "ELYPROFILE" else []
        status, message, out, summary = self.direct.simulate(plant, spec, sets, times, columns, values, outputs)
        if isinstance(status, tuple):  # stopped at a row: its values NaN, the summary an error
            status, stopped = status
            if name == "ELYSUMMARY":
                return Expected("error", "num" if stopped in NUM_STATUSES else "value", message)
        if status < 0:
            return Expected("error", "num" if status in NUM_STATUSES else "value", message)
        if name == "ELYPROFILE":
            units = [(table[x]["unit"], u) for x, u in wanted]
            result = Expected("value", [[convert(v, si, u) if u and math.isfinite(v) else v
                                         for v, (si, u) in zip(row, units)] for row in out])
        elif not wanted:
            figures = [["figure", "value", "unit", "label"]]
            for key, f in summary["figures"].items():
                display = f["display_unit"] or f["unit"]
                value = "" if f["value"] is None else f["value"] * f["display_scale"] + f["display_offset"]
                figures.append([key, value, "" if display == "1" else display, f["label"]])
            result = Expected("value", figures)
        else:
            figures = summary["figures"]
            unknown = [x for x, _ in wanted if x not in figures]
            if unknown:
                return Expected("error", "value", f"figures: the run summary has no figure '{unknown[0]}'")
            values = [convert(figures[x]["value"], figures[x]["unit"], u) if u else figures[x]["value"] for x, u in wanted]
            if not isinstance(names, list):
                result = Expected("value", values[0])  # one figure named in the formula
            else:
                result = Expected("value", [values] if len(names) == 1 else [[v] for v in values])
        result.warning = message
        return result


def close(a, b, tolerance=1e-12):
    return a == b or abs(a - b) <= tolerance * max(abs(a), abs(b)) or (math.isnan(a) and math.isnan(b))
