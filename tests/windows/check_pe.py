#!/usr/bin/python3
"""Checks a Windows DLL's export and import tables as printed by mingw's `objdump -p`.

usage: check_pe.py OBJDUMP DLL [--exports-prefix P | --exports NAME...] [--min-exports N]
                   --imports DLLNAME...
Fails when an exported name is outside the allowed set, when fewer than N names are exported,
or when the DLL imports from a DLL not in the --imports list (case-insensitive).
"""
import argparse
import re
import subprocess
import sys


def tables(objdump, dll):
    text = subprocess.run([objdump, "-p", dll], check=True, capture_output=True, text=True).stdout
    imports = sorted({m.group(1) for m in re.finditer(r"^\s*DLL Name: (\S+)", text, re.M)})
    exports = []
    section = text.split("[Ordinal/Name Pointer] Table", 1)
    if len(section) == 2:
        for line in section[1].splitlines()[1:]:
            m = re.match(r"^\s*\[\s*\d+\]\s+(\S+)\s*$", line)
            if not m:
                break
            exports.append(m.group(1))
    return exports, imports


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("objdump")
    ap.add_argument("dll")
    ap.add_argument("--exports-prefix")
    ap.add_argument("--exports", nargs="*")
    ap.add_argument("--min-exports", type=int, default=1)
    ap.add_argument("--imports", nargs="+", required=True)
    a = ap.parse_args()
    exports, imports = tables(a.objdump, a.dll)
    errors = []
    if len(exports) < a.min_exports:
        errors.append(f"{len(exports)} exports, expected at least {a.min_exports}")
    if a.exports_prefix is not None:
        errors += [f"export {e} does not start with {a.exports_prefix}" for e in exports
                   if not e.startswith(a.exports_prefix)]
    if a.exports is not None:
        errors += [f"unexpected export {e}" for e in exports if e not in a.exports]
        errors += [f"missing export {e}" for e in a.exports if e not in exports]
    allowed = {d.lower() for d in a.imports}
    errors += [f"imports from {d}, which is not allowed" for d in imports if d.lower() not in allowed]
    print(f"{a.dll}: {len(exports)} exports, imports from {', '.join(imports)}")
    for e in errors:
        print("FAILED:", e, file=sys.stderr)
    return 1 if errors else 0


if __name__ == "__main__":
    sys.exit(main())
