# The HTML report: the CSV and JSON readers against RFC 4180 and RFC 8259 cases (the JSON writer
# read back exactly), decimation and axes, a report of a small run checked as XML (every element
# closed, one plot per scenario and signal, nothing external, a size bound, the same bytes twice),
# `upright report` as a user runs it, and the page rendered by headless Chromium (skipped when
# /usr/bin/chromium is absent).
# Reaches the report's internal readers and chart helpers on purpose.
upright_test(upright_runner_report_test
  SOURCES report_csv_test.cpp report_json_test.cpp report_charts_test.cpp report_test.cpp
          report_browser_test.cpp report_design_test.cpp report_tune_test.cpp
  LIBS upright::runner tinyxml2::tinyxml2 nlohmann_json::nlohmann_json)
target_include_directories(upright_runner_report_test
  PRIVATE ${PROJECT_SOURCE_DIR}/runner/report/src)
target_compile_definitions(upright_runner_report_test PRIVATE UPRIGHT_EXE="$<TARGET_FILE:upright>")
# The runs load the built-in modules from the build tree; the CLI cases run the program.
add_dependencies(upright_runner_report_test upright upright_lqr upright_pid)
