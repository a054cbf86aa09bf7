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
