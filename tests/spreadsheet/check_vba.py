#!/usr/bin/python3
"""The Declare statements of the Excel VBA module against the C interface.

usage: check_vba.py header elyblock.h elyblock.bas
           every function of the header is declared, every Declare of elyblock.dll is a function
           of the header, with as many arguments, each of a VBA type that passes that C type
       check_vba.py exports OBJDUMP elyblock.dll elyblock.bas
           the Declares of elyblock.dll name exactly the DLL's exports
       check_vba.py c-header elyblock.bas OUT.h
           writes the C function-pointer types that the Declares amount to on 64-bit Windows (what
           VBA pushes and reads), for tests/spreadsheet/vba_calls.c, and the module's Long constants

VBA to C on 64-bit Windows: ByVal Long = int32_t, ByVal Double = double, ByVal LongPtr = a
64-bit integer (a pointer, size_t, a handle), ByRef T = a pointer to T; As Long = int32_t,
As LongPtr = a 64-bit integer, Sub = void.
"""
import os
import re
import sys

DECLARE = re.compile(r'^\s*(?:Private\s+|Public\s+)?Declare\s+PtrSafe\s+(Function|Sub)\s+(\w+)\s+Lib\s+"([^"]+)"'
                     r'(?:\s+Alias\s+"([^"]+)")?\s*\(([^)]*)\)\s*(?:As\s+(\w+))?\s*$', re.I)
ANY_DECLARE = re.compile(r"^\s*(?:Private\s+|Public\s+)?Declare\b", re.I)
PARAMETER = re.compile(r"^(?:(ByVal|ByRef)\s+)?(\w+)\s+As\s+(\w+)$", re.I)
CONSTANT = re.compile(r"^\s*Private\s+Const\s+(\w+)\s+As\s+Long\s*=\s*(-?\d+)\s*$", re.I)
VBA_TYPES = {"long": "Long", "double": "Double", "longptr": "LongPtr"}


def declares(bas_path):
    """[(name, lib, kind, [(passing, vba type, parameter name)], result type or None)]."""
    found, errors = [], []
    with open(bas_path, encoding="ascii", newline="") as f:
        text = f.read()
    for number, line in enumerate(text.replace("\r\n", "\n").split("\n"), start=1):
        if not ANY_DECLARE.match(line):
            continue
        m = DECLARE.match(line)
        if not m:
            errors.append(f"line {number}: a Declare without PtrSafe, or not on one line: {line.strip()}")
            continue
        kind, name, lib, alias, params, result = m.groups()
        parameters = []
        for p in (s.strip() for s in params.split(",") if s.strip()):
            pm = PARAMETER.match(p)
            if not pm or pm.group(3).lower() not in VBA_TYPES:
                errors.append(f"line {number}: {name}: parameter '{p}' is not ByVal/ByRef name As Long|Double|LongPtr")
                continue
            # VBA passes ByRef when neither is written.
            passing = (pm.group(1) or "ByRef").lower()
            parameters.append(("ByVal" if passing == "byval" else "ByRef", VBA_TYPES[pm.group(3).lower()], pm.group(2)))
        if kind.lower() == "function" and (result or "").lower() not in VBA_TYPES:
            errors.append(f"line {number}: {name}: result As {result}, not Long, Double or LongPtr")
        found.append((alias or name, lib, kind.capitalize(), parameters,
                      VBA_TYPES.get((result or "").lower()) if kind.lower() == "function" else None))
    return found, errors


def constants(bas_path):
    with open(bas_path, encoding="ascii") as f:
        return [(m.group(1), int(m.group(2))) for m in map(CONSTANT.match, f) if m]


def header_functions(header_path):
    """{name: (result C type, [C parameter types])} of the header's ELY_API functions."""
    with open(header_path, encoding="utf-8") as f:
        text = f.read()
    text = re.sub(r"/\*.*?\*/", " ", text, flags=re.S)
    text = re.sub(r"^\s*#.*$", " ", text, flags=re.M)
    functions = {}
    for m in re.finditer(r"ELY_API\s+([^;(]*?)\b(ely_\w+)\s*\(([^;]*?)\)\s*;", text, re.S):
        result = " ".join(m.group(1).split())
        params = [" ".join(p.split()) for p in m.group(3).split(",")]
        types = []
        for p in params:
            if p == "void":
                continue
            # Drop the parameter's name: the last identifier when something stands before it.
            pm = re.match(r"^(.*?[\s*])(\w+)$", p)
            types.append(pm.group(1).strip() if pm else p)
        functions[m.group(2)] = (result, types)
    return functions


def c_type_shape(c_type):
    """'const int32_t*' -> ('int32_t', 1); 'const char* const*' -> ('char', 2)."""
    stars = c_type.count("*")
    base = c_type.replace("*", " ").replace("const", " ").split()
    return (base[0] if base else ""), stars


BY_VALUE = {"int32_t": "Long", "uint32_t": "Long", "double": "Double", "size_t": "LongPtr", "ely_progress_fn": "LongPtr"}
BY_REFERENCE = {"int32_t": "Long", "uint32_t": "Long", "double": "Double", "size_t": "LongPtr"}


