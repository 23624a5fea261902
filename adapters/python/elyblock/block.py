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
        # Whether inputs or the spec were set since the last successful solve (or since create):
        # then the library's rollback state is not the block's current state (see _run_batch).
        self._dirty = False
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
        block._dirty = like._dirty
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
            self._dirty = True

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
                    self._dirty = True
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
            self._dirty = True

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
            self._dirty = False  # solved, or rolled back to the last successful solve
            _capi.check(status)
            self.warning = _capi.last_error() if status == errors.Status.WARNING else ""
        if self.warning:
            warnings.warn(errors.ElyWarning(self.warning), stacklevel=2)
        return errors.Status(status)

    def report(self):
        """The solved state as the library's JSON report, parsed: technology, spec, name and every
        variable with its value and unit."""
        with self._lock:
            length = ctypes.c_size_t()
            _capi.check(lib.ely_block_report_json(self._live(), None, 0, ctypes.byref(length)))
            buffer = ctypes.create_string_buffer(length.value)
            _capi.check(lib.ely_block_report_json(self._live(), buffer, length.value, ctypes.byref(length)))
        return json.loads(buffer.value.decode("utf-8"), parse_constant=lambda c: math.nan)

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
        """The C batch on a prepared table: (values, point statuses, call status, message).

        The library rolls a failed point back to the last successful solve of the block it was
        given, which is not the block's current state when inputs or the spec were set after that
        solve: the points after such a failure would then run with the old inputs and spec. So the
        batch goes to the library as is only when the block is "clean" (solved, or just created, at
        its current state, with the spec asked for); otherwise it runs on a copy anchored first by
        a successful solve at the state the batch starts from (``_anchored_copy``)."""
        with self._lock:
            resolved = [self._input_index(name) for name in table.names]
            unique([name for name, _ in resolved], "inputs")
            in_idx = np.array([index for _, index in resolved], dtype=np.int32)
            out_idx = np.array([self._index(name) for name in outputs], dtype=np.int32)
            n = table.points
            values = np.empty((n, len(outputs)), dtype=np.float64)
            status = np.empty(n, dtype=np.int32)
            matrix = np.ascontiguousarray(table.matrix, dtype=np.float64)
            spec = None if spec is None or spec == self.spec else spec
            work, first, leading = self, 0, None
            if spec is not None or (self._dirty and n > 0):
                # The library checks every name and index before it solves anything: ask it on no points.
                call_status, message = _call_batch(self, in_idx, matrix[:0], out_idx, values[:0], status[:0])
                if call_status < 0:
                    raise errors.error_for(call_status, message)
                work, first, leading = self._anchored_copy(spec, in_idx, matrix, out_idx, values, status)
            with _progress.Monitor(progress, n - first, "batch") as monitor:
                call_status, message = _call_batch(work, in_idx, matrix[first:], out_idx, values[first:],
                                                   status[first:], monitor.callback)
        if call_status < 0 and call_status != errors.Status.CANCELLED:
            raise errors.error_for(call_status, message)
        monitor.reraise()
        if first > 0 and call_status != errors.Status.CANCELLED:
            call_status = max(call_status, errors.Status.WARNING) if np.any(status[:first] > 0) else call_status
            if leading is not None:
                call_status, message = errors.Status.PARTIAL, leading
            elif call_status == errors.Status.PARTIAL:
                message += f" (points counted from point {first})"
        if call_status == errors.Status.PARTIAL:
            message = failure_message(status, message)
        return values, status, errors.Status(call_status), message

    def _anchored_copy(self, spec, in_idx, matrix, out_idx, values, status):
        """A copy of this block (with ``spec`` set) whose last successful solve is the state the
        batch starts from: the copy is solved at the current inputs. If that fails, the batch's
        first rows are solved one by one, each on a fresh copy, until one succeeds; their results
        are filled in. Returns the copy for the library's batch, the first row it has to solve,
        and the message of the first failed row (None if none failed)."""
        prepared = self.clone()
        if spec is not None:
            prepared.set_spec(spec)
        probe = prepared.clone()
        if lib.ely_block_solve(probe._live()) >= 0:
            return probe, 0, None
        leading = None
        for k in range(len(matrix)):
            probe = prepared.clone()
            point = errors.Status.OK
            for i, index in enumerate(in_idx):
                point = lib.ely_block_set(probe._live(), int(index), float(matrix[k, i]))
                if point < 0:
                    break
            if point >= 0:
                point = lib.ely_block_solve(probe._live())
            status[k] = point
            if point < 0:
                values[k] = np.nan
                leading = leading or f"some points failed; first: point {k}: {_capi.last_error()}"
                continue
            for o, index in enumerate(out_idx):
                value = ctypes.c_double()
                _capi.check(lib.ely_block_get(probe._live(), int(index), ctypes.byref(value)))
                values[k, o] = value.value
            return probe, k + 1, leading
        return probe, len(matrix), leading


def _call_batch(work, in_idx, matrix, out_idx, values, status, callback=None):
    """ely_block_solve_batch over the rows of ``matrix``: (call status, the library's message)."""
    call_status = lib.ely_block_solve_batch(
        work._live(), len(matrix), len(in_idx), in_idx.ctypes.data, matrix.ctypes.data, len(out_idx),
        out_idx.ctypes.data, values.ctypes.data, status.ctypes.data, callback or _progress.NO_CALLBACK, None)
    return call_status, _capi.last_error()
