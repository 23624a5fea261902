"""Calibration: tunable parameters of a block fitted to measured data (``ely_block_fit``).

``Block.fit(data, free, ...)`` is the entry point; this module holds the data preparation and
the result. The method, the statistics and the warnings are the library's (docs/calibration.md):
weighted least squares by Levenberg-Marquardt within bounds, standard errors and correlations
from the Jacobian at the optimum, warnings naming parameters the data cannot separate.

Data: a pandas DataFrame, or a mapping of names to equally long arrays. Each column is
- an input of the block (``in.current_density``, or the keyword ``current_density``): the
  operating points;
- a measured output (``cell.voltage``, ``cell.faraday_efficiency``, ...): NaN where not measured;
- ``weight:<output>``: that output's weights (or give ``weights=``).
A column name may carry its unit in brackets as in the command line's data files
(``"in.temperature [degC]"``, ``"cell.voltage [mV]"``): the values are converted to SI by the
library (``ely_convert_unit``); without brackets they are SI. So a data file of ``elyblock fit``
reads with ``pandas.read_csv(path, comment="#", skipinitialspace=True)`` and fits as it is.
"""
import ctypes
import json
import math
import re
import warnings
from collections.abc import Mapping

import numpy as np

from . import _capi, _progress, errors
from ._batch import is_dataframe
from .units import convert_unit, parse_quantity

lib = _capi.lib

_UNIT_IN_NAME = re.compile(r"^\s*([^\[\]]*?)\s*\[([^\[\]]*)\]\s*$")
_WEIGHT = "weight:"
#: Iterations of the library when ``max_iterations`` is not given (ely_fit_options: 0 means 200).
DEFAULT_MAX_ITERATIONS = 200


def _nan_array(rows):
    """A JSON array (of arrays) with nulls, as float64 with NaN."""
    return np.array([[math.nan if v is None else v for v in row] for row in rows], dtype=np.float64).reshape(
        len(rows), -1)


def _split_name(column):
    """("name", "unit") of a column "name [unit]"; ("name", None) without brackets."""
    match = _UNIT_IN_NAME.match(column)
    return (match.group(1), match.group(2).strip() or None) if match else (column.strip(), None)


class FitData:
    """The data of a fit laid out for the C call: input and measured indices and matrices (SI,
    row-major), the weights, and how to give results back (the DataFrame index, if any)."""

    def __init__(self, block, data, weights=None):
        if is_dataframe(data):
            columns = [(str(c), data[c].to_numpy(dtype=np.float64)) for c in data.columns]
            self.index = data.index
        elif isinstance(data, Mapping):
            columns = [(str(k), np.asarray(v, dtype=np.float64)) for k, v in data.items()]
            self.index = None
        else:
            raise TypeError(f"fit data must be a pandas DataFrame or a mapping of names to arrays, not {type(data).__name__}")
        lengths = {np.size(values) for _, values in columns if np.ndim(values) > 0}
        if len(lengths) > 1:
            raise errors.InvalidArgumentError(f"fit data: the columns have different lengths ({sorted(lengths)})")
        self.points = lengths.pop() if lengths else 1
        inputs, measured, weight_columns = [], [], {}
        seen = set()
        for column, values in columns:
            name, unit = _split_name(column)
            values = np.broadcast_to(values, (self.points,)).astype(np.float64)
            if name.startswith(_WEIGHT):
                if unit is not None:
                    raise errors.InvalidArgumentError(f"fit data: column '{column}': weights take no unit (they are 1/SI²)")
                weight_columns[name[len(_WEIGHT):]] = values
                continue
            full, index = block._input_index(name) if "." not in name else (name, block._index(name))
            if full in seen:
                raise errors.InvalidArgumentError(f"fit data: column '{full}' is given twice")
            seen.add(full)
            variable = block.variables()[index]
            if unit is not None:
                values = convert_unit(values, unit, variable.unit)
            if variable.causality == "input":
                inputs.append((full, index, values))
            elif variable.causality == "output":
                measured.append((full, index, values))
            else:
                raise errors.InvalidArgumentError(f"fit data: column '{full}' is a parameter: a data column is an input "
                                                  f"or a measured output (the parameters to fit go in free=)")
        if not measured:
            raise errors.InvalidArgumentError("fit data: no measured output among the columns (e.g. cell.voltage)")
        self.input_names = [n for n, _, _ in inputs]
        self.measured_names = [n for n, _, _ in measured]
        self.input_indices = np.array([i for _, i, _ in inputs], dtype=np.int32)
        self.measured_indices = np.array([i for _, i, _ in measured], dtype=np.int32)
        self.inputs = np.ascontiguousarray(np.column_stack([v for _, _, v in inputs]) if inputs
                                           else np.empty((self.points, 0)), dtype=np.float64)
        self.measured = np.ascontiguousarray(np.column_stack([v for _, _, v in measured]), dtype=np.float64)
        given = dict(weight_columns)
        for name, values in (weights or {}).items():
            if name in given:
                raise errors.InvalidArgumentError(f"fit weights of '{name}' are given twice (a weight: column and weights=)")
            given[name] = np.broadcast_to(np.asarray(values, dtype=np.float64), (self.points,))
        self.weights = None
        if given:
            self.weights = np.ones_like(self.measured)
            for name, values in given.items():
                if name not in self.measured_names:
                    raise errors.InvalidArgumentError(f"fit weights of '{name}': no measured column '{name}'")
                self.weights[:, self.measured_names.index(name)] = values

    def table(self, rows):
        """Results per point and measured output (points x measured) in the caller's type: a
        DataFrame with the data's index, or a dict of arrays."""
        if self.index is not None:
            import pandas
            return pandas.DataFrame(rows, index=self.index, columns=self.measured_names)
        return {name: np.ascontiguousarray(rows[:, o]) for o, name in enumerate(self.measured_names)}


