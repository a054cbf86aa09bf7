# Scenario files: every rule with its exact message, a full file into exact values, the demo suite.
upright_test(upright_runner_scenario_test SOURCES scenario_file_test.cpp LIBS upright_runner_scenario)
# Scenario parameters by path (envelopes and sweeps vary them). Links the whole runner for the
# include paths of run_test_support.hpp, whose helpers also cover runs and batches.
upright_test(upright_runner_parameter_test SOURCES scenario_parameter_test.cpp
             LIBS upright::runner)
