"""elyblock: the electrolyzer block from Python, over the library's public C interface.

    import elyblock
    b = elyblock.Block("plant.json")            # or a dict, or JSON text
    b.solve(current_density=2e4, temperature=353.15)
    b["cell.voltage"]
    curve = b.batch({"in.current_density": j}, ["cell.voltage", "product.hydrogen"])
    result = b.fit(measured, free=["anode_exchange_current_density", "contact_resistance"])

Submodules: ``elyblock.plots`` (matplotlib), ``elyblock.distributed`` (Dask). The library is
found beside this package's install prefix (see ``elyblock._capi``); ``library_path`` says
which one was loaded.
"""
from . import _capi
from .block import Block, Variable, plant_text
from .errors import (AbiMismatchError, BufferTooSmallError, CancelledError, ConfigError, ElyError, ElyWarning,
                     FileError, InfeasibleError, InternalError, InvalidArgumentError, NoConvergenceError,
                     OutOfMemoryError, OutOfRangeError, Status, UnknownNameError, WrongStateError)
from .fit import FitResult
from .units import convert_unit, parse_quantity
from .water import water_electrolysis_voltages, water_saturation_pressure

#: Version of this package (the project's version it was built with).
__version__ = getattr(_capi._build_info, "VERSION", _capi.library_version)
#: Version of the loaded library, "MAJOR.MINOR.PATCH".
library_version = _capi.library_version
#: ABI version of the loaded library (checked at import to be the one this package follows).
abi_version = _capi.ABI_VERSION
#: Path of the loaded library.
library_path = _capi.library_path

__all__ = [
    "Block", "Variable", "plant_text", "Status", "ElyError", "ElyWarning", "AbiMismatchError", "InvalidArgumentError",
    "OutOfRangeError", "ConfigError", "InfeasibleError", "NoConvergenceError", "UnknownNameError", "WrongStateError",
    "FileError", "BufferTooSmallError", "CancelledError", "OutOfMemoryError", "InternalError",
    "water_saturation_pressure", "water_electrolysis_voltages", "FitResult", "parse_quantity", "convert_unit",
    "__version__", "library_version", "abi_version",
    "library_path",
]