def parameter_name(block, name):
    """The variable name of a free parameter: a ``param.`` name as it is, a key of the cell object
    (``contact_resistance``) as ``param.cell.<key>`` when the block has it."""
    if "." not in name and f"param.cell.{name}" in block:
        return f"param.cell.{name}"
    return name


def _per_parameter(block, names, given, what):
    """``given`` (a mapping of parameter names) as a list in the order of ``names``; None where not given."""
    out = [None] * len(names)
    for key, value in (given or {}).items():
        name = parameter_name(block, str(key))
        if name not in names:
            raise errors.InvalidArgumentError(f"fit {what} of '{key}': not among the free parameters ({', '.join(names)})")
        out[names.index(name)] = value
    return out


def _bound(value, unit, which, name):
    """A bound in SI: None or NaN keeps the variable's limit; text goes through the library's
    quantity parser ("0.05 ohm cm2")."""
    if value is None:
        return math.nan
    if isinstance(value, str):
        try:
            return parse_quantity(value, unit)
        except errors.ElyError as e:
            raise type(e)(f"fit bounds of '{name}', {which}: {e.message}", e.status) from e
    return float(value)


class FitResult:
    """What ``Block.fit`` gives: the fitted parameters with their statistics, the residuals, the
    warnings and the calibrated plant description.

    Attributes (numbers in SI; NaN where the data cannot give one):
    ``names`` (the free parameters' variable names, in order), ``values``, ``standard_errors``
    and ``intervals`` (dicts by name; ``intervals`` the 95 % interval (low, high)),
    ``correlation`` (n x n array), ``condition_number``, ``measured`` (the measured variables),
    ``residuals`` and ``fitted`` (model - measured and the model's value per point: a DataFrame
    with the data's index for DataFrame data, else a dict of arrays), ``rmse`` (dict by measured
    variable), ``warnings`` (list of text), ``status`` (``Status.OK`` or ``Status.WARNING``),
    ``iterations``, ``spec``, ``plant`` (the calibrated plant description as a dict) and
    ``plant_text`` (its JSON text as the library wrote it), ``report`` (the library's whole report,
    parsed), and ``data`` (the inputs and measured values the fit used, SI: ``data.input_names``,
    ``data.inputs``, ``data.measured_names``, ``data.measured``, points x columns).
    """

    def __init__(self, status, names, values, standard_errors, report, plant_text, data, fitted_block):
        self.status = errors.Status(status)
        self._block = fitted_block
        #: The spec the rows were solved at.
        self.spec = fitted_block.spec
        self.names = list(names)
        self.values = dict(zip(names, values))
        self.standard_errors = dict(zip(names, standard_errors))
        self.report = report
        parameters = report["parameters"]
        self.intervals = {p["name"]: tuple(math.nan if v is None else v for v in p["interval_95"]) for p in parameters}
        self.units = {p["name"]: p["unit"] for p in parameters}
        self.correlation = _nan_array(report["correlation"]) if names else np.empty((0, 0))
        self.condition_number = math.nan if report["condition_number"] is None else report["condition_number"]
        self.measured = list(report["measured"])
        self.rmse = {name: (math.nan if v is None else v) for name, v in report["rmse"].items()}
        self.warnings = list(report["warnings"])
        self.iterations = report["iterations"]
        self.data = data
        self._residuals = _nan_array(report["residuals"])
        self._fitted = _nan_array(report["fitted"])
        self.plant_text = plant_text
        self.plant = json.loads(plant_text)

    @property
    def residuals(self):
        return self.data.table(self._residuals)

    @property
    def fitted(self):
        return self.data.table(self._fitted)

    @property
    def parameters(self):
        """A pandas DataFrame by parameter: value, standard_error, low_95, high_95, unit, start, scale, at_bound."""
        import pandas
        rows = [{"value": self.values[p["name"]], "standard_error": self.standard_errors[p["name"]],
                 "low_95": self.intervals[p["name"]][0], "high_95": self.intervals[p["name"]][1], "unit": p["unit"],
                 "start": p["start"], "scale": p["scale"], "at_bound": p["at_bound"]} for p in self.report["parameters"]]
        return pandas.DataFrame(rows, index=pandas.Index(self.names, name="parameter"))

    def block(self):
        """A copy of the block as it was fitted: the fitted values, with the inputs and spec it had
        (``Block(result.plant_text)`` gives the fitted values at the description's own operating
        point)."""
        return self._block.clone()

    def save_plant(self, path):
        """Writes the calibrated plant description (JSON) to ``path``."""
        with open(path, "w", encoding="utf-8") as f:
            f.write(self.plant_text)

    def __repr__(self):
        lines = [f"<elyblock.FitResult: {len(self.names)} parameters, {self.data.points} points, "
                 f"{self.iterations} iterations, {self.status.name}>"]
        for name in self.names:
            lines.append(f"  {name:<46} {self.values[name]:>13.6g} ± {self.standard_errors[name]:<10.3g} "
                         f"{self.units[name]}")
        lines += [f"  RMSE of {name}: {value:.4g}" for name, value in self.rmse.items()]
        lines += [f"  warning: {w}" for w in self.warnings]
        return "\n".join(lines)


