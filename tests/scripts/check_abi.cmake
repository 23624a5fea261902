# Compares the built library's ABI with the committed baseline (abi/elyblock.abi, made by
# scripts/abi-baseline with abidw from abigail-tools on a -g build). New functions pass;
# a removed or changed function, or a changed public struct, fails. A deliberate, compatible
# change (a struct grown at its end) is accepted by refreshing the baseline in the same commit.
execute_process(COMMAND abidiff --exported-interfaces-only --no-added-syms --headers-dir2 ${HEADERS} ${BASELINE} ${LIBRARY}
                RESULT_VARIABLE rc OUTPUT_VARIABLE out ERROR_VARIABLE err)
# abidiff's exit status is a bit field: 1 error, 2 usage error, 4 ABI change, 8 incompatible change.
if(NOT rc EQUAL 0)
  message(FATAL_ERROR "${out}${err}\nABI differs from ${BASELINE} (abidiff status ${rc}). An incompatible change needs a "
                      "new ELY_ABI_VERSION and SOVERSION; a compatible one (struct grown at its end) needs "
                      "scripts/abi-baseline and a review of the diff.")
endif()
message(STATUS "ABI matches the baseline (new functions allowed)")
