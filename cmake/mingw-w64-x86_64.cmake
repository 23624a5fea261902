# Cross toolchain: 64-bit Windows DLLs and programs from Debian 12's mingw-w64 (package
# g++-mingw-w64-x86-64-posix: GCC 12 with POSIX threads, so std::thread and thread_local work).
# Used by scripts/windows: cmake -DCMAKE_TOOLCHAIN_FILE=cmake/mingw-w64-x86_64.cmake ...
set(CMAKE_SYSTEM_NAME Windows)
set(CMAKE_SYSTEM_PROCESSOR x86_64)
set(ELY_MINGW_TRIPLET x86_64-w64-mingw32)

set(CMAKE_C_COMPILER ${ELY_MINGW_TRIPLET}-gcc-posix)
set(CMAKE_CXX_COMPILER ${ELY_MINGW_TRIPLET}-g++-posix)
set(CMAKE_RC_COMPILER ${ELY_MINGW_TRIPLET}-windres)
set(CMAKE_OBJDUMP ${ELY_MINGW_TRIPLET}-objdump)

# Libraries and headers come from the mingw sysroot only: the host's /usr/include would put
# glibc headers ahead of mingw's. Header-only Boost and fmt are brought in by cmake/windows.cmake.
set(CMAKE_FIND_ROOT_PATH /usr/${ELY_MINGW_TRIPLET})
set(CMAKE_FIND_ROOT_PATH_MODE_PROGRAM NEVER)
set(CMAKE_FIND_ROOT_PATH_MODE_LIBRARY ONLY)
set(CMAKE_FIND_ROOT_PATH_MODE_INCLUDE ONLY)
set(CMAKE_FIND_ROOT_PATH_MODE_PACKAGE ONLY)
