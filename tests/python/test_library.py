"""The package against the header it follows and the library it loads."""
import ctypes
import os
import re
import subprocess
import sys

import pytest

import elyblock
from elyblock import _capi, errors
from conftest import BUILD_DIR, HEADER, assert_same


def header_text():
    return re.sub(r"/\*.*?\*/", " ", HEADER.read_text(), flags=re.S)


def header_defines(prefix):
    return {m.group(1): int(m.group(2)) for m in
            re.finditer(r"#define\s+" + prefix + r"(\w+)\s+\(?(-?\d+)\)?", header_text())}


def test_versions():
    assert elyblock.__version__ == elyblock.library_version  # the build's package with the build's library
    assert re.fullmatch(r"\d+\.\d+\.\d+", elyblock.__version__)
    assert elyblock.abi_version == header_defines("ELY_")["ABI_VERSION"]
    assert _capi.lib.ely_abi_version() == elyblock.abi_version


def test_loads_the_library_of_this_build():
    assert os.path.samefile(elyblock.library_path, BUILD_DIR / "abi" / "libelyblock.so.1")


def test_status_values_are_the_headers():
    statuses = {k: v for k, v in header_defines("ELY_").items() if k in ("OK", "WARNING", "PARTIAL")}
    statuses.update(header_defines("ELY_ERR_"))
    assert statuses == {s.name: s.value for s in errors.Status}


def test_every_error_status_has_its_exception():
    for status in errors.Status:
        if status < 0:
            e = errors.error_for(status, "message")
            assert type(e) is not errors.ElyError and e.status == status and str(e) == "message"
    e = errors.error_for(-99, "from a newer library")
    assert type(e) is errors.ElyError and e.status == -99
    assert issubclass(errors.UnknownNameError, KeyError) and issubclass(errors.ConfigError, ValueError)
    assert issubclass(errors.FileError, OSError) and issubclass(errors.OutOfRangeError, ValueError)


def test_status_texts_come_from_the_library():
    for status in errors.Status:
        assert _capi.status_text(status) == _capi.text(_capi.lib.ely_status_text(int(status)))
    assert _capi.status_text(errors.Status.CANCELLED) == "cancelled"


C_TYPES = {"uint32_t": ctypes.c_uint32, "int32_t": ctypes.c_int32, "const char*": ctypes.c_char_p,
           "double": ctypes.c_double}


def header_struct_fields():
    body = re.search(r"typedef struct ely_variable_info \{(.*?)\} ely_variable_info;", header_text(), re.S).group(1)
    fields = []
    for declaration in filter(None, (d.strip() for d in body.split(";"))):
        match = re.fullmatch(r"(const char\s*\*|\w+)\s*(.*)", declaration, re.S)
        c_type = re.sub(r"\s+", "", match.group(1)).replace("constchar", "const char")
        for name in match.group(2).split(","):
            fields.append((name.strip(), C_TYPES[c_type]))
    return fields


def test_variable_info_layout_follows_the_header():
    """The ctypes struct holds the header's members in the header's order; members the
    package knows beyond the header's are the struct's announced next version, which a library
    of the header's version leaves untouched (struct_size protocol)."""
    declared = header_struct_fields()
    known = _capi.VariableInfo._fields_
    assert len(declared) >= _capi.VariableInfo.FIRST_VERSION_FIELDS
    assert len(known) >= len(declared), f"the header has members the package does not read: {declared[len(known):]}"
    assert known[:len(declared)] == declared


def test_abi_mismatch_is_refused():
    class OtherAbi:
        def ely_abi_version(self):
            return elyblock.abi_version + 1

    with pytest.raises(errors.AbiMismatchError, match="ABI version 2, this package needs 1"):
        _capi.check_abi(OtherAbi(), "/some/libelyblock.so.1")
    assert issubclass(errors.AbiMismatchError, ImportError)


def test_missing_library_says_where_it_looked(tmp_path):
    env = dict(os.environ, ELYBLOCK_LIBRARY=str(tmp_path / "libelyblock.so.1"))
    run = subprocess.run([sys.executable, "-c", "import elyblock"], env=env, capture_output=True, text=True)
    assert run.returncode != 0
    assert "cannot load the elyblock library" in run.stderr and str(tmp_path) in run.stderr


def test_explicit_library_is_used():
    env = dict(os.environ, ELYBLOCK_LIBRARY=str(BUILD_DIR / "abi" / "libelyblock.so.1"))
    run = subprocess.run([sys.executable, "-c", "import elyblock; print(elyblock.library_path)"], env=env,
                         capture_output=True, text=True, check=True)
    assert run.stdout.strip() == env["ELYBLOCK_LIBRARY"]


def test_water_properties_equal_the_c_interface(reference):
    for temperature in (273.16, 300.0, 353.15, 373.124, 450.0, 647.0):
        status, expected = reference.water(temperature)
        assert status == 0
        assert_same(elyblock.water_saturation_pressure(temperature), expected)
    for args in ((353.15, 1e5, 1e5), (338.15, 1.5e5, 3e6)):
        status, expected = reference.voltages(*args)
        assert status == 0
        assert_same(elyblock.water_electrolysis_voltages(*args), expected)


def test_water_errors_carry_the_message(reference):
    status, message = reference.water(700.0)
    with pytest.raises(errors.OutOfRangeError) as e:
        elyblock.water_saturation_pressure(700.0)
    assert e.value.status == status and e.value.message == message


def test_causality_and_variability_codes_are_the_headers():
    assert {name.lower(): value for name, value in header_defines("ELY_CAUSALITY_").items()} == \
        {name: value for value, name in _capi.CAUSALITY.items()}
    variability = header_defines("ELY_VARIABILITY_")
    if variability:  # the second version of the variable metadata
        assert {name.lower(): value for name, value in variability.items()} == \
            {name: value for value, name in _capi.VARIABILITY.items()}
        assert header_defines("ELY_VARIABLE_")["MIN_EXCLUSIVE"] == _capi.VARIABLE_MIN_EXCLUSIVE
