// A demo robot from models/ for the design tests, by file name ("courier.xml").
#pragma once

#include <gtest/gtest.h>

#include <string>

#include "succeeded.hpp"
#include "upright/model/model_file.hpp"

namespace upright::design {

inline model::RobotModel Demo(const std::string& name) {
  const auto loaded = model::LoadModelFile(std::string(UPRIGHT_SOURCE_DIR) + "/models/" + name);
  EXPECT_TRUE(Succeeded(loaded));
  return loaded.value_or(model::RobotModel{});
}

}  // namespace upright::design
