# Shared by the tests that use an installed tiers (consumer_test.cmake, standalone_cli_test.cmake):
# `step` runs a command and fails the test with it; the build is installed into
# ${WORK_DIR}/prefix (`prefix`), and `flags` carries the sanitizers a sanitized build needs.
# Inputs: BUILD_DIR, WORK_DIR, SANITIZE (may be empty).
file(REMOVE_RECURSE ${WORK_DIR})
function(step)
  execute_process(COMMAND ${ARGV} RESULT_VARIABLE rc)
  if(NOT rc EQUAL 0)
    message(FATAL_ERROR "failed (${rc}): ${ARGV}")
  endif()
endfunction()
set(prefix ${WORK_DIR}/prefix)
step(${CMAKE_COMMAND} --install ${BUILD_DIR} --prefix ${prefix})
set(flags "")
if(SANITIZE)
  set(flags -DCMAKE_CXX_FLAGS=-fsanitize=${SANITIZE} -DCMAKE_EXE_LINKER_FLAGS=-fsanitize=${SANITIZE})
endif()
