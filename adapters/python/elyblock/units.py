"""Quantities with units, read and converted by the library (the plant description's units:
docs/config.md, "Units"), so that Python reads "2 A/cm2" exactly as every other host does.

- ``parse_quantity("80 degC", "K")``: text that carries its unit (a bare number is taken as
  already in the unit asked for) into a unit without offset, e.g. a variable's SI unit.
- ``convert_unit(values, "mV", "V")``: numbers whose unit is known apart from them (a column
  header), elementwise for arrays; either unit may be degC.
"""
import ctypes

import numpy as np

from . import _capi


def parse_quantity(text, unit):
    """The value of ``text`` ("2 A/cm2", "30 bar", "42") in ``unit`` ("A/m2", "Pa", ...)."""
    _capi.require("ely_parse_quantity", "parse_quantity")
    value = ctypes.c_double()
    _capi.check(_capi.lib.ely_parse_quantity(str(text).encode("utf-8"), str(unit).encode("utf-8"), ctypes.byref(value)))
    return value.value


def convert_unit(values, from_unit, to_unit):
    """``values`` (a number or an array) given in ``from_unit``, in ``to_unit``; a float for a
    number, an array of the same shape for an array."""
    _capi.require("ely_convert_unit", "convert_unit")
    source, target = str(from_unit).encode("utf-8"), str(to_unit).encode("utf-8")
    array = np.asarray(values, dtype=np.float64)
    out = np.empty_like(array)
    result = ctypes.c_double()
    flat_in, flat_out = array.reshape(-1), out.reshape(-1)
    for k, value in enumerate(flat_in):
        _capi.check(_capi.lib.ely_convert_unit(float(value), source, target, ctypes.byref(result)))
        flat_out[k] = result.value
    return float(out) if array.ndim == 0 else out
