"""The public C interface (abi/include/elyblock/elyblock.h) through ctypes.

Finds and loads libelyblock, declares the prototypes of the header, and turns statuses into
exceptions. Nothing else in the package calls the library directly.

Where the library is looked for, first match wins:
1. the file named by the environment variable ELYBLOCK_LIBRARY (and only that, when set);
2. the library this package was built or installed with: ``_build_info.LIBRARY``, written by
   the build (an absolute path to the build tree's library) or by ``cmake --install`` (a path
   relative to this package's folder, so the installed tree may be moved or staged);
3. the dynamic loader's search path, by the library's SONAME (a system-wide install, e.g.
   the Debian package libelyblock1).
No LD_LIBRARY_PATH is needed for any of them.
"""
import ctypes
import os

from . import errors

try:
    from . import _build_info
except ImportError:  # the package run straight from the source tree, never built
    _build_info = None

#: ELY_ABI_VERSION of the header these declarations follow.
ABI_VERSION = 1
SONAME = getattr(_build_info, "SONAME", "libelyblock.so.1")

CAUSALITY = {0: "input", 1: "output", 2: "parameter"}
VARIABILITY = {0: "fixed", 1: "tunable", 2: "continuous", 3: "discrete"}
VARIABLE_MIN_EXCLUSIVE = 1


class VariableInfo(ctypes.Structure):
    """ely_variable_info. The first five members are the first version of the struct; the
    rest is its second version. The library fills only what fits in struct_size: a library of
    the first version leaves the rest as we set it, which is how ``has_metadata`` tells."""

    _fields_ = [
        ("struct_size", ctypes.c_uint32),
        ("causality", ctypes.c_int32),
        ("name", ctypes.c_char_p),
        ("unit", ctypes.c_char_p),
        ("description", ctypes.c_char_p),
        # ---- second version ----
        ("variability", ctypes.c_int32),
        ("flags", ctypes.c_uint32),
        ("min", ctypes.c_double),
        ("max", ctypes.c_double),
        ("start", ctypes.c_double),
        ("nominal", ctypes.c_double),
        ("label", ctypes.c_char_p),
        ("display_unit", ctypes.c_char_p),
        ("display_scale", ctypes.c_double),
        ("display_offset", ctypes.c_double),
        ("summary_group", ctypes.c_char_p),
        ("config_key", ctypes.c_char_p),
        ("summary_rank", ctypes.c_int32),
    ]
    FIRST_VERSION_FIELDS = 5

    @classmethod
    def blank(cls):
        info = cls()
        info.struct_size = ctypes.sizeof(cls)
        info.variability = -1  # stays -1 when the library knows only the first version
        return info

    @property
    def has_metadata(self):
        return self.variability != -1


class FitOptions(ctypes.Structure):
    """ely_fit_options (its first version)."""

    _fields_ = [
        ("struct_size", ctypes.c_uint32),
        ("max_iterations", ctypes.c_int32),
        ("tolerance", ctypes.c_double),
        ("lower", ctypes.c_void_p),
        ("upper", ctypes.c_void_p),
        ("scales", ctypes.c_void_p),
    ]


FIT_SCALES = {"auto": 0, "linear": 1, "log": 2}  # ELY_FIT_SCALE_*

PROGRESS = ctypes.CFUNCTYPE(ctypes.c_int32, ctypes.c_size_t, ctypes.c_size_t, ctypes.c_void_p)

_c_int32_p = ctypes.POINTER(ctypes.c_int32)
_c_double_p = ctypes.POINTER(ctypes.c_double)
_handle = ctypes.c_void_p
_handle_p = ctypes.POINTER(ctypes.c_void_p)

