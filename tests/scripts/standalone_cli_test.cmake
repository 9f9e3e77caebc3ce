# Installs the built tiers into a scratch prefix, checks that no private header is installed,
# builds tools/tiers against the prefix alone (tests/standalone-cli) and checks that the
# program so built converts a sample byte for byte as the one built in the tree does.
# Inputs: BUILD_DIR, SOURCE_DIR, WORK_DIR, SANITIZE (may be empty).
include(${CMAKE_CURRENT_LIST_DIR}/install_prefix.cmake)
file(GLOB_RECURSE private RELATIVE ${prefix} ${prefix}/include/tiers/detail/*)
if(private)
  message(FATAL_ERROR "private headers are installed: ${private}")
endif()
step(${CMAKE_COMMAND} -S ${SOURCE_DIR}/tests/standalone-cli -B ${WORK_DIR}/build
     -DCMAKE_PREFIX_PATH=${prefix} -DTIERS_SOURCE_DIR=${SOURCE_DIR} ${flags})
step(${CMAKE_COMMAND} --build ${WORK_DIR}/build)
set(sample ${SOURCE_DIR}/samples/panel-discussion.vtt)
step(${WORK_DIR}/build/tiers/tiers convert ${sample} --to json -o ${WORK_DIR}/standalone.json)
step(${BUILD_DIR}/tools/tiers/tiers convert ${sample} --to json -o ${WORK_DIR}/in-tree.json)
file(READ ${WORK_DIR}/standalone.json standalone)
file(READ ${WORK_DIR}/in-tree.json in_tree)
if(NOT standalone STREQUAL in_tree)
  message(FATAL_ERROR "the program built against the package converts differently")
endif()
message(STATUS "tools/tiers built against the installed package alone, and converts alike")
