# Builds the Debian packages with CPack, checks their split (names, SONAME, contents,
# dependencies from dpkg-shlibdeps), extracts them with dpkg-deb -x into a scratch root and runs
# from there the command line on the packaged demo plant, the packaged C consumer example,
# built against the packaged CMake files, and the Python package with Debian's python3.
# Arguments: BUILD_DIR, WORK_DIR, VERSION, C_COMPILER, PYTHON.
file(REMOVE_RECURSE ${WORK_DIR})
set(out ${WORK_DIR}/packages)
set(root ${WORK_DIR}/root)
file(MAKE_DIRECTORY ${out} ${root})

function(run)
  execute_process(COMMAND ${ARGN} RESULT_VARIABLE rc OUTPUT_VARIABLE stdout ERROR_VARIABLE stderr)
  if(NOT rc EQUAL 0)
    message(FATAL_ERROR "failed (${rc}): ${ARGN}\n${stdout}\n${stderr}")
  endif()
  set(stdout "${stdout}" PARENT_SCOPE)
endfunction()

run(cpack -G DEB --config ${BUILD_DIR}/CPackConfig.cmake -B ${out})

set(packages libelyblock1 libelyblock-dev elyblock elyblock-doc python3-elyblock)
foreach(p IN LISTS packages)
  file(GLOB deb ${out}/${p}_${VERSION}_*.deb)
  list(LENGTH deb n)
  if(NOT n EQUAL 1)
    message(FATAL_ERROR "expected one package ${p}_${VERSION}_*.deb in ${out}, found ${n}")
  endif()
  set(deb_${p} ${deb})
  run(dpkg-deb -f ${deb} Package Depends)
  set(control_${p} "${stdout}")
  run(dpkg-deb -c ${deb})
  set(contents_${p} "${stdout}")
  if(NOT contents_${p} MATCHES "usr/share/doc/${p}/copyright")
    message(FATAL_ERROR "${p} has no /usr/share/doc/${p}/copyright")
  endif()
  run(dpkg-deb -x ${deb} ${root})
endforeach()

# Dependencies: system libraries from dpkg-shlibdeps, the library package at the exact version.
if(NOT control_libelyblock1 MATCHES "libc6 \\(>= " OR NOT control_libelyblock1 MATCHES "libstdc\\+\\+6")
  message(FATAL_ERROR "libelyblock1 lacks the dependencies dpkg-shlibdeps finds:\n${control_libelyblock1}")
endif()
foreach(p libelyblock-dev elyblock python3-elyblock)
  if(NOT control_${p} MATCHES "libelyblock1 \\(= ${VERSION}\\)")
    message(FATAL_ERROR "${p} does not depend on libelyblock1 (= ${VERSION}):\n${control_${p}}")
  endif()
endforeach()
if(NOT control_elyblock MATCHES "libc6")
  message(FATAL_ERROR "elyblock lacks the dependencies dpkg-shlibdeps finds:\n${control_elyblock}")
endif()

# The Python package: pure Python (Architecture all), numpy required, nothing but the module.
foreach(d "python3(,|$)" "python3-numpy")
  if(NOT control_python3-elyblock MATCHES "Depends:[^\n]*${d}")
    message(FATAL_ERROR "python3-elyblock does not depend on ${d}:\n${control_python3-elyblock}")
  endif()
endforeach()
get_filename_component(python_deb ${deb_python3-elyblock} NAME)
if(NOT python_deb MATCHES "_all\\.deb$")
  message(FATAL_ERROR "python3-elyblock is not architecture-independent: ${python_deb}")
endif()
foreach(f __init__.py block.py fit.py plots.py _build_info.py)
  if(NOT contents_python3-elyblock MATCHES "usr/lib/python3/dist-packages/elyblock/${f}")
    message(FATAL_ERROR "python3-elyblock lacks usr/lib/python3/dist-packages/elyblock/${f}:\n${contents_python3-elyblock}")
  endif()
endforeach()
if(contents_python3-elyblock MATCHES "\\.so|usr/bin|include/")
  message(FATAL_ERROR "python3-elyblock holds more than the Python module:\n${contents_python3-elyblock}")
endif()

# The split: the runtime package holds only the versioned library, the -dev package the rest.
if(NOT contents_libelyblock1 MATCHES "libelyblock\\.so\\.1 -> " OR contents_libelyblock1 MATCHES "include/|\\.pc|cmake/")
  message(FATAL_ERROR "libelyblock1 contents are not the runtime library alone:\n${contents_libelyblock1}")
