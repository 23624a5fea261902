"""The worksheet functions of elyblock in Python, for the LibreOffice Calc add-in (addin.py).

Host-independent: arguments arrive as plain Python values (numbers, texts, None for an empty
cell, a tuple of row tuples for a range) and results leave as numbers, texts or lists of rows.
A failure raises ``Failure`` with the library's message and the error value it stands for.
The functions, their arguments and texts are those of adapters/spreadsheet/functions.json;
the Excel VBA module implements the same table.

Everything goes through the elyblock Python package (ctypes over the public C interface):
blocks are created once per plant text and kept (``BlockCache``); every call solves a fresh
clone of its plant's block, so a result depends only on the call's arguments, never on the
order in which the host recalculates its cells, and equals what a C program gets by creating
the block from the same text, setting the same inputs and solving.
"""
import collections
import ctypes
import json
import math
import os
import re
import threading
import warnings

_HERE = os.path.dirname(os.path.abspath(__file__))
# The function table: beside this module in the extension, one folder up in the source tree.
_TABLE_PATH = next((p for p in (os.path.join(_HERE, "functions.json"), os.path.join(_HERE, "..", "functions.json"))
                    if os.path.exists(p)), os.path.join(_HERE, "functions.json"))
REPEATED = ("pairs", "rest")  # argument kinds that repeat (the last argument of a function)
SPECS = ("current_density", "current", "power", "hydrogen_rate", "voltage")
CAUSALITIES = ("input", "output", "parameter")
VARIABLES_HEADER = ["name", "unit", "causality", "display unit", "description"]
SUMMARY_HEADER = ["figure", "value", "unit", "label"]
# A profile's columns: the time first, then inputs; these words stand for the drive inputs (as in
# the command line's `elyblock run`), any other name without a dot x for in.x.
TIME_COLUMNS = ("time", "t")
PROFILE_WORDS = {"power": "in.power", "current": "in.current", "current_density": "in.current_density"}
ELY_WARNING, ELY_PARTIAL = 1, 2
RUN_CACHE = 8  # profile runs kept (a sheet reads one run's summary in several cells)


class Failure(Exception):
    """A call that gives the spreadsheet's error value: ``kind`` "value" for #VALUE! (the call's
    arguments or plant are wrong), "num" for #NUM! (the model refuses the operating point)."""

    def __init__(self, message, kind="value"):
        super().__init__(message)
        self.message = message
        self.kind = kind

    def __str__(self):
        return self.message


def load_table(path=_TABLE_PATH):
    with open(path, encoding="utf-8") as f:
        return json.load(f)


# ---- the library ---------------------------------------------------------------------------------
_elyblock = None


def library():
    """The elyblock package, imported on first use (so that installing the add-in never loads the
    native library)."""
    global _elyblock
    if _elyblock is None:
        previous = os.environ.get("ELYBLOCK_LIBRARY")
        _use_bundled_library()
        try:
            import elyblock
        except ImportError as e:
            raise Failure(f"the elyblock library cannot be loaded: {e}") from e
        finally:
            if previous is None:
                os.environ.pop("ELYBLOCK_LIBRARY", None)
            else:
                os.environ["ELYBLOCK_LIBRARY"] = previous
        lib = elyblock._capi.lib
        # Calls of the header the package does not declare (it does not use them).
        lib.ely_parse_quantity.restype = ctypes.c_int32
        lib.ely_parse_quantity.argtypes = [ctypes.c_char_p, ctypes.c_char_p, ctypes.POINTER(ctypes.c_double)]
        lib.ely_convert_unit.restype = ctypes.c_int32
        lib.ely_convert_unit.argtypes = [ctypes.c_double, ctypes.c_char_p, ctypes.c_char_p,
                                         ctypes.POINTER(ctypes.c_double)]
        # The profile run (the dynamic block), in libraries that have it, declared here when the
        # package does not declare it (the package's own declarations are left as they are).
        if hasattr(lib, "ely_block_simulate") and "ely_block_simulate" not in elyblock._capi._PROTOTYPES:
            lib.ely_block_simulate.restype = ctypes.c_int32
            lib.ely_block_simulate.argtypes = [ctypes.c_void_p, ctypes.c_size_t, ctypes.c_void_p, ctypes.c_int32,
                                               ctypes.c_void_p, ctypes.c_void_p, ctypes.c_int32, ctypes.c_void_p,
                                               ctypes.c_void_p, ctypes.c_void_p, ctypes.c_void_p, ctypes.c_void_p]
            lib.ely_block_run_summary_json.restype = ctypes.c_int32
            lib.ely_block_run_summary_json.argtypes = [ctypes.c_void_p, ctypes.c_char_p, ctypes.c_size_t,
                                                       ctypes.POINTER(ctypes.c_size_t)]
        # A solve with an alarm raised is not a failure: its message is ELYMESSAGE's to give.
        warnings.filterwarnings("ignore", category=elyblock.ElyWarning)
        _elyblock = elyblock
    return _elyblock


