# Builds the example module with the README's CMake snippet for out-of-tree modules, word for word
# but for the source file, against the upright installed in PREFIX, and links it with
# --no-undefined: the snippet must link everything a module needs (the example calls libm).
include(${CMAKE_CURRENT_LIST_DIR}/../script_steps.cmake)
require_vars(readme_snippet.cmake README SOURCE PREFIX SNIPPET_BUILD)

file(READ ${README} readme)
string(FIND "${readme}" "```cmake\nfind_package(upright" start)
if(start EQUAL -1)
  message(FATAL_ERROR "${README}: no ```cmake block starting with find_package(upright")
endif()
math(EXPR start "${start} + 9")
string(SUBSTRING "${readme}" ${start} -1 snippet)
string(FIND "${snippet}" "```" end)
string(SUBSTRING "${snippet}" 0 ${end} snippet)
string(REPLACE "my_controller.c" "${SOURCE}/gain_scheduled_pd.c" snippet "${snippet}")

file(REMOVE_RECURSE ${SNIPPET_BUILD})
file(WRITE ${SNIPPET_BUILD}/src/CMakeLists.txt
     "cmake_minimum_required(VERSION 3.25)\nproject(readme_snippet LANGUAGES C)\n${snippet}")
run("configure the README's snippet" ${CMAKE_COMMAND} -S ${SNIPPET_BUILD}/src
    -B ${SNIPPET_BUILD}/build -DCMAKE_PREFIX_PATH=${PREFIX} -DCMAKE_BUILD_TYPE=Release
    -DCMAKE_MODULE_LINKER_FLAGS=-Wl,--no-undefined)
run("build the example with it, no symbol left undefined" ${CMAKE_COMMAND}
    --build ${SNIPPET_BUILD}/build)
