# The linear twin: its exact-hold linear robot against the inverted pendulum's closed forms and
# the impulse a push adds, its ideal sensors against the conventions and the sensor
# linearisation, the gap bands worked by hand, the host's plant-free tick against the plant path,
# and the twin against the plant end to end (small push: agreement; large push: a clear gap).
upright_test(upright_runner_twin_test
  SOURCES twin_dynamics_test.cpp twin_sensors_test.cpp twin_gap_test.cpp
          twin_host_tick_test.cpp twin_run_test.cpp
  LIBS upright::runner)
# The runs load the built-in modules from the build tree.
add_dependencies(upright_runner_twin_test upright_lqr upright_hinf upright_lqg upright_pid)
