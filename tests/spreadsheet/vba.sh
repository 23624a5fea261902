#!/usr/bin/env bash
# The Excel VBA module's tests that need the Windows build (registered by tests/spreadsheet/CMakeLists.txt
# under the fixtures of tests/windows/wine_tests.cmake). Environment from CTest: ELY_WINE,
# ELY_WINESERVER, WINEPREFIX, ELY_WINDOWS_BUILD, ELY_SOURCE_DIR, ELY_OBJDUMP, ELY_WORK_DIR.
#   exports               the Declares of elyblock.dll against the DLL's export table
#   calls                 vba_calls.exe calls: every Declare called with its declared types
#   points LINUX_PROGRAM  vba_calls.exe points: the 50 points of tests/windows through the Declares,
#                         against their Linux run
#   profile LINUX_LIBRARY vba_calls.exe profile: a two-day profile run and its summary through the
#                         Declares, against the same run of the Linux library (profile_run.py)
set -euo pipefail
case_name=$1
shift
source "$(dirname "$0")/../windows/wine_env.sh"
bas=$ELY_SOURCE_DIR/adapters/spreadsheet/excel/elyblock.bas
bin=$ELY_WINDOWS_BUILD/bin
mkdir -p "$ELY_WORK_DIR"

case $case_name in
exports)
  /usr/bin/python3 "$ELY_SOURCE_DIR/tests/spreadsheet/check_vba.py" exports "$ELY_OBJDUMP" \
    "$ELY_WINDOWS_BUILD/install/bin/elyblock.dll" "$bas"
  ;;
calls)
  (cd "$bin" && "$ELY_WINE" ./vba_calls.exe calls "$(winpath "$ELY_SOURCE_DIR/examples/demo-plant.json")") |
    tr -d '\r' || fail "vba_calls.exe calls failed under Wine"
  ;;
points)
  linux_program=$1
  "$linux_program" >"$ELY_WORK_DIR/linux.txt" || fail "the Linux points program failed"
  /usr/bin/python3 "$ELY_SOURCE_DIR/tests/spreadsheet/points_plants.py" "$ELY_SOURCE_DIR/tests/windows/points.c" \
    >"$ELY_WORK_DIR/plants.txt"
  (cd "$bin" && "$ELY_WINE" ./vba_calls.exe points "$(winpath "$ELY_WORK_DIR/plants.txt")" \
    "$(winpath "$ELY_WORK_DIR/linux.txt")") >"$ELY_WORK_DIR/windows.txt" || fail "vba_calls.exe points failed under Wine"
  /usr/bin/python3 "$ELY_SOURCE_DIR/tests/windows/compare_points.py" "$ELY_WORK_DIR/linux.txt" "$ELY_WORK_DIR/windows.txt"
  ;;
profile)
  linux_library=$1
  here=$ELY_SOURCE_DIR/tests/spreadsheet
  plant=$ELY_SOURCE_DIR/examples/demo-plant.json
  /usr/bin/python3 "$here/profile_run.py" write "$ELY_WORK_DIR/run.txt"
  /usr/bin/python3 "$here/profile_run.py" linux "$ELY_WORK_DIR/run.txt" "$linux_library" "$plant" \
    >"$ELY_WORK_DIR/linux.txt" || fail "the Linux run failed"
  (cd "$bin" && "$ELY_WINE" ./vba_calls.exe profile "$(winpath "$plant")" "$(winpath "$ELY_WORK_DIR/run.txt")") |
    tr -d '\r' >"$ELY_WORK_DIR/windows.txt" || fail "vba_calls.exe profile failed under Wine"
  /usr/bin/python3 "$here/profile_run.py" compare "$ELY_WORK_DIR/linux.txt" "$ELY_WORK_DIR/windows.txt"
  ;;
*)
  fail "unknown case $case_name"
  ;;
esac