def allowed(c_type):
    """The (passing, VBA type) pairs that pass this C argument type."""
    base, stars = c_type_shape(c_type)
    if stars == 0:
        return {("ByVal", BY_VALUE[base])} if base in BY_VALUE else set()
    ways = {("ByVal", "LongPtr")}  # any pointer, as an address (VarPtr, StrPtr of UTF-8 bytes, 0 for NULL)
    if stars == 1 and base in BY_REFERENCE:
        ways.add(("ByRef", BY_REFERENCE[base]))  # a variable or an array's first element
    if stars == 2:
        ways.add(("ByRef", "LongPtr"))  # a handle or string pointer written back, an array of pointers
    return ways


def allowed_result(c_type):
    base, stars = c_type_shape(c_type)
    if stars:
        return "LongPtr"
    return {"int32_t": "Long", "double": "Double", "void": None}.get(base, "?")


def check_header(header_path, bas_path):
    decls, errors = declares(bas_path)
    functions = header_functions(header_path)
    library = {d[0]: d for d in decls if d[1].lower() == "elyblock.dll"}
    for name in functions:
        if name not in library:
            errors.append(f"{name} of the header has no Declare")
    for name, (_, lib, kind, params, result) in library.items():
        if name not in functions:
            errors.append(f"Declare {name}: no such function in the header")
            continue
        c_result, c_params = functions[name]
        if allowed_result(c_result) != result:
            errors.append(f"{name}: returns {c_result}, declared {'Sub' if result is None else 'As ' + result}")
        if len(c_params) != len(params):
            errors.append(f"{name}: {len(c_params)} arguments in the header, {len(params)} declared")
            continue
        for k, (c_type, (passing, vba_type, pname)) in enumerate(zip(c_params, params), start=1):
            if (passing, vba_type) not in allowed(c_type):
                ways = " or ".join(f"{p} {t}" for p, t in sorted(allowed(c_type))) or "nothing VBA can pass"
                errors.append(f"{name}: argument {k} ({pname}) is {c_type} in the header, declared "
                              f"{passing} {vba_type}; expected {ways}")
    print(f"{len(library)} Declares of elyblock.dll checked against {len(functions)} functions of the header")
    return errors


def check_exports(objdump, dll, bas_path):
    decls, errors = declares(bas_path)
    declared = {d[0] for d in decls if d[1].lower() == "elyblock.dll"}
    sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "windows"))
    from check_pe import tables  # the export table as tests/windows reads it
    exports = set(tables(objdump, dll)[0])
    errors += [f"{n} is exported by {dll} but not declared" for n in sorted(exports - declared)]
    errors += [f"Declare {n}: {dll} does not export it" for n in sorted(declared - exports)]
    print(f"{len(declared)} Declares of elyblock.dll, {len(exports)} exports of {dll}")
    return errors


C_BY = {("ByVal", "Long"): "int32_t", ("ByVal", "Double"): "double", ("ByVal", "LongPtr"): "intptr_t",
        ("ByRef", "Long"): "int32_t*", ("ByRef", "Double"): "double*", ("ByRef", "LongPtr"): "intptr_t*"}
C_RESULT = {"Long": "int32_t", "Double": "double", "LongPtr": "intptr_t", None: "void"}


def c_header(bas_path, out_path):
    decls, errors = declares(bas_path)
    if errors:
        return errors
    lines = ["/* Written by tests/spreadsheet/check_vba.py from adapters/spreadsheet/excel/elyblock.bas:",
             " * the functions as its Declare statements call them on 64-bit Windows. */",
             "#include <stddef.h>", "#include <stdint.h>", ""]
    for name, lib, kind, params, result in decls:
        args = ", ".join(C_BY[(p, t)] for p, t, _ in params) or "void"
        lines.append(f"typedef {C_RESULT[result]} (*vba_{name}_fn)({args});")
    lines += ["", "struct vba_api {"]
    lines += [f"    vba_{name}_fn {name};" for name, *_ in decls]
    lines += ["};", "", "/* name, library (as the Declare writes it), where its pointer goes */",
              "static const struct vba_declare { const char* name; const char* lib; size_t offset; } vba_declares[] = {"]
    lines += [f'    {{"{name}", "{lib}", offsetof(struct vba_api, {name})}},' for name, lib, *_ in decls]
    lines += ["};", f"#define VBA_DECLARE_COUNT {len(decls)}", ""]
    lines += [f"#define VBA_{name} {value}" for name, value in constants(bas_path)]
    with open(out_path, "w", encoding="utf-8") as f:
        f.write("\n".join(lines) + "\n")
    return []


def main(argv):
    if len(argv) == 4 and argv[1] == "header":
        errors = check_header(argv[2], argv[3])
    elif len(argv) == 5 and argv[1] == "exports":
        errors = check_exports(argv[2], argv[3], argv[4])
    elif len(argv) == 4 and argv[1] == "c-header":
        errors = c_header(argv[2], argv[3])
    else:
        print(__doc__, file=sys.stderr)
        return 2
    for e in errors:
        print("FAILED:", e, file=sys.stderr)
    return 1 if errors else 0


if __name__ == "__main__":
    sys.exit(main(sys.argv))