endif()
foreach(f "include/elyblock/elyblock.h" "libelyblock\\.so -> libelyblock\\.so\\.1" "cmake/elyblock/elyblockConfig\\.cmake"
          "pkgconfig/elyblock\\.pc")
  if(NOT contents_libelyblock-dev MATCHES "${f}")
    message(FATAL_ERROR "libelyblock-dev lacks ${f}:\n${contents_libelyblock-dev}")
  endif()
endforeach()
if(NOT contents_elyblock MATCHES "usr/bin/elyblock")
  message(FATAL_ERROR "elyblock lacks usr/bin/elyblock")
endif()
foreach(f LICENSE README.md examples/demo-plant.json examples/c-consumer/consumer.c docs/config.md)
  if(NOT contents_elyblock-doc MATCHES "usr/share/doc/elyblock/${f}")
    message(FATAL_ERROR "elyblock-doc lacks usr/share/doc/elyblock/${f}")
  endif()
endforeach()

# The package is named after the SONAME (Debian Policy 8.1).
file(GLOB lib ${root}/usr/lib*/libelyblock.so.1 ${root}/usr/lib/*/libelyblock.so.1)
run(objdump -p ${lib})
if(NOT stdout MATCHES "SONAME +libelyblock\\.so\\.1")
  message(FATAL_ERROR "${lib}: SONAME is not libelyblock.so.1")
endif()

# The command line from the scratch root, with the library of the scratch root.
set(doc ${root}/usr/share/doc/elyblock)
run(ldd ${root}/usr/bin/elyblock)
if(NOT stdout MATCHES "libelyblock\\.so\\.1 => ${root}/")
  message(FATAL_ERROR "the extracted command line does not load the extracted library:\n${stdout}")
endif()
run(${root}/usr/bin/elyblock solve ${doc}/examples/demo-plant.json --format json)
set(stdout_cli_json "${stdout}")
if(NOT stdout MATCHES "\"cell.voltage\"")
  message(FATAL_ERROR "the extracted command line printed no cell voltage:\n${stdout}")
endif()
if(NOT stdout MATCHES "\"name\":\"Orvenne Terrace hydrogen plant \\(invented demo scenario")
  message(FATAL_ERROR "the packaged demo plant is not the invented Orvenne Terrace scenario:\n${stdout}")
endif()

# The consumer example shipped in elyblock-doc, built against the extracted -dev package.
run(${CMAKE_COMMAND} -S ${doc}/examples/c-consumer -B ${WORK_DIR}/consumer -DCMAKE_PREFIX_PATH=${root}/usr
    -DCMAKE_C_COMPILER=${C_COMPILER})
run(${CMAKE_COMMAND} --build ${WORK_DIR}/consumer)
run(${WORK_DIR}/consumer/elyblock_consumer ${doc}/examples/demo-plant.json)

# The Python package from the scratch root (its code in lines: run() would split it at a ';'):
# Debian's python3 imports it with nothing set but the
# module path (no ELYBLOCK_LIBRARY, no LD_LIBRARY_PATH), loads the extracted library by the path
# relative to the package, and solves the packaged demo plant to the command line's voltage.
string(REGEX MATCH "\"cell.voltage\":{\"value\":([^,}]+)" voltage_json "${stdout_cli_json}")
set(cli_voltage "${CMAKE_MATCH_1}")
run(${CMAKE_COMMAND} -E env --unset=ELYBLOCK_LIBRARY --unset=LD_LIBRARY_PATH
    PYTHONPATH=${root}/usr/lib/python3/dist-packages PYTHONDONTWRITEBYTECODE=1
    ${PYTHON} -c "import elyblock, sys\nprint(elyblock.library_path)\nprint(elyblock.__version__)\nb = elyblock.Block(sys.argv[1])\nb.solve()\nprint(repr(b['cell.voltage']))"
    ${doc}/examples/demo-plant.json)
string(REPLACE "\n" ";" python_lines "${stdout}")
list(GET python_lines 0 python_library)
list(GET python_lines 1 python_version)
list(GET python_lines 2 python_voltage)
file(REAL_PATH ${python_library} python_library)
file(REAL_PATH ${lib} packaged_library)
if(NOT python_library STREQUAL packaged_library)
  message(FATAL_ERROR "the extracted Python package loaded ${python_library}, not the extracted ${packaged_library}")
endif()
if(NOT python_version STREQUAL VERSION)
  message(FATAL_ERROR "the extracted Python package says version ${python_version}, not ${VERSION}")
endif()
if(cli_voltage STREQUAL "" OR NOT python_voltage STREQUAL cli_voltage)
  message(FATAL_ERROR "Python gives cell.voltage ${python_voltage}, the command line '${cli_voltage}'")
endif()
message(STATUS "packages: ${packages}; command line, consumer and Python package ran from ${root}")
