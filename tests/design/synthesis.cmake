# Linear model and controller synthesis tests.
upright_test(upright_linear_model_test
  SOURCES linear_model_test.cpp
  LIBS upright::design upright::sim upright::model)
upright_test(upright_synthesis_test
  SOURCES synthesis_test.cpp
  LIBS upright::design upright::sim upright::model)
upright_test(upright_discrete_hinf_test
  SOURCES discrete_hinf_test.cpp
  LIBS upright::design upright::model)
upright_test(upright_lqg_filter_test
  SOURCES lqg_filter_test.cpp
  LIBS upright::design upright::model)
upright_test(upright_sampled_loop_test
  SOURCES sampled_loop_test.cpp
  LIBS upright::design upright::model)
upright_test(upright_design_set_test
  SOURCES design_set_test.cpp
  LIBS upright::design upright::model)
upright_test(upright_delayed_loop_test
  SOURCES delayed_loop_test.cpp
  LIBS upright::design upright::model)
upright_test(upright_pid_poles_test
  SOURCES pid_poles_test.cpp
  LIBS upright::design upright::model)
