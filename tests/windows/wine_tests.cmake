# Registration of the tests that run Windows programs under Wine (tests/windows, tests/capeopen).
#
# They need the mingw-w64 cross compiler, widl (mingw-w64-tools) and Wine (wine64), which
# scripts/install-deps installs. When one is missing, each test prints "skipped: <why>" and
# CTest reports it as skipped (return code 77), never as passed.
#
# Fixtures: windows.build runs scripts/windows into <build>/windows (incremental: a few seconds
# when nothing changed, about 2 minutes from scratch on 2 cores); wine.prefix makes a fresh
# Wine prefix in <build>/wine (about 8 s). The tests share the prefix, so they hold the
# resource lock "wine" and run one at a time; each ends with wineserver -k.
find_program(ELY_MINGW_CXX x86_64-w64-mingw32-g++-posix)
find_program(ELY_WIDL x86_64-w64-mingw32-widl)
find_program(ELY_WINE NAMES wine64 wine PATHS /usr/lib/wine)
find_program(ELY_WINESERVER NAMES wineserver PATHS /usr/lib/wine)
find_program(ELY_MINGW_OBJDUMP x86_64-w64-mingw32-objdump)
set(ELY_WINE_MISSING "")
foreach(tool ELY_MINGW_CXX ELY_WIDL ELY_WINE ELY_WINESERVER ELY_MINGW_OBJDUMP)
  if(NOT ${tool})
    list(APPEND ELY_WINE_MISSING ${tool})
  endif()
endforeach()
string(REPLACE ";" ", " ELY_WINE_MISSING "${ELY_WINE_MISSING}")
string(REPLACE "ELY_MINGW_CXX" "x86_64-w64-mingw32-g++-posix (g++-mingw-w64-x86-64-posix)" ELY_WINE_MISSING "${ELY_WINE_MISSING}")
string(REPLACE "ELY_WIDL" "x86_64-w64-mingw32-widl (mingw-w64-tools)" ELY_WINE_MISSING "${ELY_WINE_MISSING}")
string(REPLACE "ELY_WINESERVER" "wineserver (wine64)" ELY_WINE_MISSING "${ELY_WINE_MISSING}")
string(REPLACE "ELY_WINE" "wine64 (wine64)" ELY_WINE_MISSING "${ELY_WINE_MISSING}")
string(REPLACE "ELY_MINGW_OBJDUMP" "x86_64-w64-mingw32-objdump (binutils-mingw-w64-x86-64)" ELY_WINE_MISSING "${ELY_WINE_MISSING}")
# Sanitizer and fuzzing builds leave the Windows side to the plain build (it would only repeat
# the same cross build): their Wine tests say so and count as skipped.
set(ELY_WINE_SKIP_REASON "")
if(NOT ELY_SANITIZE STREQUAL "" OR ELY_FUZZ)
  set(ELY_WINE_SKIP_REASON "this is a sanitizer or fuzzing build; the Windows tests run in the plain build (scripts/test)")
elseif(NOT ELY_WINE_MISSING STREQUAL "")
  set(ELY_WINE_SKIP_REASON "${ELY_WINE_MISSING} not found; scripts/install-deps installs them")
endif()

set(ELY_WINDOWS_BUILD ${PROJECT_BINARY_DIR}/windows)
set(ELY_WINE_PREFIX ${PROJECT_BINARY_DIR}/wine)
set(ELY_WINE_SCRIPT ${PROJECT_SOURCE_DIR}/tests/windows/wine.sh)

get_property(ely_wine_fixtures GLOBAL PROPERTY ELY_WINE_FIXTURES)
if(ELY_WINE_SKIP_REASON STREQUAL "" AND NOT ely_wine_fixtures)
  set_property(GLOBAL PROPERTY ELY_WINE_FIXTURES TRUE)
  add_test(NAME windows.build
    COMMAND env ELY_NO_INSTALL=1 ${PROJECT_SOURCE_DIR}/scripts/windows ${ELY_WINDOWS_BUILD})
  set_tests_properties(windows.build PROPERTIES FIXTURES_SETUP ely_windows_build TIMEOUT 1800)
  add_test(NAME wine.prefix COMMAND bash ${ELY_WINE_SCRIPT} fresh_prefix)
  set_tests_properties(wine.prefix PROPERTIES FIXTURES_SETUP ely_wine_prefix RESOURCE_LOCK wine TIMEOUT 300
    ENVIRONMENT "ELY_WINE=${ELY_WINE};ELY_WINESERVER=${ELY_WINESERVER};WINEPREFIX=${ELY_WINE_PREFIX}")
endif()

# ely_wine_test(<name> <case> [args...]): runs `wine.sh <case> args...` with the cross build and
# the prefix ready, or reports the test as skipped naming the missing tools.
function(ely_wine_test name case)
  ely_wine_script_test(${name} ${ELY_WINE_SCRIPT} ${case} ${ARGN})
endfunction()

# ely_wine_script_test(<name> <script> [args...]): the same for a bash script of another folder
# (tests/fmi/wine_fmu.sh), with the same environment.
function(ely_wine_script_test name script)
  if(ELY_WINE_SKIP_REASON STREQUAL "")
    add_test(NAME ${name} COMMAND bash ${script} ${ARGN})
    set_tests_properties(${name} PROPERTIES
      FIXTURES_REQUIRED "ely_windows_build;ely_wine_prefix" RESOURCE_LOCK wine TIMEOUT 600 SKIP_RETURN_CODE 77
      ENVIRONMENT "ELY_WINE=${ELY_WINE};ELY_WINESERVER=${ELY_WINESERVER};WINEPREFIX=${ELY_WINE_PREFIX};ELY_WINDOWS_BUILD=${ELY_WINDOWS_BUILD};ELY_SOURCE_DIR=${PROJECT_SOURCE_DIR};ELY_OBJDUMP=${ELY_MINGW_OBJDUMP};ELY_WORK_DIR=${CMAKE_CURRENT_BINARY_DIR}/${name}")
  else()
    add_test(NAME ${name} COMMAND sh -c "echo 'skipped: ${ELY_WINE_SKIP_REASON}'; exit 77")
    set_tests_properties(${name} PROPERTIES SKIP_RETURN_CODE 77)
  endif()
endfunction()
