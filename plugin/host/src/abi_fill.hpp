// ABI fill (internal): the robot model and its linear model in the C structs a module receives.
#pragma once

#include "upright/controller_abi.h"
#include "upright/model/robot_model.hpp"

namespace upright::host::internal {

upright_robot RobotForModule(const model::RobotModel& model);
upright_linear_model LinearForModule(const model::RobotModel& model);

}  // namespace upright::host::internal