def fit(block, data, free, *, weights=None, bounds=None, scales=None, max_iterations=None, tolerance=None,
        progress=None):
    """``Block.fit``: see there."""
    _capi.require("ely_block_fit", "Block.fit")
    if isinstance(free, str):
        free = [free]
    with block._lock:
        handle = block._live()
        prepared = FitData(block, data, weights)
        names = [parameter_name(block, str(f)) for f in free]
        if not names:
            raise errors.InvalidArgumentError("fit: no free parameter given")
        units = {name: block.variables()[block._index(name)].unit for name in names}  # unknown names raise here
        lower, upper = [], []
        for name, bound in zip(names, _per_parameter(block, names, bounds, "bounds")):
            low, high = (None, None) if bound is None else bound
            lower.append(_bound(low, units[name], "lower", name))
            upper.append(_bound(high, units[name], "upper", name))
        scale_codes = []
        for name, scale in zip(names, _per_parameter(block, names, scales, "scales")):
            if scale is not None and scale not in _capi.FIT_SCALES:
                raise errors.InvalidArgumentError(f"fit scales of '{name}': '{scale}' is not one of "
                                                  f"{', '.join(_capi.FIT_SCALES)}")
            scale_codes.append(_capi.FIT_SCALES[scale or "auto"])
        lower = np.array(lower, dtype=np.float64)
        upper = np.array(upper, dtype=np.float64)
        scale_codes = np.array(scale_codes, dtype=np.int32)
        options = _capi.FitOptions(struct_size=ctypes.sizeof(_capi.FitOptions),
                                   max_iterations=int(max_iterations or 0), tolerance=float(tolerance or 0.0),
                                   lower=lower.ctypes.data, upper=upper.ctypes.data, scales=scale_codes.ctypes.data)
        c_names = (ctypes.c_char_p * len(names))(*[n.encode("utf-8") for n in names])
        weights_pointer = prepared.weights.ctypes.data if prepared.weights is not None else None
        result = ctypes.c_void_p()
        total = int(max_iterations or DEFAULT_MAX_ITERATIONS)
        with _progress.Monitor(progress, total, "fit", catch_interrupt=True, unit="it") as monitor:
            status = lib.ely_block_fit(handle, prepared.points, len(prepared.input_names),
                                       prepared.input_indices.ctypes.data, prepared.inputs.ctypes.data,
                                       len(prepared.measured_names), prepared.measured_indices.ctypes.data,
                                       prepared.measured.ctypes.data, weights_pointer, len(names), c_names,
                                       ctypes.byref(options), monitor.callback, None, ctypes.byref(result))
            message = _capi.last_error()
        try:
            if status < 0 and status != errors.Status.CANCELLED:
                raise errors.error_for(status, message)
            monitor.reraise()
            if status == errors.Status.CANCELLED:
                raise errors.CancelledError(message, status)
            values, standard_errors = [], []
            for k in range(len(names)):
                value, standard_error = ctypes.c_double(), ctypes.c_double()
                _capi.check(lib.ely_fit_parameter(result, k, ctypes.byref(value), ctypes.byref(standard_error)))
                values.append(value.value)
                standard_errors.append(standard_error.value)
            report = json.loads(_capi.buffer_text(lib.ely_fit_report_json, result))
            plant_text = _capi.buffer_text(lib.ely_fit_plant_json, result)
        finally:
            lib.ely_fit_destroy(result)
        fitted = FitResult(status, names, values, standard_errors, report, plant_text, prepared, block.clone())
    if status == errors.Status.WARNING:
        warnings.warn(errors.ElyWarning(message), stacklevel=3)
    return fitted
