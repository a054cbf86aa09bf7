# The defaults drawn from the robot: its ground-contact tilt, the design push and the linear
# loop's response to it, and the H-infinity γ rule with its trade-off table.
upright_test(upright_design_defaults_test
  SOURCES robot_limits_test.cpp design_push_test.cpp gamma_choice_test.cpp
  LIBS upright::design upright::sim upright::model)
