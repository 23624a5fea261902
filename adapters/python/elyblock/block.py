"""``Block``: one electrolyzer block of the C interface, addressed by variable names."""
import ctypes
import dataclasses
import json
import math
import os
import threading
import warnings
from collections.abc import Mapping
from typing import Optional

import numpy as np

from . import _capi, _progress, errors
from ._batch import Table, assemble, failure_message, output_names, unique

lib = _capi.lib


# ---- plant descriptions ------------------------------------------------------------------------

def plant_source(plant):
    """('text', JSON text) or ('file', path) for a plant given as a dict, JSON text (str or
    bytes, starting with '{') or a path (str or os.PathLike)."""
    if isinstance(plant, Mapping):
        try:
            return "text", json.dumps(plant, allow_nan=False)
        except (TypeError, ValueError) as e:
            raise errors.ConfigError(f"plant description: {e}", errors.Status.CONFIG) from e
    if isinstance(plant, (bytes, bytearray)):
        plant = bytes(plant).decode("utf-8")
    if isinstance(plant, str) and plant.lstrip().startswith("{"):
        return "text", plant
    if isinstance(plant, (str, os.PathLike)):
        return "file", os.fspath(plant)
    raise TypeError(f"a plant is a dict, JSON text or a path, not {type(plant).__name__}")


def plant_text(plant):
    """The JSON text of a plant given as a dict, JSON text, a path, or a Block."""
    if isinstance(plant, Block):
        return plant.plant_text
    kind, source = plant_source(plant)
    if kind == "text":
        return source
    try:
        with open(source, encoding="utf-8") as f:
            return f.read()
    except OSError as e:
        raise errors.FileError(f"cannot read the plant file '{source}': {e.strerror or e}") from e


# ---- variables ---------------------------------------------------------------------------------

@dataclasses.dataclass(frozen=True)
class Variable:
    """One entry of the block's variable table (``ely_block_variable_info``). The fields after
    ``description`` come with the second version of the table's metadata; they are None when
    the library gives only the first."""

    name: str
    unit: str
    causality: str            # "input", "output" or "parameter"
    description: str
    variability: Optional[str] = None   # "fixed", "tunable", "continuous" or "discrete"
    min: Optional[float] = None
    max: Optional[float] = None
    min_exclusive: Optional[bool] = None
    start: Optional[float] = None       # inputs and parameters: the value of the plant description
    nominal: Optional[float] = None
    label: Optional[str] = None         # short display label
    display_unit: Optional[str] = None  # display value = SI value * display_scale + display_offset
    display_scale: Optional[float] = None
    display_offset: Optional[float] = None
    summary_group: Optional[str] = None
    summary_rank: Optional[int] = None
    config_key: Optional[str] = None

    @classmethod
    def from_info(cls, info):
        text = _capi.text
        fields = dict(name=text(info.name), unit=text(info.unit), causality=_capi.CAUSALITY.get(info.causality, "unknown"),
                      description=text(info.description))
        if info.has_metadata:
            fields.update(variability=_capi.VARIABILITY.get(info.variability, "unknown"), min=info.min, max=info.max,
                          min_exclusive=bool(info.flags & _capi.VARIABLE_MIN_EXCLUSIVE), start=info.start,
                          nominal=info.nominal, label=text(info.label), display_unit=text(info.display_unit),
                          display_scale=info.display_scale, display_offset=info.display_offset,
                          summary_group=text(info.summary_group), summary_rank=info.summary_rank,
                          config_key=text(info.config_key))
        return cls(**fields)


# ---- the block ---------------------------------------------------------------------------------

