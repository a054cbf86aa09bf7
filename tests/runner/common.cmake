# common tests: SHA-256 against the standard's examples, atomic writes, and the sample statistics
# (Wilson interval, percentiles) against published values, SciPy and NumPy.
upright_test(upright_runner_common_test
  SOURCES sha256_test.cpp atomic_file_test.cpp sample_statistics_test.cpp
  LIBS upright_runner_common)
