// Private to the scenario reader: <dispersions>, the Monte Carlo spreads of a scenario, read once
// the rest of the scenario is known (each spread names one of its parameters).
#pragma once

#include "scenario_reading.hpp"

namespace upright::runner::internal {

// Reads <dispersions> into scenario->dispersions. Parameter paths and spread centres are checked
// against the scenario only when nothing else in the file was wrong (they need the whole scenario).
void ReadDispersions(model::XmlElement root, ReadContext& context, Scenario* scenario);

}  // namespace upright::runner::internal
