# Closed-loop analysis tests: H-infinity norm and margins against closed forms and published check
# values, and the norm against SLICOT AB13DD on random stable systems.
upright_test(upright_hinf_norm_test
  SOURCES hinf_norm_test.cpp
  LIBS upright::design)
upright_test(upright_discrete_norm_test
  SOURCES discrete_norm_test.cpp
  LIBS upright::design)
upright_test(upright_margins_test
  SOURCES margins_test.cpp
  LIBS upright::design)
upright_test(upright_slicot_norm_test
  SOURCES slicot_norm_test.cpp
  LIBS upright::design ${UPRIGHT_SLICOT_LIBS})
upright_test(upright_simultaneous_margins_test
  SOURCES simultaneous_margins_test.cpp
  LIBS upright::design upright::model)

# The design pictures' curves: loops at the wheel inputs and their frequency responses against
# closed forms and published examples, and against SciPy through a small program.
upright_test(upright_loop_response_test
  SOURCES loop_response_test.cpp
  LIBS upright::design upright::model)
add_executable(upright_design_curves_tool design_curves_tool.cpp)
target_link_libraries(upright_design_curves_tool PRIVATE upright::design upright::model
                      upright_warnings)
add_test(NAME upright_scipy_design_curves
  COMMAND ${UPRIGHT_REFERENCE_PYTHON} ${CMAKE_CURRENT_SOURCE_DIR}/scipy_design_curves_test.py
          $<TARGET_FILE:upright_design_curves_tool> ${PROJECT_SOURCE_DIR}/models/courier.xml
          ${PROJECT_SOURCE_DIR}/models/tabletop.xml)
set_tests_properties(upright_scipy_design_curves PROPERTIES TIMEOUT 300)
