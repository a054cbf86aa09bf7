# tables tests: the paired tests and Student's t against SciPy, and the results folder of
# synthetic batches checked cell by cell (runs never played, floors, paired verdicts, spreads,
# partial rankings).
upright_test(upright_runner_tables_test
  SOURCES results_writer_test.cpp paired_tests_test.cpp
          summary_table_test.cpp compare_table_test.cpp ranking_table_test.cpp
  LIBS upright_runner_tables)
