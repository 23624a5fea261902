"""The block in time: profile runs (``ely_block_simulate``) and the run summary.

``Block.reset``, ``advance``, ``time``, ``save_state`` and ``restore_state`` step a plant from a
controller, one call each; ``Block.simulate(profile, outputs)`` runs a whole profile in one call
of the library and ``Block.run_summary()`` gives what the run made and used (docs/dynamics.md).

A profile is a pandas DataFrame, or a mapping of names to equally long arrays, with
- a time column, ``time`` by default, in seconds (or ``"time [h]"``, ``"time [min]"``: a unit in
  brackets, converted by the library), non-decreasing;
- input columns by variable name (``in.power``) or keyword (``power``), optionally with a unit in
  brackets (``"in.power [MW]"``, ``"in.ambient_temperature [degC]"``); without one they are SI.
Row k's inputs apply at its time and hold until the next row (the library's rule: the block is
reset at the first row's time with its inputs, then advanced row by row).

A drive input among the columns (``in.power``, ``in.current``, ``in.current_density``,
``in.hydrogen_rate``, ``in.voltage``) selects the spec that reads it, as ``elyblock run`` does,
unless ``spec=`` says otherwise; the block keeps that spec afterwards.
"""
import ctypes
import json
import math
import warnings
from collections.abc import Mapping

import numpy as np

from . import _capi, _progress, errors
from ._batch import is_dataframe, output_names, unique
from .fit import _split_name
from .units import convert_unit

lib = _capi.lib

#: The spec that reads each drive input.
DRIVES = {"in.current_density": "current_density", "in.current": "current", "in.power": "power",
          "in.hydrogen_rate": "hydrogen_rate", "in.voltage": "voltage"}
#: The name of the time column in the result.
TIME = "time"



class Profile:
    """A profile laid out for ``ely_block_simulate``: times (s), input names and indices, the
    rows x inputs matrix (SI, C order), and the DataFrame index when the profile was one."""

    def __init__(self, block, profile, time=TIME):
        if is_dataframe(profile):
            columns = [(str(c), profile[c].to_numpy(dtype=np.float64)) for c in profile.columns]
            self.index = profile.index
        elif isinstance(profile, Mapping):
            columns = [(str(k), np.asarray(v, dtype=np.float64)) for k, v in profile.items()]
            self.index = None
        else:
            raise TypeError("a profile is a pandas DataFrame or a mapping of names to arrays, "
                            f"not {type(profile).__name__}")
        if any(np.ndim(values) != 1 for _, values in columns):
            raise errors.InvalidArgumentError("profile: every column is a one-dimensional array")
        lengths = {len(values) for _, values in columns}
        if len(lengths) > 1:
            raise errors.InvalidArgumentError(f"profile: the columns have different lengths ({sorted(lengths)})")
        if not any(_split_name(column)[0] == time for column, _ in columns):
            raise errors.InvalidArgumentError(f"profile: no time column '{time}' (seconds, or with its unit: "
                                              f"'{time} [h]'); the columns are {[c for c, _ in columns]}")
        times, inputs = None, []
        for column, values in columns:
            name, unit = _split_name(column)
            if name == time:
                if times is not None:
                    raise errors.InvalidArgumentError(f"profile: the time column '{time}' is given twice")
                times = values if unit is None else convert_unit(values, unit, "s")
                continue
            full, index = block._input_index(name)
            variable = block.variables()[index]
            if variable.causality != "input":
                raise errors.InvalidArgumentError(f"profile: column '{column}': {full} is {variable.causality}, "
                                                  f"not an input (a profile's columns are the time and inputs)")
            if unit is not None:
                values = convert_unit(values, unit, variable.unit)
            inputs.append((full, index, values))
        self.rows = len(times)
        if self.rows == 0:
            raise errors.InvalidArgumentError("profile: no rows")
        unique([n for n, _, _ in inputs], "profile columns")
        self.times = np.ascontiguousarray(times, dtype=np.float64)
        self.names = [n for n, _, _ in inputs]
        self.indices = np.array([i for _, i, _ in inputs], dtype=np.int32)
        self.matrix = np.ascontiguousarray(np.column_stack([v for _, _, v in inputs]) if inputs
                                           else np.empty((self.rows, 0)), dtype=np.float64)

    def drive_spec(self):
        """The spec of the one drive input among the columns; None when there is none or several."""
        specs = [DRIVES[n] for n in self.names if n in DRIVES]
        return specs[0] if len(specs) == 1 else None


