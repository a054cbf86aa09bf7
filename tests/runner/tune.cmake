# Tuning: the search core against known optima (a second-order step's ISE through the metric
# recorder, a constrained quadratic), objective scoring by hand, tune-file errors with their lines,
# plan refusals, a real tune of a built-in whose files do not depend on the number of jobs, the
# pid module's pole knobs with a searched setting the module refuses, the evaluation log with a
# cut-short tune resumed into the uninterrupted one's tables; the Pareto filter on a hand-made set,
# the Pareto search on Schaffer's problem, and a real Pareto tune whose front and tables do not
# depend on the number of jobs.
upright_test(upright_runner_tune_test
  SOURCES tune_search_test.cpp tune_file_test.cpp tune_run_test.cpp tune_outputs_test.cpp
          tune_pid_poles_test.cpp tune_resume_test.cpp tune_pareto_test.cpp
          tune_pareto_run_test.cpp
  LIBS upright::runner)
# The runs load the built-in modules from the build tree.
add_dependencies(upright_runner_tune_test upright_lqr upright_hinf upright_lqg upright_pid)
