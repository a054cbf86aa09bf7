# Scenario files: every rule with its exact message, a full file into exact values, the demo suite.
upright_test(upright_runner_scenario_test SOURCES scenario_file_test.cpp LIBS upright_runner_scenario)
# Scenario parameters by path (envelopes and sweeps vary them).
upright_test(upright_runner_parameter_test SOURCES scenario_parameter_test.cpp
             LIBS upright_runner_scenario)
