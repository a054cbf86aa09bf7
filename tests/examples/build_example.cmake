# Installs upright from BUILD_DIR into PREFIX, then configures and builds the example module in
# SOURCE out of tree into EXAMPLE_BUILD, as a user would: find_package(upright) and nothing else.
foreach(var BUILD_DIR PREFIX SOURCE EXAMPLE_BUILD)
  if(NOT DEFINED ${var})
    message(FATAL_ERROR "build_example.cmake needs -D${var}=...")
  endif()
endforeach()

function(run what)
  execute_process(COMMAND ${ARGN} RESULT_VARIABLE result OUTPUT_VARIABLE out ERROR_VARIABLE out)
  if(result)
    message(FATAL_ERROR "${what} failed (${result}):\n${out}")
  endif()
  message(STATUS "${what}: ok")
endfunction()

file(REMOVE_RECURSE ${PREFIX} ${EXAMPLE_BUILD})
run("install upright into ${PREFIX}" ${CMAKE_COMMAND} --install ${BUILD_DIR} --prefix ${PREFIX})
run("configure the example against it" ${CMAKE_COMMAND} -S ${SOURCE} -B ${EXAMPLE_BUILD}
    -DCMAKE_PREFIX_PATH=${PREFIX} -DCMAKE_BUILD_TYPE=Release)
run("build the example" ${CMAKE_COMMAND} --build ${EXAMPLE_BUILD})
