#!/usr/bin/env bash
# The Windows binary of an FMU under Wine (registered by tests/fmi/CMakeLists.txt, with the fixtures
# and skip rules of tests/windows/wine_tests.cmake).
# Usage: wine_fmu.sh VERSION FMU LINUX_IMPORTER
# Unpacks the FMU (the demo plant's, as the build made it), runs the importer of tests/fmi on its
# Linux binary and, cross-compiled (fmi_importer.exe of the Windows build), on its Windows binary
# under Wine: every check of the importer must pass on both, and the outputs of both runs are
# compared by compare_values.py.
# Environment from CTest: ELY_WINE, ELY_WINESERVER, WINEPREFIX, ELY_WINDOWS_BUILD, ELY_SOURCE_DIR,
# ELY_WORK_DIR (and ELY_OBJDUMP, unused). Headless: no DISPLAY, WINEDEBUG=-all, no Mono/Gecko installers; wineserver -k at the end.
set -euo pipefail
version=$1 fmu=$2 linux_importer=$3
source "$(dirname "$0")/../windows/wine_env.sh"

[[ $version == 2 ]] && folder=win64 || folder=x86_64-windows
work=$ELY_WORK_DIR
# Unpacked where a tool may unpack it: a folder with spaces and non-ASCII letters (UTF-8 on Linux,
# UTF-16 on Windows; the FMI 2 resource URI percent-encodes them).
unpacked="$work/FMU – Anlage Ökostrom 電解"
rm -rf "$work"
mkdir -p "$unpacked"
/usr/bin/python3 -m zipfile -e "$fmu" "$unpacked" || fail "cannot unpack $fmu"
ls "$unpacked/binaries/$folder/"*.dll >/dev/null 2>&1 ||
  fail "$fmu has no binaries/$folder/*.dll (ELY_FMU_WINDOWS packs it)"

echo "# Linux: $linux_importer"
"$linux_importer" "$version" "$unpacked" "$work/linux.txt" >"$work/linux.log" ||
  { cat "$work/linux.log"; fail "the importer found failed checks on the Linux binary"; }
tail -n 1 "$work/linux.log"

echo "# Windows, under Wine: fmi_importer.exe on binaries/$folder"
importer=$ELY_WINDOWS_BUILD/bin/fmi_importer.exe
[[ -f $importer ]] || fail "no $importer (the Windows build, scripts/windows)"
status=0
(cd "$(dirname "$importer")" &&
  timeout 300 "$ELY_WINE" ./fmi_importer.exe "$version" "$(winpath "$unpacked")" "$(winpath "$work/windows.txt")") |
  tr -d '\r' >"$work/windows.log" || status=$?
grep -v '^ok - ' "$work/windows.log" || true  # the comments: binary, resource location, settled values
[[ $status == 0 ]] || { cat "$work/windows.log"; fail "the importer found failed checks on the Windows binary (status $status)"; }
grep -q '^0 failed$' "$work/windows.log" || fail "the Windows importer did not finish"
echo "$(grep -c '^ok - ' "$work/windows.log") checks passed on the Windows binary"

/usr/bin/python3 "$ELY_SOURCE_DIR/tests/fmi/compare_values.py" "$work/linux.txt" "$work/windows.txt"