# name: (restype, argtypes). Calls marked optional below may be missing from an older library.
_PROTOTYPES = {
    "ely_abi_version": (ctypes.c_int32, []),
    "ely_version": (ctypes.c_char_p, []),
    "ely_last_error": (ctypes.c_char_p, []),
    "ely_status_text": (ctypes.c_char_p, [ctypes.c_int32]),
    "ely_water_saturation_pressure": (ctypes.c_int32, [ctypes.c_double, _c_double_p]),
    "ely_water_electrolysis_voltages": (ctypes.c_int32, [ctypes.c_double, ctypes.c_double, ctypes.c_double,
                                                         _c_double_p, _c_double_p]),
    "ely_block_create": (ctypes.c_int32, [ctypes.c_char_p, _handle_p]),
    "ely_block_create_from_file": (ctypes.c_int32, [ctypes.c_char_p, _handle_p]),
    "ely_block_clone": (ctypes.c_int32, [_handle, _handle_p]),
    "ely_block_destroy": (None, [_handle]),
    "ely_block_variable_count": (ctypes.c_int32, [_handle, _c_int32_p]),
    "ely_block_variable_info": (ctypes.c_int32, [_handle, ctypes.c_int32, ctypes.POINTER(VariableInfo)]),
    "ely_block_find": (ctypes.c_int32, [_handle, ctypes.c_char_p, _c_int32_p]),
    "ely_block_set": (ctypes.c_int32, [_handle, ctypes.c_int32, ctypes.c_double]),
    "ely_block_get": (ctypes.c_int32, [_handle, ctypes.c_int32, _c_double_p]),
    "ely_block_set_spec": (ctypes.c_int32, [_handle, ctypes.c_char_p]),
    "ely_block_get_spec": (ctypes.c_int32, [_handle, ctypes.POINTER(ctypes.c_char_p)]),
    "ely_block_solve": (ctypes.c_int32, [_handle]),
    "ely_block_solve_batch": (ctypes.c_int32, [_handle, ctypes.c_size_t, ctypes.c_int32, ctypes.c_void_p,
                                               ctypes.c_void_p, ctypes.c_int32, ctypes.c_void_p, ctypes.c_void_p,
                                               ctypes.c_void_p, PROGRESS, ctypes.c_void_p]),
    "ely_block_solve_batch_columns": (ctypes.c_int32, [_handle, ctypes.c_size_t, ctypes.c_int32, ctypes.c_void_p,
                                                       ctypes.c_void_p, ctypes.c_int32, ctypes.c_void_p,
                                                       ctypes.c_void_p, ctypes.c_void_p, PROGRESS, ctypes.c_void_p]),
    "ely_block_report_json": (ctypes.c_int32, [_handle, ctypes.c_char_p, ctypes.c_size_t,
                                               ctypes.POINTER(ctypes.c_size_t)]),
    "ely_parse_quantity": (ctypes.c_int32, [ctypes.c_char_p, ctypes.c_char_p, _c_double_p]),
    "ely_convert_unit": (ctypes.c_int32, [ctypes.c_double, ctypes.c_char_p, ctypes.c_char_p, _c_double_p]),
    "ely_block_fit": (ctypes.c_int32, [_handle, ctypes.c_size_t, ctypes.c_int32, ctypes.c_void_p, ctypes.c_void_p,
                                       ctypes.c_int32, ctypes.c_void_p, ctypes.c_void_p, ctypes.c_void_p,
                                       ctypes.c_int32, ctypes.POINTER(ctypes.c_char_p), ctypes.POINTER(FitOptions),
                                       PROGRESS, ctypes.c_void_p, _handle_p]),
    "ely_fit_report_json": (ctypes.c_int32, [_handle, ctypes.c_char_p, ctypes.c_size_t,
                                             ctypes.POINTER(ctypes.c_size_t)]),
    "ely_fit_plant_json": (ctypes.c_int32, [_handle, ctypes.c_char_p, ctypes.c_size_t,
                                            ctypes.POINTER(ctypes.c_size_t)]),
    "ely_fit_parameter": (ctypes.c_int32, [_handle, ctypes.c_int32, _c_double_p, _c_double_p]),
    "ely_fit_destroy": (None, [_handle]),
    # the block in time
    "ely_block_reset": (ctypes.c_int32, [_handle, ctypes.c_double]),
    "ely_block_advance": (ctypes.c_int32, [_handle, ctypes.c_double]),
    "ely_block_time": (ctypes.c_int32, [_handle, _c_double_p]),
    "ely_block_save_state": (ctypes.c_int32, [_handle, ctypes.c_void_p, ctypes.c_size_t,
                                              ctypes.POINTER(ctypes.c_size_t)]),
    "ely_block_restore_state": (ctypes.c_int32, [_handle, ctypes.c_void_p, ctypes.c_size_t]),
    "ely_block_simulate": (ctypes.c_int32, [_handle, ctypes.c_size_t, ctypes.c_void_p, ctypes.c_int32, ctypes.c_void_p,
                                            ctypes.c_void_p, ctypes.c_int32, ctypes.c_void_p, ctypes.c_void_p,
                                            ctypes.c_void_p, PROGRESS, ctypes.c_void_p]),
    "ely_block_run_summary_json": (ctypes.c_int32, [_handle, ctypes.c_char_p, ctypes.c_size_t,
                                                    ctypes.POINTER(ctypes.c_size_t)]),
}
# Calls added after the first release of ABI 1: an older library lacks them, and the package
# works without them (the features that need them say so).
_OPTIONAL = {"ely_block_get_spec", "ely_parse_quantity", "ely_convert_unit", "ely_block_fit", "ely_fit_report_json",
             "ely_fit_plant_json", "ely_fit_parameter", "ely_fit_destroy", "ely_block_reset", "ely_block_advance",
             "ely_block_time", "ely_block_save_state", "ely_block_restore_state", "ely_block_simulate",
             "ely_block_run_summary_json"}


