# Run metrics: the step-response definitions against second-order handbook responses, the
# recorder's figures against synthetic runs with known integrals, settings and status strings,
# and the record of a module's messages. Allocations are counted (allocation_count.cpp) to show
# that both recorders make none per step.
upright_test(upright_runner_metrics_test
  SOURCES step_response_test.cpp metric_recorder_test.cpp metric_settings_test.cpp
          module_log_test.cpp allocation_count.cpp
  LIBS upright_runner_metrics upright::controller_abi)
