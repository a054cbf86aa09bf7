# Run metrics: the step-response definitions against second-order handbook responses, the
# recorder's figures against synthetic runs with known integrals, settings and status strings.
upright_test(upright_runner_metrics_test
  SOURCES step_response_test.cpp metric_recorder_test.cpp metric_settings_test.cpp
  LIBS upright_runner_metrics)
