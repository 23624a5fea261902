# Cases of tests/windows/wine.sh for the CAPE-OPEN unit (sourced; see tests/capeopen/CMakeLists.txt).
clsid='{9400B848-666C-4992-A0E1-24A915B30930}'
dll_unix() { echo "$install/bin/elyblock-capeopen.dll"; }
# Keys under Software\Classes in the prefix's machine registry (timestamps dropped).
class_keys() { grep -a '^\[Software\\\\Classes\\\\' "$WINEPREFIX/system.reg" | sed 's/\] [0-9]*$/]/' | sort; }

capeopen_case() {
  case $1 in
  capeopen_dll)
    /usr/bin/python3 "$ELY_SOURCE_DIR/tests/windows/check_pe.py" "$ELY_OBJDUMP" "$(dll_unix)" \
      --exports DllCanUnloadNow DllGetClassObject DllRegisterServer DllUnregisterServer --min-exports 4 \
      --imports elyblock.dll KERNEL32.dll msvcrt.dll ADVAPI32.dll ole32.dll OLEAUT32.dll
    [[ -f $install/bin/elyblock-capeopen.tlb ]] || fail "no type library installed"
    ;;
  capeopen_register)
    mkdir -p "$(dirname "$ELY_WORK_DIR")"
    "$ELY_WINESERVER" -k >/dev/null 2>&1 || true
    class_keys >"$(dirname "$ELY_WORK_DIR")/classes-before.txt"
    grep -aqi "$clsid" "$WINEPREFIX/system.reg" && fail "the prefix is not fresh: $clsid is registered already"
    run_wine regsvr32 /s "$(winpath "$(dll_unix)")" || fail "regsvr32 failed"
    "$ELY_WINESERVER" -k >/dev/null 2>&1 || true
    "$ELY_WINESERVER" -w >/dev/null 2>&1 || true
    for key in "CLSID\\$clsid\\InprocServer32" "CLSID\\$clsid\\CapeDescription" \
               "CLSID\\$clsid\\Implemented Categories\\{678C09A1-7D66-11D2-A67D-00105A42887F}" \
               "CLSID\\$clsid\\Implemented Categories\\{678C09A5-7D66-11D2-A67D-00105A42887F}" \
               "elyblock.Electrolyzer\\CLSID" "elyblock.Electrolyzer.1\\CLSID"; do
      # system.reg doubles the backslashes of key names
      line=$(printf '[Software\\Classes\\%s]' "$key" | sed 's/\\/\\\\/g')
      grep -aqiF "$line" "$WINEPREFIX/system.reg" || fail "registry key $key missing after regsvr32"
    done
    grep -aq '"CapeVersion"="1.1"' "$WINEPREFIX/system.reg" || fail "CapeDescription\\CapeVersion missing"
    echo "registered $clsid (elyblock.Electrolyzer) with its CAPE-OPEN categories and description"
    ;;
  capeopen_client)
    (cd "$bin" && run_wine ./capeopen_client.exe "$(winpath "$install/bin/elyblock-capeopen.tlb")") | tr -d '\r' |
      tee "$ELY_WORK_DIR.log"
    [[ ${PIPESTATUS[0]} -eq 0 ]] || fail "the CAPE-OPEN client reported failures"
    ;;
  capeopen_unregister)
    run_wine regsvr32 /u /s "$(winpath "$(dll_unix)")" || fail "regsvr32 /u failed"
    "$ELY_WINESERVER" -k >/dev/null 2>&1 || true
    "$ELY_WINESERVER" -w >/dev/null 2>&1 || true
    if grep -aqi "$clsid\|elyblock" "$WINEPREFIX/system.reg" "$WINEPREFIX/user.reg"; then
      grep -ai "$clsid\|elyblock" "$WINEPREFIX/system.reg" "$WINEPREFIX/user.reg" | head >&2
      fail "registry entries left after unregistering"
    fi
    class_keys | diff "$(dirname "$ELY_WORK_DIR")/classes-before.txt" - || fail "Software\\Classes differs from before registration"
    echo "unregistered: no key of the unit is left, Software\\Classes is as before"
    ;;
  *) fail "unknown case $1" ;;
  esac
}