def _use_bundled_library():
    """In the Calc extension the library and the libfmt it needs sit beside this module: load
    libfmt first (by its SONAME it then satisfies libelyblock's dependency) and have the package
    load the library beside it, whatever ELYBLOCK_LIBRARY says (for the import only)."""
    here = _HERE
    bundled = os.path.join(here, "libelyblock.so.1")
    if not os.path.exists(bundled):
        return  # outside the extension: the package finds the library as usual
    for name in sorted(os.listdir(here)):
        if name.startswith("libfmt.so"):
            ctypes.CDLL(os.path.join(here, name), mode=ctypes.RTLD_GLOBAL)
    os.environ["ELYBLOCK_LIBRARY"] = bundled


_NUM_STATUSES = {-2, -4, -5}  # out of range, infeasible, no convergence: the model refuses the point


def _failure(error):
    return Failure(error.message, "num" if error.status in _NUM_STATUSES else "value")


def _checked(status):
    ely = library()
    if status < 0:
        raise _failure(ely.errors.error_for(status, ely._capi.last_error() or ely._capi.status_text(status)))
    return status


def parse_quantity(text, unit):
    value = ctypes.c_double()
    _checked(library()._capi.lib.ely_parse_quantity(text.encode("utf-8"), unit.encode("utf-8"), ctypes.byref(value)))
    return value.value


def convert_unit(value, from_unit, to_unit):
    if from_unit == to_unit:
        return value
    result = ctypes.c_double()
    _checked(library()._capi.lib.ely_convert_unit(value, from_unit.encode("utf-8"), to_unit.encode("utf-8"),
                                                  ctypes.byref(result)))
    return result.value


# ---- cells ---------------------------------------------------------------------------------------
def rows_of(value):
    """A host value as a list of rows: a range stays as it is, a single value is one cell."""
    if isinstance(value, (tuple, list)) and value and all(isinstance(r, (tuple, list)) for r in value):
        return [list(r) for r in value]
    return [[value]]


def is_empty(cell):
    return cell is None or (isinstance(cell, str) and cell.strip() == "")


def single(value, what):
    """The one value of an argument that may arrive as a 1x1 range."""
    rows = rows_of(value)
    if len(rows) != 1 or len(rows[0]) != 1:
        raise Failure(f"{what}: expected one cell, got a range of {len(rows)} x {len(rows[0])}")
    return rows[0][0]


def text_argument(value, what, optional=False):
    cell = single(value, what)
    if is_empty(cell):
        if optional:
            return None
        raise Failure(f"{what}: empty")
    if not isinstance(cell, str):
        raise Failure(f"{what}: expected a text, got the number {number_text(cell)}")
    return cell.strip()


def number_text(x):
    """A number as JSON text that reads back to the same double (integral values without '.0')."""
    x = float(x)
    if not math.isfinite(x):
        raise Failure(f"the number {x} is not finite")
    if x == int(x) and abs(x) < 2.0**53:
        return str(int(x))
    return repr(x)


_NAME_UNIT = re.compile(r"^\s*([^\[\]\s]+)\s*(?:\[\s*([^\]]*?)\s*\])?\s*$")


def name_and_unit(text, what):
    """'product.hydrogen [kg/h]' -> ('product.hydrogen', 'kg/h'); without brackets the unit is None."""
    m = _NAME_UNIT.match(text)
    if not m:
        raise Failure(f"{what}: '{text}' is not a variable name with an optional unit in brackets "
                      f"(e.g. 'product.hydrogen [kg/h]')")
    return m.group(1), (m.group(2) or None)


