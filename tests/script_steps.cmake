# What the test scripts run with `cmake -P` share: the -D variables a script needs, and a step that
# runs a command and ends the test with the command's output when it fails.

# Stops with "<script> needs -D<var>=..." for the first of the named variables not defined.
function(require_vars script)
  foreach(var ${ARGN})
    if(NOT DEFINED ${var})
      message(FATAL_ERROR "${script} needs -D${var}=...")
    endif()
  endforeach()
endfunction()

# Runs the command after `what` (in RUN_IN when the script sets it), fails with its output, and
# leaves that output in `output` for the caller.
function(run what)
  set(where)
  if(DEFINED RUN_IN)
    set(where WORKING_DIRECTORY ${RUN_IN})
  endif()
  execute_process(COMMAND ${ARGN} ${where} RESULT_VARIABLE result OUTPUT_VARIABLE out
                  ERROR_VARIABLE out)
  if(result)
    message(FATAL_ERROR "${what} failed (${result}):\n${out}")
  endif()
  message(STATUS "${what}: ok")
  set(output "${out}" PARENT_SCOPE)
endfunction()
