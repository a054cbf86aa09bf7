# Survival envelopes: bisection against synthetic survival functions with known thresholds, and
# envelopes and survival maps end to end on the courier demo robot. Reaches the envelope's
# internal parameter-unit helper on purpose.
upright_test(upright_runner_envelope_test
  SOURCES envelope_bisect_test.cpp envelope_test.cpp
  LIBS upright::runner)
target_include_directories(upright_runner_envelope_test
  PRIVATE ${PROJECT_SOURCE_DIR}/runner/envelope/src)
# The runs load the built-in modules from the build tree.
add_dependencies(upright_runner_envelope_test upright_lqr upright_hinf upright_lqg upright_pid)