class Block:
    """An electrolyzer block: a plant description with its operating inputs and solved outputs.

    ``Block(plant)`` takes a dict, JSON text or a path to a JSON file. Variables go by name:
    ``b["in.temperature"] = 353.15``, ``b["cell.voltage"]``; ``b.solve(current_density=2e4)``
    sets ``in.current_density`` and solves. Failures raise ``ElyError`` subclasses with the
    library's message; a solve with an alarm raised returns ``Status.WARNING`` and issues an
    ``ElyWarning``.

    Threads: a Block's calls are serialized by a lock, so sharing one is safe but runs one call
    at a time; for parallel work give each thread its own Block (``clone()``).
    """

    def __init__(self, plant):
        kind, source = plant_source(plant)
        self._handle = None
        self._lock = threading.RLock()
        self._text = source if kind == "text" else None
        self._path = source if kind == "file" else None
        self._indices = {}
        self._variables = None
        #: The message of the last solve's warning ("" when it raised none).
        self.warning = ""
        handle = ctypes.c_void_p()
        if kind == "file":
            status = lib.ely_block_create_from_file(os.fsencode(source), ctypes.byref(handle))
        else:
            encoded = source.encode("utf-8")
            if b"\0" in encoded:
                raise errors.ConfigError("plant description: the JSON text contains a NUL character",
                                         errors.Status.CONFIG)
            status = lib.ely_block_create(encoded, ctypes.byref(handle))
        _capi.check(status)
        self._handle = handle

    @classmethod
    def _adopt(cls, handle, like):
        block = cls.__new__(cls)
        block._handle = handle
        block._lock = threading.RLock()
        block._text, block._path = like._text, like._path
        block._indices = dict(like._indices)
        block._variables = like._variables
        block.warning = like.warning
        return block

    # -- life cycle --
    def close(self):
        """Frees the library's block now (also done when the object is collected)."""
        with self._lock:
            if self._handle is not None:
                lib.ely_block_destroy(self._handle)
                self._handle = None

    def __del__(self):
        handle = getattr(self, "_handle", None)
        if handle is not None and lib is not None:
            lib.ely_block_destroy(handle)
            self._handle = None

    def __enter__(self):
        return self

    def __exit__(self, *exc):
        self.close()
        return False

    def _live(self):
        if self._handle is None:
            raise errors.WrongStateError("the block was closed", errors.Status.WRONG_STATE)
        return self._handle

    def clone(self):
        """An independent copy with the same inputs, spec and solution (``ely_block_clone``)."""
        with self._lock:
            handle = ctypes.c_void_p()
            _capi.check(lib.ely_block_clone(self._live(), ctypes.byref(handle)))
            return Block._adopt(handle, self)

    __copy__ = clone

    def __deepcopy__(self, memo):
        return self.clone()

    def __reduce__(self):
        raise TypeError("a Block does not pickle: send its plant_text and create a Block where it is used "
                        "(elyblock.distributed does so)")

    @property
    def plant_text(self):
        """The JSON text of the plant description (read from its file for a Block made from a path)."""
        if self._text is None:
            self._text = plant_text(self._path)
        return self._text

    def __repr__(self):
        where = f"file {self._path!r}" if self._path is not None else "JSON text"
        state = "closed" if self._handle is None else f"spec {self.spec!r}"
        return f"<elyblock.Block from {where}, {state}>"

    # -- variables --
    def _index(self, name):
        index = self._indices.get(name)
        if index is None:
            out = ctypes.c_int32()
            _capi.check(lib.ely_block_find(self._live(), name.encode("utf-8"), ctypes.byref(out)))
            index = self._indices[name] = out.value
        return index

    def _input_index(self, key):
        """A full variable name, or a keyword: ``x`` is ``in.x`` (or ``param.x`` when the block has
        no ``in.x`` but such a parameter)."""
        if "." in key:
            return key, self._index(key)
        found = self._indices.get(("keyword", key))
        if found is not None:
            return found
        for prefix in ("in.", "param."):
            try:
                found = self._indices[("keyword", key)] = prefix + key, self._index(prefix + key)
                return found
            except errors.UnknownNameError:
                pass
        raise errors.UnknownNameError(f"unknown input '{key}': this block has no variable 'in.{key}' "
                                      f"(keyword {key} stands for in.{key})", errors.Status.UNKNOWN_NAME)

    def variables(self, causality=None):
        """The variable table of this block (its technology's variables), optionally only those of
        one causality ("input", "output" or "parameter")."""
        with self._lock:
            if self._variables is None:
                count = ctypes.c_int32()
                _capi.check(lib.ely_block_variable_count(self._live(), ctypes.byref(count)))
                table = []
                for index in range(count.value):
                    info = _capi.VariableInfo.blank()
                    _capi.check(lib.ely_block_variable_info(self._live(), index, ctypes.byref(info)))
                    table.append(Variable.from_info(info))
                self._variables = tuple(table)
        return [v for v in self._variables if causality is None or v.causality == causality]

    def names(self, causality=None):
        return [v.name for v in self.variables(causality)]

    def __contains__(self, name):
        return any(v.name == name for v in self.variables())

    def __getitem__(self, name):
        """The value of a variable; a list of names gives a dict."""
        if not isinstance(name, str):
            return {n: self[n] for n in name}
        with self._lock:
            value = ctypes.c_double()
            _capi.check(lib.ely_block_get(self._live(), self._index(name), ctypes.byref(value)))
            return value.value

    def __setitem__(self, name, value):
        with self._lock:
            _capi.check(lib.ely_block_set(self._live(), self._index(name), float(value)))

    def set(self, inputs=None, /, **keywords):
        """Sets inputs given as a mapping of names and/or keywords (``x`` for ``in.x``). All or
        nothing: when one set fails, those made before it are set back, and the error is raised."""
        items = list((inputs or {}).items()) + list(keywords.items())
        with self._lock:
            done = []
            try:
                for key, value in items:
                    name, index = self._input_index(key)
                    previous = self[name]
                    _capi.check(lib.ely_block_set(self._live(), index, float(value)))
                    done.append((index, previous))
            except BaseException:
                for index, previous in reversed(done):
                    lib.ely_block_set(self._handle, index, previous)
                raise

    # -- spec and solve --
    @property
    def spec(self):
        """The drive input the solve reads ("current_density", "power", ...); None with a library
        that cannot tell (it lacks ely_block_get_spec)."""
        if not _capi.has("ely_block_get_spec"):
            return None
        with self._lock:
            out = ctypes.c_char_p()
            _capi.check(lib.ely_block_get_spec(self._live(), ctypes.byref(out)))
            return _capi.text(out.value)

    def set_spec(self, spec):
        """Chooses which drive input the solve reads: "current_density", "current", "power",
        "hydrogen_rate" or "voltage"."""
        with self._lock:
            _capi.check(lib.ely_block_set_spec(self._live(), str(spec).encode("utf-8")))

    def solve(self, inputs=None, /, *, spec=None, **keywords):
        """Sets the spec (if given) and the inputs (as ``set``), then solves the steady state.
        Returns ``Status.OK``, or ``Status.WARNING`` with an ``ElyWarning`` (an alarm raised; the
        outputs are valid; the message is also in ``self.warning``). A failed solve raises and
        rolls the block back to its last successful solve."""
        with self._lock:
            if spec is not None:
                self.set_spec(spec)
            if inputs or keywords:
                self.set(inputs, **keywords)
            status = lib.ely_block_solve(self._live())
            _capi.check(status)
            self.warning = _capi.last_error() if status == errors.Status.WARNING else ""
        if self.warning:
            warnings.warn(errors.ElyWarning(self.warning), stacklevel=2)
        return errors.Status(status)

    def report(self):
        """The solved state as the library's JSON report, parsed: technology, spec, name and every
        variable with its value and unit."""
        with self._lock:
            text = _capi.buffer_text(lib.ely_block_report_json, self._live())
        return json.loads(text, parse_constant=lambda c: math.nan)

    # -- fit --
    def fit(self, data, free, *, weights=None, bounds=None, scales=None, max_iterations=None, tolerance=None,
            progress=None):
        """Fits the tunable parameters ``free`` to measured ``data`` (``ely_block_fit``): weighted
        least squares (Levenberg-Marquardt) within bounds, at the block's spec, starting from the
        block's current values; afterwards the block holds the fitted values (its inputs and spec
        unchanged; solve before reading outputs). Returns an ``elyblock.fit.FitResult``.

        ``data``: a DataFrame, or a mapping of names to equally long arrays: input columns
        (``in.current_density`` or ``current_density``, ``in.temperature``, ...), measured outputs
        (``cell.voltage``; NaN where not measured) and optional ``weight:<output>`` columns; a
        name may carry its unit in brackets (``"cell.voltage [mV]"``, ``"in.temperature [degC]"``),
        else values are SI. ``free``: parameter names, keys of the cell object
        (``"anode_exchange_current_density"``) or variable names (``"param.cell.contact_resistance"``).
        ``weights``: {output: weights per point, or one number} (1/sigma² in SI; only ratios
        matter). ``bounds``: {parameter: (low, high)}, each a number (SI), a quantity text
        (``"0.05 ohm cm2"``) or None for the variable's own limit. ``scales``: {parameter: "auto",
        "linear" or "log"}. ``max_iterations`` (default 200), ``tolerance`` (default 1e-10).
        ``progress``: as ``batch`` (a bar counts iterations; Ctrl-C or a callable returning true
        cancels: ``CancelledError``, the block unchanged).

        A fit that succeeds with warnings (parameters the data cannot separate, a value at a
        bound) issues an ``ElyWarning``; the result lists them in ``warnings``. Errors (a row that
        does not solve at the start values, a parameter the data do not depend on, ...) raise with
        the library's message and leave the block unchanged."""
        from .fit import fit
        return fit(self, data, free, weights=weights, bounds=bounds, scales=scales, max_iterations=max_iterations,
                   tolerance=tolerance, progress=progress)

    # -- the block in time (docs/dynamics.md) --
    def _stepped(self, status):
        self.warning = _capi.last_error() if status == errors.Status.WARNING else ""
        if self.warning:
            warnings.warn(errors.ElyWarning(self.warning), stacklevel=3)
        return errors.Status(status)

    def reset(self, start_time=0.0, inputs=None, /, *, spec=None, **keywords):
        """Starts a dynamic run at ``start_time`` (s) from the current inputs, after setting the
        ones given (as ``set``): the stack temperature takes ``in.temperature``, the operating
        hours ``in.hours_operated``, and the plant is in the mode ``in.mode_request`` asks for (0
        off, 1 hot standby, 2 production, 3 automatic), at its setpoint. Every output is valid for
        that state (``ely_block_reset``). ``spec``: the spec of the run, if not the block's (as for
        ``solve``). Returns ``Status.OK`` or ``Status.WARNING`` (an alarm raised, with an
        ``ElyWarning``)."""
        _capi.require("ely_block_reset", "Block.reset")
        with self._lock:
            if spec is not None:
                self.set_spec(spec)
            if inputs or keywords:
                self.set(inputs, **keywords)
            status = lib.ely_block_reset(self._live(), float(start_time))
            _capi.check(status)
            return self._stepped(status)

    def advance(self, step, inputs=None, /, **keywords):
        """Sets the inputs given (as ``set``; they apply at the current time) and integrates the run
        over ``step`` seconds with the inputs held (``ely_block_advance``); the outputs are valid at
        the end. A step of 0 only applies the inputs. A failed step raises and rolls the block back
        to its state before the call (without the sets made since the last successful step).
        ``WrongStateError`` before a ``reset``. Returns ``Status.OK`` or ``Status.WARNING``."""
        _capi.require("ely_block_advance", "Block.advance")
        with self._lock:
            if inputs or keywords:
                self.set(inputs, **keywords)
            status = lib.ely_block_advance(self._live(), float(step))
            _capi.check(status)
            return self._stepped(status)

    @property
    def time(self):
        """The time of the dynamic run, s (``WrongStateError`` before a ``reset``)."""
        from .run import time_of
        return time_of(self)

    def save_state(self):
        """Everything a later result of this block depends on, as bytes (``ely_block_save_state``):
        a block of the same plant description and library that restores them continues bit for
        bit as this one would."""
        from .run import save_state
        return save_state(self)

    def restore_state(self, state):
        """Takes a state from ``save_state`` of a block of the same plant description and library
        version; another one raises ``InvalidArgumentError`` saying why, the block unchanged."""
        from .run import restore_state
        restore_state(self, state)

    def simulate(self, profile, outputs, *, time="time", spec=None, with_status=False, progress=None):
        """Runs the plant through a profile in one call (``ely_block_simulate``): the block is reset
        at the first row's time with its inputs, then advanced row by row, each row's inputs applied
        at its time; it is left running at the last row (``run_summary`` reports the run,
        ``advance`` goes on from there).

        ``profile``: a DataFrame or a mapping of names to equally long arrays, with a time column
        (``time``, seconds, or with a unit: ``"time [h]"``) and input columns by name or keyword,
        each optionally with a unit in brackets (``"in.power [MW]"``); see ``elyblock.run``.
        ``outputs``: variable names. ``spec``: the spec of the run (default: the one that reads
        the profile's drive column, if it has one; the block keeps it). Returns the time (s) and
        the outputs per row, a DataFrame with the profile's index for a DataFrame, else a dict of
        arrays; ``with_status=True`` adds the row statuses under "status". A run that stops at a
        failing row gives NaN from there with an ``ElyWarning``. ``progress``: as ``batch`` (a bar
        counts rows; Ctrl-C cancels and raises KeyboardInterrupt; a callable returning true raises
        ``CancelledError`` with the partial result)."""
        from .run import simulate
        return simulate(self, profile, outputs, time=time, spec=spec, with_status=with_status, progress=progress)

    def run_summary(self, full=False):
        """What the run since the last ``reset`` made and used (``ely_block_run_summary_json``):
        {figure: value in its unit} (hydrogen in kg, energy_dc and energy_ac in J, hours_* in h ... as
        docs/dynamics.md lists them; NaN where not defined). ``full=True`` gives the library's whole
        report: technology, name, start and end time, and per figure its value, unit, label and
        display unit."""
        from .run import run_summary
        return run_summary(self, full)

    # -- batch --
    def batch(self, inputs, outputs, *, spec=None, with_status=False, progress=None):
        """Solves many operating points in one call (``ely_block_solve_batch``) without changing
        the block.

        ``inputs``: a mapping of input names (``"in.current_density"``, or keywords such as
        ``"current_density"``) to arrays, broadcast together (scalars too); or a pandas DataFrame
        whose columns are input names. ``outputs``: a list of variable names. ``spec``: the spec of
        the batch, if not the block's. Points are solved in order, each starting from the state the
        previous one left. Returns a dict of arrays shaped like the broadcast inputs (a DataFrame
        with the same index for a DataFrame); ``with_status=True`` adds the point statuses under
        "status". A failed point gives NaN (with an ``ElyWarning`` saying how many failed).
        ``progress``: see ``elyblock._progress`` (a bar on a terminal by default; Ctrl-C cancels
        and raises KeyboardInterrupt; a callable ``f(done, total)`` returning true cancels and
        raises ``CancelledError`` whose ``result`` holds the partial result)."""
        table = Table.from_inputs(inputs)
        outputs = output_names(outputs)
        values, status, call_status, message = self._run_batch(table, outputs, spec, progress)
        result = assemble(table, outputs, values, status, with_status)
        if call_status == errors.Status.CANCELLED:
            raise errors.CancelledError(message, call_status, result)
        if call_status == errors.Status.PARTIAL:
            warnings.warn(errors.ElyWarning(message), stacklevel=2)
        return result

    def _run_batch(self, table, outputs, spec=None, progress=False):
        """The C batch on a prepared table: (values, point statuses, call status, message). A
        batch at another spec runs on a copy of the block with that spec (the library's batch
        starts every point from the state of the block it is given, set or solved)."""
        with self._lock:
            resolved = [self._input_index(name) for name in table.names]
            unique([name for name, _ in resolved], "inputs")
            in_idx = np.array([index for _, index in resolved], dtype=np.int32)
            out_idx = np.array([self._index(name) for name in outputs], dtype=np.int32)
            n = table.points
            values = np.empty((n, len(outputs)), dtype=np.float64, order="F")
            status = np.empty(n, dtype=np.int32)
            # Fortran order and aligned: a table unpickled on a Dask worker can hold its numbers at
            # any byte offset of the message, and the C call reads them as doubles.
            matrix = np.require(table.matrix, dtype=np.float64, requirements=["F_CONTIGUOUS", "ALIGNED"])
            work = self
            if spec is not None and spec != self.spec:
                work = self.clone()
                work.set_spec(spec)
            with _progress.Monitor(progress, n, "batch") as monitor:
                call_status, message = _call_batch(work, in_idx, matrix, out_idx, values, status, monitor.callback)
        if call_status < 0 and call_status != errors.Status.CANCELLED:
            raise errors.error_for(call_status, message)
        monitor.reraise()
        if call_status == errors.Status.PARTIAL:
            message = failure_message(status, message)
        return values, status, errors.Status(call_status), message


def _column_pointers(matrix):
    """The address of each column of a points x columns Fortran-ordered matrix (each column
    contiguous), as the library's column call takes them."""
    assert matrix.dtype == np.float64 and matrix.flags.aligned and (matrix.shape[0] <= 1 or matrix.strides[0] == 8)
    return (ctypes.c_void_p * max(1, matrix.shape[1]))(*[matrix[:, k].ctypes.data for k in range(matrix.shape[1])])


def _call_batch(work, in_idx, matrix, out_idx, values, status, callback=None):
    """ely_block_solve_batch_columns over the columns of ``matrix`` into the columns of ``values``
    (both Fortran order: no copy on either side of the call): (call status, the library's message)."""
    call_status = lib.ely_block_solve_batch_columns(
        work._live(), len(matrix), len(in_idx), in_idx.ctypes.data, _column_pointers(matrix), len(out_idx),
        out_idx.ctypes.data, _column_pointers(values), status.ctypes.data, callback or _progress.NO_CALLBACK, None)
    return call_status, _capi.last_error()
