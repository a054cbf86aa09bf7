# Runs end to end: the timeline's event timing, one run's statuses and trace, what its module
# logged, ParallelFor, and a batch whose tables do not depend on the number of jobs. Reaches the
# internal Timeline on purpose; counts allocations (allocation_count.cpp).
upright_test(upright_runner_run_test
  SOURCES timeline_test.cpp run_one_test.cpp batch_test.cpp module_log_run_test.cpp
          parallel_for_test.cpp
          allocation_count.cpp
  LIBS upright::runner)
target_include_directories(upright_runner_run_test PRIVATE ${PROJECT_SOURCE_DIR}/runner/run/src)
# A run whose module faults on its first tick, and runs whose module logs, use test modules of the
# host tests.
target_compile_definitions(upright_runner_run_test
  PRIVATE UPRIGHT_TEST_MODULE_DIR="${PROJECT_BINARY_DIR}/tests/host/modules")
add_dependencies(upright_runner_run_test faulty_1 logging)
# The runs load the built-in modules from the build tree.
add_dependencies(upright_runner_run_test upright_lqr upright_hinf upright_lqg upright_pid)
