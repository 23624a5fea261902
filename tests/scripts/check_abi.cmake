# Compares the built library's ABI with the committed baseline (abi/elyblock.abi, made by
# scripts/abi-baseline with abidw from abigail-tools on a -g build). Additions pass;
# an incompatible change (removed or changed function, changed struct layout) fails.
execute_process(COMMAND abidiff --no-added-syms --headers-dir2 ${HEADERS} ${BASELINE} ${LIBRARY}
                RESULT_VARIABLE rc OUTPUT_VARIABLE out ERROR_VARIABLE err)
message(STATUS "${out}${err}")
# abidiff exit status is a bit field: 1 error, 2 usage error, 4 ABI change, 8 incompatible change.
if(rc GREATER_EQUAL 8)
  message(FATAL_ERROR "incompatible ABI change against ${BASELINE}; if intended, bump the SOVERSION and ELY_ABI_VERSION and refresh the baseline with scripts/abi-baseline")
endif()
math(EXPR errbits "${rc} % 4")
if(NOT errbits EQUAL 0)
  message(FATAL_ERROR "abidiff failed (${rc})")
endif()
