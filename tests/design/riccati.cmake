# Riccati and Lyapunov solvers and zero-order-hold discretisation: check values, failure paths,
# and cross-checks against SLICOT (linked) and SciPy (through a small solver program).
upright_test(upright_riccati_test
  SOURCES riccati_test.cpp
  LIBS upright::design)

upright_test(upright_lyapunov_test
  SOURCES lyapunov_test.cpp
  LIBS upright::design)

upright_test(upright_slicot_riccati_test
  SOURCES slicot_riccati_test.cpp
  LIBS upright::design ${UPRIGHT_SLICOT_LIBS})

# Reads a Riccati problem on standard input and prints X: the SciPy script drives it.
add_executable(upright_riccati_tool riccati_tool.cpp)
target_link_libraries(upright_riccati_tool PRIVATE upright::design upright_warnings)
add_test(NAME upright_scipy_riccati
  COMMAND ${UPRIGHT_REFERENCE_PYTHON} ${CMAKE_CURRENT_SOURCE_DIR}/scipy_riccati_test.py
          $<TARGET_FILE:upright_riccati_tool>)
set_tests_properties(upright_scipy_riccati PROPERTIES TIMEOUT 120)
