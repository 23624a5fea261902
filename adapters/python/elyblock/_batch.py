"""Batch tables: from the caller's inputs (a mapping of arrays, or a DataFrame) to the
row-major matrix the C batch reads, and from the C output matrix back to the caller's types.
Shared by Block.batch and elyblock.distributed, so both take and give exactly the same."""
import math
import sys
from collections.abc import Mapping

import numpy as np

from . import errors


def is_dataframe(value):
    pandas = sys.modules.get("pandas")  # no DataFrame can exist unless pandas was imported
    return pandas is not None and isinstance(value, pandas.DataFrame)


class Table:
    """The inputs of a batch: ``names`` as given, ``matrix`` (points x inputs, float64, Fortran
    order: each input's points contiguous, as the library's column call reads them), the ``shape`` the points came in (NumPy broadcasting of the arrays) and the
    DataFrame index when the inputs were a DataFrame."""

    def __init__(self, names, matrix, shape, index=None):
        self.names = names
        self.matrix = matrix
        self.shape = shape
        self.index = index

    @property
    def points(self):
        return self.matrix.shape[0]

    @classmethod
    def from_inputs(cls, inputs):
        if is_dataframe(inputs):
            names = [str(c) for c in inputs.columns]
            columns = [inputs[c].to_numpy(dtype=np.float64) for c in inputs.columns]
            shape, index = (len(inputs),), inputs.index
        elif isinstance(inputs, Mapping):
            names = [str(k) for k in inputs]
            columns = [np.asarray(v, dtype=np.float64) for v in inputs.values()]
            if any(c.shape != columns[0].shape for c in columns):
                try:
                    columns = np.broadcast_arrays(*columns)
                except ValueError as e:
                    raise errors.InvalidArgumentError(f"batch inputs: the arrays do not broadcast to one shape ({e})") from e
            shape, index = (columns[0].shape if columns else ()), None
        else:
            raise TypeError("batch inputs must be a mapping of variable names to arrays, or a pandas DataFrame, "
                            f"not {type(inputs).__name__}")
        if not names:
            raise errors.InvalidArgumentError("batch inputs: no input variable given")
        points = math.prod(shape)
        matrix = np.empty((points, len(names)), dtype=np.float64, order="F")
        for i, column in enumerate(columns):
            matrix[:, i] = np.ravel(column)
        return cls(names, matrix, shape, index)

    def rows(self, start, stop):
        return Table(self.names, self.matrix[start:stop], (stop - start,))


def output_names(outputs):
    if isinstance(outputs, str):
        return [outputs]
    names = [str(o) for o in outputs]
    if not names:
        raise errors.InvalidArgumentError("batch outputs: no output variable given")
    return names


def unique(names, what):
    seen = set()
    for name in names:
        if name in seen:
            raise errors.InvalidArgumentError(f"batch {what}: '{name}' is given twice")
        seen.add(name)


def assemble(table, outputs, values, status, with_status):
    """The result in the caller's type: a dict of arrays shaped like the inputs, or a DataFrame
    with the inputs' index. ``values`` is the points x outputs matrix, ``status`` per point."""
    if table.index is not None:
        import pandas
        frame = pandas.DataFrame(values, index=table.index, columns=outputs, copy=False)
        if with_status:
            frame["status"] = status
        return frame
    result = {name: np.ascontiguousarray(values[:, o]).reshape(table.shape) for o, name in enumerate(outputs)}
    if with_status:
        result["status"] = status.reshape(table.shape)
    return result


def failure_message(status, detail):
    """The message of a batch with failed points: how many, and the library's word on the first."""
    failed = int(np.count_nonzero(status < 0))
    return f"{failed} of {status.size} points failed ({detail})"