# ---- plants --------------------------------------------------------------------------------------
def plant_json(rows):
    """The JSON text of a plant given as rows of (key, value): dotted keys make nested objects
    ('stack.cells' -> {"stack": {"cells": ...}}), in the order they first appear. Values: numbers
    as JSON numbers, 'true'/'false' as booleans, a text starting with '[' or '{' as JSON itself,
    any other text as a JSON string ("80 degC"). Rows with an empty key, or a key starting with '#',
    are skipped."""
    tree = {}
    seen = {}
    for r, row in enumerate(rows, start=1):
        key = row[0]
        if is_empty(key):
            if len(row) > 1 and not is_empty(row[1]):
                raise Failure(f"plant range, row {r}: a value without a key")
            continue
        if not isinstance(key, str):
            raise Failure(f"plant range, row {r}: the key is the number {number_text(key)}, not a text")
        key = key.strip()
        if key.startswith("#"):
            continue
        parts = key.split(".")
        if any(p == "" for p in parts):
            raise Failure(f"plant range, row {r}: the key '{key}' has an empty part")
        if key in seen:
            raise Failure(f"plant range, rows {seen[key]} and {r}: the key '{key}' is given twice")
        seen[key] = r
        value = row[1] if len(row) > 1 else None
        if is_empty(value):
            raise Failure(f"plant range, row {r}: the key '{key}' has no value")
        node = tree
        for depth, part in enumerate(parts[:-1]):
            child = node.setdefault(part, {})
            if not isinstance(child, dict):
                raise Failure(f"plant range, row {r}: '{'.'.join(parts[:depth + 1])}' has a value, "
                              f"so '{key}' cannot be under it")
            node = child
        if parts[-1] in node:
            raise Failure(f"plant range, row {r}: '{key}' holds keys below it, so it cannot have a value")
        node[parts[-1]] = _json_value(value, key, r)
    return _json_text(tree)


def _json_value(value, key, row):
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, (int, float)):
        try:
            return number_text(value)
        except Failure:
            raise Failure(f"plant range, row {row}: the value of '{key}' is not a finite number") from None
    text = str(value).strip()
    if text.lower() in ("true", "false"):
        return text.lower()
    if text.startswith(("[", "{")):
        return text  # JSON itself (a reaction table, a list): the library reads and checks it
    return json.dumps(text, ensure_ascii=False)


def _json_text(tree):
    return "{" + ", ".join(f"{json.dumps(k, ensure_ascii=False)}: {_json_text(v) if isinstance(v, dict) else v}"
                           for k, v in tree.items()) + "}"


def plant_source(plant, base_dir):
    """('text', JSON) for a key/value range, ('file', absolute path) for a path."""
    rows = rows_of(plant)
    if len(rows) == 1 and len(rows[0]) == 1:
        cell = rows[0][0]
        if is_empty(cell):
            raise Failure("plant: empty; give a path to a JSON plant description or a two-column range of keys and values")
        if not isinstance(cell, str):
            raise Failure(f"plant: the number {number_text(cell)} is neither a path nor a range of keys and values")
        return "file", resolve_path(cell.strip(), base_dir)
    widths = {len(r) for r in rows}
    if widths != {2}:
        raise Failure(f"plant: a plant range has two columns (key, value); this one has {max(widths)}")
    return "text", plant_json(rows)


def resolve_path(path, base_dir):
    if path.startswith("file://"):
        from urllib.parse import unquote, urlparse
        path = unquote(urlparse(path).path)
    path = os.path.expanduser(path)
    if not os.path.isabs(path):
        if not base_dir:
            raise Failure(f"plant: '{path}' is a relative path and this document has no folder yet (save it, "
                          f"or give an absolute path)")
        path = os.path.join(base_dir, path)
    return os.path.normpath(path)


class BlockCache:
    """Blocks by plant: the JSON text of a range, or a file by its path, size and modification
    time (an edited file is read again). The least recently used of more than ``capacity`` is
    freed. Blocks here are never solved or changed: calls work on clones."""

    def __init__(self, capacity=32):
        self.capacity = capacity
        self._blocks = collections.OrderedDict()
        self.creations = 0  # how many plants were parsed (tests check that a sheet parses each once)
        self._tables = {}  # id of a kept block -> {variable name: Variable}

    def block(self, kind, source):
        if kind == "file":
            try:
                st = os.stat(source)
            except OSError:
                st = None
            key = ("file", source, st.st_size, st.st_mtime_ns, st.st_ino) if st else None
        else:
            key = ("text", source)
        found = self._blocks.get(key) if key else None
        if found is not None:
            self._blocks.move_to_end(key)
            return found
        ely = library()
        try:
            block = ely.Block(source) if kind == "text" else ely.Block(os.fspath(source))
        except ely.ElyError as e:
            raise _failure(e) from None
        self.creations += 1
        if key is not None:
            self._blocks[key] = block
            while len(self._blocks) > self.capacity:
                self._free(self._blocks.popitem(last=False)[1])
        return block

    def variables(self, block):
        """{name: Variable} of a block of the cache."""
        table = self._tables.get(id(block))
        if table is None:
            table = {v.name: v for v in block.variables()}
            if any(b is block for b in self._blocks.values()):
                self._tables[id(block)] = table
        return table

    def _free(self, block):
        self._tables.pop(id(block), None)
        block.close()

    def clear(self):
        while self._blocks:
            self._free(self._blocks.popitem()[1])


