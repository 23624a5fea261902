# Fails when a CTest name carries a pointer or byte dump ("GetParam() = (0x55f8…", "4-byte
# object <00-00…>") instead of a readable parameter name.
execute_process(COMMAND ${CTEST} --test-dir ${BUILD_DIR} -N RESULT_VARIABLE rc OUTPUT_VARIABLE out ERROR_VARIABLE err)
if(NOT rc EQUAL 0)
  message(FATAL_ERROR "ctest -N failed: ${err}")
endif()
string(REGEX MATCHALL "Test +#[0-9]+: [^\n]*(GetParam|0x[0-9a-f]|-byte object|TypeParam)[^\n]*" bad "${out}")
if(bad)
  string(REPLACE ";" "\n" bad "${bad}")
  message(FATAL_ERROR "test names with pointer or byte dumps:\n${bad}")
endif()
message(STATUS "every test name is readable")
