# Runs end to end: the timeline's event timing, one run's statuses and trace, and a batch whose
# tables do not depend on the number of jobs. Reaches the internal Timeline on purpose.
upright_test(upright_runner_run_test
  SOURCES timeline_test.cpp run_one_test.cpp batch_test.cpp
  LIBS upright::runner)
target_include_directories(upright_runner_run_test PRIVATE ${PROJECT_SOURCE_DIR}/runner/run/src)
# The runs load the built-in modules from the build tree.
add_dependencies(upright_runner_run_test upright_lqr upright_hinf upright_lqg upright_pid)
