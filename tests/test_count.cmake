# Fails when the build tree registers fewer tests than README.md states, so a suite dropped from the
# build (a file renamed, an include lost) cannot leave the run green. README.md states the count in
# one sentence, "The suite registers N tests"; raise N there when tests are added.
#
# CTest itself counts: `ctest -N` is run from a scratch folder whose CTestTestfile.cmake points at
# the build tree, so its log lands in the scratch folder and not in the log of the run in progress.
cmake_minimum_required(VERSION 3.25)
include(${CMAKE_CURRENT_LIST_DIR}/script_steps.cmake)
require_vars(test_count.cmake CTEST BUILD_DIR README SCRATCH)

# The stated count: exactly one sentence, words separated by any white space (it may wrap).
file(READ "${README}" readme)
set(ws "[ \t\r\n]+")
set(sentence "The suite registers${ws}([0-9]+)${ws}tests")
string(REGEX MATCHALL "${sentence}" sentences "${readme}")
list(LENGTH sentences found)
if(NOT found EQUAL 1)
  message(FATAL_ERROR "${README} must state the test count in exactly one sentence "
                      "\"The suite registers N tests\" (found ${found})")
endif()
string(REGEX MATCH "${sentence}" unused "${readme}")
set(stated "${CMAKE_MATCH_1}")
if(stated LESS 1)
  message(FATAL_ERROR "${README} states ${stated} tests; the count must be at least 1")
endif()

# The registered count, as CTest reports it.
file(MAKE_DIRECTORY "${SCRATCH}")
file(WRITE "${SCRATCH}/CTestTestfile.cmake" "subdirs(\"${BUILD_DIR}\")\n")
set(RUN_IN "${SCRATCH}")
run("ctest -N" "${CTEST}" -N)
if(NOT output MATCHES "Total Tests: ([0-9]+)")
  message(FATAL_ERROR "ctest -N printed no \"Total Tests: N\" line:\n${output}")
endif()
set(registered "${CMAKE_MATCH_1}")

if(registered LESS stated)
  message(FATAL_ERROR "${registered} tests are registered, fewer than the ${stated} that "
                      "${README} states: a suite is missing from the build")
endif()
message(STATUS "${registered} tests registered; ${README} states ${stated}")