def assemble(profile, outputs, values, status, with_status):
    """The result: the time (s) and the outputs per row, a DataFrame with the profile's index for a
    DataFrame, else a dict of arrays."""
    if profile.index is not None:
        import pandas
        frame = pandas.DataFrame(values, index=profile.index, columns=outputs, copy=False)
        frame.insert(0, TIME, profile.times)
        if with_status:
            frame["status"] = status
        return frame
    result = {TIME: profile.times.copy()}
    result.update({name: np.ascontiguousarray(values[:, o]) for o, name in enumerate(outputs)})
    if with_status:
        result["status"] = status
    return result


def simulate(block, profile, outputs, *, time=TIME, spec=None, with_status=False, progress=None):
    """``Block.simulate`` (its documentation)."""
    with block._lock:
        _capi.require("ely_block_simulate", "Block.simulate")
        table = Profile(block, profile, time)
        outputs = output_names(outputs)
        if TIME in outputs:
            raise errors.InvalidArgumentError(f"simulate outputs: '{TIME}' is the time column, always in the result")
        out_idx = np.array([block._index(name) for name in outputs], dtype=np.int32)
        wanted = spec if spec is not None else table.drive_spec()
        if wanted is not None and wanted != block.spec:
            block.set_spec(wanted)
        values = np.empty((table.rows, len(outputs)), dtype=np.float64)
        status = np.empty(table.rows, dtype=np.int32)
        with _progress.Monitor(progress, table.rows, "run", catch_interrupt=True, unit="row") as monitor:
            call_status = lib.ely_block_simulate(
                block._live(), table.rows, table.times.ctypes.data, len(table.indices), table.indices.ctypes.data,
                table.matrix.ctypes.data, len(out_idx), out_idx.ctypes.data, values.ctypes.data, status.ctypes.data,
                monitor.callback, None)
            message = _capi.last_error()
    if call_status < 0 and call_status != errors.Status.CANCELLED:
        raise errors.error_for(call_status, message)
    monitor.reraise()
    result = assemble(table, outputs, values, status, with_status)
    if call_status == errors.Status.CANCELLED:
        raise errors.CancelledError(message, call_status, result)
    if call_status == errors.Status.PARTIAL:
        failed = int(np.count_nonzero(status < 0))
        warnings.warn(errors.ElyWarning(f"the run stopped: {failed} of {table.rows} rows not run ({message})"),
                      stacklevel=3)
    return result


def run_summary(block, full=False):
    """``Block.run_summary`` (its documentation)."""
    with block._lock:
        _capi.require("ely_block_run_summary_json", "Block.run_summary")
        text = _capi.buffer_text(lib.ely_block_run_summary_json, block._live())
    report = json.loads(text, parse_constant=lambda c: math.nan)
    for figure in report["figures"].values():
        if figure["value"] is None:
            figure["value"] = math.nan
    if full:
        return report
    return {name: figure["value"] for name, figure in report["figures"].items()}


def save_state(block):
    with block._lock:
        _capi.require("ely_block_save_state", "Block.save_state")
        return _capi.buffer_bytes(lib.ely_block_save_state, block._live())


def restore_state(block, state):
    with block._lock:
        _capi.require("ely_block_restore_state", "Block.restore_state")
        data = bytes(state)
        buffer = ctypes.create_string_buffer(data, max(len(data), 1))
        _capi.check(lib.ely_block_restore_state(block._live(), buffer, len(data)))


def time_of(block):
    with block._lock:
        _capi.require("ely_block_time", "Block.time")
        out = ctypes.c_double()
        _capi.check(lib.ely_block_time(block._live(), ctypes.byref(out)))
        return out.value