def _candidates():
    override = os.environ.get("ELYBLOCK_LIBRARY")
    if override:
        yield override, "ELYBLOCK_LIBRARY"
        return
    if _build_info is not None:
        path = _build_info.LIBRARY
        if not os.path.isabs(path):
            path = os.path.normpath(os.path.join(os.path.dirname(os.path.abspath(__file__)), path))
        yield path, "the library this package was built or installed with"
    yield SONAME, "the dynamic loader's search path"


def _load():
    tried = []
    for path, where in _candidates():
        if os.sep in path and not os.path.exists(path):
            tried.append(f"{path} ({where}): no such file")
            continue
        try:
            lib = ctypes.CDLL(path)
        except OSError as e:
            tried.append(f"{path} ({where}): {e}")
            continue
        return lib, path
    raise ImportError("elyblock: cannot load the elyblock library; tried " + "; ".join(tried))


lib, library_path = _load()
for _name, (_restype, _argtypes) in _PROTOTYPES.items():
    try:
        _function = getattr(lib, _name)
    except AttributeError:
        if _name in _OPTIONAL:
            continue
        raise ImportError(f"elyblock: {library_path} lacks {_name}: not an elyblock library of ABI {ABI_VERSION}")
    _function.restype = _restype
    _function.argtypes = _argtypes



def check_abi(library, path):
    """Refuses a library of another binary interface than the one these declarations follow."""
    version = library.ely_abi_version()
    if version != ABI_VERSION:
        raise errors.AbiMismatchError(f"elyblock: {path} has ABI version {version}, this package needs {ABI_VERSION}; "
                                      f"use the package that came with that library")


check_abi(lib, library_path)

library_version = lib.ely_version().decode()


def has(name):
    """Whether the loaded library has the optional call ``name``."""
    return hasattr(lib, name) and name in _PROTOTYPES


def text(raw):
    return raw.decode("utf-8", errors="replace") if raw is not None else None


def last_error():
    return text(lib.ely_last_error())


def status_text(status):
    return text(lib.ely_status_text(int(status)))


def require(name, feature):
    """Raises NotImplementedError naming ``feature`` when the loaded library lacks the call ``name``."""
    if not has(name):
        raise NotImplementedError(f"{feature} needs {name}, which the loaded library {library_path} "
                                  f"(version {library_version}) lacks; use a newer libelyblock")


def buffer_text(call, handle):
    """The text a call of the buffer protocol gives (ely_block_report_json and the like): asks
    for the length, then fills a buffer of that size."""
    length = ctypes.c_size_t()
    check(call(handle, None, 0, ctypes.byref(length)))
    buffer = ctypes.create_string_buffer(length.value)
    check(call(handle, buffer, length.value, ctypes.byref(length)))
    return buffer.value.decode("utf-8")


def buffer_bytes(call, handle):
    """The bytes a call of the buffer protocol gives without a terminator (ely_block_save_state)."""
    length = ctypes.c_size_t()
    check(call(handle, None, 0, ctypes.byref(length)))
    buffer = ctypes.create_string_buffer(max(length.value, 1))
    check(call(handle, buffer, length.value, ctypes.byref(length)))
    return buffer.raw[:length.value]


def check(status):
    """Raises the exception of a failed call (status < 0) with the calling thread's message;
    returns the status otherwise. Call it right after the call, before any other on this thread."""
    if status < 0:
        raise errors.error_for(status, last_error() or status_text(status))
    return status
