# tables tests: SHA-256 against the standard's examples, atomic writes, the paired tests and
# Student's t against SciPy, and the results folder of a synthetic batch checked cell by cell.
upright_test(upright_runner_tables_test
  SOURCES results_writer_test.cpp sha256_test.cpp atomic_file_test.cpp paired_tests_test.cpp
  LIBS upright_runner_tables)
