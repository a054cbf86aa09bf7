// One numeric field of a RobotModel addressed the way a model file writes it — an element path
// below the root and an attribute ("chassis", "mass_kg") — read or set through the same schema
// table the loader uses. Envelopes and Monte Carlo sweeps vary robot parameters through it.
#pragma once

#include <string>
#include <string_view>

#include "upright/base/result.hpp"
#include "upright/model/robot_model.hpp"

namespace upright::model {

// The field's value in `model`; a failure ("no model field chassis.mass_k; fields: ...") when the
// element or attribute names no field, or names one only files hold (the chassis box).
Result<double> GetModelField(const RobotModel& model, std::string_view element,
                             std::string_view attribute);

// Sets the field to `value` when it keeps the field's own range (and is whole where the field
// is); other fields are left as they are (a default derived from this one is not derived again).
// A failure naming the field, the value and the rule otherwise; `model` is then unchanged.
// Rules across fields are checked by ValidateModel, which callers run after their last change.
Status SetModelField(RobotModel* model, std::string_view element, std::string_view attribute,
                     double value);

}  // namespace upright::model
