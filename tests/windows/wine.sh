#!/usr/bin/env bash
# Runs one Windows test under Wine (registered by tests/windows/wine_tests.cmake).
# Environment from CTest: ELY_WINE, ELY_WINESERVER, WINEPREFIX, ELY_WINDOWS_BUILD (the cross
# build), ELY_SOURCE_DIR, ELY_OBJDUMP, ELY_WORK_DIR. Headless: no DISPLAY, WINEDEBUG=-all, no
# Mono/Gecko installers; wineserver -k at the end of every case.
set -euo pipefail
case_name=$1
shift
source "$(dirname "$0")/wine_env.sh"
run_wine() { "$ELY_WINE" "$@"; }
bin=${ELY_WINDOWS_BUILD:-}/bin
install=${ELY_WINDOWS_BUILD:-}/install

case $case_name in
fresh_prefix)
  rm -rf "$WINEPREFIX"
  run_wine wineboot --init >/dev/null 2>&1 || fail "wineboot could not make a prefix in $WINEPREFIX"
  "$ELY_WINESERVER" -w
  [[ -f $WINEPREFIX/system.reg ]] || fail "no registry in $WINEPREFIX"
  echo "fresh Wine prefix in $WINEPREFIX ($(du -sh "$WINEPREFIX" | cut -f1))"
  ;;

check_dll)
  # elyblock.dll: imports Windows system DLLs only; exports only ely_ names.
  dll=$install/bin/elyblock.dll
  [[ -f $dll && -f $install/lib/libelyblock.dll.a && -f $install/include/elyblock/elyblock.h ]] ||
    fail "install tree incomplete under $install"
  /usr/bin/python3 "$ELY_SOURCE_DIR/tests/windows/check_pe.py" "$ELY_OBJDUMP" "$dll" --exports-prefix ely_ \
    --min-exports 15 --imports KERNEL32.dll msvcrt.dll
  ;;

points)
  linux_program=$1
  mkdir -p "$ELY_WORK_DIR"
  "$linux_program" >"$ELY_WORK_DIR/linux.txt" || fail "Linux program failed"
  (cd "$bin" && run_wine ./points.exe) >"$ELY_WORK_DIR/windows.txt" || fail "points.exe failed under Wine"
  /usr/bin/python3 "$ELY_SOURCE_DIR/tests/windows/compare_points.py" "$ELY_WORK_DIR/linux.txt" "$ELY_WORK_DIR/windows.txt"
  ;;

open_file)
  # A plant file whose folder and name are not ASCII (UTF-8 on Linux, UTF-16 on Windows).
  linux_program=$1
  dir="$ELY_WORK_DIR/Anlagen – Ökostrom 電解"
  rm -rf "$ELY_WORK_DIR"
  mkdir -p "$dir"
  file="$dir/Elektrolyse Ü.json"
  cp "$ELY_SOURCE_DIR/examples/minimal/pem.json" "$file"
  "$linux_program" --open-file "$file" | tee "$ELY_WORK_DIR/linux.txt" || fail "Linux program cannot open $file"
  (cd "$bin" && run_wine ./points.exe --open-file "$(winpath "$file")") | tr -d '\r' | tee "$ELY_WORK_DIR/windows.txt" ||
    fail "points.exe cannot open the non-ASCII path under Wine"
  [[ $(sed 's/.*product.hydrogen //' "$ELY_WORK_DIR/linux.txt") == $(sed 's/.*product.hydrogen //' "$ELY_WORK_DIR/windows.txt") ]] ||
    fail "the hydrogen output differs between Linux and Windows"
  ;;

unload_thread)
  # A thread that hit an error exits after FreeLibrary: must neither hang nor crash.
  (cd "$bin" && timeout 120 "$ELY_WINE" ./points.exe --unload-thread) || fail "points.exe --unload-thread failed or hung"
  ;;

*)
  if [[ -f $ELY_SOURCE_DIR/tests/capeopen/capeopen.sh ]]; then
    source "$ELY_SOURCE_DIR/tests/capeopen/capeopen.sh"
    capeopen_case "$case_name" "$@"
  else
    fail "unknown case $case_name"
  fi
  ;;
esac
