# Scenario files: every rule with its exact message, a full file into exact values, the example.
upright_test(upright_runner_scenario_test SOURCES scenario_file_test.cpp LIBS upright_runner_scenario)
