# Monte Carlo sweeps: <dispersions> in scenario files (every rule with its path:line message),
# sampling that depends only on the seed and the sample index, and small sweeps end to end, through
# the library and through `upright sweep`.
upright_test(upright_runner_sweep_test
  SOURCES scenario_dispersions_test.cpp sweep_sampling_test.cpp
          sweep_run_test.cpp sweep_cli_test.cpp
  LIBS upright::runner)
target_compile_definitions(upright_runner_sweep_test PRIVATE UPRIGHT_EXE="$<TARGET_FILE:upright>")
# The runs load the built-in modules from the build tree; the CLI cases run the program.
add_dependencies(upright_runner_sweep_test upright upright_lqr upright_hinf upright_lqg upright_pid)
