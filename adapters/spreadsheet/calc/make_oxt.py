#!/usr/bin/python3
"""Packs the elyblock Calc add-in (an .oxt extension). Run by the build (target elyblock_calc_addin).

usage: make_oxt.py --out elyblock.oxt --rdb XFunctions.rdb --library libelyblock.so.1
                   --package DIR --version X.Y.Z [--bundle SONAME_PREFIX ...]

Layout of the extension:
  META-INF/manifest.xml        the type library and the Python component
  description.xml              identifier, version, platform, names
  XFunctions.rdb               the UNO interface generated from functions.json
  python/addin.py              the component
  python/pythonpath/           on the component's sys.path: elyblock_sheet.py, functions.json,
                               the elyblock package (with a _build_info.py naming the library
                               beside it), libelyblock.so.1 and the libraries it needs that a
                               LibreOffice install may lack (--bundle libfmt: the library's
                               dependencies of that name, as ldd finds them)
"""
import argparse
import json
import os
import platform
import re
import subprocess
import sys
import zipfile

HERE = os.path.dirname(os.path.abspath(__file__))
SPREADSHEET = os.path.dirname(HERE)
IDENTIFIER = "org.elyblock.calc"
# Fixed member dates keep the archive the same from build to build.
DATE = (2024, 1, 1, 0, 0, 0)

MANIFEST = """<?xml version="1.0" encoding="UTF-8"?>
<manifest:manifest xmlns:manifest="http://openoffice.org/2001/manifest">
  <manifest:file-entry manifest:media-type="application/vnd.sun.star.uno-typelibrary;type=RDB"
                       manifest:full-path="XFunctions.rdb"/>
  <manifest:file-entry manifest:media-type="application/vnd.sun.star.uno-component;type=Python"
                       manifest:full-path="python/addin.py"/>
</manifest:manifest>
"""

DESCRIPTION = """<?xml version="1.0" encoding="UTF-8"?>
<description xmlns="http://openoffice.org/extensions/description/2006"
             xmlns:d="http://openoffice.org/extensions/description/2006"
             xmlns:l="http://libreoffice.org/extensions/description/2011"
             xmlns:xlink="http://www.w3.org/1999/xlink">
  <identifier value="{identifier}"/>
  <version value="{version}"/>
  <platform value="{platform}"/>
  <dependencies>
    <l:LibreOffice-minimal-version d:name="LibreOffice 7.0" value="7.0"/>
  </dependencies>
  <display-name>
    <name lang="en">elyblock worksheet functions</name>
  </display-name>
  <extension-description>
    <src lang="en" xlink:href="description-en.txt"/>
  </extension-description>
</description>
"""

ABOUT = """Worksheet functions of the elyblock electrolyzer model: {names} (category Add-In of
the Function Wizard). A plant is a path to a JSON plant description or a two-column range of keys
and values. Library {version}.
"""


def uno_platform():
    machine = platform.machine()
    return {"x86_64": "linux_x86_64", "aarch64": "linux_aarch64", "i686": "linux_x86"}.get(machine, f"linux_{machine}")


def dependencies(library, prefixes):
    """(SONAME, path) of the library's dependencies whose SONAME starts with one of prefixes."""
    text = subprocess.run(["ldd", library], check=True, capture_output=True, text=True).stdout
    found = []
    for m in re.finditer(r"^\s*(\S+) => (\S+)", text, re.M):
        if any(m.group(1).startswith(p) for p in prefixes):
            found.append((m.group(1), m.group(2)))
    missing = [p for p in prefixes if not any(s.startswith(p) for s, _ in found)]
    if missing:
        raise SystemExit(f"make_oxt: {library} does not link {', '.join(missing)} (ldd: {text.strip()})")
    return found


def add(archive, name, data):
    info = zipfile.ZipInfo(name, DATE)
    info.compress_type = zipfile.ZIP_DEFLATED
    info.external_attr = 0o644 << 16
    archive.writestr(info, data)


def add_file(archive, name, path):
    with open(path, "rb") as f:
        add(archive, name, f.read())


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--out", required=True)
    ap.add_argument("--rdb", required=True)
    ap.add_argument("--library", required=True, help="libelyblock.so.1 of the build")
    ap.add_argument("--package", required=True, help="the elyblock Python package folder of the build")
    ap.add_argument("--version", required=True)
    ap.add_argument("--bundle", nargs="*", default=[], help="SONAME prefixes of dependencies to ship beside the library")
    a = ap.parse_args()

    tmp = a.out + ".tmp"
    with zipfile.ZipFile(tmp, "w") as z:
        add(z, "META-INF/manifest.xml", MANIFEST)
        add(z, "description.xml", DESCRIPTION.format(identifier=IDENTIFIER, version=a.version, platform=uno_platform()))
        with open(os.path.join(SPREADSHEET, "functions.json"), encoding="utf-8") as f:
            names = ", ".join(fn["name"] for fn in json.load(f)["functions"])
        add(z, "description-en.txt", ABOUT.format(names=names, version=a.version))
        add_file(z, "XFunctions.rdb", a.rdb)
        add_file(z, "python/addin.py", os.path.join(HERE, "addin.py"))
        add_file(z, "python/pythonpath/elyblock_sheet.py", os.path.join(HERE, "elyblock_sheet.py"))
        add_file(z, "python/pythonpath/functions.json", os.path.join(SPREADSHEET, "functions.json"))
        # Without its debug information (the code is the same): a tenth of the size.
        stripped = a.out + ".libelyblock.so.1"
        subprocess.run(["objcopy", "--strip-debug", a.library, stripped], check=True)
        add_file(z, "python/pythonpath/libelyblock.so.1", stripped)
        os.remove(stripped)
        for soname, path in dependencies(a.library, a.bundle):
            add_file(z, "python/pythonpath/" + soname, path)
        for name in sorted(os.listdir(a.package)):
            if name.endswith(".py") and name != "_build_info.py":
                add_file(z, "python/pythonpath/elyblock/" + name, os.path.join(a.package, name))
        add(z, "python/pythonpath/elyblock/_build_info.py",
            "# Written by adapters/spreadsheet/calc/make_oxt.py: the library beside the package.\n"
            f'VERSION = "{a.version}"\nSONAME = "libelyblock.so.1"\nLIBRARY = "../libelyblock.so.1"\n')
    os.replace(tmp, a.out)
    print(f"wrote {a.out}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
