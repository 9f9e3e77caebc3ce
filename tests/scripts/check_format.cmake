# Fails when any C++ file of the project differs from what clang-format makes of it.
# Inputs: SOURCE_DIR, CLANG_FORMAT.
file(GLOB_RECURSE files ${SOURCE_DIR}/libtiers/*.cpp ${SOURCE_DIR}/libtiers/*.hpp
     ${SOURCE_DIR}/tools/*.cpp ${SOURCE_DIR}/tools/*.hpp ${SOURCE_DIR}/tests/*.cpp
     ${SOURCE_DIR}/tests/*.hpp)
execute_process(COMMAND ${CLANG_FORMAT} --dry-run --Werror ${files} RESULT_VARIABLE rc)
if(NOT rc EQUAL 0)
  message(FATAL_ERROR "run: clang-format -i on the files named above")
endif()
list(LENGTH files n)
message(STATUS "${n} files formatted as .clang-format says")