# ---- the functions -------------------------------------------------------------------------------
class Functions:
    """The worksheet functions. ``call(name, args, base_dir)`` runs one with its arguments in
    order (a repeated last argument flattened), as the host passes them."""

    def __init__(self, table=None):
        self.table = table or load_table()
        self.by_name = {f["name"]: f for f in self.table["functions"]}
        self.cache = BlockCache()
        self._range_texts = {}  # range (tuple of rows) -> ("text", JSON)
        self._runs = collections.OrderedDict()  # profile runs: arguments -> (block, result)
        self._lock = threading.RLock()

    # -- dispatch --
    def find(self, name):
        key = str(name).strip().upper()
        prefix = self.table["prefix"]
        for candidate in (key, prefix + key):
            if candidate in self.by_name:
                return self.by_name[candidate]
        raise Failure(f"no elyblock function '{name}'; the functions are {', '.join(self.by_name)}")

    def call(self, name, args, base_dir=None):
        """The result of function ``name`` (a number, a text or a list of rows), or Failure."""
        result, _ = self.run(name, list(args), base_dir)
        return result

    def run(self, name, args, base_dir=None):
        """(result, warning text)."""
        spec = self.find(name)
        fixed = [a for a in spec["arguments"] if a["kind"] not in REPEATED]
        required = [a for a in fixed if not a.get("optional")]
        repeated = len(fixed) < len(spec["arguments"])
        if len(args) < len(required) or (not repeated and len(args) > len(fixed)):
            expected = f"{len(required)}" + (" or more" if repeated else "" if len(required) == len(fixed) else f" to {len(fixed)}")
            raise Failure(f"{spec['name']}: {expected} arguments expected, got {len(args)}")
        method = getattr(self, "_" + spec["name"].lower())
        with self._lock:
            return method(base_dir, *args)

    def message(self, name, args, base_dir=None):
        """ELYMESSAGE: the message of a call of another function."""
        try:
            spec = self.find(name)
            if spec["name"] == "ELYMESSAGE":
                raise Failure("ELYMESSAGE explains a call of another function")
            _, warning = self.run(spec["name"], list(args), base_dir)
            return warning
        except Failure as f:
            return f.message

    # -- plants and points --
    def _block(self, plant, base_dir):
        if isinstance(plant, tuple) and len(plant) > 1:
            # A range as the host passes it (a tuple of row tuples): its JSON text is kept with it,
            # since writing it costs more than the solve.
            try:
                source = self._range_texts.get(plant)
            except TypeError:  # a cell value that does not hash
                return self.cache.block(*plant_source(plant, base_dir))
            if source is None:
                source = plant_source(plant, base_dir)
                if len(self._range_texts) >= 4 * self.cache.capacity:
                    self._range_texts.clear()
                self._range_texts[plant] = source
            return self.cache.block(*source)
        return self.cache.block(*plant_source(plant, base_dir))

    def _solved(self, plant, inputs, base_dir):
        """A clone of the plant's block with the inputs set and solved, and its warning."""
        ely = library()
        base = self._block(plant, base_dir)
        names = self.cache.variables(base)
        spec, sets = self._inputs(base, names, inputs)
        work = self._clone(base, spec, sets)
        try:
            work.solve()
        except ely.ElyError as e:
            work.close()
            raise _failure(e) from None
        return work, names, work.warning

    def _inputs(self, block, names, inputs):
        """The spec to set (or None) and the (name, SI value) pairs of the inputs' pairs."""
        spec, sets, drives = self._pairs(block, names, inputs)
        return _chosen_spec(spec, drives), sets

    @staticmethod
    def _clone(base, spec, sets):
        """A clone of base with the spec (unless None) and the (name, SI value) inputs set."""
        work = base.clone()
        try:
            if spec is not None:
                work.set_spec(spec)
            for name, value in sets:
                work[name] = value
        except library().ElyError as e:
            work.close()
            raise _failure(e) from None
        return work

    def _pairs(self, block, names, inputs):
        """The spec the pair "spec" names (or None), the (name, SI value) pairs, and the drive inputs
        set ({spec: input name})."""
        if len(inputs) % 2:
            raise Failure(f"inputs come in pairs of name and value; the last name, "
                          f"{_quoted(inputs[-1])}, has no value")
        spec, sets, drives = None, [], {}
        for k in range(0, len(inputs), 2):
            raw_name = text_argument(inputs[k], f"input name {k // 2 + 1}")
            value = single(inputs[k + 1], f"value of {raw_name}")
            if raw_name.lower() == "spec":
                spec = text_argument(value, "value of spec")
                continue
            name, unit = name_and_unit(raw_name, f"input name {k // 2 + 1}")
            if "." not in name:  # a keyword: x stands for in.x, or param.x when there is no in.x
                name = "in." + name if "in." + name in names or "param." + name not in names else "param." + name
            si = self._si_value(value, unit, self._variable(block, names, name).unit, raw_name)
            sets.append((name, si))
            if name.startswith("in.") and name[3:] in SPECS:
                drives[name[3:]] = name
        return spec, sets, drives

    @staticmethod
    def _si_value(value, unit, si_unit, raw_name):
        if is_empty(value):
            raise Failure(f"{raw_name}: no value (an empty cell)")
        if isinstance(value, bool):
            value = float(value)
        if isinstance(value, str):
            text = value.strip()
            number = parse_quantity(text, unit or si_unit)
        elif isinstance(value, (int, float)):
            number = float(value)
            if not math.isfinite(number):
                raise Failure(f"{raw_name}: the value is not a finite number")
        else:
            raise Failure(f"{raw_name}: cannot read the value {value!r}")
        return convert_unit(number, unit, si_unit) if unit else number

    @staticmethod
    def _variable(block, names, name):
        """The variable of that name; an unknown name fails with the library's message."""
        found = names.get(name)
        if found is None:
            try:
                block[name]  # ely_block_find names the problem
            except library().ElyError as e:
                raise _failure(e) from None
            raise Failure(f"'{name}' is not in the plant's variable table")
        return found

    def _output(self, work, names, text):
        name, unit = name_and_unit(text, "variable")
        variable = self._variable(work, names, name)
        try:
            value = work[name]
        except library().ElyError as e:
            raise _failure(e) from None
        return convert_unit(value, variable.unit, unit) if unit else value

    # -- profiles --
    def _profile(self, block, names, profile):
        """A profile range: (times in s, [(input name, written header)], row-major SI values)."""
        rows = rows_of(profile)
        while rows and all(is_empty(c) for c in rows[-1]):  # a range longer than its rows
            rows.pop()
        if len(rows) < 2:
            raise Failure("profile: a header row (\"time [h]\", \"power [MW]\", ...) and at least one row of "
                          "values are needed")
        header = []
        for c, cell in enumerate(rows[0], start=1):
            if is_empty(cell) or not isinstance(cell, str):
                raise Failure(f"profile, column {c}: the header {_quoted(cell)} is not a column name such as "
                              f"\"time [h]\" or \"power [MW]\"")
            name, unit = name_and_unit(cell, f"profile, column {c}")
            header.append((cell.strip(), name, unit))
        if header[0][1] not in TIME_COLUMNS:
            raise Failure(f"profile: the first column is '{header[0][0]}'; it must be the time, e.g. \"time [h]\"")
        if len(header) < 2:
            raise Failure("profile: no input column after the time")
        time_unit = header[0][2] or "s"
        convert_unit(1.0, time_unit, "s")  # a unit of time, or the library's message
        columns = []
        for written, name, unit in header[1:]:
            full = PROFILE_WORDS.get(name) or (name if "." in name else "in." + name)
            variable = self._variable(block, names, full)
            if variable.causality != "input":
                raise Failure(f"profile: column '{written}' is {full}, a{'n' if variable.causality[0] == 'o' else ''} "
                              f"{variable.causality}; the columns after the time are inputs")
            if any(full == c[0] for c in columns):
                raise Failure(f"profile: column '{written}' gives {full} a second time")
            columns.append((full, written, unit, variable.unit))
        times, values = [], []
        for r, row in enumerate(rows[1:], start=2):
            for c, cell in enumerate(row):
                where = f"profile, row {r}, column '{header[c][0]}'"
                if c == 0:
                    t = self._si_value(cell, time_unit, "s", where)
                    if times and t < times[-1]:
                        raise Failure(f"{where}: the time goes back (rows are in time order)")
                    times.append(t)
                else:
                    _, _, unit, si_unit = columns[c - 1]
                    values.append(self._si_value(cell, unit, si_unit, where))
        return times, [(c[0], c[1]) for c in columns], values

    def _run(self, plant, profile, inputs, outputs, base_dir):
        """The plant run through the profile by ely_block_simulate (on a clone of its block):
        (status, message, outputs' rows, row statuses, run summary as parsed JSON). Kept for
        RUN_CACHE calls of the same arguments."""
        base = self._block(plant, base_dir)
        key = None
        try:
            key = (_frozen(profile), _frozen(inputs), tuple(outputs))
            hash(key)
        except TypeError:  # a cell value that does not hash
            key = None
        cached = self._runs.get(key) if key is not None else None
        if cached is not None and cached[0] is base:
            self._runs.move_to_end(key)
            return cached[1]
        ely = library()
        lib = ely._capi.lib
        if not hasattr(lib, "ely_block_simulate"):
            raise Failure(f"the elyblock library {ely._capi.library_path} (version {ely.library_version}) has no "
                          f"profile runs (ely_block_simulate); use a newer one")
        names = self.cache.variables(base)
        times, columns, values = self._profile(base, names, profile)
        spec, sets, drives = self._pairs(base, names, inputs)
        for name, written in columns:
            if any(name == n for n, _ in sets):
                raise Failure(f"{name} is a column of the profile ('{written}') and an input pair: give it once")
            if name[3:] in SPECS:
                drives[name[3:]] = name
        spec = _chosen_spec(spec, drives)
        for name in outputs:
            self._variable(base, names, name)
        out_index = [base._index(name) for name in outputs]
        in_index = [base._index(name) for name, _ in columns]
        n, n_in, n_out = len(times), len(in_index), len(out_index)
        work = self._clone(base, spec, sets)
        try:
            out = (ctypes.c_double * (n * n_out))() if n_out else None
            row_status = (ctypes.c_int32 * n)()
            status = lib.ely_block_simulate(
                work._live(), n, (ctypes.c_double * n)(*times), n_in, (ctypes.c_int32 * n_in)(*in_index),
                (ctypes.c_double * (n * n_in))(*values), n_out, (ctypes.c_int32 * n_out)(*out_index) if n_out else None,
                out, row_status, lib.ely_block_simulate.argtypes[10](), None)  # a NULL progress callback
            message = (ely._capi.last_error() or ely._capi.status_text(status)) if status != 0 else ""
            if status < 0:
                raise _failure(ely.errors.error_for(status, message))
            summary = json.loads(ely._capi.buffer_text(lib.ely_block_run_summary_json, work._live()))
        except ely.ElyError as e:
            raise _failure(e) from None
        finally:
            work.close()
        rows = [list(out[k * n_out:(k + 1) * n_out]) for k in range(n)] if n_out else [[] for _ in range(n)]
        result = (status, message, rows, list(row_status), summary)
        if key is not None:
            self._runs[key] = (base, result)
            while len(self._runs) > RUN_CACHE:
                self._runs.popitem(last=False)
        return result

    # -- the functions of the table (one method each, named after it) --
    def _elysolve(self, base_dir, plant, variable, *inputs):
        text = text_argument(variable, "variable")
        work, names, warning = self._solved(plant, inputs, base_dir)
        try:
            return self._output(work, names, text), warning
        finally:
            work.close()

    def _elyoutputs(self, base_dir, plant, variables, *inputs):
        rows = rows_of(variables)
        if all(is_empty(c) for r in rows for c in r):
            raise Failure("variables: no variable names")
        work, names, warning = self._solved(plant, inputs, base_dir)
        try:
            result = []
            for row in rows:
                out = []
                for cell in row:
                    if is_empty(cell):
                        out.append("")
                    elif not isinstance(cell, str):
                        raise Failure(f"variables: expected names, got the number {number_text(cell)}")
                    else:
                        out.append(self._output(work, names, cell))
                result.append(out)
            return result, warning
        finally:
            work.close()

    def _elyvariables(self, base_dir, plant, causality=None):
        wanted = text_argument(causality, "causality", optional=True)
        if wanted is not None and wanted.lower() not in CAUSALITIES:
            raise Failure(f"causality: '{wanted}' is none of {', '.join(CAUSALITIES)}")
        block = self._block(plant, base_dir)
        rows = [list(VARIABLES_HEADER)]
        for v in block.variables(wanted.lower() if wanted else None):
            rows.append([v.name, v.unit, v.causality, v.display_unit or v.unit, v.description])
        return rows, ""

    def _elyversion(self, base_dir):
        return library().library_version, ""

    def _elyprofile(self, base_dir, plant, profile, outputs, *inputs):
        cells = rows_of(outputs)
        if len(cells) > 1 and len(cells[0]) > 1:
            raise Failure(f"outputs: a row or a column of variable names, not a range of {len(cells)} x {len(cells[0])}")
        wanted = [c for row in cells for c in row]
        if all(is_empty(c) for c in wanted):
            raise Failure("outputs: no variable names")
        base = self._block(plant, base_dir)
        names = self.cache.variables(base)
        columns = []  # (variable name, SI unit, unit asked for) or None for an empty cell
        for cell in wanted:
            if is_empty(cell):
                columns.append(None)
            elif not isinstance(cell, str):
                raise Failure(f"outputs: expected names, got the number {number_text(cell)}")
            else:
                name, unit = name_and_unit(cell, "outputs")
                columns.append((name, self._variable(base, names, name).unit, unit))
        status, message, rows, _, _ = self._run(plant, profile, inputs, tuple(c[0] for c in columns if c), base_dir)
        result = []
        for row in rows:
            values, k = [], 0
            for column in columns:
                if column is None:
                    values.append("")
                    continue
                value = row[k]
                k += 1
                if column[2] and math.isfinite(value):
                    value = convert_unit(value, column[1], column[2])
                values.append(value)
            result.append(values)
        return result, message

    def _elysummary(self, base_dir, plant, profile, figures, *inputs):
        cells = rows_of(figures)
        status, message, _, row_status, summary = self._run(plant, profile, inputs, (), base_dir)
        if status == ELY_PARTIAL:  # the summary of a run cut short is not the profile's
            stopped = next(s for s in row_status if s < 0)
            raise Failure(message, "num" if stopped in _NUM_STATUSES else "value")
        table = summary["figures"]
        if all(is_empty(c) for row in cells for c in row):
            rows = [list(SUMMARY_HEADER)]
            for name, f in table.items():
                display = f.get("display_unit") or f["unit"]
                value = "" if f["value"] is None else f["value"] * f["display_scale"] + f["display_offset"]
                rows.append([name, value, "" if display == "1" else display, f["label"]])
            return rows, message
        result = []
        for row in cells:
            out = []
            for cell in row:
                if is_empty(cell):
                    out.append("")
                    continue
                if not isinstance(cell, str):
                    raise Failure(f"figures: expected names, got the number {number_text(cell)}")
                name, unit = name_and_unit(cell, "figures")
                figure = table.get(name)
                if figure is None:
                    raise Failure(f"figures: the run summary has no figure '{name}'; it has {', '.join(table)}")
                if figure["value"] is None:
                    raise Failure(f"figures: {name} ({figure['label']}) has no value for this run")
                value = figure["value"]
                out.append(convert_unit(value, figure["unit"], unit) if unit else value)
            result.append(out)
        return result, message


def _chosen_spec(spec, drives):
    """The spec named by the pair "spec", else the one whose drive input is set ({spec: input})."""
    if spec is None and drives:
        if len(drives) > 1:
            raise Failure(f"{' and '.join(drives.values())} are the drive inputs of different specs: "
                          f"set one, or choose the spec with the pair \"spec\"; \"<name>\"")
        spec = next(iter(drives))
    return spec


def _frozen(value):
    """A host value (ranges as nested tuples or lists) as something that hashes."""
    if isinstance(value, (tuple, list)):
        return tuple(_frozen(v) for v in value)
    return value


def _quoted(value):
    cell = value
    if isinstance(value, (tuple, list)):
        rows = rows_of(value)
        cell = rows[0][0] if rows and rows[0] else value
    return f"'{cell}'" if isinstance(cell, str) else str(cell)
