# Installs upright from BUILD_DIR into PREFIX and runs the installed program from WORK, a folder
# outside both trees: `upright demo` must read the scenarios and models installed under
# PREFIX/share/upright, and load the built-in modules installed under PREFIX's module folder.
include(${CMAKE_CURRENT_LIST_DIR}/../script_steps.cmake)
require_vars(installed_demo.cmake BUILD_DIR PREFIX WORK)
set(RUN_IN ${WORK})

function(expect_under path folder what)
  file(REAL_PATH "${path}" real)
  cmake_path(IS_PREFIX folder "${real}" NORMALIZE under)
  if(NOT under)
    message(FATAL_ERROR "${what} is ${path}, not under ${folder}")
  endif()
endfunction()

file(REMOVE_RECURSE ${PREFIX} ${WORK})
file(MAKE_DIRECTORY ${WORK})
file(REAL_PATH ${WORK} WORK)
run("install upright into ${PREFIX}" ${CMAKE_COMMAND} --install ${BUILD_DIR} --prefix ${PREFIX})
file(REAL_PATH ${PREFIX} PREFIX)

# The layout: data under share/upright, documentation under share/doc/upright with its own links.
set(data ${PREFIX}/share/upright)
foreach(file ${data}/models/courier.xml ${data}/models/tabletop.xml
             ${data}/scenarios/courier-shove-half-sine.xml
             ${PREFIX}/share/doc/upright/README.md ${PREFIX}/share/doc/upright/DEVELOPERS.md
             ${PREFIX}/share/doc/upright/models/README.md
             ${PREFIX}/share/doc/upright/scenarios/README.md)
  if(NOT EXISTS ${file})
    message(FATAL_ERROR "not installed: ${file}")
  endif()
endforeach()
file(GLOB installed_scenarios ${data}/scenarios/*.xml)
list(LENGTH installed_scenarios scenario_count)

# The program alone, away from its data, says where it looked for the demo and runs nothing.
file(COPY ${PREFIX}/bin/upright DESTINATION ${WORK}/alone/bin)
execute_process(COMMAND ${WORK}/alone/bin/upright demo --seeds 1 --out alone-demo
                WORKING_DIRECTORY ${WORK} RESULT_VARIABLE result OUTPUT_VARIABLE out
                ERROR_VARIABLE out)
set(expected "no demo scenarios in ${WORK}/alone/share/upright/scenarios (No such file or directory)")
string(FIND "${out}" "${expected}" at)
if(NOT result EQUAL 2 OR at EQUAL -1 OR EXISTS ${WORK}/alone-demo)
  message(FATAL_ERROR "the program away from its data exited ${result}, expected 2 and\n"
                      "${expected}\nbut said:\n${out}")
endif()

# The demo, one seed. Every scenario it ran, and the robot each names, is an installed file.
run("installed upright demo" ${PREFIX}/bin/upright demo --seeds 1 --trace-rate 0 --out demo)
file(READ ${WORK}/demo/manifest.json manifest)
string(JSON ran LENGTH "${manifest}" scenarios)
if(NOT ran EQUAL scenario_count)
  message(FATAL_ERROR "the demo ran ${ran} scenarios; ${scenario_count} are installed")
endif()
math(EXPR last "${ran} - 1")
foreach(i RANGE ${last})
  string(JSON path GET "${manifest}" scenarios ${i} path)
  string(JSON model GET "${manifest}" scenarios ${i} model_path)
  expect_under("${path}" ${data}/scenarios "scenario ${i}")
  expect_under("${model}" ${data}/models "the robot of scenario ${i}")
endforeach()
foreach(part envelope sweep)
  file(READ ${WORK}/demo/${part}/manifest.json manifest)
  string(JSON path GET "${manifest}" scenario path)
  expect_under("${path}" ${data}/scenarios "the ${part}'s scenario")
endforeach()

# The built-in modules come from the installed module folder: the dynamic loader's own account
# (glibc's LD_DEBUG=files) of every object the program opens.
run("installed upright run, with the loader's account"
    ${CMAKE_COMMAND} -E env LD_DEBUG=files ${PREFIX}/bin/upright run
    ${data}/scenarios/tabletop-finger-tap.xml --seeds 1 --trace-rate 0 --out run)
foreach(name lqr hinf lqg pid)
  string(REGEX MATCH "file=[^ \n]*upright_${name}\\.so" opened "${output}")
  if(NOT opened)
    message(FATAL_ERROR "upright_${name}.so was never opened:\n${output}")
  endif()
  string(REPLACE "file=" "" opened "${opened}")
  expect_under("${opened}" ${PREFIX} "module ${name}")
endforeach()
