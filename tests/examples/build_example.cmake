# Installs upright from BUILD_DIR into PREFIX, then configures and builds the example module in
# SOURCE out of tree into EXAMPLE_BUILD, as a user would: find_package(upright) and nothing else.
include(${CMAKE_CURRENT_LIST_DIR}/../script_steps.cmake)
require_vars(build_example.cmake BUILD_DIR PREFIX SOURCE EXAMPLE_BUILD)

file(REMOVE_RECURSE ${PREFIX} ${EXAMPLE_BUILD})
run("install upright into ${PREFIX}" ${CMAKE_COMMAND} --install ${BUILD_DIR} --prefix ${PREFIX})
run("configure the example against it" ${CMAKE_COMMAND} -S ${SOURCE} -B ${EXAMPLE_BUILD}
    -DCMAKE_PREFIX_PATH=${PREFIX} -DCMAKE_BUILD_TYPE=Release)
run("build the example" ${CMAKE_COMMAND} --build ${EXAMPLE_BUILD})
