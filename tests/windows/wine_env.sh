# Sourced by the scripts that run Windows programs under Wine (tests/windows/wine.sh,
# tests/spreadsheet/vba.sh, tests/fmi/wine_fmu.sh). Environment from CTest: ELY_WINE, ELY_WINESERVER,
# WINEPREFIX. Headless: no DISPLAY, WINEDEBUG=-all, no Mono/Gecko installers; wineserver -k when
# the calling script exits.
unset DISPLAY WAYLAND_DISPLAY
export HOME=${HOME:-$(dirname "$WINEPREFIX")}  # Wine wants a home even where CI gives none
export WINEDEBUG=-all WINEDLLOVERRIDES="mscoree=;mshtml=" LANG=C.UTF-8 LC_ALL=C.UTF-8
trap '"$ELY_WINESERVER" -k >/dev/null 2>&1 || true' EXIT

fail() { echo "FAILED: $*" >&2; exit 1; }
# Unix path -> the Windows path of Wine's Z: drive (the whole Unix file system).
winpath() { local p; p=$(realpath -m "$1"); echo "Z:${p//\//\\}"; }
