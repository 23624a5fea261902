# Settings of the Windows cross build (scripts/windows; toolchain cmake/mingw-w64-x86_64.cmake).
# Included by the top-level CMakeLists.txt in place of find_package(Boost), (fmt) and (Eigen3).
#
# - Boost.JSON and fmt are used header-only: an include folder in the build tree holds only
#   boost/ and fmt/ (symlinks to the host's headers), so glibc's headers never come first.
# - Everything links statically against libstdc++, libgcc and winpthread: elyblock.dll and
#   the programs import Windows system DLLs only.
# - DLL names without the "lib" prefix, import libraries with it: elyblock.dll, libelyblock.dll.a.
set(ELY_WINDOWS_HEADERS ${PROJECT_BINARY_DIR}/host-headers)
foreach(dir boost fmt xsimd)
  if(NOT EXISTS /usr/include/${dir})
    message(FATAL_ERROR "/usr/include/${dir} is missing: install libboost-json1.81-dev, libfmt-dev and libxsimd-dev")
  endif()
  file(MAKE_DIRECTORY ${ELY_WINDOWS_HEADERS})
  file(CREATE_LINK /usr/include/${dir} ${ELY_WINDOWS_HEADERS}/${dir} SYMBOLIC)
endforeach()

# Eigen (libeigen3-dev) is header-only too: its two folders beside them.
foreach(dir Eigen unsupported)
  if(NOT EXISTS /usr/include/eigen3/${dir})
    message(FATAL_ERROR "/usr/include/eigen3/${dir} is missing: install libeigen3-dev")
  endif()
  file(CREATE_LINK /usr/include/eigen3/${dir} ${ELY_WINDOWS_HEADERS}/${dir} SYMBOLIC)
endforeach()

add_library(ely_host_headers INTERFACE)
target_include_directories(ely_host_headers SYSTEM INTERFACE ${ELY_WINDOWS_HEADERS})
add_library(Boost::headers ALIAS ely_host_headers)
add_library(ely_fmt_header_only INTERFACE)
target_link_libraries(ely_fmt_header_only INTERFACE ely_host_headers)
target_compile_definitions(ely_fmt_header_only INTERFACE FMT_HEADER_ONLY=1)
add_library(fmt::fmt ALIAS ely_fmt_header_only)
add_library(Eigen3::Eigen ALIAS ely_host_headers)

set(CMAKE_SHARED_LIBRARY_PREFIX "")
set(CMAKE_IMPORT_LIBRARY_PREFIX "lib")
add_link_options(-static -static-libgcc -static-libstdc++)
# Windows 7 and later (GetProcAddress/LoadLibraryW, wide file names).
add_compile_definitions(_WIN32_WINNT=0x0601 UNICODE _UNICODE)
set(CMAKE_RUNTIME_OUTPUT_DIRECTORY ${PROJECT_BINARY_DIR}/bin)  # DLLs beside the programs that load them
