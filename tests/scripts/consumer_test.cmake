# Installs the built tiers into a scratch prefix, then configures, builds and runs
# tests/consumer against it with find_package(tiers).
# Inputs: BUILD_DIR, SOURCE_DIR, WORK_DIR, SANITIZE (may be empty).
include(${CMAKE_CURRENT_LIST_DIR}/install_prefix.cmake)
step(${CMAKE_COMMAND} -S ${SOURCE_DIR}/tests/consumer -B ${WORK_DIR}/build
     -DCMAKE_PREFIX_PATH=${prefix} ${flags})
step(${CMAKE_COMMAND} --build ${WORK_DIR}/build)
step(${WORK_DIR}/build/consumer)
message(STATUS "consumer built against the installed tiers and produced the expected CSV")
